"""One judge per test: each reads the measurements and the design and says its rule in words.

- Zs measured with the conductors at ``temperature_c``: the design maximum Zs scaled by the ratio of
  resistances (1 + 0.004 (theta_m - 20)) / (1 + 0.004 (theta_op - 20)), and the common 0.8 rule beside it
  (BS 7671 Appendix 3 approach; the verdict rests on the scaled limit).
- R1+R2 measured: corrected to the operating temperature and added to Ze, against the maximum Zs.
- Insulation resistance: at least the minimum for the circuit voltage at its test voltage (Table 64, from memory).
- RCD: operating time at IΔn and at 5 IΔn within the device's limits (BS EN 61008-1 / 61009-1 Table 1); at half
  IΔn it must not trip (from memory).
- Polarity: confirmed (643.6), a yes/no test.
- Ze measured against the Ze the design assumed; the prospective fault current measured against the device's
  breaking capacity (434.5.1, or the board's conditional rating).
- Ring continuity (643.2.1, common practice): the end-to-end r1 and rn within 0.05 ohm of each other, r2 within
  0.05 ohm of r1 times the line/cpc size ratio, and (r1 + r2) / 4 within 0.05 ohm of the R1+R2 measured: each
  judged on the difference, against the 0.05 ohm the rule allows.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from service.electrical.cables.conductors import operating_temperature_c
from service.electrical.datafiles import core_table, device_table
from service.electrical.devices import residual
from service.electrical.devices.limits import measured_limit_ohm
from service.electrical.errors import InvalidInput
from service.electrical.inputs import Circuit, Supply
from service.electrical.results.circuit_result import CircuitResult
from service.electrical.results.verdicts import Verdict
from service.electrical.testing.measured import CIRCUIT_VOLTAGES, Judgement, Measured

PASS, FAIL, NOT_VERIFIED = Verdict.PASS, Verdict.FAIL, Verdict.NOT_VERIFIED


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
ASSUMED_INSULATION = "thermoplastic-70"  # a circuit given only its R1+R2: the operating temperature taken for it


def operating_c(circuit: Circuit) -> float:
    """The conductors' operating temperature the design's limits were worked at, degC (BS 7671 Table 41 notes)."""
    return float(operating_temperature_c(circuit.conductors.insulation if circuit.conductors else ASSUMED_INSULATION))


def largest_zs_at(design: CircuitResult, circuit: Circuit, temperature_c: float) -> float | None:
    """The largest Zs a tester may read with the conductors at ``temperature_c``: the limit the design's max-zs check
    applied, scaled by the ratio of resistances (BS 7671 Appendix 3 approach); None where the design has none."""
    check = design.check("max-zs")
    if check is None or check.limit is None:
        return None
    return float(measured_limit_ohm(check.limit, operating_c(circuit), temperature_c)[0])


STABLE_NOTE = "Above 200 ohm a loop reading may not be stable (note to BS 7671:2018 Table 41.5)."
CONTINUITY_FACTOR = 1.5  # common practice: a TN loop reading this far above the design's points to the cpc path


def judge_zs(ctx: Context) -> list[Judgement]:
    """Zs measured cold against the design maximum scaled by the ratio of resistances, the 0.8 rule beside it."""
    m = ctx.measured
    if m.zs_ohm is None:
        return []
    if ctx.max_zs_ohm is None:
        return [Judgement("zs", NOT_VERIFIED, "Zs at most the design's maximum", m.zs_ohm, None, "ohm", NO_MAX_ZS)]
    limit, rule = measured_limit_ohm(ctx.max_zs_ohm, ctx.operating_c, m.temperature_c)
    basis = (
        f"design maximum Zs {ctx.max_zs_ohm:.3f} ohm scaled by {ctx.ratio:.3f} for conductors at {m.temperature_c:g} "
        f"degC instead of {ctx.operating_c:g} degC; the 0.8 rule (common practice) shown beside it"
    )
    said = f"Zs measured at {m.temperature_c:g} degC at most {limit:.3f} ohm"
    note = STABLE_NOTE if m.zs_ohm > residual.stable_resistance_limit_ohm() else None
    verdict = PASS if m.zs_ohm <= limit else FAIL
    return [Judgement("zs", verdict, said, m.zs_ohm, limit, "ohm", basis, note, rule_of_thumb_limit=rule)]


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
    said = f"Zs at most {CONTINUITY_FACTOR:g} x the {expected:.3f} ohm the design's conductors give"
    verdict = PASS if m.zs_ohm <= limit else FAIL
    return [Judgement("zs-continuity", verdict, said, m.zs_ohm, limit, "ohm", basis, note)]


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
    said = "Ze + R1+R2 (corrected to operating temperature) at most the design's maximum Zs"
    if ctx.max_zs_ohm is None:
        return [
            Judgement("r1-plus-r2", NOT_VERIFIED, said, m.r1_plus_r2_ohm, None, "ohm", NO_MAX_ZS, note,
                      corrected_value=corrected)
        ]  # fmt: skip
    room = ctx.max_zs_ohm - ze  # what the loop leaves for R1+R2 at operating temperature
    limit, rule = measured_limit_ohm(room, ctx.operating_c, m.temperature_c)
    basis = (
        f"corrected to {ctx.operating_c:g} degC ({corrected:.3f} ohm) and added to Ze {ze:g} ohm, against the "
        f"maximum Zs {ctx.max_zs_ohm:.3f} ohm; the limit shown is for the value as measured at {m.temperature_c:g} degC"
    )
    verdict = PASS if ze + corrected <= ctx.max_zs_ohm else FAIL
    return [
        Judgement("r1-plus-r2", verdict, said, m.r1_plus_r2_ohm, limit, "ohm", basis, note,
                  rule_of_thumb_limit=rule, corrected_value=corrected)
    ]  # fmt: skip


def insulation_row(circuit_voltage: str) -> dict[str, Any]:
    """The Table 64 row (from memory) of a circuit voltage: its test voltage and minimum resistance."""
    for row in core_table("insulation_resistance")["rows"]:
        if row["circuit"] == circuit_voltage:
            return row
    raise InvalidInput(("measured", "circuit_voltage"), f"circuit_voltage is one of {list(CIRCUIT_VOLTAGES)}")


def judge_insulation(ctx: Context) -> list[Judgement]:
    """Insulation resistance at least the minimum for the circuit voltage, at its test voltage (Table 64, M)."""
    m = ctx.measured
    if m.insulation_resistance_megohm is None:
        return []
    row = insulation_row(m.circuit_voltage)
    least = row["minimum_megohm"]
    basis = (
        f"{core_table('insulation_resistance')['source']}: {row['description']}, at least {least:g} megohm "
        f"at {row['test_voltage_v']} V d.c. (from memory)"
    )
    said = f"at least {least:g} megohm at {row['test_voltage_v']} V d.c."
    if m.insulation_test_voltage_v is not None and m.insulation_test_voltage_v != row["test_voltage_v"]:
        note = f"tested at {m.insulation_test_voltage_v:g} V; the table asks for {row['test_voltage_v']} V"
        return [
            Judgement("insulation-resistance", NOT_VERIFIED, said, m.insulation_resistance_megohm, least, "megohm",
                      basis, note)
        ]  # fmt: skip
    verdict = PASS if m.insulation_resistance_megohm >= least else FAIL
    return [Judgement("insulation-resistance", verdict, said, m.insulation_resistance_megohm, least, "megohm", basis)]


RCD_TESTS = (("rcd-time-idn", "rcd_time_ms_at_idn", 0), ("rcd-time-5idn", "rcd_time_ms_at_5idn", 2))


def rcd_times_ms(delay: str, index: int) -> tuple[float, float | None, float]:
    """At the ``index``-th multiple of IΔn of BS EN 61008-1 / 61009-1 Table 1: the longest and the shortest time
    (ms, None: no shortest) and the multiple."""
    row = device_table("residual")["delays"][delay]
    least = row["min_time_s"][index]
    return row["max_time_s"][index] * 1000, None if least is None else least * 1000, row["multiples"][index]


def judge_rcd_times(ctx: Context) -> list[Judgement]:
    """RCD operating times at IΔn and 5 IΔn within the device's limits (BS EN 61008-1 / 61009-1 Table 1)."""
    rcd, out = ctx.circuit.device.rcd, []
    for test, name, index in RCD_TESTS:
        value = getattr(ctx.measured, name)
        if value is None:
            continue
        if rcd is None:
            raise InvalidInput(("measured", name), "the circuit has no RCD")
        limit_ms, least_ms, multiple = rcd_times_ms(rcd.delay, index)
        ok = value <= limit_ms and (least_ms is None or value >= least_ms)
        said = f"operates at {multiple} x IΔn within {limit_ms:g} ms"
        basis = f"BS EN 61008-1 / 61009-1 Table 1: {rcd.delay} RCD at {multiple} x IΔn, at most {limit_ms:g} ms"
        if least_ms is not None:
            said += f" and not before {least_ms:g} ms"
            basis += f" and at least {least_ms:g} ms"
        out.append(Judgement(test, PASS if ok else FAIL, said, value, limit_ms, "ms", basis))
    return out


