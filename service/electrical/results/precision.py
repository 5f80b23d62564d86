"""The precision results carry: what the data support, and no float noise (DESIGN.md conventions).

One rule per unit, applied to every number a result holds, in one place (``service.electrical.results.circuit_result``):
ohms to 4 decimals, currents to 0.1 A, kA to 0.001 kA, times and energies to 3 significant figures,
margins to 0.1 %, other percentages to 0.01 %, sizes to 0.001 mm2, k to 0.1. A number is matched to its
rule by the unit in its name (``zs_ohm``, ``min_csa_mm2``) or, for a check, by the check's unit.
"""

from __future__ import annotations

import math
from functools import lru_cache
from typing import Any

import numpy as np

# (name suffix, unit of a check) -> ("decimals", n) or ("significant", n)
RULES: dict[str, tuple[str, int]] = {
    "ohm": ("decimals", 4),
    "a": ("decimals", 1),
    "ka": ("decimals", 3),
    "s": ("significant", 3),
    "a2s": ("significant", 3),
    "margin_percent": ("decimals", 1),
    "percent": ("decimals", 2),
    "mm2": ("decimals", 3),
    "k": ("decimals", 1),
    "v": ("decimals", 2),
    "c": ("decimals", 1),
    "mv_per_a_m": ("significant", 3),
    "m": ("decimals", 2),
    "ma": ("decimals", 1),
}
UNITS = {
    "ohm": "ohm", "A": "a", "kA": "ka", "s": "s", "A2s": "a2s", "mm2": "mm2", "%": "percent", "ms": "decimals-1",
    "mA": "ma",
}  # fmt: skip
_BY_NAME = {"k": "k", "k_formula": "k", "k_tabulated": "k", "margin_percent": "margin_percent"}


NAMES = {
    "ohm": "ohms",
    "a": "currents (A)",
    "ka": "kA",
    "s": "times",
    "a2s": "energies (A2s)",
    "margin_percent": "margins (%)",
    "percent": "other percentages",
    "mm2": "sizes (mm2)",
    "k": "k",
    "v": "volts",
    "c": "temperatures (degC)",
    "mv_per_a_m": "mV/A/m",
    "m": "lengths (m)",
    "ma": "residual currents (mA)",
}


def summary() -> str:
    """The rules in one sentence, for the contract (``info.description``)."""
    said = [
        f"{NAMES[key]} to {n} " + ("decimal" if kind == "decimals" else "significant figure") + ("s" if n > 1 else "")
        for key, (kind, n) in RULES.items()
    ]
    return (
        "Numbers in results carry the precision the data support, by the unit in their name: " + "; ".join(said) + "."
    )


@lru_cache(maxsize=1024)
def rule_for(name: str) -> tuple[str, int] | None:
    """The rule for a field called ``name`` (None where its name carries no unit: kept as it is)."""
    if name in _BY_NAME:
        return RULES[_BY_NAME[name]]
    if name.endswith("margin_percent"):
        return RULES["margin_percent"]
    for suffix in sorted(RULES, key=len, reverse=True):
        if name == suffix or name.endswith("_" + suffix):
            return RULES[suffix]
    return None


def rule_for_unit(unit: str) -> tuple[str, int] | None:
    """The rule for the value and limit of a check in ``unit``."""
    key = UNITS.get(unit)
    if key == "decimals-1":
        return ("decimals", 1)
    return RULES.get(key) if key else None


def rounded(values: Any, rule: tuple[str, int] | None) -> np.ndarray:
    """``values`` (an array) rounded by ``rule``; NaN and infinity stay as they are."""
    x = np.asarray(values, dtype=float)
    if rule is None:
        return x
    kind, n = rule
    if kind == "decimals":
        return np.round(x, n)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        magnitude = np.floor(np.log10(np.abs(x)))
        places = np.where(np.isfinite(magnitude), n - 1 - magnitude, 0.0)
        # scale by an exact power of ten on the side that keeps the result exact: 12 800 000 is 128 x 10^5, never
        # 128 / 10^-5 (which gives 12800000.000000002)
        up, down = 10.0 ** np.maximum(places, 0.0), 10.0 ** np.maximum(-places, 0.0)
        return np.where(np.isfinite(x) & (x != 0), np.round(x * up / down) / up * down, x)


def rounded_record(record: Any, unit: str | None = None) -> Any:
    """A plain record (dicts, lists, numbers) with each number rounded by the unit in its key (or ``unit``)."""
    if isinstance(record, dict):
        return {k: _rounded_value(k, v, unit) for k, v in record.items()}
    return record


def _rounded_value(key: str, value: Any, unit: str | None) -> Any:
    if isinstance(value, dict):
        return rounded_record(value, key)
    if isinstance(value, float) and not isinstance(value, bool):
        rule = rule_for(key) or (rule_for(unit) if unit else None)
        if rule and rule[0] == "decimals" and math.isfinite(value):
            return round(value, rule[1]) + 0.0  # one number: Python's round, no array (+ 0.0: no -0.0)
        return float(rounded(value, rule)) if rule else value
    return value
