"""The configured timeout, enforced for every request under a threaded worker.

gunicorn's own timeout replaces a worker that stops answering its master, which a threaded worker never does while
one of its threads works on: so each request carries its deadline (FAULTPATH_TIMEOUT_S from its start), and the
long operations look at it between their parts (a batch's chunks, an installation's chunks, a report's boards and
pictures). Past it, the request ends with a 503 problem and its objects are freed as it unwinds.
"""

from __future__ import annotations

import time

import flask
from werkzeug.exceptions import ServiceUnavailable


class PastDeadline(ServiceUnavailable):
    description = "The request took longer than the server allows (FAULTPATH_TIMEOUT_S): split it, or try again."


def install(app: flask.Flask, timeout_s: float) -> None:
    @app.before_request
    def _start():
        flask.g.faultpath_deadline = time.monotonic() + timeout_s


def check(*_args) -> None:
    """Raise :class:`PastDeadline` where the current request has run past its deadline (outside a request: never)."""
    if not flask.has_request_context():
        return
    deadline = flask.g.get("faultpath_deadline")
    if deadline is not None and time.monotonic() > deadline:
        raise PastDeadline()
