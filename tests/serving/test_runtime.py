"""The runtime policy is set once at start (service/runtime.py): start-up's objects frozen out of the collector's
sight, a higher first-generation threshold, and the collector never switched off (common practice for long-lived
Python servers; CPython's gc.freeze documentation)."""

import gc
import json
import subprocess
import sys


def test_the_policy_freezes_start_up_and_keeps_the_collector_running():
    code = (
        "import gc, json, service.app, service.serving.runtime as r; service.app.create_app(); r.apply(); "
        "print(json.dumps({**r.describe(), 'enabled': gc.isenabled()}))"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True, timeout=120)
    figures = json.loads(out.stdout)
    assert figures["enabled"] is True and figures["frozen_objects"] > 10_000 and figures["threshold_0"] == 50_000


def test_no_request_switches_the_collector(monkeypatch):
    # a body of 256 KiB or more used to hold the collector for its whole worker while it was served (a held upload
    # then stopped collection for every other request): no request may switch it now, however large
    from bench.payload import batch
    from service.app import create_app
    from service.settings import Settings

    client = create_app({"SETTINGS": Settings(batch_limit=2000), "TESTING": True}).test_client()
    body = json.dumps(batch(1000)).encode()
    assert len(body) > 256 * 1024
    calls = []
    monkeypatch.setattr(gc, "disable", lambda: calls.append(True))
    response = client.post("/v1/circuits/check-batch", data=body, content_type="application/json")
    assert response.status_code == 200 and calls == [] and gc.isenabled()
