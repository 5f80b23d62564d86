"""Measured test results judged against the limits of the circuit they were taken on.

- Zs measured with the conductors at ``temperature_c``: the design maximum Zs scaled by the ratio of
  resistances (1 + 0.004 (theta_m - 20)) / (1 + 0.004 (theta_op - 20)), and the common 0.8 rule beside it
  (BS 7671 Appendix 3 approach; the verdict rests on the scaled limit).
- R1+R2 measured: corrected to the operating temperature and added to Ze, against the maximum Zs.
- Insulation resistance: at least the minimum for the circuit voltage at its test voltage (Table 64, from memory).
- RCD: operating time at IΔn and at 5 IΔn within the device's limits (BS EN 61008-1 / 61009-1 Table 1).
- Polarity: confirmed.
- Ze measured against the Ze the design assumed; the prospective fault current measured against the device's
  breaking capacity (434.5.1, or the board's conditional rating).
- Ring continuity (643.2.1, common practice): the end-to-end r1 and rn within 0.05 ohm of each other, r2 within
  0.05 ohm of r1 times the line/cpc size ratio, and (r1 + r2) / 4 within 0.05 ohm of the R1+R2 measured.
- RCD at half IΔn: it must not trip (BS EN 61008-1 / 61009-1, from memory).
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass, field
from typing import Any

from service.electrical.cables.conductors import operating_temperature_c, temperature_multiplier
from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.datafiles import core_table, device_table
from service.electrical.devices import residual
from service.electrical.devices.limits import measured_limit_ohm
from service.electrical.errors import InvalidInput
from service.electrical.inputs import Circuit, Supply
from service.electrical.pipeline import check_circuits
from service.electrical.results import precision
from service.electrical.results.circuit_result import CircuitResult
from service.electrical.results.verdicts import Verdict, overall

PASS, FAIL, NOT_VERIFIED = Verdict.PASS, Verdict.FAIL, Verdict.NOT_VERIFIED

CIRCUIT_VOLTAGES = ("selv-pelv", "up-to-500v", "above-500v")


@dataclass(frozen=True)
class Measured:
    temperature_c: float = 20.0
    zs_ohm: float | None = None
    r1_plus_r2_ohm: float | None = None
    insulation_resistance_megohm: float | None = None
    insulation_test_voltage_v: float | None = None
    circuit_voltage: str = "up-to-500v"
    rcd_time_ms_at_idn: float | None = None
    rcd_time_ms_at_5idn: float | None = None
    polarity_confirmed: bool | None = None
    ze_ohm: float | None = None
    prospective_fault_current_ka: float | None = None
    ring_r1_ohm: float | None = None  # end to end
    ring_rn_ohm: float | None = None
    ring_r2_ohm: float | None = None
    rcd_tripped_at_half_idn: bool | None = None


@dataclass
class Judgement:
    test: str
    verdict: str
    measured: float | None
    limit: float | None
    unit: str
    basis: str
    note: str | None = None
    rule_of_thumb_limit: float | None = None
    corrected_value: float | None = None


@dataclass
class VerificationResult:
    id: str | None
    design_max_zs_ohm: float | None
    design_r1_plus_r2_ohm: float | None
    operating_temperature_c: float
    judgements: list[Judgement]
    verdict: str
    cautions: list[str] = field(default_factory=list)


@dataclass(frozen=True)
class Context:
    """What every judgement reads: the design's result, the supply, the circuit, the measurements and temperatures."""

    design: CircuitResult
    supply: Supply
    circuit: Circuit
    measured: Measured
    operating_c: float
    ratio: float  # resistance at the measuring temperature over resistance at the operating temperature
    max_zs_ohm: float | None  # the limit the design's max-zs check applied (the RCD's where it protects)


NO_MAX_ZS = "no maximum Zs follows from the design data"


def judge_zs(ctx: Context) -> list[Judgement]:
    """Zs measured cold against the design maximum scaled by the ratio of resistances, the 0.8 rule beside it."""
    m = ctx.measured
    if m.zs_ohm is None:
        return []
    if ctx.max_zs_ohm is None:
        return [Judgement("zs", NOT_VERIFIED, m.zs_ohm, None, "ohm", NO_MAX_ZS)]
    limit, rule = measured_limit_ohm(ctx.max_zs_ohm, ctx.operating_c, m.temperature_c)
    basis = (
        f"design maximum Zs {ctx.max_zs_ohm:.3f} ohm scaled by {ctx.ratio:.3f} for conductors at {m.temperature_c:g} "
        f"degC instead of {ctx.operating_c:g} degC; the 0.8 rule (common practice) shown beside it"
    )
    note = STABLE_NOTE if m.zs_ohm > residual.stable_resistance_limit_ohm() else None
    verdict = PASS if m.zs_ohm <= limit else FAIL
    return [Judgement("zs", verdict, m.zs_ohm, limit, "ohm", basis, note, rule_of_thumb_limit=rule)]


