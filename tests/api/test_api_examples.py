"""The request examples in schemas/examples/, sent to the app, their answers checked field by field.

Hand calculations are written beside each check (invented demo scenario: Larkspur Bakery).
"""

import json

import pytest

from tests.paths import EXAMPLES


def send(client, path, name):
    body = json.loads((EXAMPLES / name).read_text())
    response = client.post(path, json=body)
    assert response.status_code == 200, response.get_data(as_text=True)
    assert response.mimetype == "application/json"
    answer = response.get_json()
    assert not list(float_noise(answer)), list(float_noise(answer))
    return answer


def float_noise(node, where=""):
    """Numbers with more significant digits than any precision rule leaves (DESIGN.md: no 75.00000000000001)."""
    if isinstance(node, dict):
        for key, value in node.items():
            yield from float_noise(value, f"{where}/{key}")
    elif isinstance(node, list):
        for index, value in enumerate(node):
            yield from float_noise(value, f"{where}/{index}")
    elif isinstance(node, float) and len(repr(node).replace("-", "").replace(".", "").strip("0")) > 9:
        yield f"{where}: {node!r}"


def test_every_example_is_sent_by_a_test():
    sent = {
        "circuits-check.json",
        "circuits-check-batch.json",
        "fault-current.json",
        "fault-current-conductors.json",
        "disconnection-time.json",
        "max-zs.json",
        "protective-conductor.json",
        "circuits-size.json",
        "circuits-max-length.json",
        "test-results-verify.json",
        "installations-check.json",  # tests/api/test_installation_views.py
    }
    assert {p.name for p in EXAMPLES.glob("*.json")} == sent


def test_circuit_check_example(client):
    r = send(client, "/v1/circuits/check", "circuits-check.json")
    # R1+R2 = (3.08 + 7.41) x 1.20 x 18 / 1000 = 0.226584; Zs = 0.506584; If = 218.5 / Zs = 431.32 A
    # (numbers to the precision of DESIGN.md: ohms to 4 decimals, currents to 0.1 A)
    assert r["id"] == "larkspur-oven"
    assert r["r1_plus_r2_ohm"] == 0.2266 and r["zs_ohm"] == 0.5066
    assert r["earth_fault_current_a"] == 431.3 and r["earth_fault_current_nominal_a"] == 454.0
    assert r["disconnection_time_s"] == 0.1 and r["disconnection_time_bound"] == "at-most"
    assert r["max_disconnection_time_s"] == 0.4 and "Table 41.1" in r["max_disconnection_basis"]
    assert r["operating_current_a"] == 160  # 5 In, BS 7671 Table 41.3
    assert r["max_zs_ohm"] == 1.3656  # 0.95 x 230 / 160
    assert r["zs_margin_percent"] == 62.9  # (1.365625 - 0.506584) / 1.365625
    pc = r["protective_conductor"]
    assert pc["k"] == 115 and pc["csa_mm2"] == 2.5 and pc["verdict"] == "pass"
    # class 3 (given) lets through at most 18 000 A2s (BS EN 60898-1 Annex ZA, tests/data, from memory): 1.167 mm2
    assert pc["min_csa_mm2"] == 1.167 and pc["energy_a2s"] == 18000
    # short circuit: Zpn 0.19 ohm given; Imin = 218.5 / (0.19 + 2 x 3.08 x 1.2 x 18 / 1000) = 676.4 A >= 160 A
    assert r["line_neutral_loop_ohm"] == 0.19 and r["min_short_circuit_current_a"] == 676.4
    # overload: Ib 26 <= In 32 <= Iz 47 A (Table 4D5, 6 mm2 clipped direct, from memory)
    assert r["overload"]["iz_a"] == 47 and r["overload"]["verdict"] == "pass"
    assert [c["check"] for c in r["checks"]] == [
        "disconnection-time",
        "max-zs",
        "short-circuit",
        "protective-conductor",
        "breaking-capacity",
        "overload",
        "voltage-drop",
        "additional-protection",  # a cooker in a shop, on the surface: no 30 mA RCD required (BS 7671 411.3)
    ]
    assert r["edition"] == "BS 7671:2018+A4:2026" and r["verdict_scope"]["not_assessed"]
    # 7.3 mV/A/m (Table 4D5, 6 mm2, from memory) x 26 A x 18 m = 3.42 V = 1.49 % of 230 V
    assert r["voltage_drop_from_origin_percent"] == 1.49
    assert all(c["verdict"] == "pass" for c in r["checks"])
    assert r["verdict"] == "pass" and r["verdict_scope"]["left_out"] == []
    assert any("competent person" in c for c in r["cautions"])


