"""`python -m service check FILE`: JSON and CSV schedules, outputs, exit codes."""

import csv
import io
import json
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
HEADER = (
    "id,earthing,u0_v,ze_ohm,prospective_fault_current_ka,line_neutral_loop_ohm,role,load,design_current_a,"
    "device_standard,device_type,rating_a,breaking_capacity_ka,energy_limiting_class,material,insulation,"
    "line_csa_mm2,cpc_csa_mm2,length_m,ring,cable,installation_method"
)
SUPPLY = "TN-C-S,230,0.28,2.1,0.19"
ROW = "final,fixed-equipment,26,BS EN 60898,B,32,6,3,copper,thermoplastic-70,6,2.5,{length},false,flat-twin-earth-70c,C"
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
    assert rows[1]["problem"] == "/1/length_m: Not a number."


def test_all_pass_exits_0_and_not_verified_exits_4(tmp_path):
    source = tmp_path / "board.csv"
    source.write_text("\n".join([HEADER, OVEN]) + "\n")
    assert run(str(source)).returncode == 0
    source.write_text("\n".join([HEADER, NO_IB]) + "\n")
    r = run(str(source))
    assert r.returncode == 4 and b"not-verified=1" in r.stderr  # every circuit must pass for 0


def test_unreadable_file_exits_2(tmp_path):
    assert run(str(tmp_path / "missing.json")).returncode == 2
