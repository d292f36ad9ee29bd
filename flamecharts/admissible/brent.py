"""Brent's method for a root, written as a generator so that each evaluation can be a flame.

A limit search cannot call ``f(x)`` and wait: every evaluation is a flame solved by
the run's backend, and several independent searches share the workers. So the root
finder is a generator: it yields the next x to evaluate and is sent f(x) back
(:func:`brent_steps`); :func:`drive` runs it against a plain function (tests, and the
Wobbe bound, which needs no flame).
"""
from __future__ import annotations

import math
import sys
from collections.abc import Callable, Generator
from dataclasses import dataclass

#: Machine epsilon of float64: the relative part of the convergence test.
EPS = sys.float_info.epsilon


@dataclass(frozen=True)
class Bracket:
    """Where a root search ended: f(good) >= 0 > f(bad) (or the other way round when the
    function falls the other way), ``width`` = |bad - good|, ``evaluations`` made by the
    search (the two ends given to it not counted), ``converged`` False when the search was
    stopped by its evaluation budget."""

    good: float
    f_good: float
    bad: float
    f_bad: float
    evaluations: int
    converged: bool

    @property
    def width(self) -> float:
        """How far the root may lie from ``good``: 0 when f(good) is exactly 0."""
        return 0.0 if self.f_good == 0.0 else abs(self.bad - self.good)


def brent_steps(a: float, fa: float, b: float, fb: float, xtol: float,
                max_evaluations: int = 50) -> Generator[float, float, Bracket]:
    """Find a sign change of f inside [a, b] (f(a), f(b) of opposite signs, both given).

    Brent's method: inverse quadratic interpolation or the secant step where it makes
    progress, bisection where it does not, so it converges at least as surely as
    bisection and usually much faster on smooth functions (Brent, *Algorithms for
    Minimization without Derivatives*, Prentice-Hall 1973, ch. 4; the 'zeroin' routine
    as printed in Forsythe, Malcolm & Moler, *Computer Methods for Mathematical
    Computations*, 1977, section 7.2). It stops when the bracket around the sign change
    is at most ``xtol`` wide (plus 4 eps|x|), or after ``max_evaluations``.

    Yields x, receives f(x) (a finite float); returns a :class:`Bracket` whose ``good``
    end has f >= 0.

    >>> gen = brent_steps(0.0, 1.0, 1.0, -1.0, 1e-3)
    >>> x = next(gen)
    >>> try:
    ...     while True:
    ...         x = gen.send(0.3 - x)   # root at 0.3, f falls
    ... except StopIteration as stop:
    ...     r = stop.value
    >>> abs(r.good - 0.3) <= 1e-3, r.f_good >= 0 > r.f_bad
    (True, True)
    """
    if not (fa >= 0) != (fb >= 0):
        raise ValueError(f"f({a:g}) = {fa:g} and f({b:g}) = {fb:g} have the same sign: no bracket")
    n = 0
    c, fc = a, fa
    d = e = b - a
    while True:
        if (fb >= 0) == (fc >= 0):  # the new point lies on c's side: the bracket is [a, b]
            c, fc = a, fa
            d = e = b - a
        if abs(fc) < abs(fb):
            a, b, c = b, c, b
            fa, fb, fc = fb, fc, fb
        tol1 = 2.0 * EPS * abs(b) + 0.5 * xtol
        xm = 0.5 * (c - b)
        if abs(xm) <= tol1 or fb == 0.0 or n >= max_evaluations:
            converged = abs(xm) <= tol1 or fb == 0.0
            return _bracket(b, fb, c, fc, n, converged)
        if abs(e) >= tol1 and abs(fa) > abs(fb):
            s = fb / fa
            if a == c:  # secant
                p, q = 2.0 * xm * s, 1.0 - s
            else:       # inverse quadratic interpolation
                q, r = fa / fc, fb / fc
                p = s * (2.0 * xm * q * (q - r) - (b - a) * (r - 1.0))
                q = (q - 1.0) * (r - 1.0) * (s - 1.0)
            if p > 0:
                q = -q
            p = abs(p)
            if 2.0 * p < min(3.0 * xm * q - abs(tol1 * q), abs(0.5 * e * q)):
                e, d = d, p / q
            else:
                d = e = xm
        else:
            d = e = xm
        a, fa = b, fb
        b = b + d if abs(d) > tol1 else b + math.copysign(tol1, xm)
        fb = yield b
        n += 1
        if not math.isfinite(fb):
            raise ValueError(f"f({b:g}) = {fb!r} is not a finite number")


