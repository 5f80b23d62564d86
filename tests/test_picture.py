"""The time-current picture: its elements exist, and the same request gives the same bytes."""

import json
import xml.etree.ElementTree as ET
from pathlib import Path

EXAMPLE = json.loads((Path(__file__).resolve().parents[1] / "schemas" / "examples" / "circuits-check.json").read_text())
SVG = {"Accept": "image/svg+xml"}


def ids(svg_bytes):
    root = ET.fromstring(svg_bytes)
    return {el.get("id") for el in root.iter() if el.get("id")}, root


def test_device_curve_as_svg_with_cache_headers(client):
    r = client.get("/v1/devices/bs-88-2-gg/40/characteristic", headers=SVG)
    assert r.status_code == 200 and r.mimetype == "image/svg+xml"
    assert "max-age" in r.headers["Cache-Control"] and r.headers["ETag"]
    found, root = ids(r.data)
    assert root.tag.endswith("svg")
    assert {"axes", "legend", "curve-0", "curve-1", "curve-end", "published-points"} <= found
    text = r.get_data(as_text=True)
    assert "estimated (see device notes)" in text  # BS 88-2 40 A has no published 0.4 s point
    assert "prospective current (A)" in text and "maximum operating time (s)" in text
    for decade in ("100", "1000", "0.1", "10"):
        assert f">{decade}<" in text or f"{decade}</" in text
    assert client.get("/v1/devices/bs-88-2-gg/40/characteristic").mimetype == "application/json"


def test_circuit_picture_marks_the_operating_point_and_is_deterministic(client):
    first = client.post("/v1/circuits/picture", json=EXAMPLE)
    second = client.post("/v1/circuits/picture", json=EXAMPLE)
    assert first.status_code == 200 and first.mimetype == "image/svg+xml"
    assert first.data == second.data
    found, _ = ids(first.data)
    assert {"fault-current", "permitted-time", "operating-point", "operating-point-label"} <= found
    text = first.get_data(as_text=True)
    assert "BS EN 60898 B 32 A: pass" in text and "431 A, at most 0.1 s" in text


def test_picture_refuses_bad_input_as_problem_json(client):
    bad = json.loads(json.dumps(EXAMPLE))
    bad["circuit"]["device"]["rating_a"] = -3
    r = client.post("/v1/circuits/picture", json=bad)
    assert r.status_code == 422 and r.mimetype == "application/problem+json"
