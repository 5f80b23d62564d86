"""Protective conductor: k, the adiabatic minimum size and the Table 54.7 alternative.

k comes from the IEC 60364-5-54 Annex A formula (data/protective_k.json); where the case is a
row of BS 7671 Tables 43.1 or 54.2-54.6 the tabulated value is reported as the one to use, so
the answer matches the book, with the formula value beside it.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from service.electrical.column_tools import as_float, finite_or_none, scalar_io, select
from service.electrical.datafiles import core_table
from service.electrical.devices.catalogue import resolve
from service.electrical.errors import ElectricalError, InvalidInput, NoRule
from service.electrical.inputs import DeviceSpec
from service.electrical.results import verdicts
from service.electrical.results.verdicts import Verdict

ARRANGEMENTS = ("in-cable", "separate", "armour", "sheath", "conduit", "bare")
BARE_CONDITIONS = ("visible-restricted", "normal", "fire-risk")
CPC_MATERIALS = ("copper", "aluminium", "steel", "lead")
ADIABATIC_MIN_S = 0.1
ADIABATIC_MAX_S = 5.0


def _table() -> dict:
    return core_table("protective_k")


@scalar_io
def k_formula(material: str, initial_c: Any, final_c: Any) -> np.ndarray:
    """k = sqrt(Qc (beta + 20) / rho20 x ln(1 + (theta_f - theta_i) / (beta + theta_i))).

    IEC 60364-5-54:2011 Annex A, equation A.1, with the material constants of Table A.54.1.
    Units: A s^0.5 / mm2.
    """
    try:
        m = _table()["materials"][material]
    except KeyError:
        raise InvalidInput(
            "material", f"k needs a material among {sorted(_table()['materials'])}, not {material!r}"
        ) from None
    beta, qc, rho = m["beta_c"], m["qc_j_per_c_mm3"], m["rho20_ohm_mm"]
    ti, tf = as_float(initial_c), as_float(final_c)
    return np.sqrt(qc * (beta + 20.0) / rho * np.log(1.0 + (tf - ti) / (beta + ti)))


def k_case(
    material: str, arrangement: str, insulation: str | None, csa_mm2: float, condition: str | None = None
) -> dict[str, Any]:
    """The rule for one protective conductor: temperatures, k by formula and by table, and the table.

    ``arrangement``: ``in-cable`` (a core of a cable, or bunched: Table 54.3, as Table 43.1),
    ``separate`` (not in a cable and not bunched: Table 54.2), ``armour`` or ``sheath`` (Table 54.4),
    ``conduit`` (steel conduit or trunking: Table 54.5), ``bare`` (Table 54.6, by ``condition``).
    """
    if arrangement not in ARRANGEMENTS:
        raise InvalidInput("cpc_arrangement", f"cpc_arrangement is one of {list(ARRANGEMENTS)}, not {arrangement!r}")
    for case in _table()["cases"]:
        if case["arrangement"] != arrangement:
            continue
        if arrangement == "bare":
            if case["condition"] != condition:
                continue
        elif case["insulation"] != insulation:
            continue
        large = csa_mm2 > 300 and "final_c_over_300mm2" in case
        finals = case["final_c_over_300mm2"] if large else case["final_c"]
        tabulated = case["tabulated_k_over_300mm2"] if large else case["tabulated_k"]
        if material not in finals:
            raise NoRule(
                "cpc_material",
                f"no rule for a {material} protective conductor as {arrangement}; materials: {sorted(finals)}",
            )
        formula = float(k_formula(material, case["initial_c"], finals[material]))
        table_k = tabulated.get(material)
        return {
            "initial_c": float(case["initial_c"]),
            "final_c": float(finals[material]),
            "k_formula": formula,
            "k_tabulated": None if table_k is None else float(table_k),
            "k": formula if table_k is None else float(table_k),
            "table": case["table"] + (" (over 300 mm2)" if large else ""),
        }
    if arrangement == "bare":
        raise InvalidInput("bare_condition", f"a bare cpc needs bare_condition, one of {list(BARE_CONDITIONS)}")
    raise NoRule("insulation", f"no rule for a cpc as {arrangement} with {insulation!r} insulation")


@scalar_io
def fault_energy_a2s(current_a: Any, time_s: Any, let_through_a2s: Any = None, data_a2s: Any = None):
    """Energy I^2 t (A^2 s) a conductor must withstand at a fault, and how it was found.

    - 0.1 s < t <= 5 s: I^2 t (the adiabatic equation's range, BS 7671 543.1.3 and 434.5.2): ``adiabatic``.
    - t at or below 0.1 s (or 'at most 0.1 s'): the device's let-through I^2 t where given (``let-through``);
      else the standard's limit for the device (``let-through-data``: an energy-limiting class, a gG fuse's
      operating I2t); else I^2 x 0.1 s, a stated conservative value (``conservative-0.1s``).
    - t above 5 s or no disconnection: NaN (``outside-adiabatic-range``).

    Returns ``(energy_a2s, method)``.
    """
    i = as_float(current_a)
    t = np.broadcast_to(as_float(time_s), i.shape)
    given = np.broadcast_to(as_float(np.nan if let_through_a2s is None else let_through_a2s), i.shape)
    data = np.broadcast_to(as_float(np.nan if data_a2s is None else data_a2s), i.shape)
    short = t <= ADIABATIC_MIN_S
    outside = ~np.isfinite(t) | (t > ADIABATIC_MAX_S)
    has_given, has_data = short & ~np.isnan(given), short & ~np.isnan(data)
    conditions = [outside, has_given, has_data, short]
    energy = select(conditions, [np.nan, given, data, i * i * ADIABATIC_MIN_S], i * i * t)
    method = select(conditions, list(ENERGY_METHODS[1:]), ENERGY_METHODS[0])
    return energy, method.astype(object)


ENERGY_METHODS = ("adiabatic", "outside-adiabatic-range", "let-through", "let-through-data", "conservative-0.1s")
STAND_IN_METHODS = ("let-through-data", "conservative-0.1s")  # limits, not the device's own figure


@scalar_io
def min_csa_mm2(energy_a2s: Any, k: Any) -> np.ndarray:
    """Minimum protective conductor size S = sqrt(I^2 t) / k, mm2 (BS 7671 543.1.3, IEC 60364-5-54 543.1.2)."""
    return np.sqrt(as_float(energy_a2s)) / as_float(k)


def standard_sizes() -> np.ndarray:
    return np.asarray(core_table("standard_sizes")["csa_mm2"], dtype=float)


@scalar_io
def next_standard_size_mm2(csa_mm2: Any) -> np.ndarray:
    """The smallest standard size (IEC 60228) at or above each value; NaN above the largest or for NaN."""
    sizes = standard_sizes()
    csa = as_float(csa_mm2)
    idx = np.searchsorted(sizes, csa * (1 - 1e-12), side="left")
    out = sizes[np.clip(idx, 0, len(sizes) - 1)]
    return np.where((idx >= len(sizes)) | np.isnan(csa), np.nan, out)


@scalar_io
def selection_csa_mm2(line_csa_mm2: Any, k_line: Any = None, k_cpc: Any = None) -> np.ndarray:
    """Protective conductor size by selection, BS 7671:2018 Table 54.7, rounded up to a standard size.

    S <= 16 mm2: S; 16 < S <= 35: 16; S > 35: S/2; a cpc of another material: times k1/k2
    (k1 for the line conductor, k2 for the cpc).
    """
    s = as_float(line_csa_mm2)
    base = np.where(s <= 16, s, np.where(s <= 35, 16.0, s / 2.0))
    if k_line is not None and k_cpc is not None:
        base = base * as_float(k_line) / as_float(k_cpc)
    return next_standard_size_mm2(base)


@scalar_io
def cpc_verdicts(
    csa_mm2: Any, min_csa_mm2: Any, selection_csa_mm2: Any = np.nan
) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Verdict for each protective conductor, and whether it passes by calculation or by selection.

    pass where the cpc is at least sqrt(I^2 t) / k (BS 7671:2018 543.1.3) or at least the Table 54.7 size
    (543.1.4); fail where the calculation applies and neither holds; not-verified where the adiabatic
    equation does not apply (time outside 0.1-5 s) and the selection size is not met.
    Returns ``(verdict, by_calculation, by_selection)``, the verdicts as codes
    (:mod:`service.electrical.results.verdicts`).
    """
    csa = as_float(csa_mm2)
    s_min = np.broadcast_to(as_float(min_csa_mm2), csa.shape)
    selection = np.broadcast_to(as_float(selection_csa_mm2), csa.shape)
    with np.errstate(invalid="ignore"):
        by_calculation = np.isfinite(s_min) & (csa >= s_min * (1 - 1e-9))
        by_selection = np.isfinite(selection) & (csa >= selection)
    verdict = select(
        [by_calculation | by_selection, np.isfinite(s_min)], [verdicts.PASS, verdicts.FAIL], verdicts.NOT_VERIFIED
    )
    return verdict.astype(np.int8), by_calculation, by_selection


