"""Every error the API returns is in the project's own words, naming the field and what it must be."""

import pytest

STOCK = (
    "Missing data for required field",
    "Not a valid",
    "Unknown field",
    "Must be one of",
    "Must be greater",
    "Invalid JSON body",
    "Expecting property name",
    "The requested URL was not found",
    "The method is not allowed",
    "Field may not be null",
    "Length must be",
)


def texts(body):
    return [body.get("detail", "")] + [e["message"] for e in body["errors"]]


@pytest.mark.parametrize(
    ("method", "path", "kwargs", "status", "wording"),
    [
        ("get", "/v1/nothing", {}, 404, "Nothing is served at this path"),
        ("get", "/v1/circuits/check", {}, 405, "This path takes OPTIONS, POST"),
        (
            "post",
            "/v1/circuits/check",
            {"json": {"supply": {"earthing": "XX"}}},
            422,
            "must be one of: TN-S, TN-C-S, TT",
        ),
        ("post", "/v1/circuits/check", {"json": {"supply": {}}}, 422, "required: give this field"),
        ("post", "/v1/circuits/check", {"json": {"nonsense": 1}}, 422, "not a field of this object"),
        ("post", "/v1/fault-current", {"json": {"u0_v": 20, "zs_ohm": 0.5}}, 422, "must be from 50 to 1000"),
        ("post", "/v1/circuits/check", {"data": "{", "content_type": "application/json"}, 400, "not JSON at line 1"),
        ("post", "/v1/circuits/check-batch?form=tiny", {"json": {}}, 422, "must be one of: lean, full"),
    ],
)
def test_the_wording_is_the_projects(client, method, path, kwargs, status, wording):
    response = getattr(client, method)(path, **kwargs)
    assert response.status_code == status and response.mimetype == "application/problem+json"
    said = texts(response.get_json())
    assert any(wording in t for t in said), said
    assert not any(stock in t for t in said for stock in STOCK), said
