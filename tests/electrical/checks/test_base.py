"""What every check step returns, and its helpers."""

import numpy as np

from service.electrical.checks import CHECKS, STEPS
from service.electrical.checks.base import CheckColumns, margin_percent, pick
from service.electrical.results import verdicts


def test_margin_is_the_share_of_the_limit_to_spare():
    m = margin_percent([0.5, 2.0, np.nan, 1.0], [2.0, 1.0, 1.0, 0.0])
    assert m[:2].tolist() == [75.0, -100.0] and np.isnan(m[2:]).all()


def test_pick_takes_the_first_condition_that_holds():
    out = pick([np.array([True, False, False]), np.array([True, True, False])], ["a", "b"])
    assert out.tolist() == ["a", "b", None]


def test_a_check_fills_its_margin_from_value_and_limit():
    c = CheckColumns(
        "x", "ohm", verdicts.codes([0]), np.array([1.0]), np.array([4.0]), np.array(["basis"]), np.array([None])
    )
    assert c.margin_percent.tolist() == [75.0]


def test_every_step_is_named_once_in_results_order():
    assert CHECKS == (
        "disconnection-time",
        "max-zs",
        "short-circuit",
        "protective-conductor",
        "breaking-capacity",
        "overload",
        "voltage-drop",
        "rcd",
        "additional-protection",
        "rcd-type",
        "arc-fault-detection",
        "ev-earthing",
        "selectivity",
    )
    assert len(set(CHECKS)) == len(STEPS)
