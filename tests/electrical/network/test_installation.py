"""The whole installation: circuits checked with their board's values, feeds that fail, ratings, selectivity.

The tree rules: tests/electrical/test_tree.py; the board values: tests/electrical/test_boards.py; the whole
demo installation worked by hand: tests/api/test_installation_views.py.
"""

import dataclasses

import pytest

from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.errors import InvalidInput
from service.electrical.inputs import Board, CableRun, Circuit, Conductors, DeviceSpec, Installation, Supply, Unread
from service.electrical.network.installation import check_installation
from service.electrical.results.circuit_result import CircuitResult
from tests.electrical.pipeline import B32, RCBO_B16, TWIN_2_5, circuit

# Invented: a three-phase garden centre, its main board and a glasshouse board
ORIGIN = Supply("TN-S", 230, 0.25, line_neutral_loop_ohm=0.15, phases=3, three_phase_fault_current_ka=3.0)
MAIN_FUSE = DeviceSpec(rating_a=100, standard="BS 88-2", type="gG")
GG_40 = DeviceSpec(rating_a=40, standard="BS 88-2", type="gG")
ARMOURED_10 = Conductors("copper", "thermosetting-90", 10, 10, 40)
RUN = CableRun("multicore-armoured-90c", "C")


def glasshouse_feed(**kwargs):
    fields = {"role": "distribution", "load": None, "feeds_board": "GLASSHOUSE", "phases": 3, "installation": RUN}
    fields |= {"device": GG_40, "conductors": ARMOURED_10, "id": "glasshouse feed"}
    return circuit(**{**fields, **kwargs})


SOCKETS = circuit(
    RCBO_B16, TWIN_2_5, load="socket-outlets", design_current_a=10, installation=CableRun("flat-twin-earth-70c", "C")
)


def garden_centre(feed=None, below=(SOCKETS,)):
    main = Board("MAIN", (feed or glasshouse_feed(), circuit(B32, id="till", design_current_a=20)), device=MAIN_FUSE)
    return Installation(ORIGIN, (main, Board("GLASSHOUSE", tuple(below), fed_from="MAIN")), id="garden centre")


def test_a_circuit_below_a_feed_uses_its_board_values():
    result = check_installation(garden_centre())
    main, glass = result.boards
    sockets = glass.circuits[0]
    # the feed's R1+R2: 10 mm2 copper at 90 degC, 2 x 1.83 x 1.28 x 40 / 1000 = 0.18739 ohm (IEC 60228, 1 + 0.004 x 70)
    assert glass.ze_ohm == pytest.approx(0.25 + 2 * 1.83 * 1.28 * 40 / 1000, abs=1e-4)
    # the sockets' own loop on top: 2.5/1.5 mm2 at 70 degC over 25 m (7.41 + 12.1) x 1.2 x 25 / 1000 = 0.5853 ohm
    assert sockets.zs_ohm == pytest.approx(glass.ze_ohm + (7.41 + 12.1) * 1.2 * 25 / 1000, abs=2e-4)
    assert "carried down to board GLASSHOUSE" in sockets.prospective_fault_current_basis
    assert (
        sockets.selectivity["with"] == "glasshouse feed"
        and main.circuits[1].selectivity["with"] == "MAIN incoming device"
    )
    counted = result.summary["pass"] + result.summary["fail"] + result.summary["not-verified"]
    assert result.summary["boards"] == 2 and result.summary["circuits"] == counted == 3


def test_a_feed_that_cannot_be_computed_leaves_the_boards_below_unchecked():
    bad = glasshouse_feed(conductors=dataclasses.replace(ARMOURED_10, line_csa_mm2=11))
    result = check_installation(garden_centre(feed=bad))
    main, glass = result.boards
    assert isinstance(main.circuits[0], CircuitFailure) and main.circuits[0].path[:2] == ("circuit", "conductors")
    assert isinstance(main.circuits[1], CircuitResult)  # the till is checked all the same
    assert glass.ze_ohm is None and "glasshouse feed" in glass.not_checked
    assert isinstance(glass.circuits[0], CircuitFailure) and "not checked" in glass.circuits[0].message
    assert result.summary["invalid"] == 2 and glass.verdict == "not-verified"


def test_a_feed_with_only_r1_plus_r2_or_unread_cannot_carry_the_loops_down():
    known = glasshouse_feed(conductors=None, r1_plus_r2_ohm=0.2)
    glass = check_installation(garden_centre(feed=known)).boards[1]
    assert "needs its conductors" in glass.not_checked
    unread = check_installation(garden_centre(feed=Unread("glasshouse feed", "GLASSHOUSE")))
    assert isinstance(unread.boards[0].circuits[0], Unread) and "could not be read" in unread.boards[1].not_checked


