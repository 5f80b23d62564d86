"""Prometheus metrics: requests, latency, verdicts. Under several gunicorn workers they add up when
PROMETHEUS_MULTIPROC_DIR names a shared folder (deploy/gunicorn.conf.py marks dead workers)."""

from __future__ import annotations

import os
import time

import flask
from prometheus_client import CONTENT_TYPE_LATEST, CollectorRegistry, Counter, Histogram, generate_latest, multiprocess

from service.electrical.results.verdicts import VERDICTS

REQUESTS = Counter("faultpath_requests_total", "HTTP requests answered", ["method", "endpoint", "status"])
LATENCY = Histogram(
    "faultpath_request_seconds",
    "Time to answer a request",
    ["endpoint"],
    buckets=(0.001, 0.0025, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10),
)
VERDICT_COUNT = Counter("faultpath_verdicts_total", "Circuit verdicts given", ["verdict"])
# concurrent single checks computed together (coalesce.py): how many a core run serves, and the core's CPU time
SINGLE_RUN = Histogram(
    "faultpath_single_check_run_circuits",
    "Single checks computed together in one run of the core",
    buckets=(1, 2, 3, 4, 6, 8, 12, 16, 32, 64),
)
SINGLE_RUN_CPU = Counter("faultpath_single_check_core_cpu_seconds", "CPU time of the core's runs for single checks")


def count_single_run(circuits: int, cpu_s: float) -> None:
    SINGLE_RUN.observe(circuits)
    SINGLE_RUN_CPU.inc(cpu_s)


def count_verdicts(verdicts) -> None:
    for verdict in VERDICTS:
        n = sum(1 for v in verdicts if v == verdict)
        if n:
            VERDICT_COUNT.labels(str(verdict)).inc(n)


KNOWN_METHODS = frozenset({"GET", "HEAD", "POST", "PUT", "PATCH", "DELETE", "OPTIONS"})


def method_label(method: str) -> str:
    """The method as a label: a known one, else "other" (so random method names add no series)."""
    return method if method in KNOWN_METHODS else "other"


def install(app: flask.Flask) -> None:
    @app.before_request
    def _start_timer():
        flask.g.faultpath_started = time.perf_counter()

    @app.after_request
    def _record(response):
        endpoint = flask.request.url_rule.rule if flask.request.url_rule is not None else "unmatched"
        started = flask.g.get("faultpath_started")
        if started is not None:
            LATENCY.labels(endpoint).observe(time.perf_counter() - started)
        REQUESTS.labels(method_label(flask.request.method), endpoint, str(response.status_code)).inc()
        return response


def exposition() -> flask.Response:
    if os.environ.get("PROMETHEUS_MULTIPROC_DIR"):
        registry = CollectorRegistry()
        multiprocess.MultiProcessCollector(registry)
        body = generate_latest(registry)
    else:
        body = generate_latest()
    return flask.Response(body, mimetype=CONTENT_TYPE_LATEST.split(";")[0], headers={"Cache-Control": "no-store"})