def _bracket(b: float, fb: float, c: float, fc: float, n: int, converged: bool) -> Bracket:
    if fb >= 0:
        return Bracket(good=b, f_good=fb, bad=c, f_bad=fc, evaluations=n, converged=converged)
    return Bracket(good=c, f_good=fc, bad=b, f_bad=fb, evaluations=n, converged=converged)


def drive(gen: Generator[float, float, Bracket], f: Callable[[float], float]) -> Bracket:
    """Run a root-search generator against a plain function f."""
    try:
        x = next(gen)
        while True:
            x = gen.send(float(f(x)))
    except StopIteration as stop:
        return stop.value


#: The golden-section fraction (3 - sqrt 5) / 2 of Brent's minimiser.
GOLDEN = 0.5 * (3.0 - math.sqrt(5.0))


@dataclass(frozen=True)
class Peak:
    """Where a maximum search ended: the best x found, f there, the evaluations made and
    whether the bracket shrank below the tolerance (False: stopped by the budget)."""

    x: float
    f: float
    evaluations: int
    converged: bool


def maximum_steps(a: float, b: float, xtol: float, max_evaluations: int = 50) -> Generator[float, float, Peak]:
    """Find a local maximum of f inside [a, b] without derivatives.

    Brent's minimiser applied to -f: golden-section steps where the parabola through the
    last three points is not trusted, parabolic interpolation where it is, so it needs no
    more evaluations than golden section and far fewer on smooth functions (Brent,
    *Algorithms for Minimization without Derivatives*, Prentice-Hall 1973, ch. 5, 'localmin';
    the bounded form of scipy.optimize.fminbound). The ends themselves are not evaluated;
    it stops when the bracket of the maximum is about ``xtol`` wide, or after
    ``max_evaluations``. The caller may close the generator early (a limit search stops as
    soon as it meets an admissible flame).

    Yields x, receives f(x) (a finite float); returns a :class:`Peak`.

    >>> gen = maximum_steps(0.0, 1.0, 1e-4)
    >>> x = next(gen)
    >>> try:
    ...     while True:
    ...         x = gen.send(-(x - 0.3) ** 2)
    ... except StopIteration as stop:
    ...     p = stop.value
    >>> abs(p.x - 0.3) < 1e-3, p.converged
    (True, True)
    """
    sqrt_eps = math.sqrt(EPS)
    v = w = x = a + GOLDEN * (b - a)
    fx = yield x
    fx = -fx
    n = 1
    fv = fw = fx
    d = e = 0.0
    while True:
        xm = 0.5 * (a + b)
        tol1 = sqrt_eps * abs(x) + xtol / 3.0
        tol2 = 2.0 * tol1
        if abs(x - xm) <= tol2 - 0.5 * (b - a):
            return Peak(x, -fx, n, True)
        if n >= max_evaluations:
            return Peak(x, -fx, n, False)
        golden = True
        if abs(e) > tol1:  # try the parabola through x, w, v
            r = (x - w) * (fx - fv)
            q = (x - v) * (fx - fw)
            p = (x - v) * q - (x - w) * r
            q = 2.0 * (q - r)
            if q > 0.0:
                p = -p
            q = abs(q)
            r, e = e, d
            if abs(p) < abs(0.5 * q * r) and q * (a - x) < p < q * (b - x):
                d = p / q
                golden = False
                u = x + d
                if u - a < tol2 or b - u < tol2:
                    d = tol1 if xm >= x else -tol1
        if golden:
            e = (a - x) if x >= xm else (b - x)
            d = GOLDEN * e
        u = x + (d if abs(d) >= tol1 else math.copysign(tol1, d if d != 0 else 1.0))
        fu = yield u
        if not math.isfinite(fu):
            raise ValueError(f"f({u:g}) = {fu!r} is not a finite number")
        fu = -fu
        n += 1
        if fu <= fx:
            if u >= x:
                a = x
            else:
                b = x
            v, fv, w, fw, x, fx = w, fw, x, fx, u, fu
        else:
            if u < x:
                a = u
            else:
                b = u
            if fu <= fw or w == x:
                v, fv, w, fw = w, fw, u, fu
            elif fu <= fv or v == x or v == w:
                v, fv = u, fu