def test_a_stated_feed_current_wins_and_the_sum_below_is_shown_beside_it():
    # BS 7671 311.1: the designer's maximum demand after diversity is the design basis (installation-rules.md)
    result = check_installation(garden_centre(feed=glasshouse_feed(design_current_a=6)))
    feed = result.boards[0].circuits[0]
    assert feed.overload["design_current_a"] == 6
    assert any("summed demand after its stated diversity, 10 A, exceeds the feed's stated" in c for c in feed.cautions)
    assert result.boards[1].demand["design_current_a"] == 10
    # without a stated Ib the feed carries the sum below
    unstated = check_installation(garden_centre(feed=glasshouse_feed(design_current_a=None)))
    assert unstated.boards[0].circuits[0].overload["design_current_a"] == 10


def test_a_drop_not_known_above_leaves_the_drop_below_not_verified():
    result = check_installation(garden_centre(feed=glasshouse_feed(installation=None)))
    drop = result.boards[1].circuits[0].check("voltage-drop")
    assert drop.verdict == "not-verified" and "drop from the origin to this board" in drop.note
    assert result.boards[1].voltage_drop_percent is None


def test_the_board_rating_against_the_largest_fault_at_it():
    inst = garden_centre()
    rated = dataclasses.replace(inst.boards[1], conditional_short_circuit_ka=1.0)
    result = check_installation(dataclasses.replace(inst, boards=(inst.boards[0], rated)))
    rating = result.boards[1].rating
    assert rating["verdict"] == "fail" and rating["max_fault_current_ka"] > 1.0 and "61439-3" in rating["basis"]
    assert result.boards[1].verdict == "fail" and result.boards[0].rating is None


def test_selectivity_required_on_a_board_counts_for_its_circuits():
    inst = garden_centre()
    required = dataclasses.replace(inst.boards[1], selectivity_required=True)
    sockets = check_installation(dataclasses.replace(inst, boards=(inst.boards[0], required))).boards[1].circuits[0]
    assert "selectivity" in sockets.verdict_scope["covered"]


def test_diversity_is_a_share():
    inst = garden_centre()
    bad = dataclasses.replace(inst.boards[1], diversity=1.5)
    with pytest.raises(InvalidInput) as err:
        check_installation(dataclasses.replace(inst, boards=(inst.boards[0], bad)))
    assert err.value.path == ("boards", 1, "diversity")


def test_a_single_phase_device_on_a_three_phase_board_sees_the_phase_faults_not_the_three_phase_one():
    # installation-rules.md (derived): a single-pole device is reached by a line-neutral or line-earth fault, never by
    # the symmetrical three-phase one. The B32 ring on a three-phase board under a gG 100 A feed: its largest fault is
    # the board's line-neutral 2.5 kA, not the 5.0 kA three-phase; B32 class 3 lets through at most 18 000 A2s up to
    # 3 kA (BS EN 60898-1 Annex ZA, from memory) against the gG 100 A pre-arcing 27 000 A2s (IEC 60269-1, from
    # memory): selective up to 3 kA, so total for this board.
    origin = Supply("TN-S", 230, 0.25, line_neutral_loop_ohm=0.1, phases=3, three_phase_fault_current_ka=5.0)
    run = CableRun("multicore-armoured-90c", "C", earthed_metallic_covering=True)
    feed = Circuit(DeviceSpec(100, "BS 88-2", "gG"), Conductors("copper", "thermosetting-90", 35, 16, 10),
                   role="distribution", phases=3, feeds_board="DB", id="db feed", installation=run)  # fmt: skip
    ring = Circuit(DeviceSpec(32, "BS EN 60898", "B", breaking_capacity_ka=6),
                   Conductors("copper", "thermoplastic-70", 2.5, 1.5, 40, ring=True),
                   load="socket-outlets", phase="L1", id="ring", selectivity_required=True)  # fmt: skip
    motor_cable = Conductors("copper", "thermosetting-90", 6, 6, 20)
    three = Circuit(DeviceSpec(32, "BS EN 60898", "C", breaking_capacity_ka=6), motor_cable, load="fixed-equipment",
                    phases=3, id="motor")  # fmt: skip
    result = check_installation(Installation(origin, (Board("MAIN", (feed,)), Board("DB", (ring, three), "MAIN"))))
    board, (sockets, motor) = result.boards[1], result.boards[1].circuits
    assert board.three_phase_fault_current_ka > 4.9 and sockets.prospective_fault_current_ka < 2.6
    assert sockets.prospective_fault_current_ka == board.max_line_neutral_fault_current_ka
    assert sockets.selectivity["verdict"] == "total" and sockets.check("selectivity").verdict == "pass"
    assert motor.prospective_fault_current_ka == board.three_phase_fault_current_ka  # a three-phase device: Ik3
    # a single-pole device whose Icn is below the board's three-phase fault: said, not failed
    small = dataclasses.replace(ring, device=DeviceSpec(32, "BS EN 60898", "B", breaking_capacity_ka=4.5))
    result = check_installation(Installation(origin, (Board("MAIN", (feed,)), Board("DB", (small,), "MAIN"))))
    checked = result.boards[1].circuits[0]
    assert checked.check("breaking-capacity").verdict == "pass" and any("single-pole" in c for c in checked.cautions)
