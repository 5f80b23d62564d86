"""Current-carrying capacity, correction factors and voltage drop.

Tables: data/capacity_*.json (BS 7671:2018 Tables 4D5, 4E1A, 4E4A/4E4B), data/correction_factors.json,
data/voltage_drop_limits.json. Each capacity cell carries its confidence; a result that rests on a
cell marked from memory says so.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

import numpy as np

from service.electrical.cables import conductors as cond
from service.electrical.datafiles import core_table
from service.electrical.devices import catalogue
from service.electrical.errors import InvalidInput, UnknownConductor
from service.electrical.inputs import CableRun

CABLES = {
    "flat-twin-earth-70c": "capacity_flat_twin_earth_70c",
    "single-core-70c": "capacity_single_core_70c",
    "single-core-90c": "capacity_single_core_90c",
    "multicore-armoured-70c": "capacity_multicore_armoured_70c",
    "multicore-armoured-90c": "capacity_multicore_armoured_90c",
    "multicore-armoured-90c-aluminium": "capacity_multicore_armoured_90c_aluminium",
    "mineral-light-70c": "capacity_mineral_light_70c",
    "mineral-heavy-70c": "capacity_mineral_heavy_70c",
    "mineral-light-105c": "capacity_mineral_light_105c",
    "mineral-heavy-105c": "capacity_mineral_heavy_105c",
}
# the 70 degC table of the same construction, for a hotter cable landing on 70 degC terminals (512.1.5)
AT_70C = {"single-core-90c": "single-core-70c", "multicore-armoured-90c": "multicore-armoured-70c"}
AIR_GROUPINGS = ("bunched", "single-layer-touching", "under-wooden-ceiling", "perforated-tray", "ladder-or-cleats")
BURIED_GROUPINGS = ("buried-direct", "buried-in-ducts")
GROUPINGS = AIR_GROUPINGS + BURIED_GROUPINGS
BURIED_SPACINGS = ("touching", "one-cable-diameter", "125-mm", "250-mm", "500-mm", "1000-mm")
USES = ("lighting", "other")
SUPPLY_KINDS = ("public", "private")


def cable_table(cable: str) -> dict[str, Any]:
    if cable not in CABLES:
        raise InvalidInput("cable", f"cable is one of {list(CABLES)}, not {cable!r}")
    return core_table(CABLES[cable])


def methods(cable: str) -> list[str]:
    return list(cable_table(cable)["methods"])


@dataclass(frozen=True)
class TabulatedCapacity:
    csa_mm2: float
    it_a: float
    confidence: str


def capacities(cable: str, method: str, phases: int) -> list[TabulatedCapacity]:
    """Every size with a tabulated capacity It (A) for the method and phases, smallest first.

    BS 7671:2018 Table 4D5 / 4E1A / 4E4A; ``phases`` 1 (two loaded conductors) or 3 (three).
    """
    table = cable_table(cable)
    if method not in table["capacity_a"]:
        raise InvalidInput("installation_method", f"{cable} has methods {list(table['capacity_a'])}, not {method!r}")
    column = table["capacity_a"][method].get(str(phases))
    if column is None:
        raise InvalidInput(
            "phases", f"{cable} is tabulated for phases {sorted(table['capacity_a'][method])}, not {phases}"
        )
    confidence = table["capacity_confidence"][method][str(phases)]
    return [
        TabulatedCapacity(float(csa), float(it), str(conf))
        for csa, it, conf in zip(table["csa_mm2"], column, confidence, strict=True)
        if it is not None
    ]


@lru_cache(maxsize=256)
def tabulated(cable: str, method: str, phases: int, csa_mm2: float) -> TabulatedCapacity | None:
    """The tabulated capacity It of one size (None where the table has no cell for it)."""
    return next((c for c in capacities(cable, method, phases) if c.csa_mm2 == float(csa_mm2)), None)


def ambient_factor(insulation: str, ambient_c: float) -> tuple[float, str]:
    """Ca for an air ambient temperature (BS 7671 Table 4B1).

    Above 30 degC: sqrt((theta_p - theta_a) / (theta_p - 30)), theta_p the insulation's maximum operating
    temperature (reproduces Table 4B1 within 0.01). At and below 25 degC the tabulated 25 degC value;
    between 25 and 30 degC 1.00 (conservative).
    """
    table = core_table("correction_factors")["ambient"]
    theta_p = float(cond.operating_temperature_c(insulation))
    if ambient_c >= theta_p:
        raise InvalidInput("ambient_c", f"the ambient must be below the conductor's {theta_p:g} degC")
    if ambient_c > 30:
        return math.sqrt((theta_p - ambient_c) / (theta_p - 30)), "BS 7671 Table 4B1 (formula above 30 degC)"
    if ambient_c <= 25:
        confidence = "S" if insulation in ("thermoplastic-70", "thermosetting-90") else "M, from memory"
        return float(
            table["below_reference"][insulation]["25"]
        ), f"BS 7671 Table 4B1, 25 degC value, used at and below 25 degC (confidence {confidence})"
    return 1.0, "BS 7671 Table 4B1: 1.00 taken between 25 and 30 degC (conservative)"


def mineral_ambient_factor(insulation: str, ambient_c: float) -> tuple[float, str]:
    """Ca for a mineral-insulated cable (BS 7671 Table 4B1, its own column, from memory): the next warmer value."""
    table = core_table("correction_factors")["mineral_ambient"][insulation]
    if ambient_c <= 30:
        return 1.0, "BS 7671 Table 4B1, mineral: 1.00 taken at and below 30 degC (conservative)"
    temps = sorted(int(t) for t in table)
    warmer = next((t for t in temps if t >= ambient_c), None)
    if warmer is None:
        raise InvalidInput("ambient_c", f"Table 4B1 goes to {temps[-1]} degC for this mineral-insulated cable")
    return float(table[str(warmer)]), f"BS 7671 Table 4B1, mineral, at {warmer} degC (from memory)"


def _check_buried(inst: CableRun, buried: bool) -> None:
    """Buried runs (method D) take the buried groupings, and those only them; ducts as the grouping says."""
    if buried and inst.grouping not in BURIED_GROUPINGS and inst.grouped_circuits > 1:
        raise InvalidInput(
            "grouping", f"a buried run (method D) is grouped by Table 4C2 or 4C3: {list(BURIED_GROUPINGS)}"
        )
    if not buried and inst.grouping in BURIED_GROUPINGS:
        raise InvalidInput("grouping", f"{inst.grouping} is for buried runs (installation_method D)")
    if inst.grouping in BURIED_GROUPINGS and inst.in_duct != (inst.grouping == "buried-in-ducts"):
        raise InvalidInput("in_duct", f"in_duct must agree with the grouping {inst.grouping}")
    if inst.buried_spacing is not None and inst.grouping not in BURIED_GROUPINGS:
        raise InvalidInput(
            "buried_spacing", "buried_spacing goes with a buried grouping (buried-direct, buried-in-ducts)"
        )


def ground_factor(insulation: str, ground_c: float) -> tuple[float, str]:
    """Ca for a ground temperature (BS 7671 Table 4B2, from memory): the next warmer tabulated value."""
    table = core_table("correction_factors")["ground"]
    key = "thermoplastic-70" if insulation.startswith("thermoplastic") else "thermosetting-90"
    temps = sorted(int(t) for t in table["factors"][key])
    warmer = next((t for t in temps if t >= ground_c), None)
    if warmer is None:
        raise InvalidInput("ground_c", f"ground temperatures up to {temps[-1]} degC are tabulated")
    return float(table["factors"][key][str(warmer)]), f"BS 7671 Table 4B2 at {warmer} degC (from memory)"


def soil_factor(resistivity_k_m_per_w: float, in_duct: bool) -> tuple[float, str]:
    """Factor for soil thermal resistivity (BS 7671 Table 4B3, from memory): one of the table's own columns."""
    table = core_table("correction_factors")["soil_resistivity"]
    columns = [float(c) for c in table["columns_k_m_per_w"]]
    if float(resistivity_k_m_per_w) not in columns:
        raise InvalidInput(
            "soil_resistivity_k_m_per_w",
            f"Table 4B3's columns are {[f'{c:g}' for c in columns]} K m/W; use one of them",
        )
    value = table["in-duct" if in_duct else "direct"][f"{float(resistivity_k_m_per_w):g}"]
    where = "in ducts" if in_duct else "direct in the ground"
    return float(value), f"BS 7671 Table 4B3, {where}, {resistivity_k_m_per_w:g} K m/W (from memory)"


