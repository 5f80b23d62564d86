"""What the resource modules share: SVG answers."""

from __future__ import annotations

import hashlib

import flask

SVG = "image/svg+xml"


def svg_response(body: bytes, cache_seconds: int) -> flask.Response:
    """An SVG answer with a content type, cache headers and an ETag of its bytes."""
    response = flask.Response(body, mimetype=SVG)
    response.headers["Cache-Control"] = f"public, max-age={cache_seconds}" if cache_seconds else "no-store"
    response.headers["ETag"] = '"' + hashlib.sha256(body).hexdigest()[:32] + '"'
    response.headers["Vary"] = "Accept"
    response.headers["Content-Security-Policy"] = "default-src 'none'; style-src 'unsafe-inline'"
    return response
