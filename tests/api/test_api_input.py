"""Bad input always gets a clear 4xx problem+json naming the field and the reason, never a 500."""

import json

import pytest

from service.app import create_app
from service.settings import Settings
from tests.paths import EXAMPLES

EXAMPLE = json.loads((EXAMPLES / "circuits-check.json").read_text())


def post_raw(client, data, content_type="application/json", path="/v1/circuits/check"):
    return client.post(path, data=data, content_type=content_type)


def assert_problem(response, status, pointer=None):
    assert response.status_code == status, response.get_data(as_text=True)
    assert response.mimetype == "application/problem+json"
    body = response.get_json()
    assert body["status"] == status and body["title"] and isinstance(body["errors"], list)
    if pointer is not None:
        assert pointer in [e["pointer"] for e in body["errors"]], body
    return body


@pytest.mark.parametrize(
    "text",
    [
        '{"supply": NaN}',
        '{"supply": Infinity}',
        '{"supply": -Infinity}',
        '{"a": 1, "a": 2}',
        '{"n": ' + "9" * 5000 + "}",
        '{"n": ' + "9" * 50 + "}",
        "[" * 100_000 + "]" * 100_000,
        '{"n": 1e999}',
        "{",
        "\xff\xfe",
        '{"supply": {"u0_v": 230, "u0_v": 240}}',
    ],
)
def test_strict_json_gives_400(client, text):
    data = text.encode("latin-1") if text.startswith("\xff") else text.encode()
    body = assert_problem(post_raw(client, data), 400, "")
    assert body["errors"][0]["message"].startswith("the body is not strict JSON")


def test_number_as_string_is_422(client):
    bad = json.loads(json.dumps(EXAMPLE))
    bad["supply"]["u0_v"] = "230"
    assert_problem(client.post("/v1/circuits/check", json=bad), 422, "/supply/u0_v")


def test_boolean_as_number_is_422(client):
    bad = json.loads(json.dumps(EXAMPLE))
    bad["circuit"]["conductors"]["length_m"] = True
    assert_problem(client.post("/v1/circuits/check", json=bad), 422, "/circuit/conductors/length_m")


@pytest.mark.parametrize(
    "pointer, value",
    [
        ("/supply/ze_ohm", 0),
        ("/supply/ze_ohm", -1),
        ("/supply/ze_ohm", 5e-324),
        ("/supply/ze_ohm", 1e300),
        ("/circuit/conductors/length_m", -5),
        ("/circuit/conductors/length_m", 1e9),
        ("/supply/u0_v", 20),
        ("/circuit/device/rating_a", 0),
        ("/supply/earthing", "IT"),
        ("/circuit/device/type", "K"),
        ("/circuit/conductors/parallel_cables", 1.5),
        ("/circuit/role", 7),
    ],
)
def test_out_of_range_or_unknown_values_are_422(client, pointer, value):
    bad = json.loads(json.dumps(EXAMPLE))
    target = bad
    parts = pointer.strip("/").split("/")
    for part in parts[:-1]:
        target = target[part]
    target[parts[-1]] = value
    assert_problem(client.post("/v1/circuits/check", json=bad), 422, pointer)


def test_core_rejections_name_the_field(client):
    bad = json.loads(json.dumps(EXAMPLE))
    bad["circuit"]["conductors"]["line_csa_mm2"] = 3  # not an IEC 60228 size
    body = assert_problem(client.post("/v1/circuits/check", json=bad), 422, "/circuit/conductors/line_csa_mm2")
    assert "IEC 60228" in body["errors"][0]["message"]
    bad = json.loads(json.dumps(EXAMPLE))
    bad["circuit"]["device"] = {"standard": "BS 88-2", "rating_a": 17}
    assert_problem(client.post("/v1/circuits/check", json=bad), 422, "/circuit/device/rating_a")
    bad = json.loads(json.dumps(EXAMPLE))
    bad["supply"]["u0_v"] = 50
    assert_problem(client.post("/v1/circuits/check", json=bad), 422, "/supply/u0_v")


def test_missing_and_unknown_fields(client):
    bad = json.loads(json.dumps(EXAMPLE))
    del bad["circuit"]["device"]["rating_a"]
    bad["circuit"]["colour"] = "blue"
    body = assert_problem(client.post("/v1/circuits/check", json=bad), 422)
    pointers = {e["pointer"] for e in body["errors"]}
    assert {"/circuit/device/rating_a", "/circuit/colour"} <= pointers


def test_empty_body_is_422(client):
    assert_problem(post_raw(client, b""), 422, "/supply")


def test_wrong_or_missing_content_type_is_415(client):
    assert_problem(post_raw(client, json.dumps(EXAMPLE), "text/plain"), 415, "")
    assert_problem(client.post("/v1/circuits/check", data=json.dumps(EXAMPLE)), 415)


def test_body_over_the_limit_is_413():
    small = create_app({"SETTINGS": Settings(max_body_bytes=1000)}).test_client()
    assert_problem(
        small.post("/v1/circuits/check", data=b"{" + b" " * 2000 + b"}", content_type="application/json"), 413
    )


def test_batch_over_the_limit_is_413(client, app):
    body = {"supply": EXAMPLE["supply"], "circuits": [EXAMPLE["circuit"]] * (app.config["FAULTPATH_BATCH_LIMIT"] + 1)}
    assert_problem(client.post("/v1/circuits/check-batch", json=body), 413)


