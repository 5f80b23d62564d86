"""The rules beyond the calculations through the API: each case of a circuit BS 7671 forbids gets the answer the
rules give, in a single check, a batch (lean and full), an installation and its report.

Sources: BS 7671:2018+A2:2022 411.3.3, 411.3.4, 415.1.1, 421.1.7, 443.4, 522.6.202, 531.3.3, 701.411.3.3,
722.411.4.1, 722.531.2.101, 722.531.3.101, 311.1, as summarised in tests/data/requirements-rules.md (722 rows and
531.3.3 from memory); invented demo data: "Heron Row", a house with a garage sub-board.
"""

import copy
import json

from tests.api.test_api_input import assert_problem

SUPPLY = {"earthing": "TN-C-S", "u0_v": 230, "ze_ohm": 0.35, "prospective_fault_current_ka": 1.6}
SURFACE = {"cable": "flat-twin-earth-70c", "installation_method": "C", "concealed_in_wall": "no"}
B32 = {"standard": "BS EN 60898", "type": "B", "rating_a": 32, "breaking_capacity_ka": 6}
RCBO = {"standard": "BS EN 61009", "type": "B", "rating_a": 32, "breaking_capacity_ka": 6,
        "rcd": {"residual_current_ma": 30, "type": "A"}}  # fmt: skip
RING = {
    "id": "heron-ring", "role": "final", "load": "socket-outlets", "design_current_a": 20, "location": "general",
    "device": B32, "installation": SURFACE,
    "conductors": {"material": "copper", "insulation": "thermoplastic-70", "line_csa_mm2": 2.5, "cpc_csa_mm2": 1.5,
                   "length_m": 50, "ring": True},
}  # fmt: skip


def circuit(**changes):
    out = copy.deepcopy(RING)
    out.update(changes)
    return out


def check(client, c, **top):
    r = client.post("/v1/circuits/check", json={"premises": "dwelling", "supply": SUPPLY, "circuit": c, **top})
    assert r.status_code == 200, r.get_data(as_text=True)
    answer = r.get_json()
    return answer, {k["check"]: k for k in answer["checks"]}


def test_a_socket_ring_on_a_plain_b32_fails_and_with_a_30_ma_type_a_rcbo_passes(client):
    answer, checks = check(client, circuit())
    assert answer["verdict"] == "fail" and checks["additional-protection"]["verdict"] == "fail"
    assert "411.3.3" in checks["additional-protection"]["basis"] and answer["edition"] == "BS 7671:2018+A4:2026"
    answer, checks = check(client, circuit(device=RCBO))
    assert answer["verdict"] == "pass", checks
    assert any("recommended" in c for c in answer["cautions"])  # an AFDD, 421.1.7, in a house: a caution only


def test_a_100_ma_or_a_300_ma_time_delayed_rcd_on_sockets_fails(client):
    for rcd in ({"residual_current_ma": 100, "type": "A"}, {"residual_current_ma": 300, "delay": "S", "type": "A"}):
        _, checks = check(client, circuit(device={**RCBO, "rcd": rcd}))
        assert checks["additional-protection"]["verdict"] == "fail"


def test_a_shower_and_a_dwelling_lighting_circuit_without_an_rcd_fail(client):
    shower = circuit(id="shower", load="fixed-equipment", equipment="shower", location="bathroom")
    shower["conductors"] = {**shower["conductors"], "ring": False, "line_csa_mm2": 10, "cpc_csa_mm2": 4, "length_m": 12}
    shower["device"] = {**B32, "rating_a": 40}
    _, checks = check(client, shower)
    assert (
        checks["additional-protection"]["verdict"] == "fail"
        and "701.411.3.3" in checks["additional-protection"]["basis"]
    )
    lights = circuit(id="lights", load="fixed-equipment", equipment="lighting", design_current_a=3)
    lights["device"] = {**B32, "rating_a": 6}
    lights["conductors"] = {
        **lights["conductors"],
        "ring": False,
        "line_csa_mm2": 1.5,
        "cpc_csa_mm2": 1.0,
        "length_m": 10,
    }
    _, checks = check(client, lights)
    assert (
        checks["additional-protection"]["verdict"] == "fail" and "411.3.4" in checks["additional-protection"]["basis"]
    )


