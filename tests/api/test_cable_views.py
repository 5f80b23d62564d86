"""GET /v1/cables, and the cable arrangements through the API: sizing a ring, refusing a ring in parallel."""

import json

from tests.paths import EXAMPLES


def test_the_cable_families_say_what_exists(client):
    response = client.get("/v1/cables")
    assert response.status_code == 200
    families = {f["cable"]: f for f in response.get_json()["cables"]}
    assert {
        "single-core-70c",
        "multicore-armoured-70c",
        "multicore-armoured-90c-aluminium",
        "mineral-heavy-70c",
    } <= set(families)
    singles = families["single-core-70c"]
    method_b = next(m for m in singles["methods"] if m["method"] == "B")
    assert 2.5 in method_b["sizes_mm2"]["single-phase"] and singles["insulation"] == "thermoplastic-70"
    assert "4D1A" in singles["data"]["source"] and "memory" in singles["data"]["confidence"]
    assert families["multicore-armoured-90c-aluminium"]["material"] == "aluminium"


def sizing(**changes):
    body = json.loads((EXAMPLES / "circuits-size.json").read_text())
    body.update(changes)
    return body


def test_sizing_a_ring_and_refusing_one_in_parallel(client):
    ring = sizing(ring=True, design_current_a=26, load="socket-outlets", length_m=60)
    ring["installation"] = {"cable": "flat-twin-earth-70c", "installation_method": "C"}
    out = client.post("/v1/circuits/size", json=ring).get_json()
    assert out["selected"]["ring"] is True and out["device"]["rating_a"] in (30, 32)
    both = dict(ring, parallel_cables=2)
    response = client.post("/v1/circuits/size", json=both)
    assert response.status_code == 422 and response.get_json()["errors"][0]["pointer"] == "/ring"


def test_buried_grouping_needs_its_spacing_named(client):
    body = sizing(role="distribution", design_current_a=50)
    body.pop("load", None)
    body["installation"] = {"cable": "multicore-armoured-90c", "installation_method": "D",
                            "grouping": "buried-direct", "grouped_circuits": 3}  # fmt: skip
    response = client.post("/v1/circuits/size", json=body)
    assert response.status_code == 422
    assert response.get_json()["errors"][0]["pointer"] == "/installation/buried_spacing"
