"""The Flask application: configuration, blueprints, limits, errors, security headers.

`create_app(config)` builds one app; every setting comes from the environment (service.settings)
unless given in ``config``.
"""

from __future__ import annotations

import copy
import hashlib
import hmac
import logging
import re
import uuid
from http import HTTPStatus
from typing import Any

import flask
import flask_smorest
from flask_smorest.utils import prepare_response
from werkzeug.routing import BaseConverter

from service.api import (
    cable_views,
    circuit_views,
    deadline,
    device_views,
    docs,
    errors,
    health,
    installation_views,
    measurement_views,
    metrics,
    question_views,
    sizing_views,
    web,
)
from service.api.key_guard import KeyFailures
from service.contract import problems, result_schemas
from service.contract.installation_schemas import MAX_BOARDS
from service.electrical.results import precision
from service.serving.coalescer import Coalescer
from service.settings import Settings

API_VERSION = "1.0.0"
# what answers without a key (FAULTPATH_OPEN_PATHS names the groups left open)
OPEN_GROUPS = {
    "probes": ("/healthz", "/readyz"),
    "metrics": ("/metrics",),
    "docs": ("/docs", "/openapi.json", "/example/"),
}
PUBLIC_PATHS = tuple(p for group in OPEN_GROUPS.values() for p in group)
REQUEST_ID = re.compile(r"^[A-Za-z0-9._:-]{1,128}$")
BODY_METHODS = ("POST", "PUT", "PATCH")
ERROR_STATUSES = {"POST": (400, 401, 413, 415, 422, 429, 500, 503), "GET": (401, 429, 500)}


class NumberConverter(BaseConverter):
    """A path segment that is a plain decimal number, e.g. 32 or 0.5."""

    regex = r"\d{1,6}(?:\.\d{1,6})?"

    def to_python(self, value: str) -> float:
        return float(value)

    def to_url(self, value: Any) -> str:
        return f"{float(value):g}"


class Api(flask_smorest.Api):
    """flask-smorest's Api answering every error as problem+json."""

    ERROR_SCHEMA = problems.ProblemSchema

    def handle_http_exception(self, error):
        return errors.handle_http_exception(error)

    def _register_responses(self):
        for status in HTTPStatus:
            response = {"description": status.phrase}
            if not (100 <= status < 200) and status not in (204, 304):
                response["schema"] = self.ERROR_SCHEMA
            prepare_response(response, self.spec, problems.PROBLEM_TYPE)
            self.spec.components.response(status.name, response, lazy=True)
        response = {"description": "Default error response", "schema": self.ERROR_SCHEMA}
        prepare_response(response, self.spec, problems.PROBLEM_TYPE)
        self.spec.components.response("DEFAULT_ERROR", response, lazy=True)

    def _openapi_json(self):
        return flask.current_app.response_class(
            flask.json.dumps(spec_dict(self), indent=2), mimetype="application/json"
        )


def spec_dict(api: Api) -> dict[str, Any]:
    """The OpenAPI document, with the problem+json answers every operation can give."""
    spec = copy.deepcopy(api.spec.to_dict())  # apispec hands out its own path objects: never edit them
    spec.get("components", {}).get("schemas", {}).pop("PaginationMetadata", None)  # no operation pages
    spec.setdefault("components", {})["securitySchemes"] = {
        "ApiKey": {
            "type": "apiKey",
            "in": "header",
            "name": "X-API-Key",
            "description": "required for /v1 whenever the service listens beyond loopback (FAULTPATH_REQUIRE_KEYS); "
            "the probes, /metrics and the docs answer without it unless FAULTPATH_OPEN_PATHS closes them",
        }
    }
    problem = {"content": {problems.PROBLEM_TYPE: {"schema": {"$ref": "#/components/schemas/Problem"}}}}
    for path, operations in spec["paths"].items():
        for method, operation in operations.items():
            if method not in ("get", "post"):
                continue
            # /v1 takes the key, or nothing where the deployment requires none (loopback, FAULTPATH_REQUIRE_KEYS=off)
            operation["security"] = [{"ApiKey": []}, {}] if path.startswith("/v1/") else []
            responses = operation.setdefault("responses", {})
            for status in ERROR_STATUSES[method.upper()]:
                if path in ("/healthz", "/readyz", "/metrics") and status in (401, 429):
                    continue
                responses.setdefault(str(status), {"description": HTTPStatus(status).phrase, **problem})
    return spec


