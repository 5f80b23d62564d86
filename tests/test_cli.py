"""`python -m service check FILE`: JSON and CSV schedules, outputs, exit codes."""

import csv
import io
import json
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
HEADER = (
    "id,earthing,u0_v,ze_ohm,prospective_fault_current_ka,line_neutral_loop_ohm,role,load,design_current_a,"
    "device_standard,device_type,rating_a,breaking_capacity_ka,energy_limiting_class,material,insulation,"
    "line_csa_mm2,cpc_csa_mm2,length_m,ring,cable,installation_method,premises,equipment,location,concealed_in_wall"
)
SUPPLY = "TN-C-S,230,0.28,2.1,0.19"
ROW = (
    "final,fixed-equipment,26,BS EN 60898,B,32,6,3,copper,thermoplastic-70,6,2.5,{length},false,flat-twin-earth-70c,C,"
    "other,cooker,general,no"
)
OVEN = f"oven,{SUPPLY}," + ROW.format(length=18)
BAD = f"bad,{SUPPLY}," + ROW.format(length="far")
NO_IB = OVEN.replace(",26,", ",,")  # no design current: overload cannot be checked


def run(*args, cwd=ROOT):
    return subprocess.run([sys.executable, "-m", "service", "check", *args], cwd=cwd, capture_output=True, timeout=120)


def test_json_schedule_gives_results_in_order_and_exit_1_on_a_failure():
    r = run(str(ROOT / "schemas" / "examples" / "circuits-check-batch.json"))
    assert r.returncode == 1  # the garden lights fail
    body = json.loads(r.stdout)
    assert [x["index"] for x in body["results"]] == [0, 1, 2, 3]
    assert body["results"][2]["problem"]["errors"][0]["pointer"] == "/circuits/2/device/rating_a"
    assert body["summary"] == {"circuits": 4, "pass": 2, "fail": 1, "not-verified": 0, "invalid": 1}
    assert b"circuits=4 pass=2 fail=1" in r.stderr


def test_csv_in_csv_out(tmp_path):
    source = tmp_path / "board.csv"
    source.write_text("\n".join([HEADER, OVEN, BAD]) + "\n")
    out = tmp_path / "results.csv"
    r = run(str(source), "-o", str(out))
    assert r.returncode == 3  # one row could not be checked, none failed
    rows = list(csv.DictReader(io.StringIO(out.read_text())))
    assert [row["verdict"] for row in rows] == ["pass", "invalid"]
    assert float(rows[0]["zs_ohm"]) == 0.5066  # Ze 0.28 + R1+R2 0.226584, to 4 decimals
    assert rows[1]["problem"] == "/3/length_m: must be a number"  # line 3 of the file: the header is line 1
    assert [row["line"] for row in rows] == ["2", "3"] and "cautions" in rows[0]


def test_a_spreadsheets_csv_utf8_with_a_byte_order_mark_is_read(tmp_path):
    # common practice: spreadsheets save "CSV UTF-8" with a byte-order mark before the header
    source = tmp_path / "board.csv"
    source.write_bytes(b"\xef\xbb\xbf" + ("\r\n".join([HEADER, OVEN]) + "\r\n").encode())
    r = run(str(source))
    assert r.returncode == 0, r.stderr
    assert json.loads(r.stdout)["results"][0]["line"] == 2


def test_a_cell_past_the_header_is_refused_with_its_line(tmp_path):
    source = tmp_path / "board.csv"
    source.write_text("\n".join([HEADER, OVEN, "", OVEN + ",surplus"]) + "\n")  # a blank line 3 counts as a line
    r = run(str(source))
    assert r.returncode == 3
    second = json.loads(r.stdout)["results"][1]
    assert second["line"] == 4 and second["problem"]["errors"][0]["pointer"] == "/4"
    assert "line 4 has 27 cells and the header 26" in second["problem"]["errors"][0]["message"]


