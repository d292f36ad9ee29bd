"""[uncertainty]'s flame-speed sensitivities: one adjoint solve per burning point, after the sweep.

With ``kinetics = true`` each burning flame is solved again on its own grid and Cantera's adjoint
gives the sensitivity of its flame speed to every rate constant (chemistry.sensitivity); the
read-out combines them with the rate-constant uncertainty factors into the kinetic band
(design.kinetic_columns, physics.kinetic_uncertainty), so changing a factor solves nothing.

Only the extra solve lives here. The [uncertainty] table stays in config.py (``study.uncertainty``),
as do its columns, its sensitivities.csv and its report section: the core reads the table too
(design.kinetic_columns' band, the error bars of the flame-speed chart, the report's "How sure").
With this package left out of the registry a study may still ask for ``kinetics = true``; its
points then have no sensitivities, and their kinetic columns stay blank.

Parts: solve.py, task.py (flamecharts.analyses says what each declares).
"""
