"""The offline docs page, API keys, CORS, request ids and headers."""

import json
import re

import pytest

from service.app import create_app
from service.settings import Settings
from tests.paths import EXAMPLES

EXAMPLE = json.loads((EXAMPLES / "fault-current.json").read_text())


def test_docs_page_and_every_asset_are_served_from_this_process(client, monkeypatch):
    import socket

    def no_network(*args, **kwargs):
        raise AssertionError("the docs page tried to reach the network")

    monkeypatch.setattr(socket, "create_connection", no_network)
    page = client.get("/docs")
    assert page.status_code == 200 and page.mimetype == "text/html"
    assert "default-src 'none'" in page.headers["Content-Security-Policy"]
    html = page.get_data(as_text=True)
    refs = re.findall(r'(?:src|href)="([^"]+)"', html)
    assert refs and all(ref.startswith("/docs/assets/") for ref in refs)
    for ref in refs:
        asset = client.get(ref)
        assert asset.status_code == 200 and len(asset.data) > 0, ref
    bundle = client.get("/docs/assets/swagger-ui-bundle.js").get_data(as_text=True)
    assert "SwaggerUIBundle" in bundle
    assert client.get("/openapi.json").get_json()["openapi"].startswith("3.1")
    assert client.get("/docs/assets/../app.py").status_code == 404


def keyed_app(**kwargs):
    return create_app({"SETTINGS": Settings(bind="0.0.0.0", api_keys=("k-one", "k-two"), **kwargs)}).test_client()


def test_keys_are_required_off_loopback():
    client = keyed_app()
    r = client.post("/v1/fault-current", json=EXAMPLE)
    assert r.status_code == 401 and r.mimetype == "application/problem+json"
    assert r.headers["WWW-Authenticate"].startswith("ApiKey")
    assert client.post("/v1/fault-current", json=EXAMPLE, headers={"X-API-Key": "wrong"}).status_code == 401
    assert client.post("/v1/fault-current", json=EXAMPLE, headers={"X-API-Key": "k-two"}).status_code == 200
    assert client.get("/healthz").status_code == 200  # probes need no key


def test_keys_not_required_on_loopback_and_refused_start_without_keys():
    client = create_app({"SETTINGS": Settings(bind="127.0.0.1")}).test_client()
    assert client.post("/v1/fault-current", json=EXAMPLE).status_code == 200
    with pytest.raises(RuntimeError):
        create_app({"SETTINGS": Settings(bind="0.0.0.0")})
    open_client = create_app({"SETTINGS": Settings(bind="0.0.0.0", require_keys="off")}).test_client()
    assert open_client.post("/v1/fault-current", json=EXAMPLE).status_code == 200


def test_keys_never_reach_the_logs(caplog):
    client = keyed_app()
    client.post("/v1/fault-current", json=EXAMPLE, headers={"X-API-Key": "k-one"})
    client.post("/v1/fault-current", json=EXAMPLE, headers={"X-API-Key": "guess-123"})
    assert "k-one" not in caplog.text and "guess-123" not in caplog.text


def test_cors_allowlist():
    client = create_app({"SETTINGS": Settings(cors_origins=("https://quotes.example",))}).test_client()
    pre = client.options(
        "/v1/circuits/check", headers={"Origin": "https://quotes.example", "Access-Control-Request-Method": "POST"}
    )
    assert pre.status_code == 204
    assert pre.headers["Access-Control-Allow-Origin"] == "https://quotes.example"
    assert "X-API-Key" in pre.headers["Access-Control-Allow-Headers"]
    r = client.post("/v1/fault-current", json=EXAMPLE, headers={"Origin": "https://elsewhere.example"})
    assert "Access-Control-Allow-Origin" not in r.headers


def test_request_id_is_echoed_or_made(client):
    r = client.post("/v1/fault-current", json=EXAMPLE, headers={"X-Request-ID": "job-42.a"})
    assert r.headers["X-Request-ID"] == "job-42.a"
    made = client.post("/v1/fault-current", json=EXAMPLE, headers={"X-Request-ID": "bad id with spaces"}).headers[
        "X-Request-ID"
    ]
    assert re.fullmatch(r"[0-9a-f]{32}", made)


def test_rate_limit_per_key_gives_429_with_retry_after():
    client = create_app({"SETTINGS": Settings(rate_limit="3/minute")}).test_client()
    statuses = [client.post("/v1/fault-current", json=EXAMPLE).status_code for _ in range(4)]
    assert statuses == [200, 200, 200, 429]
    r = client.post("/v1/fault-current", json=EXAMPLE)
    assert r.mimetype == "application/problem+json" and int(r.headers["Retry-After"]) > 0
    assert "3 per 1 minute" in r.get_json()["detail"]
    # another key has its own allowance; probes are never limited
    assert client.post("/v1/fault-current", json=EXAMPLE, headers={"X-API-Key": "other"}).status_code == 200
    assert client.get("/healthz").status_code == 200


def test_only_json_svg_and_the_two_pages_are_served(app):
    html_routes = {"/docs", "/example/quote-form/", "/example/quote-form/<name>"}
    for rule in app.url_map.iter_rules():
        if rule.endpoint == "static":
            continue
        if rule.rule in html_routes or rule.rule.startswith("/docs/assets"):
            continue
        assert rule.rule.startswith(
            ("/v1/", "/healthz", "/readyz", "/metrics", "/openapi.json", "/example/quote-form")
        ), rule.rule
