"""A board's demand per phase and its loops and fault currents carried down from the origin.

Hand calculations here; the rules: BS 7671:2018 411.4.4 (Ze at a board: the upstream Ze plus the sub-main's
R1+R2), 434.1 (the larger of line-neutral and line-earth), IEC 60909-0 Table 1 (cmax 1.10, Cmin 0.95), as
copied in tests/data/installation-rules.md. Imbalance and neutral current: common practice.
"""

import dataclasses
import math

import numpy as np
import pytest

from service.electrical.inputs import Board, DeviceSpec, Installation, Supply
from service.electrical.network import boards
from service.electrical.network.tree import tree_of
from tests.electrical.pipeline import BAKERY, circuit

THREE = Supply("TN-C-S", 230, 0.2, line_neutral_loop_ohm=0.1, phases=3, three_phase_fault_current_ka=4.6)
FUSE = DeviceSpec(rating_a=63, standard="BS 88-2", type="gG")


def demand_of(*board_list, supply=THREE):
    inst = Installation(supply, tuple(board_list))
    return boards.demands(inst, tree_of(inst))


def test_demand_per_phase_with_diversity_and_an_unallocated_circuit():
    board = Board(
        "MAIN",
        (
            circuit(phases=3, design_current_a=10),
            circuit(phase="L1", design_current_a=6, diversity=0.5),
            circuit(design_current_a=4),  # no phase: on every phase
        ),
        diversity=0.8,
    )
    (demand,), _ = demand_of(board)
    # L1 = (10 + 6 x 0.5 + 4) x 0.8 = 13.6; L2 = L3 = (10 + 4) x 0.8 = 11.2
    assert demand.per_phase_a.tolist() == pytest.approx([13.6, 11.2, 11.2]) and demand.unallocated == 1
    spread, neutral = demand.imbalance()
    # mean 12.0 A, largest deviation 1.6 A: 13.3 %; In = sqrt(sum Ii^2 - sum IiIj) = 13.6 - 11.2 = 2.4 A
    assert spread == pytest.approx(1.6 / 12 * 100) and neutral == pytest.approx(2.4)


def test_an_incomplete_demand_and_a_stated_one():
    (demand,), _ = demand_of(Board("MAIN", (circuit(design_current_a=10), circuit(id="spare way"))))
    assert not demand.complete and demand.missing == ["spare way"] and math.isnan(demand.design_current_a)
    (stated,), _ = demand_of(Board("MAIN", (circuit(id="spare way"),), design_current_a=40))
    assert stated.complete and stated.stated and stated.per_phase_a.tolist() == [40, 40, 40]


def test_a_feed_takes_its_stated_current_and_says_where_the_sum_below_is_larger():
    # BS 7671 311.1: the designer's maximum demand after diversity is the design basis (installation-rules.md,
    # "Stated demand wins"): 15 A stated stands against a 20 A sum, with a caution naming both
    below = Board("SHOP", (circuit(design_current_a=12), circuit(design_current_a=8)), fed_from="MAIN")
    low = circuit(role="distribution", load=None, feeds_board="SHOP", phase="L2", design_current_a=15)
    (main, shop), currents = demand_of(Board("MAIN", (low,)), below)
    assert shop.per_phase_a.tolist() == [20] and currents[(0, 0)][0] == 15
    assert "20 A" in currents[(0, 0)][1] and "15 A" in currents[(0, 0)][1]
    assert main.per_phase_a.tolist() == [0, 15, 0]
    high = dataclasses.replace(low, design_current_a=25)
    _, currents = demand_of(Board("MAIN", (high,)), below)
    assert currents[(0, 0)] == (25, None)


def test_a_three_phase_feed_carries_the_phases_of_the_board_below():
    below = Board("SHOP", (circuit(phase="L1", design_current_a=12), circuit(phase="L3", design_current_a=5)), "MAIN")
    three = circuit(role="distribution", load=None, feeds_board="SHOP", phases=3)
    (main, _), currents = demand_of(Board("MAIN", (three,)), dataclasses.replace(below, fed_from="MAIN"))
    assert currents[(0, 0)][0] == 12 and main.per_phase_a.tolist() == [12, 0, 5]
    # a stated three-phase Ib below the largest phase scales the phases to it (the stated demand wins)
    stated = dataclasses.replace(three, design_current_a=6)
    (main, _), currents = demand_of(Board("MAIN", (stated,)), dataclasses.replace(below, fed_from="MAIN"))
    assert currents[(0, 0)][0] == 6 and main.per_phase_a.tolist() == pytest.approx([6, 0, 2.5])


def test_the_origin_values_follow_the_circuit_rules():
    values = boards.origin_faults(THREE)
    # line-neutral 1.1 x 230 / 0.1 = 2530 A; line-earth 1.1 x 230 / 0.2 = 1265 A; three-phase stated 4.6 kA
    assert values.max_line_neutral_a == pytest.approx(2530) and values.max_earth_fault_a == pytest.approx(1265)
    assert values.three_phase_a == pytest.approx(4600) and values.pfc_a == pytest.approx(4600)
    # smallest: 0.95 x 230 / 0.2 = 1092.5 A, 0.95 x 230 / 0.1 = 2185 A
    assert values.min_earth_fault_a == pytest.approx(1092.5) and values.min_line_neutral_a == pytest.approx(2185)
    assert values.cautions == ()
    # without the line-neutral loop: U0 / the stated PFC, or Ze in TN, stands for it, and the result says so
    assert any("U0 / the stated" in c for c in boards.origin_faults(BAKERY).cautions)
    assert any("taken as Ze" in c for c in boards.origin_faults(Supply("TN-S", 230, 0.35)).cautions)


