"""[emissions]' study table: the residence times, the reference O2, the heating-value basis."""
from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

from ...config import AnalysisTable, TableContext, check_keys, parse_axis, parse_number, parse_string, suggest_allowed
from ...errors import ConfigError, show
from ...physics.emissions import AIR_O2_PERCENT

if TYPE_CHECKING:
    from ...config import Study

KEYS = ("residence_times_ms", "design_residence_time_ms", "reference_oxygen_percent", "heating_value",
        "specific", "equal_flame_temperature")
#: Burned-gas residence times when the table gives none [ms] (gas-turbine combustors hold their
#: burned gas some 5-30 ms, appliances less; from memory), and the most it takes.
DEFAULT_RESIDENCE_TIMES_MS = (2.0, 5.0, 10.0, 20.0, 50.0)
DEFAULT_DESIGN_RESIDENCE_TIME_MS = 20.0
MAX_RESIDENCE_TIMES = 12
HEATING_VALUE_BASES = ("gross", "net")
#: Species [emissions] reads: reduction targets of a study that asks for both.
EMISSION_SPECIES = ("NO", "NO2", "N2O", "CO")


@dataclass(frozen=True)
class Emissions:
    """The [emissions] request: NO, NO2, N2O, CO and unburned fuel of every burning flame's
    burned gas after ``residence_times_s`` from its peak heat release (chemistry.emissions), dry
    and corrected to ``reference_oxygen_percent``, and in mg/kWh of the fuel's heat input on the
    ``heating_value`` basis ('gross' or 'net'). ``design_residence_time_s`` (one of the times) is
    the one results.csv, the charts and the sentences use."""

    residence_times_s: tuple[float, ...]
    design_residence_time_s: float
    reference_oxygen_percent: float = 15.0
    heating_value: str = "gross"
    specific: bool = True   # report mg/kWh
    equal_flame_temperature: bool = True  # blends also at the unblended gas's adiabatic flame temperature


def of(study: Study) -> Emissions | None:
    """The study's [emissions] table, None without one."""
    return study.tables.get("emissions")


def parse(t: Any, ctx: TableContext) -> Emissions:
    """The [emissions] table: refused on a mechanism without nitrogen chemistry and without
    stored profiles (the burned gas is read from each flame's profile)."""
    if not isinstance(t, dict):
        raise ConfigError("'emissions' must be a table")
    check_keys(t, KEYS, "emissions.")
    lacking = [m.name for m in ctx.mechanisms if not m.nitrogen_chemistry]
    if lacking:
        raise ConfigError(f"[emissions] needs a mechanism that forms NO from N2, and {lacking[0]} has no nitrogen "
                          "chemistry; use e.g. gri30.yaml (methane, hydrogen, ethane, propane) or "
                          "example_data/ammonia-CO-H2-Alzueta-2023.yaml (hydrogen, ammonia)")
    if not ctx.keep_profiles:
        raise ConfigError("[emissions] reads each flame's burned gas from its stored profile, and keep_profiles = "
                          "false stores none; remove one of the two")
    times = tuple(sorted(set(parse_axis(t.get("residence_times_ms", list(DEFAULT_RESIDENCE_TIMES_MS)),
                                   "emissions.residence_times_ms"))))
    if len(times) > MAX_RESIDENCE_TIMES or times[0] <= 0 or times[-1] > 10000:
        raise ConfigError(f"'emissions.residence_times_ms' must list 1 to {MAX_RESIDENCE_TIMES} times above 0 and up "
                          "to 10,000 ms (milliseconds after the flame's peak heat release), e.g. [5, 20, 50]")
    design = parse_number(t["design_residence_time_ms"], "emissions.design_residence_time_ms") if \
        "design_residence_time_ms" in t else (DEFAULT_DESIGN_RESIDENCE_TIME_MS if DEFAULT_DESIGN_RESIDENCE_TIME_MS in times
                                              else times[-1])
    if design not in times:
        raise ConfigError(f"'emissions.design_residence_time_ms' is {design:g}; allowed: one of residence_times_ms "
                          f"({', '.join(f'{v:g}' for v in times)})")
    ref = parse_number(t.get("reference_oxygen_percent", 15.0), "emissions.reference_oxygen_percent")
    if not 0.0 <= ref < AIR_O2_PERCENT:
        raise ConfigError(f"'emissions.reference_oxygen_percent' is {ref:g}; allowed: 0 to below {AIR_O2_PERCENT:g} "
                          "(dry O2 the concentrations are corrected to: 15 for gas turbines, 3 or 0 for appliances)")
    basis = parse_string(t.get("heating_value", "gross"), "emissions.heating_value")
    if basis not in HEATING_VALUE_BASES:
        raise ConfigError(f"'emissions.heating_value' is {basis!r}{suggest_allowed(basis, HEATING_VALUE_BASES)} (the heat "
                          "input of mg/kWh: gross = higher heating value, as appliance NOx classes use)")
    flags = {k: t.get(k, True) for k in ("specific", "equal_flame_temperature")}
    for k, v in flags.items():
        if not isinstance(v, bool):
            raise ConfigError(f"'emissions.{k}' must be true or false, got {show(v)}")
    return Emissions(residence_times_s=tuple(v * 1e-3 for v in times), design_residence_time_s=design * 1e-3,
                     reference_oxygen_percent=ref, heating_value=basis, **flags)


TABLE = AnalysisTable(name="emissions", keys=KEYS, parse=parse, kept_species=lambda table: EMISSION_SPECIES)
