"""x ** y and ln x that give a number or an array the same bits, element by element.

power     x ** y through the C library's pow (NumPy's float_power), as Python's float ** computes it
log       ln x through the C library's log, as math.log computes it
exp       e^x through the C library's exp, as math.exp computes it

Why: on a processor with AVX-512, NumPy's own ``x ** y``, ``np.log`` and ``np.exp`` run vectorised
approximations that differ from the C library's in the last bit of about 5 % of values (and
``x ** 2`` becomes ``x * x``, which differs from ``pow(x, 2)`` in about 0.1 %). The design
read-out computes its columns on arrays over all points (design.annotate) and its numbers must
be those of one flame computed alone: a flame a limit search solves, a scalar call, a result
file written before. Both functions are exact restatements of the operations, no numerical
method of their own.
"""
from __future__ import annotations

import math

import numpy as np

#: A number or an array of numbers (the physics functions that broadcast take and return either).
Real = float | np.ndarray


def power(x: Real, y: float) -> Real:
    """``x ** y`` element by element with the C library's pow: a float for a number, an array
    for an array (NumPy's ``float_power``, which is not vectorised by NumPy's own approximations;
    ``tests/test_indicators.py`` checks it equals Python's ``**`` bit for bit).

    >>> power(1.5, 2), power(np.array([1.5, 3.0]), 2)
    (2.25, array([2.25, 9.  ]))
    """
    out = np.float_power(x, y)
    return float(out) if np.ndim(out) == 0 else out


def log(x: Real) -> Real:
    """Natural logarithm element by element with ``math.log`` (the C library's log): a float for a
    number, an array for an array.

    >>> round(log(math.e), 12), log(np.array([1.0, 1.0]))
    (1.0, array([0., 0.]))
    """
    if np.ndim(x) == 0:
        return math.log(float(x))
    a = np.asarray(x, dtype=float)
    return np.fromiter(map(math.log, a.ravel()), dtype=float, count=a.size).reshape(a.shape)


def exp(x: Real) -> Real:
    """e^x element by element with ``math.exp`` (the C library's exp): a float for a number, an
    array for an array.

    >>> exp(0.0), exp(np.array([0.0, 0.0]))
    (1.0, array([1., 1.]))
    """
    if np.ndim(x) == 0:
        return math.exp(float(x))
    a = np.asarray(x, dtype=float)
    return np.fromiter(map(math.exp, a.ravel()), dtype=float, count=a.size).reshape(a.shape)