def buried_grouping_factor(arrangement: str, circuits: int, spacing: str | None) -> tuple[float, str]:
    """Cg for buried circuits (BS 7671 Table 4C2 direct in the ground, 4C3 in ducts; from memory)."""
    table = core_table("correction_factors")["buried_grouping"]
    kind = "in-duct" if arrangement == "buried-in-ducts" else "direct"
    if circuits == 1:
        return 1.0, "one buried circuit: no grouping"
    spacings = list(table[kind])
    if spacing not in spacings:
        raise InvalidInput("buried_spacing", f"{arrangement} takes buried_spacing, one of {spacings}")
    rows = table["circuits"]
    row = next((i for i, n in enumerate(rows) if n >= circuits), None)
    if row is None:
        raise InvalidInput("grouped_circuits", f"Tables 4C2 and 4C3 go to {rows[-1]} circuits")
    name = "4C3" if kind == "in-duct" else "4C2"
    counted = f"{circuits} circuits" + ("" if rows[row] == circuits else f" (the {rows[row]}-circuit row)")
    return float(table[kind][spacing][row]), f"BS 7671 Table {name}, {spacing}, {counted} (from memory)"


def grouping_factor(arrangement: str, circuits: int, spacing: str | None = None) -> tuple[float, str]:
    """Cg for ``circuits`` circuits grouped in ``arrangement`` (BS 7671 Table 4C1; buried: Tables 4C2, 4C3)."""
    table = core_table("correction_factors")["grouping"]
    if arrangement in BURIED_GROUPINGS:
        return buried_grouping_factor(arrangement, circuits, spacing)
    if arrangement not in GROUPINGS:
        raise InvalidInput("grouping", f"grouping is one of {list(GROUPINGS)}, not {arrangement!r}")
    row = table[arrangement]
    sourced = {"bunched": set(range(1, 10)) | {20}, "single-layer-touching": set(range(1, 10))}.get(arrangement, set())
    if circuits <= len(row["factors"]):
        value = row["factors"][circuits - 1]
    else:
        more = sorted((int(k), v) for k, v in row["more"].items())
        value = next((v for k, v in more if k >= circuits), more[-1][1] if more else row["factors"][-1])
    confidence = "A/S" if circuits in sourced else "M, from memory"
    counted = "1 circuit" if circuits == 1 else f"{circuits} circuits"
    return float(value), f"BS 7671 Table 4C1, {arrangement}, {counted} (confidence {confidence})"