def contract_description() -> str:
    """What the service does, its cautions and the precision of its numbers: the contract's ``info.description``."""
    return (
        "Checks, for each circuit of an installation to BS 7671 / IEC 60364, that every protection the "
        "rules require is in place: earth fault disconnection and max Zs (Chapter 41), the protective "
        "conductor (543.1), overload (433.1), short circuit (434.5.2), breaking capacity (434.5.1), "
        "voltage drop from the origin (525) and selectivity (536.4); sizing, the longest run, measured "
        "test results and whole installations. A check the data cannot make is not-verified. "
        "Results support a competent person and do not replace one; "
        "the current standard and local codes prevail. " + precision.summary()
    )


def create_app(config: dict[str, Any] | None = None) -> flask.Flask:
    """Build the service. ``config`` overrides the environment (used by tests)."""
    config = dict(config or {})
    settings: Settings = config.pop("SETTINGS", None) or Settings.from_env()
    app = flask.Flask("faultpath", static_folder=None)
    app.config.update(
        API_TITLE="Faultpath",
        API_VERSION=API_VERSION,
        OPENAPI_VERSION="3.1.0",
        OPENAPI_URL_PREFIX="/",
        OPENAPI_JSON_PATH="openapi.json",
        API_SPEC_OPTIONS={"info": {"description": contract_description()}, "servers": [{"url": "/"}]},
        MAX_CONTENT_LENGTH=settings.max_body_bytes,
        FAULTPATH_BATCH_LIMIT=settings.batch_limit,
        FAULTPATH_COALESCE_MS=settings.coalesce_ms,
        FAULTPATH_SETTINGS=settings,
        JSON_SORT_KEYS=False,
    )
    app.config.update(config)
    app.json.sort_keys = False
    if settings.keys_required and not settings.api_keys:
        raise RuntimeError(
            f"API keys are required when bound to {settings.bind}: "
            "set FAULTPATH_API_KEYS, or FAULTPATH_REQUIRE_KEYS=off"
        )
    app.url_map.converters["number"] = NumberConverter
    api = Api(app)
    api.register_converter(NumberConverter, lambda converter: {"type": "number", "minimum": 0})
    for blueprint in (
        circuit_views.blp,
        installation_views.blp,
        *question_views.BLUEPRINTS,
        sizing_views.blp,
        measurement_views.blp,
        device_views.blp,
        cable_views.blp,
        health.blp,
    ):
        api.register_blueprint(blueprint)
    if "BatchResult" not in api.spec.components.schemas:  # the full form of check-batch (?form=full)
        api.spec.components.schema("BatchResult", schema=result_schemas.BatchResultSchema)
    app.register_blueprint(docs.blp)
    app.register_blueprint(web.blp)
    app.extensions["faultpath_api"] = api
    app.extensions["faultpath_coalescer"] = Coalescer(settings.coalesce_ms / 1000.0, metrics.count_single_run)
    deadline.install(app, settings.timeout_s)
    _install_guards(app, settings)
    _install_rate_limit(app, settings)
    metrics.install(app)
    for exception, handler in errors.HANDLERS:
        app.register_error_handler(exception, handler)
    return app


def _install_rate_limit(app: flask.Flask, settings: Settings) -> None:
    """A limit per API key, or per client address without one (429 problem+json with Retry-After).

    With memory:// storage each worker and each replica counts alone; several replicas need a shared
    store (FAULTPATH_RATE_LIMIT_STORAGE=redis://...) or the limit set at the ingress.
    """
    if settings.proxies:
        from werkzeug.middleware.proxy_fix import ProxyFix

        app.wsgi_app = ProxyFix(app.wsgi_app, x_for=settings.proxies, x_proto=settings.proxies)
    if not settings.rate_limit:
        return
    from flask_limiter import Limiter

    def client_key() -> str:
        key = flask.request.headers.get("X-API-Key")
        if key:
            return "key:" + hashlib.sha256(key.encode()).hexdigest()[:24]
        return "addr:" + (flask.request.remote_addr or "unknown")

    limiter = Limiter(
        client_key,
        app=app,
        default_limits=[settings.rate_limit],
        storage_uri=settings.rate_limit_storage,
        headers_enabled=True,
        default_limits_exempt_when=lambda: flask.request.path.startswith(PUBLIC_PATHS),
    )
    app.extensions["faultpath_limiter"] = limiter


def open_paths(settings: Settings) -> tuple[str, ...]:
    """The paths that answer without a key, by the groups the settings leave open."""
    unknown = set(settings.open_paths) - set(OPEN_GROUPS)
    if unknown:
        raise RuntimeError(f"FAULTPATH_OPEN_PATHS names {sorted(unknown)}: the groups are {sorted(OPEN_GROUPS)}")
    return tuple(p for name in settings.open_paths for p in OPEN_GROUPS[name])


