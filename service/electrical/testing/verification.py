"""Measured test results judged against the limits of the circuit they were taken on (the judges:
:mod:`service.electrical.testing.judges` and :mod:`service.electrical.testing.ring`)."""

from __future__ import annotations

import dataclasses
from collections import Counter
from collections.abc import Sequence

from service.electrical.cables.conductors import temperature_multiplier
from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.errors import InvalidInput
from service.electrical.inputs import Circuit, Supply
from service.electrical.pipeline import check_circuits
from service.electrical.results import precision
from service.electrical.results.circuit_result import CircuitResult
from service.electrical.results.verdicts import COUNTED, overall
from service.electrical.testing import judges
from service.electrical.testing.judges import Context
from service.electrical.testing.measured import CIRCUIT_VOLTAGES, Judgement, Measured, VerificationResult
from service.electrical.testing.ring import judge_ring

__all__ = ["CIRCUIT_VOLTAGES", "Measured", "verify"]

JUDGES = (
    judges.judge_ze,
    judges.judge_fault_level,
    judges.judge_zs,
    judges.judge_zs_continuity,
    judges.judge_r1_plus_r2,
    lambda ctx: judge_ring(ctx.measured, ctx.circuit.conductors),
    judges.judge_insulation,
    judges.judge_rcd_times,
    judges.judge_rcd_half,
    judges.judge_polarity,
)
RCD_RULES = {
    "additional-protection": "a 30 mA RCD where the rules call for one",
    "rcd-type": "an RCD of a type that suits the load",
}
RCD_REQUIREMENTS = tuple(RCD_RULES)
CAUTION_TABLE_64 = "The insulation resistance minimum is from memory (BS 7671 Table 64, unverified)."


def judge_rcd_requirement(ctx: Context) -> list[Judgement]:
    """Whether the circuit has the RCD the rules call for (a 30 mA RCD where required, of a suitable type): the
    design's own checks of those rules (additional-protection, rcd-type), the same whatever was measured."""
    out = []
    for name in RCD_REQUIREMENTS:
        c = ctx.design.check(name)
        if c is not None:
            said = (
                "a 30 mA RCD where the rules call for one"
                if name == "additional-protection"
                else "an RCD of a type that suits the load"
            )
            out.append(Judgement(name, c.verdict, said, c.value, c.limit, c.unit, c.basis, c.note))
    return out


def _judge(design: CircuitResult, supply: Supply, circuit: Circuit, m: Measured) -> VerificationResult:
    theta_op = judges.operating_c(circuit)
    ratio = temperature_multiplier(m.temperature_c) / temperature_multiplier(theta_op)
    ctx = Context(design, supply, circuit, m, theta_op, ratio, design.check("max-zs").limit)
    out = [judgement for judge in JUDGES for judgement in judge(ctx)]
    if not out:
        raise InvalidInput("measured", "give at least one measured value")
    out += judge_rcd_requirement(ctx)
    cautions = list(design.cautions[:3])
    if m.insulation_resistance_megohm is not None:
        cautions.append(CAUTION_TABLE_64)
    counts = Counter(j.verdict for j in out)
    ohm = precision.rule_for_unit("ohm")
    return VerificationResult(
        id=circuit.id,
        design_max_zs_ohm=_round(ctx.max_zs_ohm, ohm),
        design_r1_plus_r2_ohm=_round(design.r1_plus_r2_ohm, ohm),
        operating_temperature_c=theta_op,
        judgements=[_rounded(j) for j in out],
        counts={str(v): counts.get(v, 0) for v in COUNTED},
        verdict=overall(j.verdict for j in out),
        cautions=cautions,
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


def verify(
    supply: Supply | Sequence[Supply], items: list[tuple[Circuit, Measured]]
) -> list[VerificationResult | CircuitFailure]:
    """Judge each circuit's measurements; the design limits come from the same whole check (array path).
    ``supply``: one for every circuit, or one each (a test sheet's circuits on several boards)."""
    supplies = [supply] * len(items) if isinstance(supply, Supply) else list(supply)
    designs = check_circuits(supplies, [c for c, _ in items], exact=True)
    out: list[VerificationResult | CircuitFailure] = []
    for index, ((circuit, measured), design, on) in enumerate(zip(items, designs, supplies, strict=True)):
        if isinstance(design, CircuitFailure):
            out.append(design)
            continue
        try:
            out.append(_judge(design, on, circuit, measured))
        except InvalidInput as err:
            out.append(CircuitFailure(index, circuit.id, err.path, err.message, type(err)))
    return out