def thermal_insulation_factor(length_mm: float, csa_mm2: float = 0.0) -> tuple[float, str]:
    """Ci for a cable totally surrounded by thermal insulation over ``length_mm`` (BS 7671 Table 52.2).

    Table 52.2 covers cables up to 10 mm2; a larger cable totally surrounded takes 0.5 (Appendix 4, from memory).
    """
    if length_mm <= 0:
        return 1.0, "no thermal insulation"
    table = core_table("correction_factors")["thermal_insulation"]
    if csa_mm2 > table["largest_csa_mm2"]:
        return float(table["above_largest_factor"]), table["above_largest_basis"]
    for length, factor, conf in zip(table["lengths_mm"], table["factors"], table["confidence"], strict=True):
        if length_mm <= length:
            conf = "M, from memory" if conf == "M" else conf
            return float(factor), f"BS 7671 Table 52.2 at {length} mm (confidence {conf})"
    return float(table["factors"][-1]), "BS 7671 Table 52.2, 500 mm and more (confidence A)"


def voltage_drop_mv_per_a_m(
    cable: str, csa_mm2: float, phases: int, reactance_mohm_per_m: float | None = None, method: str | None = None
) -> tuple[float, str]:
    """Voltage drop per ampere per metre (mV/A/m) at the conductor's operating temperature.

    From the tabulated value where the table has one (BS 7671 Tables 4D1B, 4D4B, 4D5, 4E1B, 4E4B: z, or
    sqrt(r^2 + x^2)); for single-core cables the column of the method's arrangement (enclosed, or touching).
    Otherwise 2 (single-phase) or sqrt(3) (three-phase) x R20 x (1 + 0.004 (theta - 20)) of the table's
    conductor material, with a stated reactance added as sqrt(r^2 + x^2).
    """
    table = cable_table(cable)
    sizes = [float(s) for s in table["csa_mm2"]]
    if float(csa_mm2) not in sizes:
        raise UnknownConductor("line_csa_mm2", f"{cable} is tabulated for {sizes}")
    i = sizes.index(float(csa_mm2))
    columns = table.get("voltage_drop_mv_per_a_m") or {}
    arrangement = (table.get("voltage_drop_arrangements") or {}).get(method)
    if "voltage_drop_arrangements" in table:
        columns = columns.get(arrangement, {}) if arrangement else {}
    vd = columns.get(str(phases))
    if vd is not None:
        where = f" ({arrangement})" if arrangement else ""
        z = vd.get("z", [None] * len(sizes))[i]
        if z is not None:
            return float(z), f"{table['source']}: tabulated {z:g} mV/A/m{where}"
        r, x = vd.get("r", [None] * len(sizes))[i], vd.get("x", [None] * len(sizes))[i]
        if r is not None and x is not None:
            return math.hypot(r, x), f"{table['source']}: sqrt(r^2 + x^2) from r {r:g} and x {x:g} mV/A/m{where}"
    return _computed_drop(table, csa_mm2, phases, reactance_mohm_per_m)