def judge_yes_no(test: str, found: bool | None, required: bool, said: str, basis: str) -> list[Judgement]:
    """A test whose answer is yes or no: passed where the answer is the one the rule asks."""
    if found is None:
        return []
    words = {True: "yes", False: "no"}
    verdict = PASS if found == required else FAIL
    return [Judgement(test, verdict, said, None, None, "", basis, answer=words[found], required=words[required])]


def judge_polarity(ctx: Context) -> list[Judgement]:
    """Polarity confirmed (BS 7671:2018 643.6)."""
    basis = "BS 7671:2018 643.6, polarity"
    return judge_yes_no("polarity", ctx.measured.polarity_confirmed, True, "polarity confirmed correct", basis)


def judge_rcd_half(ctx: Context) -> list[Judgement]:
    """At half its IΔn an RCD must not trip (BS EN 61008-1 / 61009-1, from memory)."""
    tripped = ctx.measured.rcd_tripped_at_half_idn
    if tripped is not None and ctx.circuit.device.rcd is None:
        raise InvalidInput(("measured", "rcd_tripped_at_half_idn"), "the circuit has no RCD")
    basis = "BS EN 61008-1 / 61009-1: no tripping at 0.5 x IΔn (from memory)"
    return judge_yes_no("rcd-half-idn", tripped, False, "the RCD trips at half its IΔn (it must not)", basis)


