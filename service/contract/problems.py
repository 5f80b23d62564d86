"""Problem records (RFC 9457), the same for the HTTP answers and the CLI's: a problem's shape, the JSON pointer
of a field at fault, a core error or a schema's messages as ``errors: [{pointer, message}]``, and JSON bytes.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from http import HTTPStatus
from typing import Any

import orjson
from marshmallow import fields

from service.contract.fields import ContractSchema
from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.errors import ElectricalError

PROBLEM_TYPE = "application/problem+json"


class FieldErrorSchema(ContractSchema):
    pointer = fields.String(required=True, metadata={"description": "JSON pointer (RFC 6901) into the request body"})
    message = fields.String(required=True)


class ProblemSchema(ContractSchema):
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
                out.append({"pointer": base, "message": str(item)})
    else:
        out.append({"pointer": base, "message": str(messages)})
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


def invalid_item(index: int, ident: str | None, messages: Any, base: str, what: str = "circuit") -> dict[str, Any]:
    """The record of a batch item that did not validate: its place, its id, and every field at fault."""
    return {
        "index": index,
        "id": ident,
        "problem": problem_body(422, f"This {what} did not validate.", flatten(messages, base)),
    }


def failed_item(
    index: int, ident: str | None, failure: CircuitFailure, roots: Mapping[str, str], what: str = "circuit"
) -> dict[str, Any]:
    """The record of a batch item the rules or the data do not cover, its path as a pointer."""
    detail = f"The rules or the data do not cover this {what}."
    return {"index": index, "id": ident, "problem": problem_body(422, detail, core_errors(failure, roots))}
