"""GET /example/quote-form/: an example quotation form that calls the API (plain HTML, CSS, JavaScript)."""

from __future__ import annotations

from functools import lru_cache
from importlib import resources

import flask

blp = flask.Blueprint("web", __name__)

FILES = {"index.html": "text/html", "form.css": "text/css", "form.js": "text/javascript"}
CSP = (
    "default-src 'none'; script-src 'self'; style-src 'self'; img-src 'self' blob:; connect-src 'self'; "
    "base-uri 'none'; form-action 'self'; frame-ancestors 'none'"
)
PATH = "/example/quote-form/"


@lru_cache(maxsize=len(FILES))
def _file(name: str) -> bytes:
    return resources.files("service.web").joinpath("quote-form", name).read_bytes()


@blp.route("/example/quote-form")
def redirect():
    return flask.redirect(PATH, code=308)


@blp.route(PATH, defaults={"name": "index.html"})
@blp.route(PATH + "<name>")
def page(name: str):
    if name not in FILES:
        flask.abort(404)
    response = flask.Response(_file(name), mimetype=FILES[name])
    response.headers["Content-Security-Policy"] = CSP
    response.headers["Cache-Control"] = "no-cache"
    return response
