"""What the resource modules share: SVG answers, and the records of items that could not be checked."""

from __future__ import annotations

import hashlib
from collections.abc import Mapping
from typing import Any

import flask

from service.api.errors import core_errors, flatten, problem_body
from service.electrical.circuit_arrays import CircuitFailure

SVG = "image/svg+xml"


def svg_response(body: bytes, cache_seconds: int) -> flask.Response:
    """An SVG answer with a content type, cache headers and an ETag of its bytes."""
    response = flask.Response(body, mimetype=SVG)
    response.headers["Cache-Control"] = f"public, max-age={cache_seconds}" if cache_seconds else "no-store"
    response.headers["ETag"] = '"' + hashlib.sha256(body).hexdigest()[:32] + '"'
    response.headers["Vary"] = "Accept"
    response.headers["Content-Security-Policy"] = "default-src 'none'; style-src 'unsafe-inline'"
    return response


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
