"""No float noise anywhere (DESIGN.md conventions: ohms to 4 decimals, currents to 0.1 A, times and energies to 3
significant figures ...): every example answer, an installation with awkward figures, its report and the CLI's CSV.
Common practice: no figure a client reads may carry more digits than its precision rule leaves."""

import json
import re
import subprocess
import sys

from bench.payload import installation
from tests.api.test_api_examples import EXAMPLES, float_noise

PATHS = {
    "circuits-check.json": "/v1/circuits/check",
    "circuits-check-batch.json": "/v1/circuits/check-batch?form=full",
    "fault-current.json": "/v1/fault-current",
    "fault-current-conductors.json": "/v1/fault-current",
    "disconnection-time.json": "/v1/disconnection-time",
    "max-zs.json": "/v1/max-zs",
    "protective-conductor.json": "/v1/protective-conductor",
    "circuits-size.json": "/v1/circuits/size",
    "circuits-max-length.json": "/v1/circuits/max-length",
    "installations-check.json": "/v1/installations/check",
    "test-results-verify.json": "/v1/test-results/verify",
}
NOISY = re.compile(r"\d+\.\d{7,}")  # a number printed with seven or more decimals


def test_every_example_answer_is_free_of_float_noise(client):
    assert set(PATHS) == {p.name for p in EXAMPLES.glob("*.json")}
    for name, path in PATHS.items():
        answer = client.post(path, json=json.loads((EXAMPLES / name).read_text())).get_json()
        assert not list(float_noise(answer)), (name, list(float_noise(answer))[:5])


def awkward():
    """The bench's installation with awkward figures: diversities of 0.73, odd lengths, stated feed currents."""
    body = installation(n_circuits=120, groups=2, per_group=2)
    for board in body["boards"]:
        board["diversity"] = 0.73
        for k, circuit in enumerate(board["circuits"]):
            circuit["conductors"]["length_m"] = round(circuit["conductors"]["length_m"] * 1.0137 + k / 7, 3)
            if "feeds_board" not in circuit:
                circuit["design_current_a"] = round(circuit.get("design_current_a", 10) * 0.917, 3)
    return body


def test_an_installation_and_its_report_are_free_of_float_noise(client):
    body = awkward()
    answer = client.post("/v1/installations/check", json=body).get_json()
    assert not list(float_noise(answer)), list(float_noise(answer))[:5]
    html = client.post("/v1/installations/report", json=body).get_data(as_text=True)
    text = re.sub(r"<svg.*?</svg>", "", html, flags=re.S)  # the pictures' coordinates are drawing, not figures
    assert not NOISY.findall(text), NOISY.findall(text)[:5]


def test_the_clis_csv_is_free_of_float_noise(tmp_path):
    out = tmp_path / "results.csv"
    command = [sys.executable, "-m", "service", "check", str(EXAMPLES / "circuits-check-batch.json"), "-o", str(out)]
    subprocess.run(command, capture_output=True, timeout=120, check=False)
    assert out.read_text().count("\n") == 5 and not NOISY.findall(out.read_text())
