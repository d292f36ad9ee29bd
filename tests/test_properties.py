"""Property-based tests (hypothesis): the config loader and the mixture functions.

Any input either gives a valid result or raises flamecharts' own error type
(a FlamechartsError subclass), never another exception:

- study_from_dict on mutations of a valid config and on arbitrary TOML-like tables;
- study_from_toml on arbitrary and on mutated TOML text;
- mixtures: normalize, blend, stoich_o2_per_fuel, unburned_mixture and
  equivalence_ratio return mole fractions that are finite, >= 0 and sum to one,
  and phi round-trips; or they raise MixtureError.

Runs are bounded (max_examples about 200, no deadline) so the suite stays fast.
"""
from __future__ import annotations

import copy
import math

import pytest
from hypothesis import HealthCheck, assume, event, given, settings, strategies as st

from flamecharts.config import Study, study_from_dict, study_from_toml
from flamecharts.errors import FlamechartsError, MixtureError
from flamecharts.physics import mixtures

BOUNDED = settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])

BASE = {
    "title": "property base",
    "mechanism": "h2o2.yaml",
    "fuels": {"hydrogen": {"H2": 1.0}, "diluted": {"H2": 0.6, "N2": 0.4}},
    "oxidizers": {"air": {"O2": 1.0, "N2": 3.76}},
    "sweep": {"fuel": ["diluted"], "oxidizer": ["air"], "blend": {"with": "hydrogen", "fraction": [0.0, 0.5]},
              "equivalence_ratio": [0.8, 1.0], "pressure_bar": [1.0], "unburned_temperature_K": [300.0]},
    "burner": {"port": "round", "port_diameter_mm": 2.5, "port_velocity_m_s": 2.0},
    "gas_quality": {"wobbe_tolerance_percent": 5.0},
    "indicators": {"flashback_peclet": 13.0},
}

BASE_TOML = """\
title = "property base"
mechanism = "h2o2.yaml"
max_points = 50

[fuels]
hydrogen = { H2 = 1.0 }
diluted = { H2 = 0.6, N2 = 0.4 }

[oxidizers]
air = { O2 = 1.0, N2 = 3.76 }

[sweep]
fuel = ["diluted"]
oxidizer = ["air"]
blend = { with = "hydrogen", fraction = [0.0, 0.5] }
equivalence_ratio = { from = 0.8, to = 1.0, step = 0.1 }
pressure_bar = [1.0]
unburned_temperature_K = 300.0

[burner]
port_diameter_mm = 2.5
port_velocity_m_s = 2.0
"""

SPECIES = ["H2", "O2", "N2", "AR", "H2O", "OH", "H", "O", "HO2", "H2O2", "CH4", "h2", ""]
NAMES = ["hydrogen", "diluted", "air", "methane", "x"]
KEYS = sorted({*BASE, *BASE["sweep"], "from", "to", "step", "with", "fraction", "port", "wobbe", "max_points",
               "transport", "resolution", "thermal_diffusion", "reference_fuel", *SPECIES[:6], *NAMES})

floats = st.floats(allow_nan=True, allow_infinity=True) | st.sampled_from(
    [0.0, -0.0, 1.0, 0.5, 1e-320, 5e-324, 1e308, -1e308, 1e-9, 2.0, 300.0, 1e6])
scalars = (floats | st.integers(min_value=-(10 ** 30), max_value=10 ** 30) | st.booleans()
           | st.text(max_size=12) | st.sampled_from(SPECIES + NAMES + ["h2o2.yaml", "gri30.yaml", "round", "slot"])
           | st.dates() | st.datetimes() | st.times())
values = st.recursive(scalars, lambda inner: st.lists(inner, max_size=4)
                      | st.dictionaries(st.sampled_from(KEYS) | st.text(max_size=6), inner, max_size=4),
                      max_leaves=12)