def test_an_earth_fault_only_question(client):
    body = json.loads((EXAMPLES / "circuits-check.json").read_text())
    del body["circuit"]["design_current_a"]
    body["checks"] = ["disconnection-time", "max-zs", "protective-conductor"]
    r = client.post("/v1/circuits/check", json=body).get_json()
    assert r["verdict"] == "pass" and "overload" in r["verdict_scope"]["left_out"]
    body["checks"] = ["max-zs", "max-zs"]
    bad = client.post("/v1/circuits/check", json=body)
    assert bad.status_code == 422 and bad.get_json()["errors"][0]["pointer"] == "/checks"


def test_batch_example(client):
    r = send(client, "/v1/circuits/check-batch?form=full", "circuits-check-batch.json")
    items = r["results"]
    assert [i["index"] for i in items] == [0, 1, 2, 3]
    assert [i["id"] for i in items] == [
        "larkspur-oven",
        "larkspur-garden-lights",
        "larkspur-mixer",
        "larkspur-shop-ring",
    ]
    assert items[0]["result"]["verdict"] == "pass"
    assert items[1]["result"]["verdict"] == "fail"  # Zs 1.68472 > 1.0925 (C20)
    assert items[2]["problem"]["status"] == 422  # no 17 A BS 88-2 fuse
    assert items[2]["problem"]["errors"][0]["pointer"] == "/circuits/2/device/rating_a"
    assert items[3]["result"]["r1_plus_r2_ohm"] == 0.3746  # (0.47424 + 0.7744) x 1.2 / 4
    assert r["summary"] == {"circuits": 4, "pass": 2, "fail": 1, "not-verified": 0, "invalid": 1}


def test_the_lean_batch_says_each_text_once_and_matches_the_full_form(client):
    full = send(client, "/v1/circuits/check-batch?form=full", "circuits-check-batch.json")
    lean = send(client, "/v1/circuits/check-batch", "circuits-check-batch.json")
    table, texts = lean["columns"], lean["texts"]
    assert lean["form"] == "lean" and lean["summary"] == full["summary"] and len(texts) == len(set(texts))
    assert table["verdict"] == ["pass", "fail", "invalid", "pass"] and table["problem"][2] == 0
    assert lean["problems"][0]["problem"] == full["results"][2]["problem"]
    for i in (0, 1, 3):
        result = full["results"][i]["result"]
        assert table["zs_ohm"][i] == result["zs_ohm"] and table["id"][i] == result["id"]
        assert lean["devices"][table["device"][i]] == result["device"]
        for check in result["checks"]:
            name = check["check"]
            assert table[f"{name}.verdict"][i] == check["verdict"] and table[f"{name}.value"][i] == check["value"]
            assert texts[table[f"{name}.basis"][i]] == check["basis"]
        own = [texts[k] for k in table["cautions"][i] or []]
        assert lean["cautions"] + own == result["cautions"]


def test_fault_current_examples(client):
    r = send(client, "/v1/fault-current", "fault-current.json")
    # to the precision of their units (DESIGN.md: currents to 0.1 A, ohms to 4 decimals, kA to 0.001 kA)
    assert r["earth_fault_current_a"] == round(0.95 * 230 / 0.8, 1)  # 273.125 A
    assert r["earth_fault_current_nominal_a"] == 287.5  # 230 / 0.8
    assert r["r1_plus_r2_ohm"] is None and r["prospective_fault_current_ka"] is None
    r = send(client, "/v1/fault-current", "fault-current-conductors.json")
    assert r["r1_plus_r2_ohm"] == round(0.226584, 4) and r["zs_ohm"] == round(0.506584, 4)
    assert r["prospective_fault_current_ka"] == round(230 * 1.1 / 0.28 / 1000, 3)  # U0 cmax / Ze


def test_disconnection_time_example(client):
    r = send(client, "/v1/disconnection-time", "disconnection-time.json")
    # BS 88-3 32 A: Ia(0.4 s) = 239.6 A (BS 7671:2008+A1 Table 41.2 via tests/data/fuse-operating-currents.csv)
    assert r["time_s"] == 0.4 and r["bound"] == "interpolated" and r["region"] == "fuse-curve"
    assert r["device"]["device_id"] == "bs-88-3-gg" and r["rcd_time_s"] is None


def test_max_zs_example(client):
    r = send(client, "/v1/max-zs", "max-zs.json")
    assert r["operating_current_a"] == 160
    # 0.95 x 230 / 160 = 1.365625, to 4 decimals (ohms); BS 7671 Table 41.3 B32: 1.37
    assert r["max_zs_ohm"] == 1.3656
    assert r["max_measured_zs_ohm"] == round(1.365625 / 1.2, 4)  # at 20 degC against 70 degC
    assert r["max_measured_zs_rule_of_thumb_ohm"] == round(1.365625 * 0.8, 4)
    assert r["rcd_max_zs_ohm"] is None


