"""Design, sheet, fill, verify: the site test sheet (installations/test-sheet) and test-results/verify agree on every
limit, as JSON and as CSV. The installation is the example's joinery (invented) with a kitchen ring added (invented)."""

import copy
import csv
import io
import json

import pytest

from tests.paths import EXAMPLES

BODY = json.loads((EXAMPLES / "installations-check.json").read_text())
RING = {
    "id": "kitchen ring",
    "role": "final",
    "load": "socket-outlets",
    "design_current_a": 20,
    "device": {"standard": "BS EN 61009", "type": "B", "rating_a": 32, "breaking_capacity_ka": 6,
               "rcd": {"residual_current_ma": 30, "type": "A"}},
    "conductors": {"material": "copper", "insulation": "thermoplastic-70", "line_csa_mm2": 2.5, "cpc_csa_mm2": 1.5,
                   "length_m": 45, "ring": True},
    "installation": {"cable": "flat-twin-earth-70c", "installation_method": "C", "concealed_in_wall": "no"},
}  # fmt: skip


@pytest.fixture
def body():
    out = copy.deepcopy(BODY)
    office = next(b for b in out["boards"] if b["id"] == "OFFICE")
    office["circuits"].append(copy.deepcopy(RING))
    return out


def sheet_of(client, body):
    r = client.post("/v1/installations/test-sheet", json=body)
    assert r.status_code == 200, r.get_json()
    return r.get_json()


def fill(sheet):
    """Readings a careful tester might take: each what the design leads one to expect."""
    for item in sheet["circuits"]:
        e, m = item["expected"], item["measured"]
        m["zs_ohm"] = e["expected_zs_ohm"]
        m["r1_plus_r2_ohm"] = e["expected_r1_plus_r2_ohm"]
        m["insulation_resistance_megohm"], m["insulation_test_voltage_v"] = 299, e["insulation_test_voltage_v"]
        m["polarity_confirmed"] = True
        if "ring_r1_ohm" in m:
            m["ring_r1_ohm"], m["ring_rn_ohm"], m["ring_r2_ohm"] = e["ring_r1_ohm"], e["ring_rn_ohm"], e["ring_r2_ohm"]
            m["r1_plus_r2_ohm"] = round((e["ring_r1_ohm"] + e["ring_r2_ohm"]) / 4, 4)
        if "rcd_time_ms_at_idn" in m:
            m["rcd_time_ms_at_idn"], m["rcd_time_ms_at_5idn"], m["rcd_tripped_at_half_idn"] = 24, 11, False
    return sheet


def test_the_sheet_says_what_to_find_on_site(client, body):
    sheet = sheet_of(client, body)
    items = {item["circuit"]["id"]: item for item in sheet["circuits"]}
    assert len(items) == 9 and set(sheet) >= {"edition", "supply", "circuits"}
    heater = items["heater"]["expected"]
    # BS 7671:2018 Table 41.3: B20 at 0.4 s, max Zs 2.19 ohm at 70 degC; at 20 degC x 1/(1 + 0.004 x 50) (Appendix 3)
    assert heater["max_zs_ohm"] == pytest.approx(2.19 / 1.2, abs=0.005)
    assert items["heater"]["board"] == "OFFICE" and items["heater"]["supply"]["ze_ohm"] > BODY["supply"]["ze_ohm"]
    ring = items["kitchen ring"]["expected"]
    # IEC 60228 Table 1 (class 2 copper at 20 degC): 2.5 mm2 7.41 mohm/m, 1.5 mm2 12.1 mohm/m; a 45 m ring end to end
    assert ring["ring_r1_ohm"] == pytest.approx(0.045 * 7.41, abs=0.001) == ring["ring_rn_ohm"]
    assert ring["ring_r2_ohm"] == pytest.approx(0.045 * 12.1, abs=0.001) and ring["ring_tolerance_ohm"] == 0.05
    # BS EN 61008-1 / 61009-1 Table 1: a general RCD within 300 ms at IΔn and 40 ms at 5 IΔn
    assert (ring["rcd_residual_current_ma"], ring["rcd_type"]) == (30, "A")
    assert (ring["rcd_max_time_ms_at_idn"], ring["rcd_max_time_ms_at_5idn"]) == (300, 40)
    assert (ring["insulation_test_voltage_v"], ring["insulation_min_megohm"]) == (500, 1.0)  # Table 64, from memory
    assert set(items["kitchen ring"]["measured"]) >= {"ring_r1_ohm", "rcd_time_ms_at_idn", "zs_ohm"}
    assert "ring_r1_ohm" not in items["heater"]["measured"] and items["heater"]["measured"]["zs_ohm"] is None