def test_a_repeated_column_refuses_the_file_naming_it(tmp_path):
    source = tmp_path / "board.csv"
    source.write_text("\n".join([HEADER + ",u0_v", OVEN + ",400"]) + "\n")
    r = run(str(source))
    assert r.returncode == 2 and b"line 1: the columns ['u0_v'] appear more than once" in r.stderr


def test_the_csv_answer_carries_each_circuits_cautions_and_the_rules_it_fails(tmp_path):
    # a socket circuit on a plain breaker: BS 7671 411.3.3 calls for a 30 mA RCD
    sockets = OVEN.replace("fixed-equipment", "socket-outlets").replace(",cooker,", ",,")
    source = tmp_path / "board.csv"
    source.write_text("\n".join([HEADER, sockets]) + "\n")
    out = tmp_path / "results.csv"
    assert run(str(source), "-o", str(out)).returncode == 1
    (row,) = csv.DictReader(io.StringIO(out.read_text()))
    assert row["verdict"] == "fail" and "additional-protection" in row["failed_checks"]
    assert "additional-protection: fail: required, and no RCD is fitted" in row["cautions"]
    # in premises "other" an AFDD is only recommended for socket-outlets (421.1.7): a caution, never a fail
    assert "arc fault detection device (BS EN 62606) is recommended" in row["cautions"]


def test_all_pass_exits_0_and_not_verified_exits_4(tmp_path):
    source = tmp_path / "board.csv"
    source.write_text("\n".join([HEADER, OVEN]) + "\n")
    assert run(str(source)).returncode == 0
    source.write_text("\n".join([HEADER, NO_IB]) + "\n")
    r = run(str(source))
    assert r.returncode == 4 and b"not-verified=1" in r.stderr  # every circuit must pass for 0


def test_unreadable_file_exits_2(tmp_path):
    assert run(str(tmp_path / "missing.json")).returncode == 2


INSTALLATION = ROOT / "schemas" / "examples" / "installations-check.json"


def test_an_installation_file_gives_the_installation_answer_and_its_report(tmp_path):
    report = tmp_path / "joinery.html"
    r = run(str(INSTALLATION), "--report", str(report))
    assert r.returncode == 1, r.stderr  # the yard lights fail (voltage drop, tests/api/test_installation_views.py)
    body = json.loads(r.stdout)
    assert [b["id"] for b in body["boards"]] == ["MAIN", "WORKSHOP", "OFFICE"]
    assert body["boards"][1]["ze_ohm"] == 0.2883 and b"boards=3 circuits=8" in r.stderr
    html = report.read_text()
    assert html.startswith("<!doctype html>") and html.count('class="circuit"') == 8


def test_a_bad_tree_in_a_file_exits_2_naming_the_field(tmp_path):
    body = json.loads(INSTALLATION.read_text())
    body["boards"][2]["fed_from"] = "NOWHERE"
    source = tmp_path / "bad.json"
    source.write_text(json.dumps(body))
    r = run(str(source))
    assert r.returncode == 2 and b"/boards/2/fed_from" in r.stderr


def test_a_report_needs_an_installation_and_an_installation_answers_in_json(tmp_path):
    r = run(str(ROOT / "schemas" / "examples" / "circuits-check-batch.json"), "--report", str(tmp_path / "x.html"))
    assert r.returncode == 2 and b"--report needs an installation" in r.stderr
    r = run(str(INSTALLATION), "--format", "csv")
    assert r.returncode == 2 and b"answer is JSON" in r.stderr