CONTINUITY_FACTOR = 1.5  # common practice: a TN loop reading this far above the design's points to the cpc path


def judge_zs_continuity(ctx: Context) -> list[Judgement]:
    """TN: a measured Zs far above what the design's conductors give points to an open or high-resistance cpc.

    The loop is metallic all the way in TN, so the reading should be near Ze + (R1+R2) at the measuring
    temperature; more than 1.5 times that fails, whatever an RCD would tolerate (common practice). Above
    200 ohm the reading may not be stable (note to BS 7671:2018 Table 41.5).
    """
    m, design = ctx.measured, ctx.design.r1_plus_r2_ohm
    if m.zs_ohm is None or ctx.supply.earthing == "TT" or design is None:
        return []
    expected = ctx.supply.ze_ohm + design * ctx.ratio
    limit = CONTINUITY_FACTOR * expected
    note = STABLE_NOTE if m.zs_ohm > residual.stable_resistance_limit_ohm() else None
    basis = (
        f"TN: Ze {ctx.supply.ze_ohm:g} ohm + design R1+R2 {design:.4f} ohm x {ctx.ratio:.3f} = {expected:.4f} ohm at "
        f"{m.temperature_c:g} degC; a reading above {CONTINUITY_FACTOR:g} times that points to an open or "
        "high-resistance protective conductor (common practice)"
    )
    verdict = PASS if m.zs_ohm <= limit else FAIL
    return [Judgement("zs-continuity", verdict, m.zs_ohm, limit, "ohm", basis, note)]


STABLE_NOTE = "Above 200 ohm a loop reading may not be stable (note to BS 7671:2018 Table 41.5)."


def judge_r1_plus_r2(ctx: Context) -> list[Judgement]:
    """R1+R2 measured cold, corrected to the operating temperature and added to Ze, against the maximum Zs."""
    m, ze = ctx.measured, ctx.supply.ze_ohm
    if m.r1_plus_r2_ohm is None:
        return []
    corrected = m.r1_plus_r2_ohm / ctx.ratio
    design = ctx.design.r1_plus_r2_ohm
    note = (
        f"{(corrected / design - 1) * 100:+.1f} % against the design R1+R2 at operating temperature" if design else None
    )
    if ctx.max_zs_ohm is None:
        return [Judgement("r1-plus-r2", NOT_VERIFIED, m.r1_plus_r2_ohm, None, "ohm", NO_MAX_ZS, note, None, corrected)]
    room = ctx.max_zs_ohm - ze  # what the loop leaves for R1+R2 at operating temperature
    limit, rule = measured_limit_ohm(room, ctx.operating_c, m.temperature_c)
    basis = (
        f"corrected to {ctx.operating_c:g} degC ({corrected:.3f} ohm) and added to Ze {ze:g} ohm, against the "
        f"maximum Zs {ctx.max_zs_ohm:.3f} ohm; the limit shown is for the value as measured at {m.temperature_c:g} degC"
    )
    verdict = PASS if ze + corrected <= ctx.max_zs_ohm else FAIL
    return [Judgement("r1-plus-r2", verdict, m.r1_plus_r2_ohm, limit, "ohm", basis, note, rule, corrected)]


def _insulation_row(circuit_voltage: str) -> dict[str, Any]:
    for row in core_table("insulation_resistance")["rows"]:
        if row["circuit"] == circuit_voltage:
            return row
    raise InvalidInput(("measured", "circuit_voltage"), f"circuit_voltage is one of {list(CIRCUIT_VOLTAGES)}")


def judge_insulation(ctx: Context) -> list[Judgement]:
    """Insulation resistance at least the minimum for the circuit voltage, at its test voltage (Table 64, M)."""
    m = ctx.measured
    if m.insulation_resistance_megohm is None:
        return []
    row = _insulation_row(m.circuit_voltage)
    least = row["minimum_megohm"]
    basis = (
        f"{core_table('insulation_resistance')['source']}: {row['description']}, at least {least:g} megohm "
        f"at {row['test_voltage_v']} V d.c. (from memory)"
    )
    if m.insulation_test_voltage_v is not None and m.insulation_test_voltage_v != row["test_voltage_v"]:
        note = f"tested at {m.insulation_test_voltage_v:g} V; the table asks for {row['test_voltage_v']} V"
        return [
            Judgement(
                "insulation-resistance", NOT_VERIFIED, m.insulation_resistance_megohm, least, "megohm", basis, note
            )
        ]
    verdict = PASS if m.insulation_resistance_megohm >= least else FAIL
    return [Judgement("insulation-resistance", verdict, m.insulation_resistance_megohm, least, "megohm", basis)]


