"""The precision results carry (DESIGN.md: ohms to 4 decimals, currents to 0.1 A, times to 3 significant figures,
margins to 0.1 %): no float noise reaches a client."""

import numpy as np

from service.electrical.results import precision


def test_rules_by_unit_in_the_name():
    assert precision.rule_for("zs_ohm") == ("decimals", 4)
    assert precision.rule_for("earth_fault_current_a") == ("decimals", 1)
    assert precision.rule_for("prospective_fault_current_ka") == ("decimals", 3)
    assert precision.rule_for("disconnection_time_s") == ("significant", 3)
    assert precision.rule_for("zs_margin_percent") == ("decimals", 1)
    assert precision.rule_for("k_formula") == ("decimals", 1)
    assert precision.rule_for("energy_basis") is None


def test_rounding_removes_the_noise():
    assert precision.rounded([75.00000000000001], ("decimals", 1)).tolist() == [75.0]
    assert precision.rounded([114.83612782557213], precision.rule_for("k_formula")).tolist() == [114.8]
    assert precision.rounded([0.87561234, 1234.567, 0.0], ("significant", 3)).tolist() == [0.876, 1230.0, 0.0]
    out = precision.rounded([np.nan, np.inf], ("decimals", 2))
    assert np.isnan(out[0]) and np.isinf(out[1])


def test_the_contract_sentence_names_every_rule():
    sentence = precision.summary()
    assert "ohms to 4 decimals" in sentence and "times to 3 significant figures" in sentence
    assert "currents (A) to 1 decimal;" in sentence and sentence.count(" to ") == len(precision.RULES)