def _paths(node, prefix=()):
    yield prefix
    if isinstance(node, dict):
        for k, v in node.items():
            yield from _paths(v, prefix + (k,))
    elif isinstance(node, list):
        for i, v in enumerate(node):
            yield from _paths(v, prefix + (i,))


@st.composite
def mutated_configs(draw):
    """The valid BASE with 1-3 mutations: a value replaced, a key dropped, or a key added."""
    d = copy.deepcopy(BASE)
    for _ in range(draw(st.integers(1, 3))):
        paths = [p for p in _paths(d) if p]
        path = draw(st.sampled_from(paths))
        parent = d
        for k in path[:-1]:
            parent = parent[k]
        action = draw(st.sampled_from(["replace", "replace", "drop", "add"]))
        if action == "replace":
            parent[path[-1]] = draw(values)
        elif action == "drop":
            del parent[path[-1]]
        elif isinstance(parent, dict):
            parent[draw(st.sampled_from(KEYS) | st.text(max_size=8))] = draw(values)
        else:
            parent.append(draw(values))
    return d


def _check_study(s: Study) -> None:
    """A study that loaded is usable: normalised compositions, a plan, valid mixtures."""
    from flamecharts.sweep import points as plan_points

    for comp in (*s.fuels.values(), *s.oxidizers.values()):
        _assert_fractions(comp)
    assert 1 <= s.n_points <= s.max_points
    for phi in s.equivalence_ratios:
        assert math.isfinite(phi) and phi > 0
    for v in (*s.pressures_bar, *s.unburned_temperatures_K):
        assert math.isfinite(v) and v > 0
    if s.n_points <= 200:
        for p in plan_points.points(s):
            _assert_fractions(p.X_unburned)
        from flamecharts.design import fuel_gas_table

        for gas in fuel_gas_table(s):  # what `check` prints, and `run` writes to fuel_gases.csv
            assert gas["higher_heating_value_MJ_m3"] >= gas["lower_heating_value_MJ_m3"] - 1e-9


def _load_or_own_error(load, *args, **kwargs):
    try:
        s = load(*args, **kwargs)
    except FlamechartsError as exc:
        msg = str(exc)
        assert msg and "\n" not in msg and msg.isprintable()
        event(f"refused: {type(exc).__name__}: {msg[:45]}")
        return None
    _check_study(s)
    event("loaded")
    return s


@BOUNDED
@given(mutated_configs())
def test_mutated_configs_load_or_raise_our_error(d):
    _load_or_own_error(study_from_dict, d)


H2O2_SPECIES = ["H2", "O2", "N2", "AR", "H2O", "OH", "H", "O", "HO2", "H2O2"]
plausible_amounts = st.floats(min_value=0.0, max_value=10.0) | st.sampled_from([0.0, 1e-12, 1e-7, 1e6, 1e300])
plausible_axis = (st.lists(st.floats(min_value=1e-3, max_value=9.0), min_size=1, max_size=3)
                  | st.floats(min_value=1e-3, max_value=9.0)
                  | st.builds(lambda a, n, step: {"from": a, "to": a + n * step, "step": step},
                              st.floats(0.05, 3.0), st.integers(0, 4), st.floats(0.01, 1.0))
                  | st.sampled_from([[1e-3], [9.99], [0.5, 1.0, 2.0]]))