def _computed_drop(table: dict, csa_mm2: float, phases: int, reactance_mohm_per_m: float | None) -> tuple[float, str]:
    factor = 2.0 if phases == 1 else math.sqrt(3.0)
    material = table.get("material", "copper")
    r20 = float(cond.resistance_mohm_per_m(material, csa_mm2))
    multiplier = float(cond.temperature_multiplier(table["conductor_operating_c"]))
    r = factor * r20 * multiplier
    x = 0.0 if reactance_mohm_per_m is None else factor * reactance_mohm_per_m
    basis = f"computed: {factor:.3g} x R20 {r20:g} mohm/m ({material}) x {multiplier:.2f}"
    if reactance_mohm_per_m is not None:
        basis += f", with reactance {reactance_mohm_per_m:g} mohm/m"
    elif csa_mm2 > 16:
        basis += ", no reactance given: resistance alone understates the drop of a large cable"
    return math.hypot(r, x), basis


def drop_v(mv_per_a_m: Any, design_current_a: Any, length_m: Any, parallel_cables: Any = 1, ring: Any = False):
    """Voltage drop of a run, V: mV/A/m x Ib x L / 1000, shared by cables in parallel; on a ring a quarter of
    the whole ring's length (the load taken at the far point, fed from both ends: common practice)."""
    share = np.where(np.asarray(ring, dtype=bool), 0.25, 1.0)
    return (
        np.asarray(mv_per_a_m)
        * np.asarray(design_current_a)
        * np.asarray(length_m)
        * share
        / 1000.0
        / np.asarray(parallel_cables)
    )


def nominal_voltage_v(u0_v: Any, phases: Any) -> np.ndarray:
    """The voltage a drop is a percentage of: U0 single-phase, the line voltage sqrt(3) U0 three-phase."""
    return np.where(np.asarray(phases) == 3, math.sqrt(3.0), 1.0) * np.asarray(u0_v, dtype=float)


@lru_cache(maxsize=8)
def voltage_drop_limit_percent(supply_kind: str, use: str) -> tuple[float, str]:
    """The voltage drop limit (percent): 3 % lighting, 5 % other uses for a public supply (BS 7671 Appendix 4, 6.4)."""
    table = core_table("voltage_drop_limits")
    if supply_kind not in SUPPLY_KINDS or use not in USES:
        raise InvalidInput("use", f"use is one of {list(USES)} and supply_kind one of {list(SUPPLY_KINDS)}")
    value = float(table["limits_percent"][supply_kind][use])
    conf = "A" if supply_kind == "public" else "M, from memory"
    return value, f"{table['source']}: {supply_kind} supply, {use}, {value:g} % ({conf})"


