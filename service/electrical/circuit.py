"""The whole check of one circuit or of many: every figure, every check, a verdict and cautions.

One path serves all: :func:`check_circuits` turns the circuits into columns and computes each
formula once over all of them (devices are grouped, so each characteristic is read once per group).
:func:`check_circuit` is that path with one circuit.

Checks and the clauses they rest on (BS 7671:2018):
- ``disconnection-time``: time read off the device's characteristic at the earth fault current
  against the maximum time of Table 41.1 / 411.3.2.3 / 411.3.2.4 / 411.8.3;
- ``max-zs``: Zs against U0 x Cmin / Ia (411.4.4 TN, 411.5.4 TT), or 50 V / IΔn with an RCD;
- ``protective-conductor``: cpc size against sqrt(I^2 t) / k (543.1.3), or Table 54.7 (543.1.4);
- ``breaking-capacity``: the device's rated breaking capacity against the prospective fault current (434.5.1);
- ``rcd``: Zs (TN, 411.4.5) or RA (TT, 411.5.3) x IΔn <= 50 V, where an RCD is fitted.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from . import conductors as cond
from . import disconnection, faults, protective
from .arrays import groups
from .devices import residual
from .devices.base import Device
from .devices.catalogue import resolve
from .devices.characteristic import AT_MOST, BEYOND_DATA, ESTIMATED
from .errors import ElectricalError, InvalidInput

PASS, FAIL, NOT_VERIFIED = "pass", "fail", "not-verified"
VERDICTS = (PASS, FAIL, NOT_VERIFIED)
CHECKS = ("disconnection-time", "max-zs", "protective-conductor", "breaking-capacity", "rcd")

GENERAL_CAUTIONS = (
    "This result supports a competent person; it does not replace one. A competent person must verify the design.",
    "The current edition of BS 7671 / IEC 60364, local codes and licensed practice prevail over this result.",
    "Site measurements (Ze, Zs, R1+R2, RCD operation) must confirm the design before the circuit is put into service.",
)


@dataclass(frozen=True)
class Supply:
    """The supply at the origin. For TT, ``ze_ohm`` is the whole external loop including RA."""

    earthing: str
    u0_v: float
    ze_ohm: float
    prospective_fault_current_ka: float | None = None
    c_max: float | None = None
    electrode_ohm: float | None = None
    bonding_complete: bool = False
    current_kind: str = "ac"
    reduced_low_voltage: bool = False


@dataclass(frozen=True)
class Rcd:
    residual_current_ma: float
    delay: str = "general"


@dataclass(frozen=True)
class DeviceSpec:
    rating_a: float
    standard: str | None = None
    type: str | None = None
    breaking_capacity_ka: float | None = None
    curve_points: tuple[tuple[float, float], ...] | None = None
    rcd: Rcd | None = None
    let_through_a2s: float | None = None

    def as_mapping(self) -> dict[str, Any]:
        points = None if self.curve_points is None else [{"current_a": c, "time_s": t} for c, t in self.curve_points]
        return {"standard": self.standard, "type": self.type, "rating_a": self.rating_a, "curve_points": points}

    @property
    def curve_key(self) -> tuple:
        return (self.standard, self.type, float(self.rating_a), self.curve_points)


@dataclass(frozen=True)
class Conductors:
    material: str
    insulation: str
    line_csa_mm2: float
    cpc_csa_mm2: float
    length_m: float
    cpc_arrangement: str = "in-cable"
    ring: bool = False
    parallel_cables: int = 1
    conductor_class: int = 2
    cpc_material: str | None = None
    cpc_resistance_mohm_per_m: float | None = None
    bare_condition: str | None = None


@dataclass(frozen=True)
class Circuit:
    device: DeviceSpec
    conductors: Conductors | None = None
    r1_plus_r2_ohm: float | None = None
    role: str = "final"
    load: str | None = None
    id: str | None = None
    design_current_a: float | None = None


@dataclass
class Check:
    check: str
    verdict: str
    value: float | None
    limit: float | None
    unit: str
    margin_percent: float | None
    basis: str
    note: str | None = None


@dataclass
class CircuitResult:
    id: str | None
    r1_plus_r2_ohm: float | None
    zs_ohm: float
    earth_fault_current_a: float
    earth_fault_current_nominal_a: float
    prospective_fault_current_ka: float
    prospective_fault_current_basis: str
    device: dict[str, Any]
    disconnection_time_s: float | None
    disconnection_time_bound: str
    disconnection_region: str
    disconnected_by: str | None
    max_disconnection_time_s: float | None
    max_disconnection_basis: str
    operating_current_a: float | None
    operating_current_bound: str
    max_zs_ohm: float | None
    zs_margin_percent: float | None
    protective_conductor: dict[str, Any]
    checks: list[Check]
    verdict: str
    cautions: list[str] = field(default_factory=list)


@dataclass
class CircuitFailure:
    """A circuit the core could not compute with: which field, and why."""

    index: int
    id: str | None
    field: str
    message: str


def overall_verdict(verdicts: Sequence[str]) -> str:
    """``fail`` if any check fails, else ``not-verified`` if any is, else ``pass``."""
    if FAIL in verdicts:
        return FAIL
    if NOT_VERIFIED in verdicts:
        return NOT_VERIFIED
    return PASS


def _num(value: Any) -> float | None:
    v = float(value)
    return v if math.isfinite(v) else None


def _margin(value: float, limit: float) -> float | None:
    if not (math.isfinite(value) and math.isfinite(limit)) or limit == 0:
        return None
    return (limit - value) / limit * 100.0


def _opt(values: Sequence[Any]) -> np.ndarray:
    return np.array([np.nan if v is None else float(v) for v in values], dtype=float)


def _column(items: Sequence[Any], name: str) -> list[Any]:
    return [getattr(item, name) for item in items]


class _Rows:
    """Columns of the circuits being checked (only those that passed the per-item lookups)."""

    def __init__(self, supplies: Sequence[Supply], circuits: Sequence[Circuit]):
        self.n = len(circuits)
        self.earthing = np.array(_column(supplies, "earthing"), dtype=object)
        self.u0 = np.array(_column(supplies, "u0_v"), dtype=float)
        self.ze = np.array(_column(supplies, "ze_ohm"), dtype=float)
        self.pfc_stated = _opt(_column(supplies, "prospective_fault_current_ka"))
        self.electrode = _opt(_column(supplies, "electrode_ohm"))
        self.bonded = np.array(_column(supplies, "bonding_complete"), dtype=bool)
        self.kind = np.array(_column(supplies, "current_kind"), dtype=object)
        self.rlv = np.array(_column(supplies, "reduced_low_voltage"), dtype=bool)
        self.c_max = [s.c_max for s in supplies]
        self.role = np.array(_column(circuits, "role"), dtype=object)
        self.load = np.array(_column(circuits, "load"), dtype=object)
        self.rating = np.array([c.device.rating_a for c in circuits], dtype=float)
        self.r1r2_given = _opt(_column(circuits, "r1_plus_r2_ohm"))
        self.has_cond = np.array([c.conductors is not None for c in circuits], dtype=bool)


def conductor_columns(items: Sequence[Conductors | None]) -> dict[str, np.ndarray]:
    """R1, R2 (ohm, at the temperatures the rules assume), k and sizes for each item (NaN where None).

    R = r20 x (1 + 0.004 (theta - 20)) x L / n, a quarter of the end-to-end value on a ring; the line
    conductor at its insulation's operating temperature, the cpc at the initial temperature of its
    k case (BS 7671 Tables 54.2-54.6). Raises the core's typed errors naming the conductor field.
    """
    n = len(items)
    out = {name: np.full(n, np.nan) for name in ("r1", "r2", "cpc_csa", "line_csa", "k", "k_formula", "k_tabulated", "cpc_temp", "line_temp", "k_line")}
    out["k_table"] = np.full(n, None, dtype=object)
    out["cpc_material"] = np.full(n, None, dtype=object)
    out["line_material"] = np.full(n, None, dtype=object)
    idx = [i for i, c in enumerate(items) if c is not None]
    if not idx:
        return out
    cs = [items[i] for i in idx]
    line_r20 = cond.resistance_mohm_per_m(_column(cs, "material"), _column(cs, "line_csa_mm2"), _column(cs, "conductor_class"), field="line_csa_mm2")
    cpc_materials = [c.cpc_material or (c.material if c.cpc_arrangement in ("in-cable", "separate", "bare") else "steel") for c in cs]
    kc = protective.k_cases(cpc_materials, _column(cs, "cpc_arrangement"), _column(cs, "insulation"), _column(cs, "cpc_csa_mm2"), _column(cs, "bare_condition"))
    k_line = protective.k_cases(_column(cs, "material"), "in-cable", _column(cs, "insulation"), _column(cs, "line_csa_mm2"))["k"]
    cpc_r20 = np.empty(len(cs))
    for j, c in enumerate(cs):
        if c.cpc_resistance_mohm_per_m is not None:
            cpc_r20[j] = c.cpc_resistance_mohm_per_m
        elif cpc_materials[j] in cond.MATERIALS:
            cpc_r20[j] = cond.resistance_mohm_per_m(cpc_materials[j], c.cpc_csa_mm2, c.conductor_class, field="cpc_csa_mm2")[0]
        else:
            raise InvalidInput(
                "cpc_resistance_mohm_per_m",
                f"a {cpc_materials[j]} {c.cpc_arrangement} used as the cpc needs its resistance at 20 degC from the maker's data",
            )
    line_temp = cond.operating_temperature_c(_column(cs, "insulation"), len(cs), field="insulation")
    length = np.array(_column(cs, "length_m"), dtype=float)
    parallel = np.array(_column(cs, "parallel_cables"), dtype=float)
    ring = cond.ring_factor(np.array(_column(cs, "ring"), dtype=bool), length.shape)
    r1 = cond.conductor_resistance_ohm(line_r20, length, line_temp, parallel) * ring
    r2 = cond.conductor_resistance_ohm(cpc_r20, length, kc["initial_c"], parallel) * ring
    sel = np.asarray(idx)
    for name, values in (
        ("r1", r1), ("r2", r2), ("cpc_csa", _column(cs, "cpc_csa_mm2")), ("line_csa", _column(cs, "line_csa_mm2")),
        ("k", kc["k"]), ("k_formula", kc["k_formula"]), ("k_tabulated", kc["k_tabulated"]), ("cpc_temp", kc["initial_c"]),
        ("line_temp", line_temp), ("k_line", k_line),
    ):
        out[name][sel] = np.asarray(values, dtype=float)
    out["k_table"][sel] = kc["table"]
    out["cpc_material"][sel] = cpc_materials
    out["line_material"][sel] = _column(cs, "material")
    return out


def _prefixed(prefix: str, err: ElectricalError) -> ElectricalError:
    field = err.field if err.field.startswith(prefix) else f"{prefix}{err.field}"
    return type(err)(field, err.message)


_SUPPLY_FIELDS = ("earthing", "u0_v", "ze_ohm", "c_max", "current_kind", "zs_ohm")


def _validate_one(supply: Supply, circuit: Circuit) -> None:
    """Per-item lookups that can fail, so that one bad circuit never sinks a batch.

    Errors name the field from the circuit's point of view: ``device.rating_a``,
    ``conductors.line_csa_mm2``, ``supply.u0_v``, ``role``.
    """
    try:
        dev = resolve(circuit.device.as_mapping())
        if circuit.device.rcd is not None:
            residual.rcd_characteristic(circuit.device.rcd.residual_current_ma, circuit.device.rcd.delay)
        if dev.residual and circuit.device.rcd is None:
            raise InvalidInput("rcd", f"an RCBO to {dev.standard} needs its residual part: rcd.residual_current_ma")
    except ElectricalError as err:
        raise _prefixed("device.", err) from None
    if circuit.conductors is None and circuit.r1_plus_r2_ohm is None:
        raise InvalidInput("conductors", "give the conductors, or a known r1_plus_r2_ohm")
    if circuit.conductors is not None:
        try:
            conductor_columns([circuit.conductors])
        except ElectricalError as err:
            raise _prefixed("conductors.", err) from None
    for name in ("ze_ohm", "u0_v"):
        if not getattr(supply, name) > 0:
            raise InvalidInput(f"supply.{name}", "must be greater than zero")
    try:
        disconnection.max_disconnection_time_s(
            supply.earthing, supply.u0_v, circuit.role, circuit.load, circuit.device.rating_a,
            supply.current_kind, False, supply.reduced_low_voltage,
        )
        faults.prospective_fault_current_ka(supply.u0_v, supply.ze_ohm, supply.prospective_fault_current_ka, supply.c_max)
    except ElectricalError as err:
        raise (_prefixed("supply.", err) if err.field in _SUPPLY_FIELDS else err) from None


def check_circuit(supply: Supply, circuit: Circuit) -> CircuitResult:
    """Check one circuit: :func:`check_circuits` with one element. Raises the core's typed errors."""
    result = check_circuits(supply, [circuit])[0]
    if isinstance(result, CircuitFailure):
        raise ElectricalError(result.field, result.message)
    return result