@dataclass
class CpcSizing:
    """The answer to 'how large must the cpc be?' for one fault (sizes mm2, energy A^2 s, temperatures degC)."""

    k: float
    k_formula: float
    k_tabulated: float | None
    k_basis: str
    initial_c: float
    final_c: float
    time_s: float | None
    time_bound: str
    energy_a2s: float | None
    energy_basis: str
    min_csa_mm2: float | None
    csa_mm2: float | None
    selection_csa_mm2: float | None
    verdict: Verdict | None
    basis: str


def size_for_fault(
    fault_current_a: float,
    material: str,
    arrangement: str,
    insulation: str | None = None,
    *,
    time_s: float | None = None,
    device: DeviceSpec | None = None,
    bare_condition: str | None = None,
    cpc_csa_mm2: float | None = None,
    line_csa_mm2: float | None = None,
    line_material: str | None = None,
    let_through_a2s: float | None = None,
) -> CpcSizing:
    """k, the minimum cpc S = sqrt(I^2 t) / k and the next standard size, with Table 54.7 and a verdict where asked.

    The time is ``time_s``, or read off ``device`` at the fault current. BS 7671:2018 543.1.3 and 543.1.4;
    k from IEC 60364-5-54 Annex A. Errors name the question's own fields (``material``, ``arrangement``,
    ``device.rating_a`` ...).
    """
    names = {"cpc_material": "material", "cpc_arrangement": "arrangement"}
    try:
        case = k_case(material, arrangement, insulation, cpc_csa_mm2 or line_csa_mm2 or 1.0, bare_condition)
    except ElectricalError as err:
        raise type(err)(names.get(str(err.path[0]), err.path[0]), err.message) from None
    time_s, bound, let_through_a2s = _time_of(fault_current_a, time_s, device, let_through_a2s)
    energy, method = fault_energy_a2s(fault_current_a, time_s, let_through_a2s)
    s_min = finite_or_none(min_csa_mm2(energy, case["k"]))
    selection = None
    if line_csa_mm2 is not None:
        other = line_material or material
        k_line = None if other == material else k_case(other, "in-cable", insulation, line_csa_mm2)["k"]
        selection = finite_or_none(selection_csa_mm2(line_csa_mm2, k_line, None if k_line is None else case["k"]))
    verdict = None
    if cpc_csa_mm2 is not None:
        code = cpc_verdicts(
            cpc_csa_mm2, np.nan if s_min is None else s_min, np.nan if selection is None else selection
        )[0]
        verdict = verdicts.VERDICTS[code]
    return CpcSizing(
        k=case["k"],
        k_formula=case["k_formula"],
        k_tabulated=case["k_tabulated"],
        k_basis=case["table"],
        initial_c=case["initial_c"],
        final_c=case["final_c"],
        time_s=finite_or_none(time_s),
        time_bound=str(bound),
        energy_a2s=finite_or_none(energy),
        energy_basis=str(method),
        min_csa_mm2=s_min,
        csa_mm2=None if s_min is None else finite_or_none(next_standard_size_mm2(s_min)),
        selection_csa_mm2=selection,
        verdict=verdict,
        basis=ADIABATIC_BASIS + ("; Table 54.7 (543.1.4)" if selection is not None else ""),
    )


def _time_of(current_a: float, time_s: float | None, device: DeviceSpec | None, let_through_a2s: float | None):
    """The time (given, or read off the device at the current), its bound, and the let-through energy to use."""
    if device is None:
        return time_s, "given", let_through_a2s
    try:
        time_s, bound = resolve(device).time_at(current_a)
    except ElectricalError as err:
        raise err.within("device") from None
    return time_s, bound, device.let_through_a2s if let_through_a2s is None else let_through_a2s


ADIABATIC_BASIS = "BS 7671:2018 543.1.3, S = sqrt(I^2 t) / k; k from IEC 60364-5-54 Annex A"