def design_current_a(power_kw: float, power_factor: float, phases: int, u0_v: float) -> float:
    """Ib from a load: P / (U0 pf) single-phase, P / (3 U0 pf) = P / (sqrt(3) U pf) three-phase (common practice)."""
    if not 0 < power_factor <= 1:
        raise InvalidInput("power_factor", "the power factor is above 0 and at most 1")
    return power_kw * 1000.0 / ((1 if phases == 1 else 3) * u0_v * power_factor)


@lru_cache(maxsize=1024)
def derating(inst: CableRun, insulation: str, device_standard: str | None, csa_mm2: float):
    """Ca x Cg x Ci x Cc for a cable run as ``inst`` (BS 7671 Appendix 4), with each factor's value and basis.

    Ca from the air (Table 4B1) or ground (Table 4B2) temperature, with the soil (Table 4B3) for method D;
    Cg Table 4C1; Ci Table 52.2 (or 0.5 above 10 mm2); Cc for the device (0.725 for BS 3036).
    """
    factors: dict[str, dict[str, Any]] = {}
    buried = inst.installation_method == "D"
    _check_buried(inst, buried)
    if buried:
        ca, basis = ground_factor(insulation, 20.0 if inst.ground_c is None else inst.ground_c)
    elif insulation.startswith("mineral"):
        ca, basis = mineral_ambient_factor(insulation, inst.ambient_c)
    else:
        ca, basis = ambient_factor(insulation, inst.ambient_c)
    factors["ambient"] = {"factor": ca, "basis": basis}
    if buried and inst.soil_resistivity_k_m_per_w is not None:
        cs, basis = soil_factor(inst.soil_resistivity_k_m_per_w, inst.in_duct)
        factors["soil"] = {"factor": cs, "basis": basis}
    cg, basis = grouping_factor(inst.grouping, inst.grouped_circuits, inst.buried_spacing)
    factors["grouping"] = {"factor": cg, "basis": basis}
    if inst.thermal_insulation_mm > 0 and inst.installation_method in cable_table(inst.cable).get(
        "methods_with_insulation_allowed", []
    ):
        ci, basis = 1.0, f"method {inst.installation_method} already allows for the insulation"
    else:
        ci, basis = thermal_insulation_factor(inst.thermal_insulation_mm, csa_mm2)
    factors["thermal_insulation"] = {"factor": ci, "basis": basis}
    cc, basis = catalogue.overload_factor(device_standard)
    factors["device"] = {"factor": cc, "basis": basis}
    return math.prod(f["factor"] for f in factors.values()), factors


def installed_capacity(
    inst: CableRun, it_a: float, insulation: str, device_standard: str | None, csa_mm2: float = 0.0
) -> tuple[float, dict[str, dict[str, Any]]]:
    """Iz = It x Ca x Cg x Ci x Cc (BS 7671 Appendix 4), A, with each factor's value and basis."""
    product, factors = derating(inst, insulation, device_standard, float(csa_mm2))
    return it_a * product, factors


def families() -> list[dict[str, Any]]:
    """Every cable family: what it is, its methods with the sizes tabulated for each, its cpc, its sources."""
    out = []
    for cable in CABLES:
        table = cable_table(cable)
        methods_out = []
        for method, text in table["methods"].items():
            columns = table["capacity_a"].get(method, {})
            methods_out.append(
                {
                    "method": method,
                    "description": text,
                    "sizes_mm2": {
                        ("single-phase" if phases == "1" else "three-phase"): [
                            c.csa_mm2 for c in capacities(cable, method, int(phases))
                        ]
                        for phases in sorted(columns)
                    },
                }
            )
        out.append(
            {
                "cable": cable,
                "title": table["title"],
                "material": table.get("material", "copper"),
                "insulation": table["insulation"],
                "conductor_operating_c": table["conductor_operating_c"],
                "methods": methods_out,
                "cpc": table["cpc"]["kind"],
                "voltage_drop_table": bool(table.get("voltage_drop_mv_per_a_m")),
                "data": {k: table[k] for k in ("title", "source", "edition", "confidence", "notes") if k in table},
            }
        )
    return out