# the operations whose bodies hold many circuits: counted in the raw body before it is parsed
COUNTED_PATHS = ("/v1/circuits/check-batch", "/v1/installations/", "/v1/test-results/verify")
DEVICE_KEY = re.compile(rb'"device"\s*:')
BOARD_KEY = re.compile(rb'"fed_from"\s*:')


def _count_refused(settings: Settings) -> flask.Response | None:
    """A 413 for a body that holds more circuits (one device each) or boards than the limits, found by counting their
    keys in the raw bytes before any parsing: the parse, the load and their memory are never paid for it."""
    request = flask.request
    if request.method != "POST" or not request.path.startswith(COUNTED_PATHS):
        return None
    data = request.get_data(cache=True)
    circuits = len(DEVICE_KEY.findall(data))
    if circuits > settings.batch_limit + MAX_BOARDS:  # a board's own device is counted too
        detail = f"the body holds about {circuits} circuits: at most {settings.batch_limit} in one request"
        return errors.problem_response(413, detail, [{"pointer": "", "message": detail}])
    if request.path.startswith("/v1/installations/") and len(BOARD_KEY.findall(data)) > MAX_BOARDS:
        detail = f"an installation holds at most {MAX_BOARDS} boards"
        return errors.problem_response(413, detail, [{"pointer": "/boards", "message": detail}])
    return None


def _key_refused(keys: tuple[bytes, ...], failures: KeyFailures) -> flask.Response | None:
    """A 401 for a missing or wrong key (counted for its client), a 429 for a client past its wrong keys."""
    client = flask.request.remote_addr or "unknown"
    wait = failures.wait_s(client)
    if wait:
        return errors.problem_response(
            429,
            "Too many wrong API keys from this client: wait before trying again.",
            [],
            {"Retry-After": str(int(wait + 0.999))},
        )
    given = flask.request.headers.get("X-API-Key", "").encode()
    ok = False
    for key in keys:  # compare with every key, in constant time each
        ok |= hmac.compare_digest(given, key)
    if not ok:
        failures.failed(client)
        return errors.problem_response(
            401,
            "A valid API key is required in the X-API-Key header.",
            [],
            {"WWW-Authenticate": 'ApiKey header="X-API-Key"'},
        )
    return None


def _install_guards(app: flask.Flask, settings: Settings) -> None:
    keys = tuple(k.encode() for k in settings.api_keys)
    required = settings.keys_required
    origins = set(settings.cors_origins)
    public = open_paths(settings)
    failures = KeyFailures(settings.key_failures)

    @app.before_request
    def _guard():
        supplied = flask.request.headers.get("X-Request-ID", "")
        flask.g.request_id = supplied if REQUEST_ID.match(supplied) else uuid.uuid4().hex
        if flask.request.method == "OPTIONS":  # preflight or a question about methods: no body, ever
            response = flask.Response(status=204)
            if flask.request.url_rule is not None:
                response.headers["Allow"] = ", ".join(sorted(flask.request.url_rule.methods - {"HEAD"}))
            return response
        path = flask.request.path
        if required and not path.startswith(public):
            refused = _key_refused(keys, failures)
            if refused is not None:
                return refused
        too_many = _count_refused(settings)
        if too_many is not None:
            return too_many
        if flask.request.method in BODY_METHODS and flask.request.url_rule is not None:
            view = app.view_functions.get(flask.request.url_rule.endpoint)
            types = getattr(view, "body_types", ("application/json",))
            if flask.request.mimetype not in types:
                said = " or ".join(types)
                return errors.problem_response(
                    415,
                    f"Send the body as {said}.",
                    [{"pointer": "", "message": f"content type {flask.request.mimetype or 'none'} is not {said}"}],
                )
        return None

    @app.after_request
    def _headers(response: flask.Response):
        response.headers["X-Request-ID"] = flask.g.get("request_id", "")
        response.headers.setdefault("X-Content-Type-Options", "nosniff")
        response.headers.setdefault("Cache-Control", "no-store")
        origin = flask.request.headers.get("Origin")
        if origin and origin in origins:
            response.headers["Access-Control-Allow-Origin"] = origin
            response.headers["Vary"] = "Origin"
            response.headers["Access-Control-Expose-Headers"] = "X-Request-ID"
            if flask.request.method == "OPTIONS":
                response.headers["Access-Control-Allow-Methods"] = "GET, POST, OPTIONS"
                response.headers["Access-Control-Allow-Headers"] = "Content-Type, X-API-Key, X-Request-ID"
                response.headers["Access-Control-Max-Age"] = "600"
        return response

    logging.getLogger("faultpath").setLevel(logging.INFO)
