"""What a tester measures on site, and the shapes of the answer: each judgement says its rule in words, a yes/no
test as yes or no, and a result counts its verdicts (declared once: :mod:`service.electrical.results.shapes`)."""

from __future__ import annotations

from dataclasses import dataclass

from service.electrical.results.shapes import figure
from service.electrical.results.verdicts import VERDICTS

CIRCUIT_VOLTAGES = ("selv-pelv", "up-to-500v", "above-500v")
ANSWERS = ("yes", "no")


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
    """One test of one circuit judged against its rule."""

    test: str = figure("the test's name", nullable=False)
    verdict: str = figure(nullable=False, choices=VERDICTS)
    rule: str = figure("the rule in words, with the figures it was applied with", nullable=False)
    measured: float | None = figure("the value as measured (a difference where the rule is one), in unit")
    limit: float | None = figure("what the rule allows for the value as measured, in unit; null for a yes/no test")
    unit: str = figure("of measured and limit", nullable=False)
    basis: str = figure("the clause or practice the rule rests on", nullable=False)
    note: str | None = figure("why the verdict is what it is, where it is not plain", default=None)
    rule_of_thumb_limit: float | None = figure("the 0.8 rule, beside the temperature-corrected limit", default=None)
    corrected_value: float | None = figure("the measured value corrected to operating temperature", default=None)
    answer: str | None = figure("a yes/no test: what was found", choices=ANSWERS, default=None)
    required: str | None = figure("a yes/no test: what the rule asks", choices=ANSWERS, default=None)


@dataclass
class VerificationResult:
    """One circuit's measured results judged against its design's limits."""

    id: str | None = figure("the circuit's id, as given")
    design_max_zs_ohm: float | None = figure("the largest Zs at operating temperature the design allows")
    design_r1_plus_r2_ohm: float | None = figure("the design's R1+R2 at operating temperature")
    operating_temperature_c: float = figure("the conductors' operating temperature the design assumed", nullable=False)
    judgements: list[Judgement] = figure(nullable=False)
    counts: dict[str, int] = figure("how many judgements came to each verdict", nullable=False)
    verdict: str = figure(
        "fail if a judgement fails, else not-verified if one could not be made, else pass",
        nullable=False,
        choices=VERDICTS,
    )
    cautions: list[str] = figure(nullable=False, default_factory=list)
