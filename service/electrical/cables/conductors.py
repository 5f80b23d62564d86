"""Conductor resistance, temperature correction and R1+R2.

Resistances are the IEC 60228 maximum d.c. values at 20 degC (data/conductor_resistance.json).
Every function works on arrays: pass one circuit's values or ten thousand.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Sequence
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

import numpy as np

from service.electrical.cables import protective
from service.electrical.column_tools import as_float, map_column, scalar_io
from service.electrical.datafiles import core_table
from service.electrical.errors import InvalidInput, NoRule, UnknownConductor
from service.electrical.inputs import Conductors

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


@scalar_io
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
    keys = list(zip(materials, classes, csa.tolist(), strict=True))

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


@scalar_io
def temperature_multiplier(temperature_c: Any) -> np.ndarray:
    """Resistance at ``temperature_c`` relative to 20 degC: 1 + alpha (theta - 20), alpha 0.004 /degC.

    The form behind BS 7671 Appendix 3's multipliers: 1.20 at 70 degC, 1.28 at 90 degC, 1.04 at 30 degC.
    """
    table = core_table("insulation")
    alpha = float(table["alpha_per_c"])
    ref = float(table["reference_temperature_c"])
    return 1.0 + alpha * (as_float(temperature_c) - ref)


@scalar_io
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


@scalar_io
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


def arrangement(c: Conductors) -> tuple:
    """The fields of the conductors that do not depend on the length (the key of :func:`conductor_constants`)."""
    return (
        c.material,
        c.insulation,
        c.line_csa_mm2,
        c.cpc_csa_mm2,
        c.cpc_arrangement,
        c.conductor_class,
        c.cpc_material,
        c.cpc_resistance_mohm_per_m,
        c.bare_condition,
        c.neutral_csa_mm2,
        c.cores,
    )


def conductor_constants(c: Conductors) -> tuple:
    """What the arrangement of ``c`` contributes whatever its length: :func:`constants_of`."""
    return constants_of(*arrangement(c))


@lru_cache(maxsize=4096)
def constants_of(
    material: str,
    insulation: str,
    line_csa_mm2: float,
    cpc_csa_mm2: float,
    cpc_arrangement: str,
    conductor_class: int,
    cpc_material: str | None,
    cpc_resistance_mohm_per_m: float | None,
    bare_condition: str | None,
    neutral_csa_mm2: float | None = None,
    cores: int | None = None,
) -> tuple:
    """What a conductor arrangement contributes whatever its length.

    Resistances at 20 degC (mohm/m), the temperatures the rules assume, k for the cpc and for the
    line conductor, and the k table. The line conductor is taken at its insulation's operating
    temperature; the cpc at the initial temperature of its k case (BS 7671 Tables 54.2-54.6), which is
    the same for a core of the cable. Raises the core's typed errors with a path below the conductors.
    The neutral (for line-neutral faults) is of the line conductor's material and temperature, of
    ``neutral_csa_mm2`` or the line size. One lookup per distinct arrangement (the length is not part of it).
    """
    cpc_mat = cpc_material or (material if cpc_arrangement in ("in-cable", "separate", "bare") else "steel")
    line_r20 = resistance_mohm_per_m(material, line_csa_mm2, conductor_class, field="line_csa_mm2")
    case = protective.k_case(cpc_mat, cpc_arrangement, insulation, cpc_csa_mm2, bare_condition)
    k_line = protective.k_case(material, "in-cable", insulation, line_csa_mm2)["k"]
    if cpc_resistance_mohm_per_m is not None:
        cpc_r20 = float(cpc_resistance_mohm_per_m)
    elif cpc_mat in MATERIALS:
        cpc_r20 = resistance_mohm_per_m(cpc_mat, cpc_csa_mm2, conductor_class, field="cpc_csa_mm2")
    elif cpc_arrangement == "armour" and cpc_mat == "steel" and cores is not None:
        cpc_r20 = armour_resistance_mohm_per_m(insulation, line_csa_mm2, cores)
    else:
        hint = " (or, for a thermosetting steel-wire-armoured cable, its cores)" if cpc_arrangement == "armour" else ""
        raise InvalidInput(
            "cpc_resistance_mohm_per_m",
            f"a {cpc_mat} {cpc_arrangement} as the cpc needs its resistance at 20 degC from the maker's data{hint}",
        )
    neutral_r20 = line_r20
    if neutral_csa_mm2 is not None:
        neutral_r20 = resistance_mohm_per_m(material, neutral_csa_mm2, conductor_class, field="neutral_csa_mm2")
    line_temp = operating_temperature_c(insulation, field="insulation")
    tabulated = np.nan if case["k_tabulated"] is None else case["k_tabulated"]
    numbers = (
        line_r20,
        cpc_r20,
        neutral_r20,
        line_temp,
        case["initial_c"],
        case["k"],
        case["k_formula"],
        tabulated,
        k_line,
    )
    return tuple(float(v) for v in numbers) + (case["table"], cpc_mat)


def armour_area_mm2(insulation: str, line_csa_mm2: float, cores: int | None) -> float:
    """The steel wire armour's cross-section, mm2, of a BS 5467 armoured cable (data/armour_resistance.json).

    Raises InvalidInput naming ``cpc_resistance_mohm_per_m`` for other insulation (the maker's figure is
    needed), InvalidInput naming ``cores`` without 2, 3 or 4 cores, and NoRule naming ``line_csa_mm2`` for a size
    the table does not hold.
    """
    table = core_table("armour_resistance")
    if insulation != table["insulation"]:
        raise InvalidInput(
            "cpc_resistance_mohm_per_m", "armour data are for thermosetting (BS 5467) cables: give the maker's"
        )
    if cores is None or str(cores) not in table["armour_area_mm2"]:
        raise InvalidInput(
            "cores", f"armour as the cpc needs the cable's cores, one of {sorted(table['armour_area_mm2'])}"
        )
    sizes = [float(s) for s in table["csa_mm2"]]
    if float(line_csa_mm2) not in sizes:
        raise NoRule("line_csa_mm2", f"armour data are for {sizes} mm2")
    return float(table["armour_area_mm2"][str(cores)][sizes.index(float(line_csa_mm2))])


def armour_resistance_mohm_per_m(insulation: str, line_csa_mm2: float, cores: int) -> float:
    """Steel wire armour resistance at 20 degC, mohm/m: rho20 / area x the a.c. factor (data/armour_resistance.json)."""
    table = core_table("armour_resistance")
    area = armour_area_mm2(insulation, line_csa_mm2, cores)
    return table["steel_rho20_ohm_mm2_per_m"] / area * 1000.0 * table["ac_factor"]


_CONSTANTS = ("line_r20", "cpc_r20", "neutral_r20", "line_temp", "cpc_temp", "k", "k_formula", "k_tabulated", "k_line")


@dataclass
class ConductorColumns:
    """The conductors of N circuits as columns (NaN, or None for texts, where a circuit has none).

    ``r1``, ``r2`` and ``rn`` (the neutral) are ohm at the temperatures the rules assume (a quarter of the
    end-to-end value on a ring); ``*_r20`` mohm/m at 20 degC; temperatures degC; ``k`` the cpc's k as used
    (tabulated where the case is a table row) and ``k_line`` the line conductor's (Table 43.1); sizes
    mm2 of one cable, ``parallel`` the number of cables, ``length_m`` the route (the whole ring on a ring).
    """

    present: np.ndarray
    r1: np.ndarray
    r2: np.ndarray
    rn: np.ndarray
    line_csa: np.ndarray
    cpc_csa: np.ndarray
    length_m: np.ndarray
    parallel: np.ndarray
    ring: np.ndarray
    line_r20: np.ndarray
    cpc_r20: np.ndarray
    neutral_r20: np.ndarray
    line_temp: np.ndarray
    cpc_temp: np.ndarray
    k: np.ndarray
    k_formula: np.ndarray
    k_tabulated: np.ndarray
    k_line: np.ndarray
    k_table: np.ndarray
    cpc_material: np.ndarray
    line_material: np.ndarray


def conductor_columns(items: Sequence[Conductors | None]) -> ConductorColumns:
    """R1, R2 (ohm), k and sizes for each item, from :func:`conductor_constants` and the lengths.

    R = r20 x (1 + 0.004 (theta - 20)) x L / n for n cables in parallel, x 1/4 on a ring (the loop at
    the ring's mid-point). Raises the core's typed errors with a path below the conductors.
    """
    n = len(items)
    idx = [i for i, c in enumerate(items) if c is not None]
    numbers = {name: np.full(n, np.nan) for name in ("r1", "r2", "rn", "line_csa", "cpc_csa", "length_m") + _CONSTANTS}
    numbers["parallel"] = np.ones(n)
    texts = {name: np.full(n, None, dtype=object) for name in ("k_table", "cpc_material", "line_material")}
    present = np.zeros(n, dtype=bool)
    ring_flags = np.zeros(n, dtype=bool)
    if idx:
        cs = [items[i] for i in idx]
        constants = [constants_of(*arrangement(c)) for c in cs]
        sel = np.asarray(idx)
        present[sel] = True
        table = np.array([k[: len(_CONSTANTS)] for k in constants], dtype=float)
        for j, name in enumerate(_CONSTANTS):
            numbers[name][sel] = table[:, j]
        length = np.array([c.length_m for c in cs], dtype=float)
        parallel = np.array([c.parallel_cables for c in cs], dtype=float)
        rings = np.array([c.ring for c in cs], dtype=bool)
        ring = ring_factor(rings, length.shape)
        line_temp = table[:, _CONSTANTS.index("line_temp")]
        numbers["r1"][sel] = _resistance(table[:, 0], length, line_temp, parallel) * ring
        numbers["r2"][sel] = _resistance(table[:, 1], length, table[:, _CONSTANTS.index("cpc_temp")], parallel) * ring
        numbers["rn"][sel] = _resistance(table[:, 2], length, line_temp, parallel) * ring
        numbers["length_m"][sel], numbers["parallel"][sel], ring_flags[sel] = length, parallel, rings
        numbers["line_csa"][sel] = [c.line_csa_mm2 for c in cs]
        numbers["cpc_csa"][sel] = [c.cpc_csa_mm2 for c in cs]
        texts["k_table"][sel] = [k[-2] for k in constants]
        texts["cpc_material"][sel] = [k[-1] for k in constants]
        texts["line_material"][sel] = [c.material for c in cs]
    return ConductorColumns(present=present, ring=ring_flags, **numbers, **texts)


def _resistance(r20: np.ndarray, length: np.ndarray, temperature: np.ndarray, parallel: np.ndarray) -> np.ndarray:
    check_parallel_cables(parallel)
    return r20 * temperature_multiplier(temperature) * length / 1000.0 / parallel


def loop_resistance_per_m(c: Conductors) -> tuple[float, float, float]:
    """(R1+R2, R2, R1+Rn) in ohm per metre of route at the temperatures the rules assume (the longest-run search)."""
    cols = conductor_columns([dataclasses.replace(c, length_m=1.0)])
    return float(cols.r1[0] + cols.r2[0]), float(cols.r2[0]), float(cols.r1[0] + cols.rn[0])