@st.composite
def plausible_configs(draw):
    """Configs built from sensible parts (h2o2 species, numbers of the right kind): many load."""
    fuels = {f"f{i}": {**draw(st.dictionaries(st.sampled_from(H2O2_SPECIES), plausible_amounts, max_size=3)),
                       draw(st.sampled_from(["H2", "H"])): draw(st.floats(0.01, 10.0))}
             for i in range(draw(st.integers(1, 3)))}
    ox = {**draw(st.dictionaries(st.sampled_from(["N2", "AR", "H2O"]), plausible_amounts, max_size=2)),
          "O2": draw(st.floats(0.01, 10.0))}
    sweep = {"fuel": draw(st.lists(st.sampled_from(sorted(fuels)), min_size=1, max_size=2, unique=True)),
             "oxidizer": ["air"], "equivalence_ratio": draw(plausible_axis)}
    if draw(st.booleans()):
        sweep["blend"] = {"with": draw(st.sampled_from(sorted(fuels))),
                          "fraction": draw(st.lists(st.floats(0.0, 1.2), min_size=1, max_size=3))}
    for key, scale in (("pressure_bar", 10.0), ("unburned_temperature_K", 200.0)):
        if draw(st.booleans()):
            axis = draw(plausible_axis)
            sweep[key] = ([v * scale for v in axis] if isinstance(axis, list) else
                          {k: v * scale for k, v in axis.items()} if isinstance(axis, dict) else axis * scale)
    d = {"mechanism": "h2o2.yaml", "fuels": fuels, "oxidizers": {"air": ox}, "sweep": sweep,
         "max_points": draw(st.sampled_from([10000, 50, 3]))}
    if draw(st.booleans()):
        d["burner"] = {"port_diameter_mm": draw(st.floats(0.1, 10.0)), "port_velocity_m_s": draw(st.floats(0.1, 50.0))}
    if draw(st.booleans()):
        d["gas_quality"] = {"wobbe_tolerance_percent": draw(st.floats(0.5, 20.0))}
    return d


@BOUNDED
@given(plausible_configs())
def test_plausible_configs_load_into_usable_studies_or_raise_our_error(d):
    _load_or_own_error(study_from_dict, d)


@BOUNDED
@given(st.dictionaries(st.sampled_from(KEYS) | st.text(max_size=8), values, max_size=6))
def test_arbitrary_tables_load_or_raise_our_error(d):
    _load_or_own_error(study_from_dict, d)


@BOUNDED
@given(values)
def test_any_value_as_the_whole_config_raises_our_error(v):
    with pytest.raises(FlamechartsError):
        study_from_dict(v)


@st.composite
def mutated_toml(draw):
    """BASE_TOML with lines dropped, duplicated or swapped, or characters changed."""
    lines = BASE_TOML.splitlines()
    for _ in range(draw(st.integers(1, 4))):
        i = draw(st.integers(0, len(lines) - 1))
        action = draw(st.sampled_from(["drop", "dup", "swap", "insert_char", "replace_value"]))
        if action == "drop":
            del lines[i]
        elif action == "dup":
            lines.insert(i, lines[i])
        elif action == "swap":
            j = draw(st.integers(0, len(lines) - 1))
            lines[i], lines[j] = lines[j], lines[i]
        elif action == "insert_char":
            pos = draw(st.integers(0, len(lines[i])))
            lines[i] = lines[i][:pos] + draw(st.sampled_from(list("[]{}=\",.#'\\\n\t 0-e") + ["nan", "inf"])) \
                + lines[i][pos:]
        elif "=" in lines[i]:
            key = lines[i].split("=", 1)[0]
            lines[i] = key + "= " + draw(st.sampled_from(
                ["nan", "inf", "-inf", "1e400", "0", "-1", "true", '"x"', "[]", "{}", "[1, 2, 3]", "1979-05-27",
                 "{ from = 1, to = 0, step = 0.1 }", "{ H2 = 1e308, N2 = 1e308 }", "{ H2 = 5e-324 }",
                 "{ from = 0.5, to = 1.0, step = 1e-12 }", "[" * 300 + "]" * 300]))
        if not lines:
            lines = [""]
    return "\n".join(lines) + "\n"


@BOUNDED
@given(mutated_toml())
def test_mutated_toml_text_loads_or_raises_our_error(text):
    if len(text) < 20_000:
        _load_or_own_error(study_from_toml, text)


@BOUNDED
@given(st.text(max_size=200))
def test_arbitrary_text_loads_or_raises_our_error(text):
    _load_or_own_error(study_from_toml, text)


