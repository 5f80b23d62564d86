"""Verdicts and their codes: the worse verdict has the larger code."""

import numpy as np

from service.electrical.results import verdicts
from service.electrical.results.verdicts import Verdict


def test_codes_order_the_verdicts():
    assert verdicts.VERDICTS == (Verdict.PASS, Verdict.NOT_VERIFIED, Verdict.FAIL)
    assert verdicts.PASS < verdicts.NOT_VERIFIED < verdicts.FAIL


def test_overall_is_the_worst():
    assert verdicts.overall(["pass", "not-verified"]) == "not-verified"
    assert verdicts.overall(["not-verified", "fail", "pass"]) == "fail"
    assert verdicts.overall([]) == "pass"


def test_decode_and_where():
    codes = verdicts.where(np.array([True, False]), verdicts.PASS, verdicts.FAIL)
    assert codes.dtype == np.int8 and verdicts.decode(codes) == ["pass", "fail"]
    assert Verdict.NOT_VERIFIED == "not-verified"  # a StrEnum: equal to its text


def test_a_summary_counts_each_verdict_and_the_rest_as_invalid():
    counted = {Verdict.PASS: 3, "fail": 1}  # enum members and their words count alike
    assert verdicts.summary(counted, 6) == {"circuits": 6, "pass": 3, "fail": 1, "not-verified": 0, "invalid": 2}
    assert list(verdicts.summary({}, 0)) == ["circuits", "pass", "fail", "not-verified", "invalid"]
