"""Python's cyclic garbage collector held while a large request is served.

A batch of thousands of circuits allocates hundreds of thousands of small objects that live until its answer
is written, and none of them form reference cycles. Left running, the collector scans them again and again as
they are made, and at each full pass every object the worker holds as well (the app, numpy, matplotlib): in a
process set up as a worker is, reading a 10 000-circuit body took about twice as long with it running. While a
request whose body is at least ``LARGE_BODY_BYTES`` is served the collector is held; the request's objects are
freed by reference counting as it ends, so when the collector is let go it finds little to scan.

The collector is the process's: requests served meanwhile by other threads are not collected either, which
delays their garbage by the length of the large request and loses nothing. Only the request that held the
collector lets it go.
"""

from __future__ import annotations

import gc

import flask

LARGE_BODY_BYTES = 256 * 1024


def install(app: flask.Flask) -> None:
    """Hold the collector for large requests (registered after the guards, so a refused request never holds it)."""

    @app.before_request
    def _hold():
        length = flask.request.content_length
        if length is not None and length >= LARGE_BODY_BYTES and gc.isenabled():
            gc.disable()
            flask.g.faultpath_collector_held = True

    @app.teardown_request
    def _release(error):
        if flask.g.pop("faultpath_collector_held", False):
            gc.enable()
