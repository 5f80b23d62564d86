"""Problem answers (RFC 9457) for every 4xx and 5xx: the one place an exception becomes a response.

Each problem carries ``errors: [{pointer, message}]`` where a field is at fault (JSON pointers, RFC 6901,
into the request body; :mod:`service.contract.problems`). A 500 logs the traceback under an error id and
returns only the id.
"""

from __future__ import annotations

import functools
import logging
import uuid
from collections.abc import Callable, Mapping
from http import HTTPStatus
from typing import Any

import flask
from marshmallow import ValidationError
from werkzeug.exceptions import HTTPException

from service.contract.problems import PROBLEM_TYPE, core_errors, flatten, json_bytes, problem_body
from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.errors import ElectricalError

log = logging.getLogger("faultpath")


def json_response(payload: Any, status: int = 200) -> flask.Response:
    """A JSON answer written straight from the core's results (the response schema documents it;
    tests and schemathesis check that it conforms)."""
    return flask.current_app.response_class(json_bytes(payload), status=status, mimetype="application/json")


def problem_response(status: int, detail: str | None = None, errors=None, headers=None, **extra: Any) -> flask.Response:
    response = flask.current_app.response_class(
        flask.json.dumps(problem_body(status, detail, errors, **extra)), status=status, mimetype=PROBLEM_TYPE
    )
    for key, value in (headers or {}).items():
        response.headers[key] = value
    return response


class CoreInputError(HTTPException):
    """Raised by a view when the core rejects an input the schema let through (422)."""

    code = 422

    def __init__(self, errors: list[dict[str, str]]):
        super().__init__(description="The request is well formed but the rules or the data do not cover it.")
        self.errors = errors

    @classmethod
    def of(
        cls, err: ElectricalError | CircuitFailure, roots: Mapping[str, str] | None = None, base: str = ""
    ) -> CoreInputError:
        """The 422 for a core error, its path turned into a pointer by :func:`pointer_of`."""
        return cls(core_errors(err, roots, base))


def problem_roots(roots: Mapping[str, str]) -> Callable[[Callable[..., Any]], Callable[..., Any]]:
    """Declare on a view where the core's paths lie in its request body (``{"supply": "/supply", "circuit": ""}``),
    for :func:`core_problem`; a view that declares nothing has the core's paths from the body's root."""

    def declare(view: Callable[..., Any]) -> Callable[..., Any]:
        @functools.wraps(view)
        def with_roots(*args: Any, **kwargs: Any) -> Any:
            flask.g.problem_roots = roots
            return view(*args, **kwargs)

        return with_roots

    return declare


def core_problem(err: ElectricalError) -> flask.Response:
    """The one place a core error raised in a view becomes a problem: a 422 naming the field at fault, its path a
    pointer below the roots the view declared (:func:`problem_roots`)."""
    return handle_http_exception(CoreInputError.of(err, flask.g.get("problem_roots")))


def unexpected(exc: Exception) -> flask.Response:
    """Any other exception: an HTTP error as its status says, anything else a 500 with an error id."""
    if isinstance(exc, HTTPException):
        return handle_http_exception(exc)
    return internal_error(exc)


def invalid_body(err: ValidationError) -> flask.Response:
    """A body a view reads itself (installations/design) that does not validate: a 422 naming every field."""
    return problem_response(422, "The request body did not validate.", flatten(err.messages))


# the exceptions a view may raise, each with the one function that answers it (registered by create_app)
HANDLERS: tuple[tuple[type[Exception], Callable[[Any], flask.Response]], ...] = (
    (ElectricalError, core_problem),
    (ValidationError, invalid_body),
    (Exception, unexpected),
)


DOCS_HINT = "/openapi.json lists every operation."
STATUS_WORDS = {
    400: "The request could not be read.",
    401: "An API key is needed: send it in the X-API-Key header.",
    403: "This API key may not do this.",
    404: f"Nothing is served at this path: {DOCS_HINT}",
    406: "The answer cannot be given in the media type the Accept header asks for.",
    408: "The request took too long to arrive.",
    411: "The request needs a Content-Length.",
    413: "The request body is larger than the service takes.",
    414: "The request line is longer than the service takes.",
    415: "Send the body as application/json.",
    422: "The request body did not validate.",
    431: "The request's headers are larger than the service takes.",
}


def handle_http_exception(error: HTTPException) -> flask.Response:
    data = getattr(error, "data", None) or {}
    messages = data.get("messages") if isinstance(data, Mapping) else None
    if isinstance(messages, Mapping) and set(messages) <= {
        "json",
        "query",
        "view_args",
        "path",
        "headers",
        "form",
        "files",
        "cookies",
    }:
        flat = []
        for location, inner in messages.items():
            flat.extend(flatten(inner, "" if location == "json" else f"/{location}"))
        errors = flat
    elif messages is not None:
        errors = flatten(messages)
    else:
        errors = list(getattr(error, "errors", []) or [])
    as_read = flask.g.get("body_pointer") if flask.has_request_context() else None
    if as_read is not None:  # a body read from another form (a CSV file): its pointers as that form reads them
        errors = [{**e, "pointer": as_read(e["pointer"])} for e in errors]
    headers = {k: v for k, v in error.get_headers() if k.lower() != "content-type"}
    headers.update((data.get("headers") or {}) if isinstance(data, Mapping) else {})
    status = error.code or 500
    if status == 503:  # the request's deadline (api/deadline.py), or the server shedding load: said, not an error id
        return problem_response(503, error.description, [], {"Retry-After": "5", **headers})
    if status >= 500:
        return internal_error(getattr(error, "original_exception", None) or error)
    detail = (
        {400: "The request body is not strict JSON.", 422: "The request body did not validate."}.get(status)
        if errors
        else None
    )
    if error.description == type(error).description:  # the toolkit's stock sentence: ours instead
        detail = detail or STATUS_WORDS.get(status, HTTPStatus(status).phrase + ".")
        if status == 405:
            detail = f"This path takes {error.valid_methods and ', '.join(sorted(error.valid_methods))}: {DOCS_HINT}"
    detail = detail or error.description
    if isinstance(error, CoreInputError):
        detail = error.description
    if status == 429:
        detail = f"Too many requests: the limit is {error.description}. Retry after the seconds in Retry-After."
    return problem_response(status, detail, errors, headers)


def internal_error(exc: BaseException | None) -> flask.Response:
    error_id = uuid.uuid4().hex
    log.error("internal error %s", error_id, exc_info=exc if isinstance(exc, BaseException) else None)
    return problem_response(
        500, "An internal error occurred; quote the error id to the operator.", [], error_id=error_id
    )