# ------------------------------------------------------------------------------ mixtures

def _assert_fractions(X) -> None:
    assert X, "empty composition"
    for name, x in X.items():
        assert isinstance(name, str) and math.isfinite(x) and x > 0, (name, x)
    assert math.fsum(X.values()) == pytest.approx(1.0, abs=1e-12)


amounts = (st.floats(allow_nan=True, allow_infinity=True)
           | st.sampled_from([0.0, 1e-320, 5e-324, 1e308, 1.7e308, -1.0, 1.0])
           | st.integers(min_value=-(10 ** 400), max_value=10 ** 400) | st.booleans() | st.none() | st.text(max_size=3))
compositions = st.dictionaries(st.sampled_from(SPECIES) | st.text(max_size=4) | st.integers(), amounts, max_size=6)
good_amounts = st.floats(min_value=0.0, max_value=1e308, allow_nan=False) | st.sampled_from([1e-320, 1e308])
ATOMS = {"H2": {"H": 2}, "O2": {"O": 2}, "N2": {"N": 2}, "AR": {"Ar": 1}, "H2O": {"H": 2, "O": 1},
         "OH": {"O": 1, "H": 1}, "H": {"H": 1}, "CH4": {"C": 1, "H": 4}, "C2H6": {"C": 2, "H": 6},
         "CO": {"C": 1, "O": 1}, "CO2": {"C": 1, "O": 2}, "H2S": {"H": 2, "S": 1}, "CH3OH": {"C": 1, "H": 4, "O": 1}}
FUEL_SPECIES = ["H2", "CH4", "C2H6", "CO", "H2S", "CH3OH", "N2", "CO2", "H2O", "AR"]
OX_SPECIES = ["N2", "AR", "CO2", "H2O"]
fuel_streams = st.dictionaries(st.sampled_from(FUEL_SPECIES), good_amounts, min_size=1, max_size=5)
oxidizers = st.builds(lambda o2, rest: {"O2": o2, **rest},
                      st.floats(min_value=1e-6, max_value=1e6),
                      st.dictionaries(st.sampled_from(OX_SPECIES), good_amounts, max_size=3))


def _own_error_or(fn, *args):
    try:
        return fn(*args)
    except MixtureError as exc:
        assert isinstance(exc, FlamechartsError) and "\n" not in str(exc)
        return None


@BOUNDED
@given(compositions)
def test_normalize_gives_mole_fractions_or_our_error(X):
    out = _own_error_or(mixtures.normalize, X)
    if out is not None:
        _assert_fractions(out)
        assert set(out) <= {k for k, v in X.items() if v > 0}


@BOUNDED
@given(compositions, compositions, amounts)
def test_blend_of_anything_gives_mole_fractions_or_our_error(a, b, f):
    out = _own_error_or(mixtures.blend, a, b, f)
    if out is not None:
        _assert_fractions(out)


@BOUNDED
@given(fuel_streams, fuel_streams, st.floats(min_value=0.0, max_value=1.0))
def test_blend_conserves_each_species(a, b, f):
    out = _own_error_or(mixtures.blend, a, b, f)
    assume(out is not None)
    na, nb = mixtures.normalize(a), mixtures.normalize(b)
    for sp in set(na) | set(nb):
        want = (1 - f) * na.get(sp, 0.0) + f * nb.get(sp, 0.0)
        assert out.get(sp, 0.0) == pytest.approx(want, rel=1e-9, abs=1e-300)


@BOUNDED
@given(fuel_streams, fuel_streams, st.floats(min_value=0.0, max_value=1.0))
def test_stoichiometry_is_linear_in_the_blend(a, b, f):
    ab = _own_error_or(mixtures.blend, a, b, f)
    assume(ab is not None)
    s_a, s_b = mixtures.stoich_o2_per_fuel(ATOMS, a), mixtures.stoich_o2_per_fuel(ATOMS, b)
    assert mixtures.stoich_o2_per_fuel(ATOMS, ab) == pytest.approx((1 - f) * s_a + f * s_b, rel=1e-9, abs=1e-12)


