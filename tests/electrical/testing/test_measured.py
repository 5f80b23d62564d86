"""The shapes of a verification, declared once: the contract's schemas come from them (service.contract.shapes)."""

import dataclasses

from service.electrical.testing.measured import Judgement, Measured, VerificationResult


def test_a_judgement_says_its_rule_and_a_yes_no_answer():
    names = [f.name for f in dataclasses.fields(Judgement)]
    assert names[:3] == ["test", "verdict", "rule"] and {"answer", "required"} <= set(names)
    described = {f.name for f in dataclasses.fields(Judgement) if f.metadata.get("description")}
    assert {"rule", "measured", "limit", "answer"} <= described


def test_a_result_counts_its_verdicts_and_nothing_measured_is_the_default():
    assert "counts" in {f.name for f in dataclasses.fields(VerificationResult)}
    nothing = Measured()
    assert nothing.temperature_c == 20.0 and nothing.zs_ohm is None and nothing.circuit_voltage == "up-to-500v"