def check_circuits(supply: Supply | Sequence[Supply], circuits: Sequence[Circuit]) -> list[CircuitResult | CircuitFailure]:
    """Check many circuits as arrays; one result or one failure per circuit, in order."""
    supplies = [supply] * len(circuits) if isinstance(supply, Supply) else list(supply)
    if len(supplies) != len(circuits):
        raise InvalidInput("supply", "give one supply, or one per circuit")
    out: list[CircuitResult | CircuitFailure | None] = [None] * len(circuits)
    good: list[int] = []
    for i, (s, c) in enumerate(zip(supplies, circuits)):
        try:
            _validate_one(s, c)
            good.append(i)
        except ElectricalError as err:
            out[i] = CircuitFailure(i, c.id, err.field, err.message)
    if good:
        results = _evaluate([supplies[i] for i in good], [circuits[i] for i in good])
        for i, r in zip(good, results):
            out[i] = r
    return out  # type: ignore[return-value]


def _evaluate(supplies: Sequence[Supply], circuits: Sequence[Circuit]) -> list[CircuitResult]:
    rows = _Rows(supplies, circuits)
    n = rows.n
    cc = conductor_columns([c.conductors for c in circuits])
    calc_r1r2 = cc["r1"] + cc["r2"]
    r1r2 = np.where(np.isnan(rows.r1r2_given), calc_r1r2, rows.r1r2_given)

    # 411.4.4 / 411.5.4: the loop and the fault currents
    zs = faults.loop_impedance_ohm(rows.ze, r1r2)
    i_f = faults.earth_fault_current_a(rows.u0, zs)
    i_nom = faults.earth_fault_current_a(rows.u0, zs, voltage_factor=1.0)
    pfc = np.empty(n)
    for key, idx in groups(rows.c_max).items():
        pfc[idx] = faults.prospective_fault_current_ka(rows.u0[idx], rows.ze[idx], rows.pfc_stated[idx], key)

    # which times apply: the overcurrent device may use TN times in a bonded TT installation
    tt = rows.earthing == "TT"
    t_req_oc, basis_oc = disconnection.max_disconnection_time_s(
        rows.earthing, rows.u0, rows.role, rows.load, rows.rating, rows.kind, tt & rows.bonded, rows.rlv
    )
    t_req_rcd, basis_rcd = disconnection.max_disconnection_time_s(
        rows.earthing, rows.u0, rows.role, rows.load, rows.rating, rows.kind, False, rows.rlv
    )

    # the overcurrent device, one characteristic per distinct device
    devices: list[Device] = [None] * n  # type: ignore[list-item]
    t_oc = np.empty(n)
    b_oc = np.empty(n, dtype=object)
    region = np.empty(n, dtype=object)
    ia = np.empty(n)
    b_ia = np.empty(n, dtype=object)
    for key, idx in groups([c.device.curve_key for c in circuits]).items():
        dev = resolve(circuits[idx[0]].device.as_mapping())
        t_oc[idx], b_oc[idx] = dev.time_at(i_f[idx])
        region[idx] = dev.region_at(i_f[idx])
        ia[idx], b_ia[idx] = dev.current_for(np.nan_to_num(t_req_oc[idx], nan=np.inf))
        for i in idx:
            devices[i] = dev
    max_zs_oc = faults.c_min() * rows.u0 / ia

    # the RCD, where fitted
    has_rcd = np.array([c.device.rcd is not None for c in circuits], dtype=bool)
    t_rcd = np.full(n, np.inf)
    b_rcd = np.full(n, BEYOND_DATA, dtype=object)
    rcd_limit = np.full(n, np.nan)
    for key, idx in groups([(c.device.rcd.residual_current_ma, c.device.rcd.delay) if c.device.rcd else None for c in circuits]).items():
        if key is None:
            continue
        t_rcd[idx], b_rcd[idx] = residual.rcd_characteristic(*key).time_at(i_f[idx])
        rcd_limit[idx] = residual.rcd_max_loop_ohm(key[0])
    ra = np.where(tt, np.where(np.isnan(rows.electrode), zs, rows.electrode + np.nan_to_num(cc["r2"])), zs)

    results: list[CircuitResult] = []
    for i, circuit in enumerate(circuits):
        results.append(_one_result(
            i, circuit, supplies[i], devices[i], rows, cc, r1r2, zs, i_f, i_nom, pfc,
            t_req_oc, basis_oc, t_req_rcd, basis_rcd, t_oc, b_oc, region, ia, b_ia, max_zs_oc,
            has_rcd, t_rcd, b_rcd, rcd_limit, ra,
        ))
    return results