RCD_TESTS = (("rcd-time-idn", "rcd_time_ms_at_idn", 0), ("rcd-time-5idn", "rcd_time_ms_at_5idn", 2))


def judge_rcd_times(ctx: Context) -> list[Judgement]:
    """RCD operating times at IΔn and 5 IΔn within the device's limits (BS EN 61008-1 / 61009-1 Table 1)."""
    rcd, out = ctx.circuit.device.rcd, []
    for test, name, index in RCD_TESTS:
        value = getattr(ctx.measured, name)
        if value is None:
            continue
        if rcd is None:
            raise InvalidInput(("measured", name), "the circuit has no RCD")
        row = device_table("residual")["delays"][rcd.delay]
        limit_ms = row["max_time_s"][index] * 1000
        least = row["min_time_s"][index]
        ok = value <= limit_ms and (least is None or value >= least * 1000)
        basis = (
            f"BS EN 61008-1 / 61009-1 Table 1: {rcd.delay} RCD at {row['multiples'][index]} x IΔn, "
            f"at most {limit_ms:g} ms"
        )
        if least is not None:
            basis += f" and at least {least * 1000:g} ms"
        out.append(Judgement(test, PASS if ok else FAIL, value, limit_ms, "ms", basis))
    return out


RCD_REQUIREMENTS = ("additional-protection", "rcd-type")


def judge_rcd_requirement(ctx: Context) -> list[Judgement]:
    """Whether the circuit has the RCD the rules call for (a 30 mA RCD where required, of a suitable type): the
    design's own checks of those rules (additional-protection, rcd-type), the same whatever was measured."""
    out = []
    for name in RCD_REQUIREMENTS:
        c = ctx.design.check(name)
        if c is not None:
            out.append(Judgement(name, c.verdict, c.value, c.limit, c.unit, c.basis, c.note))
    return out


def judge_polarity(ctx: Context) -> list[Judgement]:
    """Polarity confirmed (BS 7671:2018 643.6)."""
    confirmed = ctx.measured.polarity_confirmed
    if confirmed is None:
        return []
    return [Judgement("polarity", PASS if confirmed else FAIL, None, None, "", "BS 7671:2018 643.6, polarity")]


def judge_ze(ctx: Context) -> list[Judgement]:
    """Ze measured against the Ze the design's limits were worked from (no higher, or the design must be redone)."""
    m = ctx.measured
    if m.ze_ohm is None:
        return []
    design = ctx.supply.ze_ohm
    basis = f"the design assumed Ze {design:g} ohm; every limit of this circuit was worked from it (411.4.4)"
    note = "above the design's Ze: check the circuit again with the measured value" if m.ze_ohm > design else None
    return [Judgement("ze", PASS if m.ze_ohm <= design * (1 + 1e-9) else FAIL, m.ze_ohm, design, "ohm", basis, note)]


def judge_fault_level(ctx: Context) -> list[Judgement]:
    """The prospective fault current measured against the device's breaking capacity (or the board's rating)."""
    m = ctx.measured
    if m.prospective_fault_current_ka is None:
        return []
    check = ctx.design.check("breaking-capacity")
    limit = None if check is None else check.limit
    if limit is None:
        note = "the device's breaking capacity is not known: state breaking_capacity_ka"
        return [Judgement("fault-level", NOT_VERIFIED, m.prospective_fault_current_ka, None, "kA", BC_BASIS, note)]
    verdict = PASS if m.prospective_fault_current_ka <= limit * (1 + 1e-9) else FAIL
    return [Judgement("fault-level", verdict, m.prospective_fault_current_ka, limit, "kA", check.basis, check.note)]


BC_BASIS = "BS 7671:2018 434.5.1: the breaking capacity at least the prospective fault current measured"
RING_TOLERANCE_OHM = 0.05  # common practice