def test_a_cable_concealed_under_50_mm_can_be_described_and_needs_an_rcd(client):
    shallow = {**SURFACE, "concealed_in_wall": "under-50-mm", "earthed_metallic_covering": False}
    oven = circuit(id="oven", load="fixed-equipment", equipment="cooker", installation=shallow)
    oven["conductors"] = {**oven["conductors"], "ring": False, "line_csa_mm2": 6, "cpc_csa_mm2": 2.5, "length_m": 10}
    _, checks = check(client, oven)
    assert (
        checks["additional-protection"]["verdict"] == "fail" and "522.6.202" in checks["additional-protection"]["basis"]
    )


def ev_point(device, ev, location="outdoors"):
    c = circuit(id="ev", load="fixed-equipment", equipment="ev-charge-point", location=location, ev=ev, device=device)
    c["conductors"] = {**c["conductors"], "ring": False, "line_csa_mm2": 6, "cpc_csa_mm2": 2.5, "length_m": 15}
    return c


def test_an_outdoor_ev_charge_point_on_pme(client):
    # 722.411.4.1 without a measure against a broken PEN, and no RCD at all: both fail
    _, checks = check(client, ev_point(B32, {"earthing_measure": "none"}))
    assert checks["ev-earthing"]["verdict"] == "fail" and checks["additional-protection"]["verdict"] == "fail"
    assert checks["rcd-type"]["verdict"] == "fail"
    # a type AC device cannot be used on a charge point (722.531.3.101)
    ac = {**RCBO, "rcd": {"residual_current_ma": 30, "type": "AC"}}
    _, checks = check(client, ev_point(ac, {"earthing_measure": "open-pen-device", "dc_fault_detection": True}))
    assert checks["rcd-type"]["verdict"] == "fail" and checks["ev-earthing"]["verdict"] == "pass"
    # type A with the charger's d.c. detection, and an open-PEN device: every rule met
    ok = ev_point(RCBO, {"earthing_measure": "open-pen-device", "dc_fault_detection": True})
    answer, checks = check(client, ok)
    assert all(checks[k]["verdict"] == "pass" for k in ("ev-earthing", "rcd-type", "additional-protection")), checks


def test_a_request_that_states_nothing_new_gets_no_silent_pass(client):
    bare = {k: v for k, v in circuit(device=B32, load="fixed-equipment").items() if k != "location"}
    bare["installation"] = {"cable": "flat-twin-earth-70c", "installation_method": "C"}
    bare["conductors"] = {**bare["conductors"], "ring": False}
    r = client.post("/v1/circuits/check", json={"supply": SUPPLY, "circuit": bare}).get_json()
    checks = {k["check"]: k for k in r["checks"]}
    assert r["verdict"] != "pass" and checks["additional-protection"]["verdict"] == "not-verified"
    assert "installation.concealed_in_wall" in checks["additional-protection"]["note"]


def test_asked_for_a2_the_answer_follows_a2(client):
    shower_ac = circuit(id="shower", load="fixed-equipment", equipment="shower", location="bathroom",
                        device={**RCBO, "rating_a": 40, "rcd": {"residual_current_ma": 30, "type": "AC"}})  # fmt: skip
    shower_ac["conductors"] = {
        **shower_ac["conductors"],
        "ring": False,
        "line_csa_mm2": 10,
        "cpc_csa_mm2": 4,
        "length_m": 12,
    }
    a2, checks_a2 = check(client, shower_ac, edition="BS 7671:2018+A2:2022")
    a4, checks_a4 = check(client, shower_ac)
    assert a2["edition"] == "BS 7671:2018+A2:2022" and checks_a2["rcd-type"]["verdict"] == "pass"
    assert checks_a2["rcd-type"]["basis"].startswith("BS 7671:2018+A2:2022 531.3.3")
    assert a4["edition"] == "BS 7671:2018+A4:2026" and checks_a4["rcd-type"]["verdict"] == "fail"


