"""The only code that imports Cantera.

mechanism   find, fingerprint and load mechanism files; the one Solution cache
flame       one freely propagating flame: fresh or warm start, measured
ignition    constant-pressure ignition delay (autoignition warning)
emissions   a flame's burned gas after a residence time (profile, then plug flow); nitrogen chemistry
reduction   skeletal mechanisms (DRGEP) for a study's conditions, their ignition-delay error measured
skeletal    a study's skeletal mechanism: the smallest candidate whose ignition delays and flames hold
"""
