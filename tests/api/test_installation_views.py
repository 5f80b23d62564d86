"""POST /v1/installations/check: the demo installation worked through by hand, and every bad tree a 422.

Invented demo scenario: Tannery Lane joinery (schemas/examples/installations-check.json). Sources of the
values used by hand: IEC 60228 Table 2 (r20: 1.15 mohm/m for 16 mm2, 1.83 for 10, 4.61 for 4, 7.41 for 2.5,
12.1 for 1.5, 18.1 for 1.0 copper), BS 7671 Appendix 3 (1 + 0.004 (theta - 20): 1.20 at 70 degC, 1.28 at
90 degC), IEC 60909-0 Table 1 (cmax 1.10, Cmin 0.95), BS 7671 Tables 4D5 and 4E4B (mV/A/m, from memory),
BS 7671:2018 Appendix 4 6.4 (3 % lighting, 5 % other), gG I2t (IEC 60269-1, tests/data/gG-i2t.csv, from
memory), BS EN 60898-1 (instantaneous 3-5 In for B) and Annex ZA (tests/data/let-through-energy.csv, from
memory); how the impedances combine: tests/data/installation-rules.md.
"""

import copy
import json
import math

import pytest

from tests.paths import EXAMPLES

DEMO = json.loads((EXAMPLES / "installations-check.json").read_text())
CMAX_U0, CMIN_U0 = 1.10 * 230, 0.95 * 230  # 253 V, 218.5 V


def post(client, body):
    return client.post("/v1/installations/check", json=body)


@pytest.fixture(scope="module")
def answer(app):
    response = post(app.test_client(), DEMO)
    assert response.status_code == 200, response.get_data(as_text=True)
    out = response.get_json()
    out["by_id"] = {b["id"]: b for b in out["boards"]}
    return out


def result(answer, board, circuit):
    return next(i["result"] for i in answer["by_id"][board]["circuits"] if i["id"] == circuit)


def test_the_origin_board(answer):
    main = answer["by_id"]["MAIN"]
    # line-neutral 253 / 0.10 = 2530 A; line-earth 253 / 0.20 = 1265 A; three-phase stated 4.6 kA: the largest
    assert main["max_line_neutral_fault_current_ka"] == 2.53 and main["max_earth_fault_current_ka"] == 1.265
    assert main["max_fault_current_ka"] == 4.6 and main["three_phase_fault_current_ka"] == 4.6
    # smallest: 218.5 / 0.20 = 1092.5 A; 218.5 / 0.10 = 2185 A; no drop at the origin
    assert main["min_earth_fault_current_a"] == 1092.5 and main["min_line_neutral_fault_current_a"] == 2185
    assert main["voltage_drop_percent"] == 0


def test_the_workshop_board_below_a_three_phase_sub_main(answer):
    board = answer["by_id"]["WORKSHOP"]
    v = board
    # the feed: 16 mm2 copper 90 degC, 30 m: R1 = R2 = Rn = 1.15 x 1.28 x 30 / 1000 = 0.04416 ohm
    # Ze = 0.20 + 0.08832 = 0.28832; Zpn = 0.10 + 0.08832 = 0.18832 (moduli added, hot)
    assert v["ze_ohm"] == 0.2883 and v["line_neutral_loop_ohm"] == 0.1883
    # largest: at 20 degC R1+R2 = R1+Rn = 2 x 1.15 x 0.030 = 0.069 ohm, R1 = 0.0345 ohm, root-sum-square:
    # 253 / sqrt(0.20^2 + 0.069^2) = 1195.8 A; 253 / sqrt(0.10^2 + 0.069^2) = 2082.4 A;
    # three-phase: 253 / 4600 = 0.055 ohm at the origin, 253 / sqrt(0.055^2 + 0.0345^2) = 3896.8 A
    assert v["max_earth_fault_current_ka"] == 1.196 and v["max_line_neutral_fault_current_ka"] == 2.082
    assert v["three_phase_fault_current_ka"] == 3.897 and v["max_fault_current_ka"] == 3.897
    # smallest: 218.5 / 0.28832 = 757.8 A; 218.5 / 0.18832 = 1160.3 A
    assert v["min_earth_fault_current_a"] == 757.8 and v["min_line_neutral_fault_current_a"] == 1160.3
    # demand: saw 14 A and extractor 10 A on each phase, bench sockets 20 A x 0.5 on L2: 24 / 34 / 24 A
    d = board["demand"]
    assert d["phase_current_a"] == {"L1": 24, "L2": 34, "L3": 24} and d["design_current_a"] == 34
    # imbalance: mean 27.33 A, largest deviation 6.67 A: 24.39 %; neutral sqrt(24^2 + 34^2 + 24^2 - 24 x 34
    # - 34 x 24 - 24 x 24) = 10 A
    assert d["imbalance_percent"] == 24.39 and d["neutral_current_a"] == 10
    # the feed's drop: Table 4E4B three-phase 2.5 mV/A/m x 34 A x 30 m = 2.55 V of 398.4 V = 0.64 %
    assert v["voltage_drop_percent"] == 0.64 and board["fed_by"] == "workshop feed"


