"""The cyclic collector is held while a large request is served, and let go when it ends."""

import gc
import json

from service.api import circuit_views, collector
from tests.paths import EXAMPLES

BATCH = json.loads((EXAMPLES / "circuits-check-batch.json").read_text())


def seen_during_the_batch(monkeypatch):
    """Whether the collector was running when each batch's view began its own pause."""
    seen = []
    real = circuit_views.paused_gc

    def watching():
        seen.append(gc.isenabled())
        return real()

    monkeypatch.setattr(circuit_views, "paused_gc", watching)
    monkeypatch.setattr(collector, "LARGE_BODY_BYTES", 4096)  # the test app's limits are small
    return seen


def test_a_large_body_holds_the_collector_and_lets_it_go(client, monkeypatch):
    seen = seen_during_the_batch(monkeypatch)
    body = json.dumps({**BATCH, "circuits": BATCH["circuits"] * 4})
    assert len(body) >= collector.LARGE_BODY_BYTES
    assert client.post("/v1/circuits/check-batch", data=body, content_type="application/json").status_code == 200
    assert seen == [False] and gc.isenabled()


def test_a_small_body_leaves_it_running(client, monkeypatch):
    seen = seen_during_the_batch(monkeypatch)
    assert client.post("/v1/circuits/check-batch", json=BATCH).status_code == 200
    assert seen == [True] and gc.isenabled()


def test_a_refused_request_never_holds_it(client, monkeypatch):
    held = []
    monkeypatch.setattr(collector.gc, "disable", lambda: held.append(True))
    big = "x" * (collector.LARGE_BODY_BYTES + 1)
    assert client.post("/v1/circuits/check-batch", data=big, content_type="text/plain").status_code == 415
    assert held == [] and gc.isenabled()