def test_below_adds_moduli_for_the_smallest_and_squares_for_the_largest():
    feed = boards.FeedLoop(
        r1r2_hot=0.08832, r1rn_hot=0.08832, r1r2_20=0.069, r1rn_20=0.069, r1_20=0.0345, x_loop=math.nan,
        three_phase=True, drop_percent=0.64,
    )  # fmt: skip
    values = boards.below(boards.origin_faults(THREE), feed)
    assert values.ze_ohm == pytest.approx(0.28832) and values.zpn_ohm == pytest.approx(0.18832)
    # largest earth fault: 253 / sqrt(0.2^2 + 0.069^2) = 1195.8 A; line-neutral 253 / sqrt(0.1^2 + 0.069^2) = 2082.4 A
    assert values.max_earth_fault_a == pytest.approx(253 / math.hypot(0.2, 0.069))
    assert values.max_line_neutral_a == pytest.approx(253 / math.hypot(0.1, 0.069))
    # three-phase: the origin's 253 / 4600 = 0.055 ohm with the line conductor's 0.0345 ohm
    assert values.three_phase_a == pytest.approx(253 / math.hypot(0.055, 0.0345))
    assert values.voltage_drop_percent == pytest.approx(0.64)
    single = boards.below(boards.origin_faults(THREE), dataclasses.replace(feed, three_phase=False))
    assert math.isnan(single.three_phase_a) and single.pfc_a == pytest.approx(single.max_line_neutral_a)


def test_a_given_reactance_enters_both_sums():
    feed = boards.FeedLoop(0.01, 0.01, 0.008, 0.008, 0.004, x_loop=0.012, three_phase=True, drop_percent=0.1)
    values = boards.below(boards.origin_faults(THREE), feed)
    assert values.ze_ohm == pytest.approx(0.2 + math.hypot(0.01, 0.012))
    # the least modulus over supply angles of 0 to 90 degrees (installation-rules.md, derived): with X = 0.012 above
    # R = 0.008 it is sqrt((|Zs| + R)^2 + X^2), not the root of the sum of squares of the moduli
    assert values.ze_min_ohm == pytest.approx(math.hypot(0.2 + 0.008, 0.012))
    assert values.z3_min_ohm == pytest.approx(math.hypot(0.055 + 0.004, 0.006))


def test_in_tt_the_line_earth_value_is_not_a_fault_level():
    kiosk = Supply("TT", 230, 21, electrode_ohm=20)
    values = boards.origin_faults(kiosk)
    assert math.isnan(values.pfc_a) and math.isnan(values.zpn_ohm)
    supply = boards.board_supply(kiosk, Board("SHED", (), fed_from="MAIN"), values, 1, ())
    assert supply.prospective_fault_current_ka is None and supply.line_neutral_loop_ohm is None
    assert supply.board == "SHED" and supply.ze_ohm == 21


def test_the_tight_bound_against_complex_sums_down_three_levels():
    # Hand-worked complex sums (IEC 60909-0 method, derived): the supply's impedance at the origin has modulus
    # 0.1 ohm at an unknown angle of 0 to 90 degrees; two sub-mains below it, the second with reactance.
    # The true loop for an angle t is |0.1 e^jt + (R + jX)|, R and X summed from the origin. The service's least
    # modulus must never exceed the true one for any angle (the largest current never underestimated) and be
    # within 3 % of the smallest true one (no needless false fails).
    origin = Supply("TN-S", 230, 0.1, line_neutral_loop_ohm=0.1)
    first = boards.FeedLoop(0.06, 0.06, 0.05, 0.05, 0.025, x_loop=0.0, three_phase=False, drop_percent=0.5)
    second = boards.FeedLoop(0.3, 0.3, 0.25, 0.25, 0.125, x_loop=0.04, three_phase=False, drop_percent=1.0)
    level2 = boards.below(boards.below(boards.origin_faults(origin), first), second)
    r, x = 0.05 + 0.25, 0.04
    true = [abs(0.1 * complex(math.cos(t), math.sin(t)) + complex(r, x)) for t in np.linspace(0, math.pi / 2, 91)]
    assert level2.ze_min_ohm <= min(true) + 1e-12 and level2.ze_min_ohm >= 0.97 * min(true)
    # the old root of the sum of squares board by board gave sqrt(0.1^2 + 0.05^2 + 0.25^2 + 0.04^2) = 0.2762 ohm,
    # below every true figure: 8 % too much current here
    assert math.hypot(0.1, 0.05, math.hypot(0.25, 0.04)) < 0.93 * min(true)
    # with the supply's X/R given (here 1.0, an angle of 45 degrees) the complex sum itself
    given = boards.below(boards.below(boards.origin_faults(dataclasses.replace(origin, x_over_r=1.0)), first), second)
    assert given.ze_min_ohm == pytest.approx(
        abs(0.1 * complex(math.cos(math.pi / 4), math.sin(math.pi / 4)) + complex(r, x))
    )


def test_the_origin_line_neutral_and_line_earth_maxima_are_each_their_own():
    # Ze 0.08 ohm below the stated line-neutral loop 0.15 ohm: the line-neutral maximum is 1.1 x 230 / 0.15, not the
    # line-earth value 1.1 x 230 / 0.08 (IEC 60909-0 cmax 1.10), and no caution says the loop was calculated from Ze
    values = boards.origin_faults(Supply("TN-C-S", 230, 0.08, line_neutral_loop_ohm=0.15))
    assert values.max_line_neutral_a == pytest.approx(253 / 0.15) and values.max_earth_fault_a == pytest.approx(
        253 / 0.08
    )
    assert not any("calculated from Ze" in c for c in values.cautions)
