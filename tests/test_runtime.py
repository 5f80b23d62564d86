"""The runtime policy is set once at start (service/runtime.py): start-up's objects frozen out of the collector's
sight, a higher first-generation threshold, and the collector never switched off (common practice for long-lived
Python servers; CPython's gc.freeze documentation)."""

import gc
import json
import subprocess
import sys


def test_the_policy_freezes_start_up_and_keeps_the_collector_running():
    code = (
        "import gc, json, service.app, service.runtime as r; service.app.create_app(); r.apply(); "
        "print(json.dumps({**r.describe(), 'enabled': gc.isenabled()}))"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True, timeout=120)
    figures = json.loads(out.stdout)
    assert figures["enabled"] is True and figures["frozen_objects"] > 10_000 and figures["threshold_0"] == 50_000


def test_no_request_switches_the_collector(client):
    # a large body used to hold the collector for its worker while it was served: no request may switch it now
    calls = []
    real = gc.disable
    gc.disable = lambda: calls.append(True)  # noqa: E731
    try:
        client.post("/v1/circuits/check-batch", json={"supply": {}, "circuits": []})
    finally:
        gc.disable = real
    assert calls == [] and gc.isenabled()
