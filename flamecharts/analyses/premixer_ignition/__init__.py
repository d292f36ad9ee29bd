"""[premixer]'s ignition delays: the fresh mixture's and five near the fuel injection, per point.

Every point, burning or not, gets the constant-pressure ignition delays of its fresh mixture and of
the mixtures near the fuel injection (physics.autoignition.INJECTION_PHIS), integrated after the
sweep over the premixer's horizon (physics.autoignition.premixer_horizon); the read-out divides them
by the residence time into the autoignition margins and verdict (design.premixer_columns).

Only the extra solve lives here. The [premixer] table stays in config.py (``study.premixer``), as do
its columns, verdicts, charts and report section: the core reads the table for much more than these
delays (the premixer's turbulence, turbulent flame speeds, flashback and blowout margins, limits).
With this package left out of the registry a [premixer] study still runs; its delays are then not
integrated, and its autoignition verdict says they are not stored.

Parts: solve.py, task.py (flamecharts.analyses says what each declares).
"""