def judge_ze(ctx: Context) -> list[Judgement]:
    """Ze measured against the Ze the design's limits were worked from (no higher, or the design must be redone)."""
    m = ctx.measured
    if m.ze_ohm is None:
        return []
    design = ctx.supply.ze_ohm
    basis = f"the design assumed Ze {design:g} ohm; every limit of this circuit was worked from it (411.4.4)"
    note = "above the design's Ze: check the circuit again with the measured value" if m.ze_ohm > design else None
    verdict = PASS if m.ze_ohm <= design * (1 + 1e-9) else FAIL
    return [Judgement("ze", verdict, f"Ze at most the {design:g} ohm the design assumed", m.ze_ohm, design, "ohm",
                      basis, note)]  # fmt: skip


BC_BASIS = "BS 7671:2018 434.5.1: the breaking capacity at least the prospective fault current measured"


def judge_fault_level(ctx: Context) -> list[Judgement]:
    """The prospective fault current measured against the device's breaking capacity (or the board's rating)."""
    m = ctx.measured
    if m.prospective_fault_current_ka is None:
        return []
    check = ctx.design.check("breaking-capacity")
    limit = None if check is None else check.limit
    said = "the prospective fault current at most the device's breaking capacity"
    if limit is None:
        note = "the device's breaking capacity is not known: state breaking_capacity_ka"
        return [
            Judgement("fault-level", NOT_VERIFIED, said, m.prospective_fault_current_ka, None, "kA", BC_BASIS, note)
        ]
    verdict = PASS if m.prospective_fault_current_ka <= limit * (1 + 1e-9) else FAIL
    return [
        Judgement("fault-level", verdict, said, m.prospective_fault_current_ka, limit, "kA", check.basis, check.note)
    ]
