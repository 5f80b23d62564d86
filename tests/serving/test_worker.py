"""The real server: gunicorn with deploy/gunicorn.conf.py, two workers, metrics that add up."""

import json
import os
import socket
import subprocess
import sys
import tempfile
import time
import urllib.request
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]


def free_port():
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


@pytest.fixture()
def server():
    port = free_port()
    metrics_dir = tempfile.mkdtemp(prefix="faultpath-test-metrics-")
    env = dict(os.environ, FAULTPATH_PORT=str(port), FAULTPATH_WORKERS="2", PROMETHEUS_MULTIPROC_DIR=metrics_dir)
    proc = subprocess.Popen(
        [sys.executable, "-m", "service", "serve"], cwd=ROOT, env=env, stdout=subprocess.PIPE, stderr=subprocess.STDOUT
    )
    base = f"http://127.0.0.1:{port}"
    deadline = time.monotonic() + 30
    while time.monotonic() < deadline:
        try:
            with urllib.request.urlopen(base + "/readyz", timeout=1) as r:
                if r.status == 200:
                    break
        except OSError:
            time.sleep(0.2)
    else:
        proc.kill()
        pytest.fail("the server did not become ready: " + proc.stdout.read().decode(errors="replace")[-2000:])
    yield base, proc
    proc.terminate()
    try:
        proc.wait(timeout=40)
    finally:
        if proc.poll() is None:
            proc.kill()
        proc.stdout.close()


def post(url, body):
    request = urllib.request.Request(url, data=json.dumps(body).encode(), headers={"Content-Type": "application/json"})
    with urllib.request.urlopen(request, timeout=5) as r:
        return r.status, dict(r.headers), json.loads(r.read())


def test_gunicorn_serves_and_metrics_add_up_across_workers(server):
    base, proc = server
    for _ in range(30):
        status, headers, body = post(base + "/v1/fault-current", {"u0_v": 230, "zs_ohm": 0.8})
        assert status == 200 and body["earth_fault_current_a"] == 273.1
    assert headers["Server"] == "faultpath"
    with urllib.request.urlopen(base + "/metrics", timeout=5) as r:
        text = r.read().decode()
    wanted = ("faultpath_requests_total", 'endpoint="/v1/fault-current"')
    line = next(row for row in text.splitlines() if row.startswith(wanted[0]) and wanted[1] in row)
    assert float(line.rsplit(" ", 1)[1]) == 30.0  # whichever worker answered, the counts add up


def test_graceful_shutdown(server):
    base, proc = server
    proc.terminate()
    assert proc.wait(timeout=40) == 0
    output = proc.stdout.read().decode(errors="replace")
    lines = [json.loads(row) for row in output.splitlines() if row.startswith("{")]
    assert lines, "the access log wrote no JSON line (the fixture's /readyz request should be there)"
    assert all({"time", "request_id", "method", "path", "status", "duration_ms"} <= set(row) for row in lines)


def test_a_worker_holding_as_many_connections_as_threads_leaves_new_ones_to_its_siblings(monkeypatch):
    """gunicorn accepts while nr_conns < worker_connections: a worker holding as many connections as it has
    threads reports no room, except once every ACCEPT_EVERY_S (so connections never starve when every
    worker is full), and its configured room again as soon as it holds fewer."""
    from gunicorn.config import Config
    from gunicorn.workers.gthread import ThreadWorker

    from service.serving import worker as serving

    clock = [100.0]
    monkeypatch.setattr(serving.time, "monotonic", lambda: clock[0])
    monkeypatch.setattr(ThreadWorker, "accept", lambda self, listener: None)
    cfg = Config()
    cfg.set("threads", 2)
    cfg.set("worker_connections", 1000)
    worker = serving.BalancedThreadWorker(0, os.getpid(), [], None, 30, cfg, None)
    worker.tmp.close()  # the heartbeat file a worker makes; this one never runs
    assert worker.worker_connections == 1000
    worker.accept(None)
    worker.nr_conns = 1
    assert worker.worker_connections == 1000
    worker.accept(None)
    worker.nr_conns = 2
    assert worker.worker_connections == 0
    clock[0] += serving.ACCEPT_EVERY_S * 1.5
    assert worker.worker_connections == 1000  # one more, even so
    worker.accept(None)
    worker.nr_conns = 3
    assert worker.worker_connections == 0
    worker.nr_conns = 1  # two closed
    assert worker.worker_connections == 1000

    waits = []
    monkeypatch.setattr(ThreadWorker, "wait_for_and_dispatch_events", lambda self, timeout: waits.append(timeout))
    worker._accepting, worker.nr_conns = False, 2  # held back, every connection perhaps an idle keep-alive
    worker.wait_for_and_dispatch_events(1.0)
    worker._accepting = True
    worker.wait_for_and_dispatch_events(1.0)
    assert waits == [serving.ACCEPT_EVERY_S, 1.0]  # a held-back worker looks again soon; one accepting waits