def test_protective_conductor_example(client):
    r = send(client, "/v1/protective-conductor", "protective-conductor.json")
    # S = sqrt(900^2 x 0.4) / 115 = 4.95 mm2 -> 6 mm2; Table 54.7 for 10 mm2 line: 10 mm2
    assert r["k"] == 115 and r["k_tabulated"] == 115
    assert r["min_csa_mm2"] == round((900**2 * 0.4) ** 0.5 / 115, 3)
    assert r["k_formula"] == 114.8  # Annex A formula for 70 -> 160 degC copper, to 0.1
    assert r["csa_mm2"] == 6 and r["selection_csa_mm2"] == 10
    assert r["verdict"] == "fail"  # 4 mm2 chosen: below 4.95 mm2 and below Table 54.7's 10 mm2


def test_devices_and_characteristic(client):
    r = client.get("/v1/devices").get_json()
    assert any(d["device_id"] == "bs-en-60898-b" for d in r["devices"])
    r = client.get("/v1/devices/bs-en-60898-b/32/characteristic")
    assert r.status_code == 200
    points = r.get_json()["points"]
    assert points[-1] == {"current_a": 160, "time_s": 0.1, "estimated": False}
    assert client.get("/v1/devices/bs-88-2-gg/17/characteristic").status_code == 404
    assert client.get("/v1/devices/nothing/32/characteristic").status_code == 404


def test_health(client):
    assert client.get("/healthz").get_json() == {"status": "ok"}
    assert client.get("/readyz").get_json() == {"status": "ready"}
    text = client.get("/metrics").get_data(as_text=True)
    assert "faultpath_requests_total" in text and "faultpath_verdicts_total" in text


def test_api_size_and_max_length_examples(client):
    body = json.loads((EXAMPLES / "circuits-size.json").read_text())
    r = client.post("/v1/circuits/size", json=body)
    assert r.status_code == 200, r.get_data(as_text=True)
    out = r.get_json()
    # RCBO B25 30 mA: the same sizes as the hand calculation above; with the RCD the loop limit is 50 V / 30 mA
    assert out["device"]["rating_a"] == 25 and out["selected"]["line_csa_mm2"] == 4
    assert [t["ruled_out_by"] for t in out["tried"]] == ["capacity", "voltage-drop"]
    assert out["max_length"]["limited_by"] == "voltage-drop"
    assert out["max_length"]["max_length_m"] == pytest.approx(43.5606, abs=1e-3)
    r = client.post("/v1/circuits/max-length", json=json.loads((EXAMPLES / "circuits-max-length.json").read_text()))
    assert r.status_code == 200 and r.get_json()["limited_by"] == "voltage-drop"
    bad = dict(body, installation={"cable": "flat-twin-earth-70c", "installation_method": "E"})
    r = client.post("/v1/circuits/size", json=bad)
    assert r.status_code == 422 and r.get_json()["errors"][0]["pointer"] == "/installation/installation_method"


def test_api_verify_example(client):
    r = client.post("/v1/test-results/verify", json=json.loads((EXAMPLES / "test-results-verify.json").read_text()))
    assert r.status_code == 200, r.get_data(as_text=True)
    ring, oven = r.get_json()["results"]
    judged = {j["test"]: j for j in ring["result"]["judgements"]}
    # ring: max Zs 1.3656 ohm x (1.0 / 1.2) = 1.1380 ohm for a value measured at 20 degC; 0.8 rule 1.0925 ohm
    assert judged["zs"]["limit"] == 1.138 and judged["zs"]["rule_of_thumb_limit"] == 1.0925
    # TN continuity: the design's loop at 20 degC, 0.28 + 0.374592 / 1.2 = 0.5922 ohm; 0.62 ohm measured is near it
    assert judged["zs-continuity"]["verdict"] == "pass"
    # R1+R2 0.30 ohm at 20 degC -> 0.36 ohm at 70 degC; + Ze 0.28 = 0.64 <= 1.3656
    assert judged["r1-plus-r2"]["corrected_value"] == 0.36 and judged["r1-plus-r2"]["verdict"] == "pass"
    assert judged["rcd-time-idn"]["limit"] == 300 and judged["rcd-time-5idn"]["limit"] == 40
    assert ring["result"]["verdict"] == "pass"
    # oven at 15 degC: limit 1.3656 x (0.98 / 1.2) = 1.1152 ohm < 1.2 ohm measured -> fail
    assert oven["result"]["judgements"][0]["limit"] == 1.1153
    assert oven["result"]["verdict"] == "fail"