@BOUNDED
@given(compositions, st.dictionaries(st.sampled_from(SPECIES) | st.text(max_size=3),
                                     st.dictionaries(st.sampled_from(["C", "H", "O", "S", "N"]), amounts,
                                                     max_size=3), max_size=6))
def test_stoichiometry_of_anything_is_a_number_or_our_error(X, atoms):
    need = _own_error_or(mixtures.stoich_o2_per_fuel, atoms, X)
    if need is not None:
        assert math.isfinite(need)


@BOUNDED
@given(fuel_streams, oxidizers, st.floats(min_value=1e-4, max_value=1e4))
def test_equivalence_ratio_round_trips(fuel, ox, phi):
    o2 = _own_error_or(mixtures.stoich_o2_per_fuel, ATOMS, fuel)
    assume(o2 is not None and o2 > 1e-6)
    X = _own_error_or(mixtures.unburned_mixture, fuel, ox, phi, o2)
    assume(X is not None)
    _assert_fractions(X)
    back = _own_error_or(mixtures.equivalence_ratio, X, fuel, ox, o2)
    if back is not None:  # None: fuel and oxidizer too alike to tell apart
        assert back == pytest.approx(phi, rel=1e-6)


@BOUNDED
@given(compositions, compositions, amounts, amounts)
def test_unburned_mixture_of_anything_gives_mole_fractions_or_our_error(fuel, ox, phi, o2):
    X = _own_error_or(mixtures.unburned_mixture, fuel, ox, phi, o2)
    if X is not None:
        _assert_fractions(X)


def test_examples_found_by_hypothesis_stay_fixed():
    # sums that overflow a float used to give all-zero "mole fractions"
    _assert_fractions(mixtures.normalize({"H2": 1e308, "N2": 1e308}))
    # a species without atom counts used to raise KeyError
    with pytest.raises(MixtureError, match="'CH4' has no atom counts"):
        mixtures.stoich_o2_per_fuel({"H2": {"H": 2}}, {"CH4": 1.0})
    # an equivalence ratio so small that the fuel vanishes from the mixture
    with pytest.raises(MixtureError, match="leaves no fuel"):
        mixtures.unburned_mixture({"H2": 1.0}, {"O2": 1.0}, 1e-310, 0.5)
    with pytest.raises(MixtureError, match="must be a number"):
        mixtures.normalize({"H2": "1"})
    # a range wider than a float and a huge integer used to raise OverflowError
    with pytest.raises(FlamechartsError, match="too many values"):
        study_from_dict({**BASE, "sweep": {**BASE["sweep"], "pressure_bar": {"from": -1.7e308, "to": 1.7e308,
                                                                             "step": 1.0}}})
    with pytest.raises(FlamechartsError, match="digits"):
        study_from_dict({**BASE, "sweep": {**BASE["sweep"], "pressure_bar": [10 ** 400]}})
    with pytest.raises(FlamechartsError, match="too deeply"):
        study_from_toml("x = " + "[" * 3000 + "]" * 3000)
    # a sweep fuel that is almost all O2 or water, blended only at fraction 1, is still the Wobbe
    # reference of its blends: its zero heating value used to divide by zero in the gas table
    for other in ("O2", "H2O"):
        d = {"mechanism": "h2o2.yaml", "fuels": {"f0": {"H2": 1.0}, "f1": {other: 1e300, "H2": 1.0}},
             "oxidizers": {"air": {"O2": 1.0}},
             "sweep": {"fuel": ["f1"], "oxidizer": ["air"], "equivalence_ratio": [1.0],
                       "blend": {"with": "f0", "fraction": [1.0]}}}
        with pytest.raises(FlamechartsError, match="'fuels.f1' has .almost. no combustible species"):
            study_from_dict(d)
