"""Running the service under gunicorn: a threaded worker that leaves connections beyond its threads to a
sibling, and a JSON-lines access log."""

from __future__ import annotations

import datetime
import json
import time

from gunicorn.glogging import Logger
from gunicorn.workers.gthread import ThreadWorker

ACCEPT_EVERY_S = 0.005


class BalancedThreadWorker(ThreadWorker):
    """gunicorn's threaded worker, slow to take more connections than it has threads.

    The stock worker accepts every connection it can while its siblings sleep on the same socket: under
    a burst of 16 connections one worker often took 13 to 16 of them and the other few or none, so one
    core idled while requests queued on the other, and concurrent single checks were computed together
    in smaller sets. This worker takes connections freely while it holds fewer than it has threads;
    beyond that, at most one every ``ACCEPT_EVERY_S``, leaving the rest to a sibling that holds fewer.
    When every worker is full the waiting connections are still taken, a few every few milliseconds, so
    none waits long; the connections a worker keeps alive stay with it.
    """

    def __init__(self, *args, **kwargs):
        self._connection_limit = 0
        self._last_accept = 0.0
        super().__init__(*args, **kwargs)

    @property
    def worker_connections(self) -> int:
        # gunicorn's accept loop takes a connection while nr_conns < worker_connections
        if self.nr_conns < self.cfg.threads or time.monotonic() - self._last_accept >= ACCEPT_EVERY_S:
            return self._connection_limit
        return 0

    @worker_connections.setter
    def worker_connections(self, value: int) -> None:
        self._connection_limit = value

    def accept(self, listener):
        self._last_accept = time.monotonic()
        return super().accept(listener)

    def wait_for_and_dispatch_events(self, timeout):
        # while new connections are held back, look again within ACCEPT_EVERY_S: a worker whose connections
        # are all idle keep-alives has no other event to wake it, and a new client would wait a whole second
        if not self._accepting and self.nr_conns >= self.cfg.threads:
            timeout = min(timeout, ACCEPT_EVERY_S)
        return super().wait_for_and_dispatch_events(timeout)


class JsonLinesLogger(Logger):
    """gunicorn's logger, writing one JSON object per request to the access log.

    Only these fields are written: no request headers, so API keys never reach a log.
    """

    def access(self, resp, req, environ, request_time):
        if not (self.cfg.accesslog or self.cfg.logconfig or self.cfg.logconfig_dict or self.cfg.syslog):
            return
        headers = dict((k.lower(), v) for k, v in (resp.headers or []))
        record = {
            "time": datetime.datetime.now(datetime.UTC).isoformat(timespec="milliseconds"),
            "request_id": headers.get("x-request-id", ""),
            "method": environ.get("REQUEST_METHOD"),
            "path": environ.get("PATH_INFO"),
            "status": int(str(resp.status).split()[0]) if resp.status else None,
            "bytes": getattr(resp, "sent", None),
            "duration_ms": round(request_time.total_seconds() * 1000, 3),
            "remote": environ.get("REMOTE_ADDR"),
        }
        try:
            self.access_log.info(json.dumps(record))
        except Exception:  # noqa: BLE001 - a log line must never fail a request
            self.exception("could not write the access log line")
