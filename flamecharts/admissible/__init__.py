"""Admissible limits of a burner, by warm-started root finding on stored and new flames.

brent      Brent's method as a generator (each evaluation may be a flame)
search     the limit function of a flame row; blend-fraction and equivalence-ratio searches
driver     runs every search of a study together on the run's backend -> limits.csv rows
"""
from .driver import LimitsProgress, find_limits

__all__ = ["LimitsProgress", "find_limits"]