def test_a_filled_sheet_is_judged_against_the_limits_it_showed(client, body):
    sheet = fill(sheet_of(client, body))
    r = client.post("/v1/test-results/verify", json=sheet)
    assert r.status_code == 200, r.get_json()
    answer = r.get_json()
    assert answer["summary"] == {"circuits": 9, "pass": 9, "fail": 0, "not-verified": 0, "invalid": 0}
    for item, outcome in zip(sheet["circuits"], answer["results"], strict=True):
        judged = {j["test"]: j for j in outcome["result"]["judgements"]}
        assert judged["zs"]["limit"] == item["expected"]["max_zs_ohm"]
        assert judged["zs-continuity"]["limit"] == item["expected"]["continuity_max_zs_ohm"]
        assert judged["r1-plus-r2"]["limit"] == item["expected"]["max_r1_plus_r2_ohm"]
        assert outcome["result"]["counts"]["fail"] == 0


def test_a_reading_past_its_limit_fails_that_circuit_only(client, body):
    sheet = fill(sheet_of(client, body))
    heater = next(item for item in sheet["circuits"] if item["circuit"]["id"] == "heater")
    heater["measured"]["zs_ohm"] = round(heater["expected"]["max_zs_ohm"] + 0.01, 3)
    answer = client.post("/v1/test-results/verify", json=sheet).get_json()
    assert answer["summary"]["fail"] == 1 and answer["summary"]["pass"] == 8


def test_the_inspectors_answer_says_each_rule_as_a_rule(client, body):
    sheet = fill(sheet_of(client, body))
    ring = next(item for item in sheet["circuits"] if item["circuit"]["id"] == "kitchen ring")
    ring["measured"]["ring_rn_ohm"] = round(ring["measured"]["ring_r1_ohm"] + 0.06, 4)  # ends 0.06 ohm apart
    answer = client.post("/v1/test-results/verify", json=sheet).get_json()
    result = next(o["result"] for o in answer["results"] if o["id"] == "kitchen ring")
    judged = {j["test"]: j for j in result["judgements"]}
    # 643.2.1 (tolerance common practice): the ends within 0.05 ohm of each other, judged on the difference
    ends = judged["ring-r1-rn"]
    assert ends["verdict"] == "fail" and ends["measured"] == pytest.approx(0.06) and ends["limit"] == 0.05
    assert "within 0.05 ohm of each other" in ends["rule"] and "r1 " in ends["note"]
    assert judged["polarity"]["answer"] == "yes" == judged["polarity"]["required"]
    assert judged["rcd-half-idn"]["answer"] == "no" == judged["rcd-half-idn"]["required"]
    assert result["counts"] == {"pass": len(judged) - 1, "not-verified": 0, "fail": 1}


def cell(value):
    """A value as a person types it in a spreadsheet."""
    if isinstance(value, bool):
        return "yes" if value else "no"
    return "" if value is None else value


def csv_rows(text):
    return list(csv.DictReader(io.StringIO(text)))


def test_the_sheet_as_csv_filled_in_a_spreadsheet_is_judged_the_same(client, body):
    filled = {item["circuit"]["id"]: item["measured"] for item in fill(sheet_of(client, body))["circuits"]}
    r = client.post("/v1/installations/test-sheet", json=body, headers={"Accept": "text/csv"})
    assert r.status_code == 200 and r.mimetype == "text/csv"
    rows = csv_rows(r.get_data(as_text=True))
    for row in rows:
        for name, value in filled[row["id"]].items():
            row[f"measured_{name}"] = (
                {True: "yes", False: "no", None: ""}.get(value, value) if value is not None else ""
            )
    text = written(rows)
    r = client.post("/v1/test-results/verify", data=text.encode(), content_type="text/csv")
    assert r.status_code == 200, r.get_json()
    assert r.get_json()["summary"]["pass"] == 9
    rows[2]["measured_zs_ohm"] = "far"  # line 4 of the file: the header is line 1
    answer = client.post("/v1/test-results/verify", data=written(rows).encode(), content_type="text/csv").get_json()
    problem = answer["results"][2]["problem"]["errors"][0]
    assert problem == {"pointer": "/4/measured_zs_ohm", "message": "must be a number"}


def written(rows):
    """The rows as a spreadsheet saves them as "CSV UTF-8": a byte-order mark first (common practice)."""
    out = io.StringIO()
    writer = csv.DictWriter(out, fieldnames=list(rows[0]), lineterminator="\r\n")
    writer.writeheader()
    writer.writerows(rows)
    return "\ufeff" + out.getvalue()


def test_the_printable_sheet_lists_every_circuit(client, body):
    r = client.post("/v1/installations/test-sheet", json=body, headers={"Accept": "text/html"})
    assert r.status_code == 200 and r.mimetype == "text/html"
    page = r.get_data(as_text=True)
    assert page.count('class="circuit"') == 9 and "kitchen ring" in page and "Board OFFICE" in page


def test_a_csv_body_elsewhere_is_refused(client):
    r = client.post("/v1/circuits/check", data="a,b\n1,2\n", content_type="text/csv")
    assert r.status_code == 415 and "application/json" in r.get_json()["detail"]


def test_a_body_that_names_no_edition_gets_its_sheet_under_the_default(client, body):
    body.pop("edition")
    sheet = sheet_of(client, body)
    office = next(item for item in sheet["circuits"] if item["board"] == "OFFICE")
    assert "edition" not in sheet and office["expected"]["max_zs_ohm"] is not None