def test_batch_keeps_every_item(client):
    bad = dict(EXAMPLE["circuit"], conductors=dict(EXAMPLE["circuit"]["conductors"], length_m="far"))
    body = {
        "supply": EXAMPLE["supply"],
        "circuits": [EXAMPLE["circuit"], bad, {"nonsense": 1}, "text", EXAMPLE["circuit"]],
    }
    r = client.post("/v1/circuits/check-batch?form=full", json=body)
    assert r.status_code == 200
    items = r.get_json()["results"]
    assert len(items) == 5 and [i["index"] for i in items] == [0, 1, 2, 3, 4]
    assert "result" in items[0] and "result" in items[4]
    assert items[1]["problem"]["errors"][0]["pointer"] == "/circuits/1/conductors/length_m"
    assert items[1]["id"] == "larkspur-oven"
    assert items[3]["problem"]["status"] == 422 and items[3]["id"] is None
    assert r.get_json()["summary"]["invalid"] == 3


def test_the_full_form_written_a_chunk_at_a_time_is_one_document_in_order(client, monkeypatch):
    """Past a chunk's end (service/contract/batch.py CHUNK, made small here) the answer is still one JSON
    document with every item in order, its length said, and a bad item on either side of a boundary in its
    place."""
    from service.contract import batch

    monkeypatch.setattr(batch, "CHUNK", 3)
    circuits = [EXAMPLE["circuit"]] * 8
    circuits[2] = circuits[3] = {"id": "no-such-circuit"}
    r = client.post("/v1/circuits/check-batch?form=full", json={"supply": EXAMPLE["supply"], "circuits": circuits})
    assert r.status_code == 200 and int(r.headers["Content-Length"]) == len(r.data)
    items = r.get_json()["results"]
    assert [i["index"] for i in items] == list(range(8))
    assert [i["index"] for i in items if "problem" in i] == [2, 3]
    assert r.get_json()["summary"]["invalid"] == 2 and r.get_json()["summary"]["circuits"] == 8


def test_unknown_path_and_method(client):
    assert_problem(client.get("/v1/nothing"), 404)
    r = client.get("/v1/circuits/check")
    assert_problem(r, 405)
    assert "POST" in r.headers["Allow"]


def test_a_500_returns_only_an_error_id(app, monkeypatch, caplog):
    from service.serving import coalescer as coalesce

    def explode(*args, **kwargs):
        raise RuntimeError("secret internals")

    monkeypatch.setattr(coalesce, "check_circuits", explode)
    app.config["PROPAGATE_EXCEPTIONS"] = False
    r = app.test_client().post("/v1/circuits/check", json=EXAMPLE)
    body = assert_problem(r, 500)
    assert body["error_id"] and "secret" not in r.get_data(as_text=True)
    assert body["error_id"] in caplog.text


def test_output_never_holds_nan_or_infinity(client):
    body = json.loads(json.dumps(EXAMPLE))
    body["circuit"]["conductors"]["length_m"] = 4000  # no disconnection: time null, not Infinity
    r = client.post("/v1/circuits/check", json=body)
    text = r.get_data(as_text=True)
    assert r.status_code == 200 and "NaN" not in text and "Infinity" not in text
    assert r.get_json()["disconnection_time_s"] is None


def test_batch_streams_ndjson_in_order(client):
    bad = dict(EXAMPLE["circuit"], device={"standard": "BS 88-2", "rating_a": 17})
    body = {"supply": EXAMPLE["supply"], "circuits": [EXAMPLE["circuit"], bad, EXAMPLE["circuit"]]}
    r = client.post("/v1/circuits/check-batch", json=body, headers={"Accept": "application/x-ndjson"})
    assert r.status_code == 200 and r.mimetype == "application/x-ndjson"
    lines = [json.loads(line) for line in r.get_data(as_text=True).splitlines()]
    assert [line.get("index") for line in lines[:3]] == [0, 1, 2]
    assert "result" in lines[0] and "problem" in lines[1] and "result" in lines[2]
    assert lines[3] == {
        "summary": {"circuits": 3, "pass": 2, "fail": 0, "not-verified": 0, "invalid": 1},
        "edition": "BS 7671:2018+A4:2026",
    }
    plain = client.post("/v1/circuits/check-batch?form=full", json=body).get_json()
    assert [line for line in lines[:3]] == plain["results"]


def test_tt_ze_below_the_electrode_names_both_fields(client):
    bad = json.loads(json.dumps(EXAMPLE))
    bad["supply"] = {"earthing": "TT", "u0_v": 230, "ze_ohm": 0.8, "electrode_ohm": 100}
    body = assert_problem(client.post("/v1/circuits/check", json=bad), 422)
    assert {"/supply/ze_ohm", "/supply/electrode_ohm"} <= {e["pointer"] for e in body["errors"]}


def test_an_unknown_check_or_energy_class_is_422(client):
    bad = json.loads(json.dumps(EXAMPLE))
    bad["checks"] = ["earthing"]
    assert_problem(client.post("/v1/circuits/check", json=bad), 422, "/checks/0")
    bad = json.loads(json.dumps(EXAMPLE))
    bad["circuit"]["device"]["energy_limiting_class"] = 4
    assert_problem(client.post("/v1/circuits/check", json=bad), 422, "/circuit/device/energy_limiting_class")
    bad = json.loads(json.dumps(EXAMPLE))
    bad["circuit"]["installation"]["installation_method"] = "E"  # not a method of Table 4D5
    assert_problem(client.post("/v1/circuits/check", json=bad), 422, "/circuit/installation/installation_method")