def test_nonsense_combinations_are_422_naming_the_field(client):
    body = {"supply": SUPPLY, "circuit": circuit(ev={"earthing_measure": "none"})}
    assert_problem(client.post("/v1/circuits/check", json=body), 422, "/circuit/ev")
    body = {"supply": SUPPLY, "circuit": circuit(location="moon")}
    assert_problem(client.post("/v1/circuits/check", json=body), 422, "/circuit/location")
    body = {"supply": SUPPLY, "circuit": circuit(), "edition": "BS 7671:2008"}
    assert_problem(client.post("/v1/circuits/check", json=body), 422, "/edition")
    body = {"supply": SUPPLY, "circuit": circuit(socket_outlet_rating_a=13, load="fixed-equipment")}
    assert_problem(client.post("/v1/circuits/check", json=body), 422, "/circuit/socket_outlet_rating_a")


def test_a_batch_lean_and_full_names_the_edition_once_and_fails_the_plain_ring(client):
    body = {"premises": "dwelling", "supply": SUPPLY, "circuits": [circuit(), circuit(id="ok", device=RCBO)]}
    full = client.post("/v1/circuits/check-batch?form=full", json=body).get_json()
    lean = client.post("/v1/circuits/check-batch", json=body).get_json()
    assert [i["result"]["verdict"] for i in full["results"]] == ["fail", "pass"]
    assert lean["columns"]["additional-protection.verdict"] == ["fail", "pass"]
    assert full["edition"] == lean["edition"] == "BS 7671:2018+A4:2026" and lean["not_assessed"]
    assert "edition" not in full["results"][0]["result"]


def house(demand_a, rated_a):
    garage = {"id": "garage feed", "role": "distribution", "feeds_board": "GARAGE", "design_current_a": demand_a,
              "device": {"standard": "BS EN 60898", "type": "B", "rating_a": 40, "breaking_capacity_ka": 6},
              "conductors": {"material": "copper", "insulation": "thermosetting-90", "line_csa_mm2": 6,
                             "cpc_csa_mm2": 6, "length_m": 12},
              "installation": {"cable": "multicore-armoured-90c", "installation_method": "C",
                               "earthed_metallic_covering": True}}  # fmt: skip
    garage_ring = circuit(id="garage sockets", device=RCBO, design_current_a=16)
    return {
        "premises": "dwelling",
        "supply": {**SUPPLY, "rated_current_a": rated_a},
        "surge_protection": {"fitted": False, "consequence": "other", "declined_in_writing": True},
        "boards": [
            {"id": "CU", "fed_from": None, "circuits": [circuit(), garage]},
            {"id": "GARAGE", "fed_from": "CU", "circuits": [garage_ring]},
        ],
    }


def test_an_installation_judges_demand_against_the_supply_and_shows_the_rules_in_its_report(client):
    # 311.1: 150 A of demand on a 63 A supply fails; the plain ring's 411.3.3 failure reaches the report in words
    body = house(demand_a=130, rated_a=63)
    answer = client.post("/v1/installations/check", json=body).get_json()
    origin = answer["boards"][0]
    demand = {c["check"]: c for c in origin["checks"]}["demand"]
    assert demand["verdict"] == "fail" and demand["value"] == 150 and demand["limit"] == 63
    assert answer["edition"] == "BS 7671:2018+A4:2026" and answer["checks"][0]["verdict"] == "pass"  # surge declined
    fits = house(demand_a=20, rated_a=63)
    fits["boards"][0]["circuits"][0]["device"] = RCBO
    fine = client.post("/v1/installations/check", json=fits).get_json()
    assert {c["check"]: c for c in fine["boards"][0]["checks"]}["demand"]["verdict"] == "pass"
    assert fine["verdict"] == "pass", json.dumps(fine)[:2000]
    html = client.post("/v1/installations/report", json=body).get_data(as_text=True)
    assert "BS 7671:2018+A4:2026" in html and "30 mA RCD (additional protection): fail" in html
    assert "Demand against what feeds the board" in html
