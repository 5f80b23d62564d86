"""Text that cannot break the writer, bounded metrics, wrong keys slowed down, the open paths as set.

Common practice for a service on the open network (RFC 9457 problems; Prometheus label cardinality kept bounded)."""

import json

import pytest

from service.app import create_app
from service.settings import Settings
from tests.api.test_api_examples import EXAMPLES

SURROGATE_BODY = '{"supply": {"earthing": "TN-S", "u0_v": 230, "ze_ohm": 0.3}, "id": "\\ud800x"}'
BODY_PATHS = [
    "/v1/circuits/check",
    "/v1/circuits/check-batch",
    "/v1/circuits/picture",
    "/v1/installations/check",
    "/v1/installations/report",
    "/v1/fault-current",
    "/v1/disconnection-time",
    "/v1/max-zs",
    "/v1/protective-conductor",
    "/v1/circuits/size",
    "/v1/circuits/max-length",
    "/v1/test-results/verify",
]


@pytest.mark.parametrize("path", BODY_PATHS)
def test_a_lone_surrogate_is_a_400_naming_the_field_on_every_operation(client, path):
    r = client.post(path, data=SURROGATE_BODY, content_type="application/json")
    assert r.status_code == 400 and r.get_json()["errors"][0]["pointer"] == "/id", r.get_data(as_text=True)


def test_control_and_bidirectional_characters_are_refused_in_ids_and_long_ids_echoed_cut(client):
    body = json.loads((EXAMPLES / "circuits-check-batch.json").read_text())
    body["circuits"][0]["id"] = "lights\u202etxt.exe"
    body["circuits"][1]["id"] = "x" * 100_000
    body["circuits"][1]["role"] = "nonsense"
    body["circuits"][3]["id"] = "nul\x00here"
    items = client.post("/v1/circuits/check-batch?form=full", json=body).get_json()["results"]
    assert items[0]["problem"]["errors"][0]["pointer"] == "/circuits/0/id" and items[0]["id"] is None
    assert len(items[1]["id"]) == 200 and items[1]["id"].endswith("…")
    assert items[3]["problem"]["errors"][0]["pointer"] == "/circuits/3/id"


def test_random_methods_add_no_metrics_series(client):
    before = client.get("/metrics").get_data(as_text=True).count("faultpath_requests_total{")
    for k in range(20):
        client.open("/v1/circuits/check", method=f"X{k}FOO")
    after = client.get("/metrics").get_data(as_text=True)
    assert after.count("faultpath_requests_total{") <= before + 3 and 'method="other"' in after


def keyed(**changes):
    settings = Settings(require_keys="on", api_keys=("right-key",), key_failures="3/minute", **changes)
    return create_app({"SETTINGS": settings, "TESTING": True}).test_client()


def test_wrong_keys_slow_their_client_down():
    client = keyed()
    for _ in range(3):
        assert client.get("/v1/devices", headers={"X-API-Key": "wrong"}).status_code == 401
    blocked = client.get("/v1/devices", headers={"X-API-Key": "right-key"})
    assert blocked.status_code == 429 and int(blocked.headers["Retry-After"]) >= 1
    other = keyed()  # another worker, or the same client before its wrong keys
    assert other.get("/v1/devices", headers={"X-API-Key": "right-key"}).status_code == 200


def test_metrics_and_docs_are_open_by_default_and_can_be_closed():
    assert keyed().get("/metrics").status_code == 200 and keyed().get("/openapi.json").status_code == 200
    closed = keyed(open_paths=("probes",))
    assert closed.get("/metrics").status_code == 401 and closed.get("/docs").status_code == 401
    assert closed.get("/healthz").status_code == 200
    assert closed.get("/metrics", headers={"X-API-Key": "right-key"}).status_code == 200


def test_the_contract_declares_the_key():
    spec = keyed().get("/openapi.json").get_json()
    assert spec["components"]["securitySchemes"]["ApiKey"]["name"] == "X-API-Key"
    assert spec["paths"]["/v1/circuits/check"]["post"]["security"] == [{"ApiKey": []}, {}]
    assert spec["paths"]["/healthz"]["get"]["security"] == []


def test_a_body_with_too_many_circuits_is_a_413_before_it_is_parsed():
    app = create_app({"SETTINGS": Settings(batch_limit=50, max_body_bytes=8 * 1024 * 1024), "TESTING": True})
    item = {"role": "final", "load": "fixed-equipment", "device": {"standard": "BS EN 60898", "type": "B",
            "rating_a": 16}, "r1_plus_r2_ohm": 0.1}  # fmt: skip
    body = {"supply": {"earthing": "TN-S", "u0_v": 230, "ze_ohm": 0.3}, "circuits": [item] * 1000}
    r = app.test_client().post("/v1/circuits/check-batch", json=body)
    assert r.status_code == 413 and "1000 circuits" in r.get_json()["detail"]


def test_the_configured_timeout_holds_for_every_long_request():
    app = create_app({"SETTINGS": Settings(timeout_s=0.0), "TESTING": True})
    client = app.test_client()
    batch = json.loads((EXAMPLES / "circuits-check-batch.json").read_text())
    installation = json.loads((EXAMPLES / "installations-check.json").read_text())
    for path, body in (("/v1/circuits/check-batch", batch), ("/v1/installations/check", installation),
                       ("/v1/installations/report", installation)):  # fmt: skip
        r = client.post(path, json=body)
        assert r.status_code == 503 and r.mimetype == "application/problem+json", (path, r.status_code)