def _time_verdict(t: float, bound: str, limit: float) -> str:
    if not math.isfinite(limit):
        return NOT_VERIFIED
    if bound == BEYOND_DATA:
        return FAIL
    if t <= limit * (1 + 1e-9):
        return PASS
    return NOT_VERIFIED if bound == AT_MOST else FAIL


def _one_result(i, circuit, supply, dev, rows, cc, r1r2, zs, i_f, i_nom, pfc, t_req_oc, basis_oc, t_req_rcd, basis_rcd,
                t_oc, b_oc, region, ia, b_ia, max_zs_oc, has_rcd, t_rcd, b_rcd, rcd_limit, ra) -> CircuitResult:
    cautions = list(GENERAL_CAUTIONS)
    checks: list[Check] = []
    system = "TT" if supply.earthing == "TT" else "TN"

    # disconnection time: the overcurrent device, else the RCD
    v_oc = _time_verdict(t_oc[i], b_oc[i], t_req_oc[i])
    v_rcd = _time_verdict(t_rcd[i], b_rcd[i], t_req_rcd[i]) if has_rcd[i] else None
    by_rcd = v_oc != PASS and v_rcd == PASS
    if by_rcd:
        t, bound, limit, basis, verdict, by = t_rcd[i], b_rcd[i], t_req_rcd[i], basis_rcd[i], PASS, "rcd"
    else:
        t, bound, limit, basis, by = t_oc[i], b_oc[i], t_req_oc[i], basis_oc[i], "overcurrent-device"
        verdict = v_oc if v_rcd is None else (NOT_VERIFIED if NOT_VERIFIED in (v_oc, v_rcd) else v_oc)
    note = None
    if not math.isfinite(limit):
        note = "Table 41.1 sets no disconnection time for this case; disconnection may still be required for other reasons."
    elif bound == BEYOND_DATA:
        note = "The fault current is below the device's data: no disconnection is shown."
    elif verdict == NOT_VERIFIED:
        note = f"The device's data show operation within {t:g} s at most; a shorter time cannot be shown from standard data."
    if bound == ESTIMATED:
        note = "Time read from an estimated part of the curve (see the device notes)."
    checks.append(Check("disconnection-time", verdict, _num(t), _num(limit), "s", _margin(t, limit), basis, note))

    # max Zs: the overcurrent device's limit; with an RCD, 50 V / IΔn where that limit is not met
    oc_limit = max_zs_oc[i]
    oc_clause = "411.5.4" if system == "TT" else "411.4.4"
    value, zs_limit, zs_note = zs[i], oc_limit, None
    zs_basis = f"BS 7671:2018 {oc_clause}, Zs <= U0 x Cmin / Ia"
    if math.isfinite(oc_limit) and zs[i] <= oc_limit:
        zs_verdict = PASS
        if b_ia[i] == ESTIMATED:
            zs_note = "Ia read from an estimated part of the curve."
    elif has_rcd[i]:
        value, zs_limit = (ra[i], rcd_limit[i]) if system == "TT" else (zs[i], rcd_limit[i])
        zs_basis = ("BS 7671:2018 411.5.3, RA x IΔn <= 50 V" if system == "TT" else "BS 7671:2018 411.4.5, Zs x IΔn <= 50 V")
        zs_basis += " (fault protection by the RCD)"
        zs_verdict = PASS if value <= zs_limit else FAIL
        zs_note = "The overcurrent device alone would not meet its limit; the RCD provides fault protection."
    elif math.isfinite(oc_limit):
        zs_verdict = FAIL
    else:
        zs_verdict = NOT_VERIFIED
        zs_note = "The device's data cannot show operation within the required time, so no maximum Zs follows."
    checks.append(Check("max-zs", zs_verdict, _num(value), _num(zs_limit), "ohm", _margin(value, zs_limit), zs_basis, zs_note))

    # protective conductor
    pc = _protective_check(i, circuit, cc, i_f[i], t, bound, cautions)
    checks.append(pc.pop("check"))

    # breaking capacity against the prospective fault current at the origin
    icn = circuit.device.breaking_capacity_ka
    bc_basis = "BS 7671:2018 434.5.1, rated breaking capacity >= prospective fault current"
    bc_note = None
    if icn is None and dev.default_breaking_capacity_ka is not None:
        icn = dev.default_breaking_capacity_ka
        bc_note = f"Rated breaking capacity not given: taken as the {dev.default_breaking_capacity_basis}."
        cautions.append("Breaking capacity taken from a standard minimum that is from memory: confirm it from the maker's data.")
    if icn is None:
        checks.append(Check("breaking-capacity", NOT_VERIFIED, _num(pfc[i]), None, "kA", None, bc_basis,
                            "State the device's rated short-circuit capacity (breaking_capacity_ka)."))
    else:
        checks.append(Check("breaking-capacity", PASS if icn >= pfc[i] else FAIL, _num(pfc[i]), float(icn), "kA",
                            _margin(pfc[i], icn), bc_basis, bc_note))
    pfc_basis = ("stated in the request" if supply.prospective_fault_current_ka is not None else
                 f"U0 x cmax / Ze with cmax {supply.c_max or faults.core_table('voltage_factors')['c_max_default']:g} (IEC 60909-0 Table 1)")
    if supply.prospective_fault_current_ka is None:
        cautions.append("Prospective fault current calculated from Ze; the line-neutral (or three-phase) value may be higher: state the larger one.")

    # the RCD's own 50 V rule
    if has_rcd[i]:
        value = ra[i] if system == "TT" else zs[i]
        clause = "BS 7671:2018 411.5.3, RA x IΔn <= 50 V" if system == "TT" else "BS 7671:2018 411.4.5, Zs x IΔn <= 50 V"
        rcd_note = None
        if system == "TT" and supply.electrode_ohm is None:
            rcd_note = "RA not given: Zs used in its place (larger, so on the safe side)."
        checks.append(Check("rcd", PASS if value <= rcd_limit[i] else FAIL, _num(value), _num(rcd_limit[i]), "ohm",
                            _margin(value, rcd_limit[i]), clause, rcd_note))
        if system == "TT" and supply.electrode_ohm is not None and supply.electrode_ohm > residual.stable_resistance_limit_ohm():
            cautions.append("Earth electrode resistance above 200 ohm may not be stable (note to BS 7671:2018 Table 41.5).")

    # cautions from the data and the rules
    if ESTIMATED in (bound, b_ia[i]):
        cautions.append("A figure rests on an estimated part of the device's curve; a maker's curve (curve_points) removes the estimate.")
    rcd_ma = circuit.device.rcd.residual_current_ma if circuit.device.rcd else None
    if circuit.role == "final" and circuit.load == "socket-outlets" and circuit.device.rating_a <= 32 and (rcd_ma is None or rcd_ma > residual.additional_protection_max_ma()):
        cautions.append("Socket-outlets rated up to 32 A need additional protection by a 30 mA RCD (BS 7671:2018 411.3.3), unless an exception applies.")
    if circuit.design_current_a is not None and circuit.design_current_a > circuit.device.rating_a:
        cautions.append("The design current exceeds the device rating (Ib <= In, BS 7671:2018 433.1.1).")
    if not np.isnan(rows.r1r2_given[i]):
        cautions.append("R1+R2 taken as given: it must be the value at the conductors' operating temperature.")

    return CircuitResult(
        id=circuit.id,
        r1_plus_r2_ohm=_num(r1r2[i]),
        zs_ohm=float(zs[i]),
        earth_fault_current_a=float(i_f[i]),
        earth_fault_current_nominal_a=float(i_nom[i]),
        prospective_fault_current_ka=float(pfc[i]),
        prospective_fault_current_basis=pfc_basis,
        device={"device_id": dev.device_id, "label": dev.label, "source": dev.source, "confidence": dev.confidence, "notes": list(dev.notes)},
        disconnection_time_s=_num(t),
        disconnection_time_bound=str(bound),
        disconnection_region=str(region[i]) if not by_rcd else "residual",
        disconnected_by=by if bound != BEYOND_DATA else None,
        max_disconnection_time_s=_num(limit),
        max_disconnection_basis=str(basis),
        operating_current_a=_num(ia[i]),
        operating_current_bound=str(b_ia[i]),
        max_zs_ohm=_num(checks[1].limit if checks[1].limit is not None else np.nan),
        zs_margin_percent=checks[1].margin_percent,
        protective_conductor=pc,
        checks=checks,
        verdict=overall_verdict([c.verdict for c in checks]),
        cautions=list(dict.fromkeys(cautions)),
    )


