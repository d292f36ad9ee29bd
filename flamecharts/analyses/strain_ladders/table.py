"""[stretch]'s study table: which swept mixtures get a strained-flame ladder."""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

from ...config import AnalysisTable, TableContext, check_keys, parse_axis, parse_string_list
from ...errors import ConfigError

if TYPE_CHECKING:
    from ...config import Study

#: [stretch]: which swept mixtures get a strained-flame ladder (each a subset of its sweep axis).
KEYS = ("fuel", "oxidizer", "blend_fraction", "equivalence_ratio", "pressure_bar", "unburned_temperature_K")
#: Most strained-flame ladders one study may ask for (each is 10-40 flames).
MAX_LADDERS = 200


@dataclass(frozen=True)
class Stretch:
    """The [stretch] request: the swept mixtures (a subset of each sweep axis) that get a
    twin counterflow flame ladder from low strain to extinction (chemistry.strained)."""

    fuels: tuple[str, ...]
    oxidizers: tuple[str, ...]
    blend_fractions: tuple[float, ...]
    equivalence_ratios: tuple[float, ...]
    pressures_bar: tuple[float, ...]
    unburned_temperatures_K: tuple[float, ...]

    @property
    def n_ladders(self) -> int:
        return (len(self.fuels) * len(self.oxidizers) * len(self.blend_fractions) * len(self.equivalence_ratios)
                * len(self.pressures_bar) * len(self.unburned_temperatures_K))


def of(study: Study) -> Stretch | None:
    """The study's [stretch] table, None without one."""
    return study.tables.get("stretch")


def _subset(t: dict, key: str, allowed: tuple) -> tuple:
    """``stretch.KEY``: the listed values of the sweep axis ``allowed``, in the sweep's order."""
    if key in ("fuel", "oxidizer"):
        return parse_string_list(t[key], f"stretch.{key}", allowed)
    if t[key] == []:
        raise ConfigError(f"'stretch.{key}' is empty; give at least one of the swept values "
                          f"({', '.join(f'{a:g}' for a in allowed)})"
                          + ("" if key == "equivalence_ratio" else " or leave the key out (all of them)"))
    values = parse_axis(t[key], f"stretch.{key}")
    for v in values:
        if not any(math.isclose(v, a, rel_tol=1e-9, abs_tol=1e-12) for a in allowed):
            raise ConfigError(f"'stretch.{key}' lists {v:.10g}, which the sweep does not have; allowed: "
                              f"{', '.join(f'{a:g}' for a in allowed)}")
    return tuple(a for a in allowed if any(math.isclose(v, a, rel_tol=1e-9, abs_tol=1e-12) for v in values))


def parse(t: Any, ctx: TableContext) -> Stretch:
    """The [stretch] table: each key a subset of its sweep axis (default: the whole axis,
    except equivalence_ratio, which must be given)."""
    if not isinstance(t, dict):
        raise ConfigError("'stretch' must be a table")
    check_keys(t, KEYS, "stretch.")
    axes = ctx.axes
    if "equivalence_ratio" not in t:
        raise ConfigError("[stretch] needs 'equivalence_ratio': the swept values that get a strained-flame ladder "
                          f"(allowed: {', '.join(f'{v:g}' for v in axes['equivalence_ratio'])})")
    chosen = {key: _subset(t, key, axes[key]) if key in t else axes[key] for key in KEYS}
    st = Stretch(fuels=chosen["fuel"], oxidizers=chosen["oxidizer"], blend_fractions=chosen["blend_fraction"],
                 equivalence_ratios=chosen["equivalence_ratio"], pressures_bar=chosen["pressure_bar"],
                 unburned_temperatures_K=chosen["unburned_temperature_K"])
    if st.n_ladders > MAX_LADDERS:
        raise ConfigError(f"[stretch] asks for {st.n_ladders} strained-flame ladders, more than {MAX_LADDERS} "
                          "(each is 10-40 flames): choose fewer equivalence ratios, blends, pressures or preheats")
    return st


TABLE = AnalysisTable(name="stretch", keys=KEYS, parse=parse, enables=("extinction_blowout",))