def judge_ring(ctx: Context) -> list[Judgement]:
    """Ring continuity from the end-to-end readings (643.2.1; tolerances common practice)."""
    m, c = ctx.measured, ctx.circuit.conductors
    readings = (m.ring_r1_ohm, m.ring_rn_ohm, m.ring_r2_ohm)
    if all(r is None for r in readings):
        return []
    if c is None or not c.ring:
        raise InvalidInput(("measured", "ring_r1_ohm"), "ring continuity readings are for a ring final circuit")
    out = []
    tol = RING_TOLERANCE_OHM
    if m.ring_r1_ohm is not None and m.ring_rn_ohm is not None:
        basis = f"643.2.1: the end-to-end line and neutral readings within {tol:g} ohm of each other (common practice)"
        verdict = PASS if abs(m.ring_r1_ohm - m.ring_rn_ohm) <= tol + 1e-12 else FAIL
        out.append(Judgement("ring-r1-rn", verdict, m.ring_rn_ohm, m.ring_r1_ohm, "ohm", basis))
    if m.ring_r1_ohm is not None and m.ring_r2_ohm is not None:
        expected = m.ring_r1_ohm * c.line_csa_mm2 / c.cpc_csa_mm2
        basis = (
            f"643.2.1: r2 about r1 x {c.line_csa_mm2:g}/{c.cpc_csa_mm2:g} = {expected:.3f} ohm, within {tol:g} ohm "
            "(common practice)"
        )
        verdict = PASS if abs(m.ring_r2_ohm - expected) <= tol + 1e-12 else FAIL
        out.append(Judgement("ring-r2", verdict, m.ring_r2_ohm, expected, "ohm", basis))
    if m.ring_r1_ohm is not None and m.ring_r2_ohm is not None and m.r1_plus_r2_ohm is not None:
        expected = (m.ring_r1_ohm + m.ring_r2_ohm) / 4
        basis = (
            f"643.2.1: R1+R2 at the sockets about (r1 + r2) / 4 = {expected:.3f} ohm, within {tol:g} ohm (common "
            "practice; the highest reading is at the mid-point)"
        )
        verdict = PASS if abs(m.r1_plus_r2_ohm - expected) <= tol + 1e-12 else FAIL
        out.append(Judgement("ring-r1-plus-r2", verdict, m.r1_plus_r2_ohm, expected, "ohm", basis))
    return out


def judge_rcd_half(ctx: Context) -> list[Judgement]:
    """At half its IΔn an RCD must not trip (BS EN 61008-1 / 61009-1, from memory)."""
    tripped = ctx.measured.rcd_tripped_at_half_idn
    if tripped is None:
        return []
    if ctx.circuit.device.rcd is None:
        raise InvalidInput(("measured", "rcd_tripped_at_half_idn"), "the circuit has no RCD")
    basis = "BS EN 61008-1 / 61009-1: no tripping at 0.5 x IΔn (from memory)"
    return [Judgement("rcd-half-idn", FAIL if tripped else PASS, None, None, "", basis)]


JUDGES = (
    judge_ze,
    judge_fault_level,
    judge_zs,
    judge_zs_continuity,
    judge_r1_plus_r2,
    judge_ring,
    judge_insulation,
    judge_rcd_times,
    judge_rcd_half,
    judge_polarity,
)
CAUTION_TABLE_64 = "The insulation resistance minimum is from memory (BS 7671 Table 64, unverified)."


def _judge(design: CircuitResult, supply: Supply, circuit: Circuit, m: Measured) -> VerificationResult:
    insulation = circuit.conductors.insulation if circuit.conductors is not None else "thermoplastic-70"
    theta_op = operating_temperature_c(insulation)
    ratio = temperature_multiplier(m.temperature_c) / temperature_multiplier(theta_op)
    ctx = Context(design, supply, circuit, m, theta_op, ratio, design.check("max-zs").limit)
    out = [judgement for judge in JUDGES for judgement in judge(ctx)]
    if not out:
        raise InvalidInput("measured", "give at least one measured value")
    out += judge_rcd_requirement(ctx)
    cautions = list(design.cautions[:3])
    if m.insulation_resistance_megohm is not None:
        cautions.append(CAUTION_TABLE_64)
    verdict = overall(j.verdict for j in out)
    ohm = precision.rule_for_unit("ohm")
    return VerificationResult(
        circuit.id,
        _round(ctx.max_zs_ohm, ohm),
        _round(design.r1_plus_r2_ohm, ohm),
        theta_op,
        [_rounded(j) for j in out],
        verdict,
        cautions,
    )


def _round(value: float | None, rule) -> float | None:
    return None if value is None else float(precision.rounded(value, rule))


def _rounded(j: Judgement) -> Judgement:
    """A judgement's numbers to the precision of its unit (DESIGN.md conventions)."""
    rule = precision.rule_for_unit(j.unit)
    return dataclasses.replace(
        j,
        measured=_round(j.measured, rule),
        limit=_round(j.limit, rule),
        rule_of_thumb_limit=_round(j.rule_of_thumb_limit, rule),
        corrected_value=_round(j.corrected_value, rule),
    )


def verify(supply: Supply, items: list[tuple[Circuit, Measured]]) -> list[VerificationResult | CircuitFailure]:
    """Judge each circuit's measurements; the design limits come from the same whole check (array path)."""
    designs = check_circuits(supply, [c for c, _ in items], exact=True)
    out: list[VerificationResult | CircuitFailure] = []
    for index, ((circuit, measured), design) in enumerate(zip(items, designs, strict=True)):
        if isinstance(design, CircuitFailure):
            out.append(design)
            continue
        try:
            out.append(_judge(design, supply, circuit, measured))
        except InvalidInput as err:
            out.append(CircuitFailure(index, circuit.id, err.path, err.message, type(err)))
    return out