def _protective_check(i, circuit, cc, fault_a, t, bound, cautions) -> dict[str, Any]:
    basis = "BS 7671:2018 543.1.3, S >= sqrt(I^2 t) / k"
    if circuit.conductors is None:
        check = Check("protective-conductor", NOT_VERIFIED, None, None, "mm2", None, basis,
                      "The cpc is not described (conductors not given), so its size cannot be checked.")
        return {"k": None, "k_formula": None, "k_basis": None, "min_csa_mm2": None, "csa_mm2": None, "next_standard_csa_mm2": None,
                "selection_csa_mm2": None, "energy_a2s": None, "energy_basis": None, "verdict": NOT_VERIFIED, "basis": basis, "check": check}
    energy, method = protective.fault_energy_a2s(fault_a, t, circuit.device.let_through_a2s)
    energy, method = float(energy[0]), str(method[0])
    k = cc["k"][i]
    s_min = float(protective.min_csa_mm2(energy, k)[0]) if math.isfinite(energy) else math.nan
    csa = cc["cpc_csa"][i]
    same_material = cc["cpc_material"][i] == cc["line_material"][i]
    selection = float(protective.selection_csa_mm2(cc["line_csa"][i], None if same_material else cc["k_line"][i], None if same_material else k)[0])
    note = None
    if method == "conservative-0.1s":
        cautions.append("Below 0.1 s the cpc check uses I^2 x 0.1 s, a conservative stand-in for the device's let-through energy (give let_through_a2s to use the maker's value).")
        note = "Energy I^2 x 0.1 s (conservative: the device clears within 0.1 s)."
    elif method == "let-through":
        note = "Energy from the device's let-through I^2 t given in the request."
    if math.isfinite(s_min) and csa >= s_min * (1 - 1e-9):
        verdict = PASS
    elif math.isfinite(selection) and csa >= selection:
        verdict, basis = PASS, "BS 7671:2018 543.1.4, Table 54.7 (cpc by selection)"
        note = "The cpc meets Table 54.7 by selection" + ("" if math.isfinite(s_min) else "; the adiabatic check does not apply at this time.")
    elif not math.isfinite(s_min):
        verdict = NOT_VERIFIED
        note = "The adiabatic equation applies from 0.1 s to 5 s; at this fault the device's time is outside it."
    else:
        verdict = FAIL
    check = Check("protective-conductor", verdict, float(csa), _num(s_min), "mm2", _margin(s_min, csa) if math.isfinite(s_min) else None, basis, note)
    return {
        "k": float(k),
        "k_formula": float(cc["k_formula"][i]),
        "k_basis": str(cc["k_table"][i]),
        "min_csa_mm2": _num(s_min),
        "csa_mm2": float(csa),
        "next_standard_csa_mm2": _num(protective.next_standard_size_mm2(s_min)[0]) if math.isfinite(s_min) else None,
        "selection_csa_mm2": _num(selection),
        "energy_a2s": _num(energy),
        "energy_basis": method,
        "verdict": verdict,
        "basis": basis,
        "check": check,
    }
