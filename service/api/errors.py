"""Problem details (RFC 9457) for every 4xx and 5xx answer.

Each problem carries ``errors: [{pointer, message}]`` where a field is at fault (JSON pointers,
RFC 6901, into the request body). A 500 logs the traceback under an error id and returns only the id.
"""

from __future__ import annotations

import logging
import re
import uuid
from collections.abc import Mapping, Sequence
from http import HTTPStatus
from typing import Any

import flask
import orjson
from marshmallow import Schema, fields
from werkzeug.exceptions import HTTPException

from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.errors import ElectricalError

PROBLEM_TYPE = "application/problem+json"
log = logging.getLogger("faultpath")


class FieldErrorSchema(Schema):
    pointer = fields.String(required=True, metadata={"description": "JSON pointer (RFC 6901) into the request body"})
    message = fields.String(required=True)


class ProblemSchema(Schema):
    """RFC 9457 problem details with the fields at fault."""

    type = fields.String(required=True)
    title = fields.String(required=True)
    status = fields.Integer(required=True)
    detail = fields.String()
    errors = fields.List(fields.Nested(FieldErrorSchema), required=True)
    error_id = fields.String(metadata={"description": "Present on 500: quote it to the operator"})


def escape(segment: Any) -> str:
    return str(segment).replace("~", "~0").replace("/", "~1")


def pointer(*segments: Any) -> str:
    return "".join(f"/{escape(s)}" for s in segments if s != "")


def pointer_of(path: Sequence[Any], roots: Mapping[str, str] | None = None, base: str = "") -> str:
    """The one place a core path becomes a JSON pointer.

    Where ``roots`` maps the path's first segment (``{"supply": "/supply", "circuit": "/circuits/3"}``),
    the rest of the path goes below that pointer; otherwise the whole path goes below ``base``.
    """
    if roots and path and path[0] in roots:
        return roots[path[0]] + pointer(*path[1:])
    return base + pointer(*path)


def core_errors(
    err: ElectricalError | CircuitFailure, roots: Mapping[str, str] | None = None, base: str = ""
) -> list[dict[str, str]]:
    """A core error (or a circuit's failure) as the ``errors`` list of a 422 problem."""
    return [{"pointer": pointer_of(err.path, roots, base), "message": err.message}]


# The wording of the libraries underneath, in the project's own voice (each message sits beside the pointer of
# the field it is about, so it says what the field must be).
VOICE = {
    "Missing data for required field.": "required: give this field",
    "Field may not be null.": "may not be null: give a value, or leave the field out where it is optional",
    "Unknown field.": "not a field of this object: /openapi.json lists its fields",
    "Not a valid string.": "must be a string",
    "Not a valid integer.": "must be a whole number",
    "Not a valid boolean.": "must be true or false",
    "Not a valid list.": "must be a list",
    "Not a valid mapping type.": "must be an object",
    "Invalid input type.": "must be an object",
    "Not a valid number.": "must be a number",
    "Not a number.": "must be a number",
    "Not a finite number.": "must be a finite number",
    "Invalid value.": "not an allowed value",
}
VOICE_PATTERNS = (
    (
        re.compile(r"^Must be greater than or equal to (.+) and less than or equal to (.+)\.$"),
        "must be from {0} to {1}",
    ),
    (re.compile(r"^Must be greater than or equal to (.+)\.$"), "must be at least {0}"),
    (re.compile(r"^Must be less than or equal to (.+)\.$"), "must be at most {0}"),
    (re.compile(r"^Must be one of: (.+)\.$"), "must be one of: {0}"),
    (re.compile(r"^Length must be between (.+) and (.+)\.$"), "must hold from {0} to {1} items or characters"),
    (re.compile(r"^Shorter than minimum length (.+)\.$"), "must hold at least {0} items or characters"),
    (re.compile(r"^Longer than maximum length (.+)\.$"), "must hold at most {0} items or characters"),
    (re.compile(r"^Must be equal to (.+)\.$"), "must be {0}"),
)


def voiced(message: str) -> str:
    """A library's stock sentence in the project's words (the project's own messages pass unchanged)."""
    if message in VOICE:
        return VOICE[message]
    for pattern, wording in VOICE_PATTERNS:
        found = pattern.match(message)
        if found:
            return wording.format(*found.groups())
    return message


def flatten(messages: Any, base: str = "") -> list[dict[str, str]]:
    """marshmallow / webargs nested messages as a flat list of ``{pointer, message}``."""
    out: list[dict[str, str]] = []
    if isinstance(messages, Mapping):
        for key, value in messages.items():
            if key == "_schema":
                out.extend(flatten(value, base))
            else:
                out.extend(flatten(value, f"{base}/{escape(key)}" if key != "" else base))
    elif isinstance(messages, (list, tuple)):
        for item in messages:
            if isinstance(item, (Mapping, list, tuple)):
                out.extend(flatten(item, base))
            else:
                out.append({"pointer": base, "message": voiced(str(item))})
    else:
        out.append({"pointer": base, "message": voiced(str(messages))})
    return out


def problem_body(
    status: int, detail: str | None = None, errors: list[dict[str, str]] | None = None, **extra: Any
) -> dict[str, Any]:
    body: dict[str, Any] = {"type": "about:blank", "title": HTTPStatus(status).phrase, "status": status}
    if detail:
        body["detail"] = detail
    body["errors"] = errors or []
    body.update(extra)
    return body


def json_bytes(payload: Any) -> bytes:
    """JSON for plain data and the core's result dataclasses (orjson). The core gives None, never NaN
    or Infinity, for a figure that does not exist; orjson would write null for them in any case."""
    return orjson.dumps(payload)


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
