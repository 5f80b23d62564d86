"""Fault levels down the tree and the maker's data said once, through the API.

Sources: the tight bound and the single-pole devices of tests/data/installation-rules.md (derived; IEC 60909-0
voltage factors cmax 1.10); the maker's let-through figures here are invented demo data.
"""

import copy
import json
import math

from tests.api.test_api_examples import EXAMPLES
from tests.api.test_api_input import assert_problem

POINTS = ((200, 900), (1000, 2000), (3000, 4500), (6000, 7500))
CURVE = [{"prospective_current_a": i, "i2t_a2s": e} for i, e in POINTS]


def example():
    return json.loads((EXAMPLES / "installations-check.json").read_text())


def test_device_defaults_give_every_rcbo_of_the_joinery_the_makers_data(client):
    body = example()
    body["device_defaults"] = [{"standard": "BS EN 61009", "type": "B", "let_through_curve": CURVE}]
    answer = client.post("/v1/installations/check", json=body).get_json()
    sockets = next(c["result"] for b in answer["boards"] for c in b["circuits"] if c["id"] == "bench sockets")
    assert sockets["protective_conductor"]["energy_basis"] == "let-through"  # the maker's, not the class limit
    repeated = copy.deepcopy(body)
    repeated["device_defaults"].append(repeated["device_defaults"][0])
    assert_problem(client.post("/v1/installations/check", json=repeated), 422, "/device_defaults")
    falling = copy.deepcopy(body)
    falling["device_defaults"][0]["let_through_curve"] = list(reversed(CURVE))
    answer = client.post("/v1/installations/check", json=falling).get_json()  # the core refuses it per circuit
    refused = [c for b in answer["boards"] for c in b["circuits"] if c["id"] in ("bench sockets", "desk sockets")]
    assert all(c["problem"]["errors"][0]["pointer"].endswith("/device/let_through_curve") for c in refused)
    single = json.loads((EXAMPLES / "circuits-check.json").read_text())
    single["circuit"]["device"]["let_through_curve"] = list(reversed(CURVE))
    assert_problem(client.post("/v1/circuits/check", json=single), 422, "/circuit/device/let_through_curve")


def test_the_supplys_x_over_r_makes_the_sums_complex_and_the_board_says_so(client):
    body = example()
    plain = client.post("/v1/installations/check", json=body).get_json()
    body["supply"]["x_over_r"] = 1.0
    given = client.post("/v1/installations/check", json=body).get_json()
    workshop = [next(b for b in a["boards"] if b["id"] == "WORKSHOP") for a in (plain, given)]
    assert "least modulus any supply angle" in workshop[0]["impedance_basis"]
    assert "as complex numbers" in workshop[1]["impedance_basis"]
    # any given angle gives a loop no smaller than the least over all angles: never more current
    assert workshop[1]["max_earth_fault_current_ka"] <= workshop[0]["max_earth_fault_current_ka"]
    assert math.isclose(workshop[0]["min_earth_fault_current_a"], workshop[1]["min_earth_fault_current_a"])


def test_a_stated_sub_main_current_is_used_with_a_caution_where_the_sum_below_exceeds_it(client):
    # 311.1: the designer's maximum demand after diversity (installation-rules.md, "stated demand wins")
    body = example()
    feed = body["boards"][0]["circuits"][0]
    feed["design_current_a"] = 20  # the workshop's sum is 34 A on its largest phase
    answer = client.post("/v1/installations/check", json=body).get_json()
    result = answer["boards"][0]["circuits"][0]["result"]
    assert result["overload"]["design_current_a"] == 20
    assert any("summed demand after its stated diversity, 34 A" in c for c in result["cautions"])
