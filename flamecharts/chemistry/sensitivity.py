"""Sensitivity of the laminar flame speed to every reaction's rate constant, by the adjoint method.

flame_speed_sensitivities   a stored flame solved again on its own grid, then Cantera's adjoint
                            solve: s_i = d ln S_L / d ln k_i for every reaction (one linear solve
                            and one residual evaluation per reaction)

The adjoint method gives all sensitivities of one output at the cost of one linear solve
with the transposed Jacobian (Cantera's ``Sim1D.solve_adjoint``; the method as used for
flames: Braman, Oliver & Raman, Combust. Theory Model. 17 (2013) 858). Checked against
brute-force finite differences in tests/test_uncertainty.py.
"""
from __future__ import annotations

import contextlib
import io
import warnings

import cantera as ct
import numpy as np

from . import flame as flame_mod


def flame_speed_sensitivities(gas: ct.Solution, T_u: float, P: float, X: dict, transport: str, soret: bool,
                              profile: dict, numerics: flame_mod.Numerics) -> dict:
    """Normalized sensitivities s_i = (k_i / S_L) dS_L/dk_i of a converged flame.

    The flame is set up from its stored ``profile`` on the stored grid and solved there (no
    refinement: the grid is the flame's own, so this converges in a few Newton steps), then
    Cantera's adjoint solve gives every s_i.

    Parameters
    ----------
    gas : cantera.Solution of the mechanism, with the flame's transport model
    T_u : unburned temperature [K]; P : pressure [Pa]; X : unburned mole fractions
    transport, soret : as the flame was solved
    profile : the stored profile (chemistry.flame.profile_of form)
    numerics : the flame's chemistry.flame.Numerics (grid ceiling, refine criteria)

    Returns
    -------
    dict: ``sensitivities`` list of floats, one per reaction in the mechanism's order [-];
    ``laminar_flame_speed_m_s`` of the re-solved flame [m/s] (equal to the stored one within
    the solver's tolerance); ``grid_points``.
    """
    with warnings.catch_warnings(), contextlib.redirect_stdout(io.StringIO()):
        warnings.simplefilter("ignore")
        gas.TPX = T_u, P, X
        f = flame_mod._make_flame(ct, gas, 0.01, transport, soret, numerics)
        flame_mod._set_criteria(f, numerics.stages[-1], numerics.prune)
        f.set_initial_guess(data=flame_mod._initial_guess(ct, gas, profile, P, T_u))
        f.P = P
        f.inlet.T = T_u
        f.inlet.X = X
        f.solve(loglevel=0, refine_grid=False, auto=False)
        s = np.asarray(f.get_flame_speed_reaction_sensitivities(), dtype=float)
    return {"sensitivities": [float(v) for v in s], "laminar_flame_speed_m_s": float(f.velocity[0]),
            "grid_points": int(len(f.grid))}