def test_the_office_board_below_a_single_phase_sub_main(answer):
    board = answer["by_id"]["OFFICE"]
    v = board
    # the feed: 10/4 mm2 twin and earth, 70 degC, 20 m: R1 = Rn = 1.83 x 1.2 x 0.02 = 0.04392, R2 = 0.11064
    # Ze = 0.20 + 0.15456 = 0.35456; Zpn = 0.10 + 0.08784 = 0.18784
    assert v["ze_ohm"] == 0.3546 and v["line_neutral_loop_ohm"] == 0.1878
    # largest: at 20 degC (1.83 + 4.61) x 0.02 = 0.1288 and 2 x 1.83 x 0.02 = 0.0732 ohm:
    # 253 / sqrt(0.2^2 + 0.1288^2) = 1063.5 A; 253 / sqrt(0.1^2 + 0.0732^2) = 2041.5 A; single-phase: no Ik3
    assert v["max_earth_fault_current_ka"] == 1.064 and v["max_line_neutral_fault_current_ka"] == 2.042
    assert v["three_phase_fault_current_ka"] is None and v["max_fault_current_ka"] == 2.042
    # demand 16 + 12 = 28 A; drop: Table 4D5 4.4 mV/A/m x 28 A x 20 m = 2.464 V of 230 V = 1.07 %
    assert board["demand"]["design_current_a"] == 28 and v["voltage_drop_percent"] == 1.07
    # the main board's demand per phase: L1 24 + 28 (the office on L1), L2 34, L3 24 + 5 (the yard lights)
    assert answer["by_id"]["MAIN"]["demand"]["phase_current_a"] == {"L1": 52, "L2": 34, "L3": 29}


def test_each_circuit_uses_its_board_values(answer):
    saw = result(answer, "WORKSHOP", "saw bench")
    # Zs = 0.28832 + 2 x 4.61 x 1.28 x 15 / 1000 = 0.28832 + 0.17702 = 0.46534 ohm
    assert saw["zs_ohm"] == 0.4653 and saw["prospective_fault_current_ka"] == 3.897
    assert "carried down to board WORKSHOP" in saw["prospective_fault_current_basis"]
    sockets = result(answer, "WORKSHOP", "bench sockets")
    # 0.64 % above, and its own 11 mV/A/m x 20 A x 25 m = 5.5 V = 2.39 % of 230 V: 3.03 % from the origin
    assert sockets["voltage_drop_from_origin_percent"] == 3.03
    lights = result(answer, "MAIN", "yard lights")
    # the failing circuit: 29 mV/A/m x 5 A x 95 m = 13.775 V = 5.99 % > 3 % for lighting
    assert lights["verdict"] == "fail" and lights["voltage_drop_from_origin_percent"] == 5.99
    assert answer["verdict"] == "fail" and answer["summary"]["fail"] == 1 and answer["summary"]["circuits"] == 8


