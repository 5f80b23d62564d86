"""Conductor resistance, temperature correction and R1+R2.

Resistances are the IEC 60228 maximum d.c. values at 20 degC (data/conductor_resistance.json).
Every function works on arrays: pass one circuit's values or ten thousand.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from .arrays import as_float, map_column
from .datafiles import core_table
from .errors import InvalidInput, UnknownConductor

MATERIALS = ("copper", "aluminium")
CONDUCTOR_CLASSES = (1, 2)


def _resistance_lookup() -> dict[tuple[str, int, float], float]:
    table = core_table("conductor_resistance")
    out: dict[tuple[str, int, float], float] = {}
    for i, csa in enumerate(table["csa_mm2"]):
        for cls in CONDUCTOR_CLASSES:
            value = table[f"copper_class{cls}"][i]
            if value is not None:
                out[("copper", cls, float(csa))] = float(value)
            al = table["aluminium"][i]
            if al is not None:
                out[("aluminium", cls, float(csa))] = float(al)
    return out


_RESISTANCE = _resistance_lookup()


def resistance_mohm_per_m(material: Any, csa_mm2: Any, conductor_class: Any = 2, field: str = "csa_mm2") -> np.ndarray:
    """Maximum d.c. resistance at 20 degC in milliohm per metre.

    IEC 60228:2004 Tables 1 (class 1, solid) and 2 (class 2, stranded). ``material`` is
    ``copper`` or ``aluminium``. A size, class or material the table does not hold raises
    :class:`UnknownConductor` naming ``field``.
    """
    csa = as_float(csa_mm2)
    n = len(csa)
    materials = map_column(material, n, lambda m: m, dtype=object)
    classes = map_column(conductor_class, n, lambda c: c, dtype=object)
    keys = list(zip(materials, classes, csa.tolist()))

    def lookup(key: tuple[str, int, float]) -> float:
        mat, cls, size = key
        if mat not in MATERIALS:
            raise UnknownConductor("material", f"unknown conductor material {mat!r}; use one of {list(MATERIALS)}")
        if cls not in CONDUCTOR_CLASSES:
            raise UnknownConductor("conductor_class", f"unknown conductor class {cls!r}; use 1 (solid) or 2 (stranded)")
        try:
            return _RESISTANCE[(mat, int(cls), float(size))]
        except KeyError:
            sizes = sorted({k[2] for k in _RESISTANCE if k[0] == mat and k[1] == cls})
            raise UnknownConductor(
                field, f"IEC 60228 lists no {mat} class {cls} conductor of {size:g} mm2; sizes: {sizes}"
            ) from None

    return map_column(keys, n, lookup)


def temperature_multiplier(temperature_c: Any) -> np.ndarray:
    """Resistance at ``temperature_c`` relative to 20 degC: 1 + alpha (theta - 20), alpha 0.004 /degC.

    The form behind BS 7671 Appendix 3's multipliers: 1.20 at 70 degC, 1.28 at 90 degC, 1.04 at 30 degC.
    """
    table = core_table("insulation")
    alpha = float(table["alpha_per_c"])
    ref = float(table["reference_temperature_c"])
    return 1.0 + alpha * (as_float(temperature_c) - ref)


def operating_temperature_c(insulation: Any, n: int | None = None, field: str = "insulation") -> np.ndarray:
    """Maximum operating temperature (degC) the rules assume for a conductor with this insulation."""
    insulations = core_table("insulation")["insulations"]
    count = n if n is not None else (1 if isinstance(insulation, str) else len(insulation))

    def lookup(name: str) -> float:
        try:
            return float(insulations[name]["operating_c"])
        except KeyError:
            raise UnknownConductor(field, f"unknown insulation {name!r}; use one of {sorted(insulations)}") from None

    return map_column(insulation, count, lookup)


def insulation_names() -> list[str]:
    return sorted(core_table("insulation")["insulations"])


def conductor_resistance_ohm(
    r20_mohm_per_m: Any, length_m: Any, temperature_c: Any, parallel_cables: Any = 1
) -> np.ndarray:
    """Resistance of one conductor of a circuit at ``temperature_c``, ohm.

    R = r20 x (1 + 0.004 (theta - 20)) x L / 1000 / n for n cables in parallel. For a ring final
    circuit ``length_m`` is the whole ring and the result is the end-to-end value r1 (or r2); see
    :func:`ring_factor` for the loop value.
    """
    r20 = as_float(r20_mohm_per_m)
    length = as_float(length_m)
    n = np.broadcast_to(as_float(parallel_cables), r20.shape)
    check_parallel_cables(n)
    return r20 * temperature_multiplier(temperature_c) * length / 1000.0 / n


def check_parallel_cables(count: Any) -> None:
    """Cables in parallel are a whole number of at least 1 (raises InvalidInput naming parallel_cables)."""
    n = as_float(count)
    if np.any(n < 1) or np.any(n != np.floor(n)):
        raise InvalidInput("parallel_cables", "the number of cables in parallel is a whole number of at least 1")


def ring_factor(ring: Any, shape: tuple[int, ...]) -> np.ndarray:
    """1/4 for ring final circuits, 1 otherwise: what each conductor contributes to the loop.

    On a ring, ``length_m`` is the whole ring and r1, r2 are the end-to-end values; the loop seen at
    the mid-point, where it is highest, is (r1 + r2) / 4 (common practice).
    """
    return np.where(np.broadcast_to(np.asarray(ring, dtype=bool), shape), 0.25, 1.0)
