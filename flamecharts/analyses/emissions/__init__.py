"""[emissions]: NO, NO2, N2O, CO and unburned fuel of every burning flame's burned gas.

The burned gas of each stored flame is followed for the study's residence times from its peak heat
release (chemistry.emissions: the flame's own profile inside its domain, a constant-pressure plug
flow beyond), and read out dry at a reference O2 and per kWh of heat input (physics.emissions).
Blends are also burned at the unblended gas's adiabatic flame temperature (equal_flame_temperature).

Parts: columns.py, table.py, solve.py, task.py, readout.py, dataset.py, report.py, charts.py,
console.py (flamecharts.analyses says what each declares).
"""
