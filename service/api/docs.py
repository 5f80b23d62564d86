"""GET /docs: the contract as a browsable page, served with no internet.

Swagger UI 5 (which renders OpenAPI 3.1) comes from the swagger-ui-bundle-v2 package; the page and
its assets are served from this process, never from a CDN.
"""

from __future__ import annotations

import mimetypes
from functools import lru_cache

import flask
from swagger_ui_bundle import swagger_ui_path

blp = flask.Blueprint("docs", __name__)

ASSETS = {"swagger-ui.css", "swagger-ui-bundle.js", "swagger-ui-standalone-preset.js"}

PAGE = """<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<title>Faultpath API</title>
<link rel="stylesheet" href="/docs/assets/swagger-ui.css">
<link rel="icon" type="image/svg+xml" href="/docs/assets/faultpath-icon.svg">
</head>
<body>
<div id="contract"></div>
<script src="/docs/assets/swagger-ui-bundle.js"></script>
<script src="/docs/assets/docs-start.js"></script>
</body>
</html>
"""

# the project's own mark: a fault path stepping down to earth
ICON = """<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 32 32">
<rect width="32" height="32" rx="6" fill="#1f5f5b"/>
<path d="M9 5h9l-4 9h6l-9 13 2-9H8z" fill="#fbfbf8"/>
<path d="M8 28h16" stroke="#fbfbf8" stroke-width="2"/>
</svg>
"""

START = """window.addEventListener("load", function () {
  window.ui = SwaggerUIBundle({url: "/openapi.json", dom_id: "#contract", deepLinking: true});
});
"""

CSP = (
    "default-src 'none'; script-src 'self'; style-src 'self' 'unsafe-inline'; img-src 'self' data:; "
    "connect-src 'self'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'"
)


@blp.route("/docs")
def page():
    response = flask.Response(PAGE, mimetype="text/html")
    response.headers["Content-Security-Policy"] = CSP
    return response


@blp.route("/docs/assets/<path:name>")
def asset(name: str):
    if name == "docs-start.js":
        return flask.Response(START, mimetype="text/javascript")
    if name == "faultpath-icon.svg":
        return flask.Response(ICON, mimetype="image/svg+xml", headers={"Cache-Control": "public, max-age=86400"})
    if name not in ASSETS:
        flask.abort(404)
    body, mimetype = _asset(name)
    return flask.Response(body, mimetype=mimetype, headers={"Cache-Control": "public, max-age=86400"})


@lru_cache(maxsize=len(ASSETS))
def _asset(name: str) -> tuple[bytes, str]:
    """An asset's bytes, read once per process."""
    mimetype = mimetypes.guess_type(name)[0] or "application/octet-stream"
    return (swagger_ui_path / name).read_bytes(), mimetype
