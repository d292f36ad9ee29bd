"""[stretch]: strained twin counterflow flames from low strain to extinction (a ladder) for chosen mixtures.

A ladder needs its free flame's unstretched S_L and T_ad, so its solves read the points' rows: they
run after every per-point extra and before the limits (sweep.analyses.PerStudy), one task per
ladder on the run's workers, stored under keys of their own (family 'stretch:...', no profile).
Each ladder is a row of stretch.csv and of ``Results.ladders_dataset`` (over ``ladder`` and
``strain_step``); its strongest consumption speed and its extinction strain rate are merged into
its point's stored values, where a premixer's read-out reads them by column name
(design.Ladders: its leading-point flame speed and extinction-strain blowout).

The physics (chemistry.strained, the ladder's settings in numerics) stays shared science.

Parts: columns.py, table.py, solve.py, task.py, dataset.py, report.py, charts.py, console.py
(flamecharts.analyses says what each declares).
"""
