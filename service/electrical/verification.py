"""Measured test results judged against the limits of the circuit they were taken on.

- Zs measured with the conductors at ``temperature_c``: the design maximum Zs scaled by the ratio of
  resistances (1 + 0.004 (theta_m - 20)) / (1 + 0.004 (theta_op - 20)), and the common 0.8 rule beside it
  (BS 7671 Appendix 3 approach; the verdict rests on the scaled limit).
- R1+R2 measured: corrected to the operating temperature and added to Ze, against the maximum Zs.
- Insulation resistance: at least the minimum for the circuit voltage at its test voltage (Table 64, from memory).
- RCD: operating time at IΔn and at 5 IΔn within the device's limits (BS EN 61008-1 / 61009-1 Table 1).
- Polarity: confirmed.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from .circuit import check_circuits
from .columns import CircuitFailure
from .conductors import operating_temperature_c, temperature_multiplier
from .datafiles import core_table, device_table
from .errors import InvalidInput
from .limits import measured_limit_ohm
from .model import Circuit, Supply
from .results import CircuitResult
from .verdicts import Verdict, overall

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


def _insulation_row(circuit_voltage: str) -> dict[str, Any]:
    for row in core_table("insulation_resistance")["rows"]:
        if row["circuit"] == circuit_voltage:
            return row
    raise InvalidInput(("measured", "circuit_voltage"), f"circuit_voltage is one of {list(CIRCUIT_VOLTAGES)}")


def _judge(design: CircuitResult, supply: Supply, circuit: Circuit, m: Measured) -> VerificationResult:
    insulation = circuit.conductors.insulation if circuit.conductors is not None else "thermoplastic-70"
    theta_op = operating_temperature_c(insulation)
    ratio = temperature_multiplier(m.temperature_c) / temperature_multiplier(theta_op)
    max_zs = design.check("max-zs").limit  # the limit the design's max-zs check applied (the RCD's where it protects)
    out: list[Judgement] = []
    cautions = list(design.cautions[:3])
    if m.zs_ohm is not None:
        if max_zs is None:
            out.append(Judgement("zs", NOT_VERIFIED, m.zs_ohm, None, "ohm", "no maximum Zs follows from the design data"))
        else:
            limit, rule = measured_limit_ohm(max_zs, theta_op, m.temperature_c)
            out.append(Judgement(
                "zs", PASS if m.zs_ohm <= limit else FAIL, m.zs_ohm, limit, "ohm",
                f"design maximum Zs {max_zs:.3f} ohm scaled by {ratio:.3f} for conductors at {m.temperature_c:g} degC "
                f"instead of {theta_op:g} degC; the 0.8 rule (common practice) shown beside it",
                rule_of_thumb_limit=rule,
            ))
    if m.r1_plus_r2_ohm is not None:
        corrected = m.r1_plus_r2_ohm / ratio
        zs = supply.ze_ohm + corrected
        note = None
        if design.r1_plus_r2_ohm:
            note = f"{(corrected / design.r1_plus_r2_ohm - 1) * 100:+.1f} % against the design R1+R2 at operating temperature"
        if max_zs is None:
            out.append(Judgement("r1-plus-r2", NOT_VERIFIED, m.r1_plus_r2_ohm, None, "ohm", "no maximum Zs follows from the design data", note, None, corrected))
        else:
            room = max_zs - supply.ze_ohm  # what the loop leaves for R1+R2 at operating temperature
            limit, rule = measured_limit_ohm(room, theta_op, m.temperature_c)
            out.append(Judgement(
                "r1-plus-r2", PASS if zs <= max_zs else FAIL, m.r1_plus_r2_ohm, limit, "ohm",
                f"corrected to {theta_op:g} degC ({corrected:.3f} ohm) and added to Ze {supply.ze_ohm:g} ohm, against the "
                f"maximum Zs {max_zs:.3f} ohm; the limit shown is for the value as measured at {m.temperature_c:g} degC",
                note, rule, corrected,
            ))
    if m.insulation_resistance_megohm is not None:
        row = _insulation_row(m.circuit_voltage)
        basis = f"{core_table('insulation_resistance')['source']}: {row['description']}, at least {row['minimum_megohm']:g} megohm at {row['test_voltage_v']} V d.c. (from memory)"
        if m.insulation_test_voltage_v is not None and m.insulation_test_voltage_v != row["test_voltage_v"]:
            out.append(Judgement("insulation-resistance", NOT_VERIFIED, m.insulation_resistance_megohm, row["minimum_megohm"], "megohm", basis,
                                 f"tested at {m.insulation_test_voltage_v:g} V; the table asks for {row['test_voltage_v']} V"))
        else:
            verdict = PASS if m.insulation_resistance_megohm >= row["minimum_megohm"] else FAIL
            out.append(Judgement("insulation-resistance", verdict, m.insulation_resistance_megohm, row["minimum_megohm"], "megohm", basis))
        cautions.append("The insulation resistance minimum is from memory (BS 7671 Table 64, unverified).")
    rcd = circuit.device.rcd
    for test, value, index in (("rcd-time-idn", m.rcd_time_ms_at_idn, 0), ("rcd-time-5idn", m.rcd_time_ms_at_5idn, 2)):
        if value is None:
            continue
        if rcd is None:
            raise InvalidInput(("measured", "rcd_time_ms_at_idn" if index == 0 else "rcd_time_ms_at_5idn"), "the circuit has no RCD")
        row = device_table("residual")["delays"][rcd.delay]
        limit_ms = row["max_time_s"][index] * 1000
        least = row["min_time_s"][index]
        ok = value <= limit_ms and (least is None or value >= least * 1000)
        basis = f"BS EN 61008-1 / 61009-1 Table 1: {rcd.delay} RCD at {row['multiples'][index]} x IΔn, at most {limit_ms:g} ms"
        if least is not None:
            basis += f" and at least {least * 1000:g} ms"
        out.append(Judgement(test, PASS if ok else FAIL, value, limit_ms, "ms", basis))
    if m.polarity_confirmed is not None:
        out.append(Judgement("polarity", PASS if m.polarity_confirmed else FAIL, None, None, "", "BS 7671:2018 643.6, polarity"))
    if not out:
        raise InvalidInput("measured", "give at least one measured value")
    return VerificationResult(circuit.id, max_zs, design.r1_plus_r2_ohm, theta_op, out, overall(j.verdict for j in out), cautions)


def verify(supply: Supply, items: list[tuple[Circuit, Measured]]) -> list[VerificationResult | CircuitFailure]:
    """Judge each circuit's measurements; the design limits come from the same whole check (array path)."""
    designs = check_circuits(supply, [c for c, _ in items])
    out: list[VerificationResult | CircuitFailure] = []
    for index, ((circuit, measured), design) in enumerate(zip(items, designs)):
        if isinstance(design, CircuitFailure):
            out.append(design)
            continue
        try:
            out.append(_judge(design, supply, circuit, measured))
        except InvalidInput as err:
            out.append(CircuitFailure(index, circuit.id, err.path, err.message, type(err)))
    return out
