"""[flame_response]' study table: whether to solve the Zeldovich pair, and the inert's step."""
from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

from ...config import AnalysisTable, TableContext, check_keys, parse_positive
from ...errors import ConfigError, show
from ...physics.flame_response import DEFAULT_INERT_STEP

if TYPE_CHECKING:
    from ...config import Study

KEYS = ("zeldovich", "inert_step")


@dataclass(frozen=True)
class FlameResponse:
    """The [flame_response] request: two extra flames per point with the inert's mole
    fraction moved by ``inert_step`` either way give the Zeldovich number, and with it the
    effective Lewis number, the Markstein number and the thermodiffusive regime."""

    zeldovich: bool = True
    inert_step: float = DEFAULT_INERT_STEP


def of(study: Study) -> FlameResponse | None:
    """The study's [flame_response] table, None without one."""
    return study.tables.get("flame_response")


def zeldovich_step(study: Study) -> float | None:
    """The inert step of the study's Zeldovich flames, None when it asks for none."""
    fr = of(study)
    return fr.inert_step if fr is not None and fr.zeldovich else None


def parse(t: Any, ctx: TableContext) -> FlameResponse:
    """The [flame_response] table: ``zeldovich`` true or false, ``inert_step`` a mole fraction in (0, 0.1]."""
    if not isinstance(t, dict):
        raise ConfigError("'flame_response' must be a table")
    check_keys(t, KEYS, "flame_response.")
    z = t.get("zeldovich", True)
    if not isinstance(z, bool):
        raise ConfigError(f"'flame_response.zeldovich' must be true or false, got {show(z)}")
    given = t.get("inert_step")
    if given is not None and (isinstance(given, bool) or not isinstance(given, (int, float))):
        raise ConfigError(f"'flame_response.inert_step' must be a number above 0, at most 0.1 (a mole fraction of "
                          f"the mixture: 0.5 % is 0.005), got {show(given)}")
    step = parse_positive(t, "inert_step", "flame_response")
    if step is not None and step > 0.1:
        raise ConfigError(f"'flame_response.inert_step' is {step:g}; allowed: above 0, at most 0.1 (a mole "
                          "fraction of the mixture: 0.5 % is 0.005)")
    return FlameResponse(zeldovich=z, **({} if step is None else {"inert_step": step}))


TABLE = AnalysisTable(name="flame_response", keys=KEYS, parse=parse)
