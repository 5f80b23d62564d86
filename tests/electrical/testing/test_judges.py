"""The judges: each says its rule in words; a yes/no test answers yes or no (BS 7671:2018 643.6; BS EN 61008-1)."""

from service.electrical.testing.judges import insulation_row, judge_yes_no, rcd_times_ms


def test_a_yes_no_test_says_what_was_found_and_what_the_rule_asks():
    # polarity must be confirmed (643.6): found yes, asked yes
    (ok,) = judge_yes_no("polarity", True, True, "polarity confirmed correct", "643.6")
    assert (ok.verdict, ok.answer, ok.required, ok.measured, ok.limit) == ("pass", "yes", "yes", None, None)
    # an RCD must not trip at half its IΔn (BS EN 61008-1, from memory): it tripped
    (bad,) = judge_yes_no("rcd-half-idn", True, False, "the RCD trips at half its IΔn (it must not)", "61008-1")
    assert (bad.verdict, bad.answer, bad.required) == ("fail", "yes", "no")
    assert judge_yes_no("polarity", None, True, "", "") == []  # not tested: nothing said


def test_rcd_times_and_insulation_rows():
    # BS EN 61008-1 / 61009-1 Table 1: general 300 ms at IΔn, 40 ms at 5 IΔn; S 130 to 500 ms at IΔn (from memory)
    assert rcd_times_ms("general", 0) == (300, None, 1) and rcd_times_ms("general", 2)[0] == 40
    assert rcd_times_ms("S", 0) == (500, 130, 1)
    # BS 7671:2018 Table 64 (from memory): up to 500 V, 500 V d.c. and at least 1 megohm
    assert (insulation_row("up-to-500v")["test_voltage_v"], insulation_row("up-to-500v")["minimum_megohm"]) == (
        500,
        1.0,
    )