def test_selectivity_with_the_device_feeding_each_board(answer):
    workshop = result(answer, "MAIN", "workshop feed")["selectivity"]
    # gG 63 A operates with at most 27 000 A2s, below gG 125 A's 46 000 A2s pre-arcing: total
    assert workshop["with"] == "main fuse" and workshop["verdict"] == "total" and "27000" in workshop["basis"]
    office = result(answer, "MAIN", "office feed")["selectivity"]
    # B32 class 3 lets through 45 000 A2s at 6 kA, within 46 000: up to 6 kA, above the 2.53 kA there
    assert office["verdict"] == "total" and office["up_to_a"] == 6000
    heater = result(answer, "OFFICE", "heater")
    # the non-selective pair: B20 needs up to 5 x 20 = 100 A, B32 may trip from 3 x 32 = 96 A
    assert heater["selectivity"]["verdict"] == "none" and heater["selectivity"]["with"] == "office feed"
    assert "selectivity" in heater["verdict_scope"]["left_out"] and heater["verdict"] == "pass"


BAD_TREES = [
    (lambda b: b["boards"][2].update(fed_from="NOWHERE"), "/boards/2/fed_from"),
    (lambda b: b["boards"][1].update(id="OFFICE"), "/boards/2/id"),
    (lambda b: b["boards"][0]["circuits"][1].update(feeds_board="WORKSHOP"), "/boards/0/circuits/1/feeds_board"),
    (lambda b: b["boards"][0].update(fed_from="OFFICE"), "/boards/0/fed_from"),
    (lambda b: b["boards"][1].update(diversity=0), "/boards/1/diversity"),
]


@pytest.mark.parametrize(("spoil", "pointer"), BAD_TREES)
def test_a_bad_tree_is_a_422_naming_the_field(client, spoil, pointer):
    body = copy.deepcopy(DEMO)
    spoil(body)
    response = post(client, body)
    assert response.status_code == 422 and response.mimetype == "application/problem+json"
    assert pointer in [e["pointer"] for e in response.get_json()["errors"]], response.get_json()


def test_a_bad_circuit_stays_in_its_place_and_a_bad_feed_leaves_its_board_unchecked(client):
    body = copy.deepcopy(DEMO)
    body["boards"][2]["circuits"][0]["conductors"]["line_csa_mm2"] = "2.5"
    body["boards"][0]["circuits"][0]["device"]["rating_a"] = -1
    out = post(client, body).get_json()
    office = out["boards"][2]["circuits"]
    assert office[0]["problem"]["errors"][0]["pointer"] == "/boards/2/circuits/0/conductors/line_csa_mm2"
    assert "result" in office[1]
    feed = out["boards"][0]["circuits"][0]
    assert feed["problem"]["errors"][0]["pointer"] == "/boards/0/circuits/0/device/rating_a"
    workshop = out["boards"][1]
    assert workshop["ze_ohm"] is None and "workshop feed" in workshop["not_checked"]
    assert all("problem" in i for i in workshop["circuits"]) and out["summary"]["invalid"] == 5


def test_too_many_circuits_is_a_413(client):
    body = copy.deepcopy(DEMO)
    body["boards"][2]["circuits"] *= 30  # the test app's limit is 50 circuits
    assert post(client, body).status_code == 413


def test_ohms_and_amps_are_not_float_noise(answer):
    for board in answer["boards"]:
        figures = [v for k, v in board.items() if k.endswith(("_ohm", "_ka", "_a", "_percent")) and v is not None]
        assert figures and all(math.isclose(v, round(v, 4)) for v in figures)


def test_the_report_is_html_that_fetches_nothing(client):
    response = client.post("/v1/installations/report", json=DEMO)
    assert response.status_code == 200 and response.mimetype == "text/html"
    assert "default-src 'none'" in response.headers["Content-Security-Policy"]
    page = response.get_data(as_text=True)
    assert page.count('class="circuit"') == 8 and "Board OFFICE" in page
    spoiled = copy.deepcopy(DEMO)
    spoiled["boards"][2]["fed_from"] = "NOWHERE"
    assert client.post("/v1/installations/report", json=spoiled).status_code == 422