def test_ndjson_and_strictness_of_a_json_read_incrementally(tmp_path):
    batch = json.loads((ROOT / "schemas" / "examples" / "circuits-check-batch.json").read_text())
    lines = tmp_path / "board.ndjson"
    lines.write_text("\n".join(json.dumps(x) for x in [{"supply": batch["supply"]}, *batch["circuits"]]) + "\n")
    r = run(str(lines))
    body = json.loads(r.stdout)
    assert r.returncode == 1 and [x["index"] for x in body["results"]] == [0, 1, 2, 3]
    assert body["results"][2]["problem"]["errors"][0]["pointer"] == "/circuits/2/device/rating_a"
    # the incremental JSON reader is as strict as the API's: a repeated key, NaN
    repeated = tmp_path / "repeated.json"
    text = json.dumps(batch).replace('"role": "final"', '"role": "final", "role": "final"', 1)
    repeated.write_text(text)
    r = run(str(repeated))
    assert r.returncode == 2 and b"duplicate key 'role'" in r.stderr
    nan = tmp_path / "nan.json"
    nan.write_text(json.dumps(batch).replace('"length_m": 18', '"length_m": NaN', 1))
    assert run(str(nan)).returncode == 2


def test_a_json_schedule_names_its_edition_and_premises_anywhere_at_its_top(tmp_path):
    # BS 7671:2018+A2:2022 asked for after the circuits: the answer follows A2 (tests/data/requirements-rules.md)
    body = json.loads((ROOT / "schemas" / "examples" / "circuits-check-batch.json").read_text())
    body.pop("edition")
    body["edition"] = "BS 7671:2018+A2:2022"
    source = tmp_path / "schedule.json"
    source.write_text(json.dumps(body))
    answer = json.loads(run(str(source)).stdout)
    bases = [c["basis"] for r in answer["results"] if "result" in r for c in r["result"]["checks"]]
    assert any(b.startswith("BS 7671:2018+A2:2022") for b in bases)
    assert not any(b.startswith("BS 7671:2018+A4:2026") for b in bases)


def test_design_writes_the_completed_installation_the_bill_and_the_report(tmp_path):
    body = json.loads(INSTALLATION.read_text())
    for board in body["boards"]:
        for circuit in board["circuits"]:
            circuit["device"].pop("rating_a")
            circuit["conductors"].pop("line_csa_mm2")
            circuit["conductors"].pop("cpc_csa_mm2")
    body["allowance_percent"] = 5
    source, completed = tmp_path / "left-out.json", tmp_path / "completed.json"
    source.write_text(json.dumps(body))
    bill, report = tmp_path / "bill.csv", tmp_path / "design.html"
    r = subprocess.run(
        [sys.executable, "-m", "service", "design", str(source), "-o", str(completed), "--bill", str(bill),
         "--report", str(report)],
        cwd=ROOT, capture_output=True, timeout=120,
    )  # fmt: skip
    assert r.returncode == 0, r.stderr
    assert run(str(completed)).returncode == 0  # the completed installation passes the check
    rows = list(csv.DictReader(io.StringIO(bill.read_text())))
    design = json.loads(completed.read_text())
    metres = sum(c["conductors"]["length_m"] for b in design["boards"] for c in b["circuits"])
    assert sum(float(r["quantity"]) for r in rows if r["item"] == "cable") == pytest.approx(metres * 1.05, abs=0.5)
    assert sum(int(r["quantity"]) for r in rows if r["item"] == "device") == 8 + 1  # the circuits' and the main fuse
    assert "Bill of quantities" in report.read_text()


def test_design_says_where_no_design_passes(tmp_path):
    body = json.loads(INSTALLATION.read_text())
    lights = body["boards"][0]["circuits"][2]
    lights["conductors"].pop("line_csa_mm2")
    lights["conductors"].pop("cpc_csa_mm2")
    lights["conductors"]["length_m"] = 1500
    source = tmp_path / "far.json"
    source.write_text(json.dumps(body))
    r = subprocess.run(
        [sys.executable, "-m", "service", "design", str(source)], cwd=ROOT, capture_output=True, timeout=120
    )
    assert r.returncode == 1 and b"no design passes: board MAIN, yard lights: voltage-drop" in r.stderr
