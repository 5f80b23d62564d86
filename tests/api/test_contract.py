"""The published contract: the committed file equals the code's spec, and it is valid OpenAPI 3.1."""

import json

from openapi_spec_validator import validate

from service.app import spec_dict
from tests.paths import CONTRACT

REGENERATE = "python -m service openapi schemas/openapi.json"


def live_spec(app):
    with app.app_context():
        return json.loads(json.dumps(spec_dict(app.extensions["faultpath_api"])))


def test_committed_contract_matches_the_code(app):
    committed = json.loads(CONTRACT.read_text(encoding="utf-8"))
    assert committed == live_spec(app), f"the contract drifted from the code: run `{REGENERATE}` and review the diff"


def test_contract_is_valid_openapi_3_1():
    spec = json.loads(CONTRACT.read_text(encoding="utf-8"))
    assert spec["openapi"].startswith("3.1")
    validate(spec)


def test_every_endpoint_of_the_sketch_is_in_the_contract():
    paths = json.loads(CONTRACT.read_text(encoding="utf-8"))["paths"]
    for path in (
        "/v1/circuits/check",
        "/v1/circuits/check-batch",
        "/v1/fault-current",
        "/v1/disconnection-time",
        "/v1/max-zs",
        "/v1/protective-conductor",
        "/v1/devices",
        "/v1/devices/{device_id}/{rating_a}/characteristic",
        "/healthz",
        "/readyz",
        "/metrics",
    ):
        assert path in paths, path


def test_every_number_in_a_request_has_bounds():
    spec = json.loads(CONTRACT.read_text(encoding="utf-8"))
    schemas = spec["components"]["schemas"]
    requests = {
        "Supply",
        "Device",
        "CurvePoint",
        "Rcd",
        "Conductors",
        "Circuit",
        "FaultCurrentRequest",
        "DisconnectionRequest",
        "MaxZsRequest",
        "ProtectiveRequest",
    }
    for name in requests:
        for field, prop in schemas[name]["properties"].items():
            types = prop.get("type")
            if types in ("number", "integer") or (isinstance(types, list) and ({"number", "integer"} & set(types))):
                assert "minimum" in prop and "maximum" in prop, (name, field)
        assert schemas[name].get("additionalProperties") is False, name


def test_the_contract_has_nothing_client_generators_reject():
    # openapi-python-client cannot model an enum of numbers; every generator names functions by operationId;
    # a schema registered twice comes out as Foo and Foo1
    spec = json.loads(CONTRACT.read_text(encoding="utf-8"))

    def enums(node):
        if isinstance(node, dict):
            if "enum" in node:
                yield node["enum"]
            for value in node.values():
                yield from enums(value)
        elif isinstance(node, list):
            for value in node:
                yield from enums(value)

    assert all(isinstance(v, str) or v is None for values in enums(spec) for v in values)
    ids = [op["operationId"] for ops in spec["paths"].values() for m, op in ops.items() if m in ("get", "post")]
    assert len(ids) == len(set(ids)) and all(ids)
    names = spec["components"]["schemas"]
    assert not [n for n in names if n[-1].isdigit() and n[:-1] in names] and "PaginationMetadata" not in names
