"""Hostile clients on loopback, for the reliability report: slow headers, slow bodies, a held upload, large reports.

Each step is bounded in time and talks only to 127.0.0.1. The proxy steps run deploy/nginx.conf itself, with the
upstream and the listening port swapped in.
"""

from __future__ import annotations

import http.client
import json
import os
import re
import shutil
import signal
import socket
import subprocess
import tempfile
import threading
import time
from collections.abc import Callable
from pathlib import Path

from bench.harness import Server, free_port

ROOT = Path(__file__).resolve().parents[1]
WORDS = {"header": "headers", "body": "bodies"}
CHECK = (ROOT / "schemas" / "examples" / "circuits-check.json").read_bytes()


class DeployProxy:
    """deploy/nginx.conf run on loopback in front of ``backend_port``."""

    def __init__(self, backend_port: int):
        self.tmp = tempfile.mkdtemp(prefix="faultpath-proxy-")
        self.port = free_port()
        conf = (ROOT / "deploy" / "nginx.conf").read_text()
        conf = conf.replace("server faultpath:8000;", f"server 127.0.0.1:{backend_port};")
        conf = re.sub(r"listen 8080;", f"listen 127.0.0.1:{self.port};", conf)
        conf = conf.replace("worker_processes auto;", f"worker_processes 1;\npid {self.tmp}/nginx.pid;")
        os.makedirs(os.path.join(self.tmp, "logs"), exist_ok=True)
        path = os.path.join(self.tmp, "nginx.conf")
        Path(path).write_text(conf)
        subprocess.run(["nginx", "-c", path, "-p", self.tmp, "-g", "error_log stderr crit;"], check=True)
        time.sleep(0.3)

    def stop(self) -> None:
        pid = Path(self.tmp) / "nginx.pid"
        if pid.exists():
            os.kill(int(pid.read_text()), signal.SIGTERM)
            time.sleep(0.3)
        shutil.rmtree(self.tmp, ignore_errors=True)


def _probe(port: int, within_s: float) -> bool:
    """One single check, answered (200) within ``within_s``."""
    conn = http.client.HTTPConnection("127.0.0.1", port, timeout=within_s)
    try:
        started = time.monotonic()
        conn.request("POST", "/v1/circuits/check", body=CHECK, headers={"Content-Type": "application/json"})
        ok = conn.getresponse().status == 200
        return ok and time.monotonic() - started <= within_s
    except OSError:
        return False
    finally:
        conn.close()


def _hold(port: int, count: int, kind: str, stop: threading.Event) -> None:
    """``count`` connections that send a header line (or a few body bytes) every 2 s until ``stop``."""
    socks = []
    for _ in range(count):
        try:
            s = socket.create_connection(("127.0.0.1", port), timeout=5)
        except OSError:
            break
        head = b"POST /v1/circuits/check HTTP/1.1\r\nHost: x\r\nContent-Type: application/json\r\n"
        if kind == "body":
            head += b"Content-Length: 100000\r\n\r\n{"
        s.sendall(head)
        socks.append(s)
    while not stop.wait(2.0):
        for s in list(socks):
            try:
                s.sendall(b"X-Slow: 1\r\n" if kind == "header" else b" ")
            except OSError:
                socks.remove(s)
    for s in socks:
        s.close()


def slow_clients(port: int, count: int, kind: str, probes: int = 10, within_s: float = 2.0) -> int:
    """How many of ``probes`` single checks are answered within ``within_s`` while ``count`` slow clients hold on."""
    stop = threading.Event()
    holder = threading.Thread(target=_hold, args=(port, count, kind, stop), daemon=True)
    holder.start()
    time.sleep(3.0)  # let the slow clients take what they can
    answered = 0
    for _ in range(probes):
        answered += _probe(port, within_s)
        time.sleep(0.2)
    stop.set()
    holder.join(timeout=10)
    return answered


def rss_mb(pid: int) -> float:
    for line in Path(f"/proc/{pid}/status").read_text().splitlines():
        if line.startswith("VmRSS:"):
            return int(line.split()[1]) / 1024
    return float("nan")


def peak_mb(pid: int) -> float:
    for line in Path(f"/proc/{pid}/status").read_text().splitlines():
        if line.startswith("VmHWM:"):
            return int(line.split()[1]) / 1024
    return float("nan")


def held_upload(pictures: int = 150) -> tuple[float, float]:
    """A 300 KB upload left unfinished, then ``pictures`` picture calls to the same (single) worker: its memory
    before and after, MB."""
    server = Server(workers=1, env={"FAULTPATH_RATE_LIMIT": "", "FAULTPATH_MAX_REQUESTS": "0"})
    try:
        (worker,) = server.worker_pids()
        _probe(server.port, 30)  # warm
        before = rss_mb(worker)
        held = socket.create_connection(("127.0.0.1", server.port), timeout=5)
        held.sendall(b"POST /v1/circuits/check-batch HTTP/1.1\r\nHost: x\r\nContent-Type: application/json\r\n"
                     b"Content-Length: 300000\r\n\r\n" + b" " * 1000)  # fmt: skip
        for _ in range(pictures):
            conn = http.client.HTTPConnection("127.0.0.1", server.port, timeout=30)
            conn.request("POST", "/v1/circuits/picture", body=CHECK, headers={"Content-Type": "application/json"})
            conn.getresponse().read()
            conn.close()
        after = rss_mb(worker)
        held.close()
    finally:
        server.stop()
    return before, after


def chain(boards: int, padding: int) -> bytes:
    """An installation of ``boards`` boards in a chain, each circuit id padded to ``padding`` characters."""
    out = []
    for b in range(boards):
        feed = {"id": f"feed {b}", "role": "distribution", "feeds_board": f"B{b + 1}", "design_current_a": 20,
                "device": {"standard": "BS 88-2", "type": "gG", "rating_a": 63},
                "conductors": {"material": "copper", "insulation": "thermosetting-90", "line_csa_mm2": 16,
                               "cpc_csa_mm2": 16, "length_m": 1},
                "installation": {"cable": "multicore-armoured-90c", "installation_method": "C"}}  # fmt: skip
        final = {"id": (f"c{b}-" + "p" * padding)[:200], "role": "final", "load": "fixed-equipment",
                 "design_current_a": 10, "device": {"standard": "BS EN 60898", "type": "B", "rating_a": 16,
                 "breaking_capacity_ka": 6}, "conductors": {"material": "copper", "insulation": "thermoplastic-70",
                 "line_csa_mm2": 2.5, "cpc_csa_mm2": 1.5, "length_m": 5}}  # fmt: skip
        out.append({"id": f"B{b}", "fed_from": None if b == 0 else f"B{b - 1}",
                    "circuits": [feed, final] if b < boards - 1 else [final]})  # fmt: skip
    supply = {"earthing": "TN-S", "u0_v": 230, "ze_ohm": 0.05, "prospective_fault_current_ka": 16}
    return json.dumps({"supply": supply, "boards": out}).encode()


def report_bounds(sizes: list[tuple[int, int]]) -> list[tuple[int, int, float, float]]:
    """For each (boards, padding): the report's status, its time (s) and the worker's peak memory (MB)."""
    server = Server(workers=1, env={"FAULTPATH_RATE_LIMIT": "", "FAULTPATH_MAX_REQUESTS": "0"})
    out = []
    try:
        (worker,) = server.worker_pids()
        for boards, padding in sizes:
            body = chain(boards, padding)
            conn = http.client.HTTPConnection("127.0.0.1", server.port, timeout=120)
            started = time.monotonic()
            conn.request("POST", "/v1/installations/report", body=body, headers={"Content-Type": "application/json"})
            status = conn.getresponse().status
            out.append((boards, status, time.monotonic() - started, peak_mb(worker)))
            conn.close()
    finally:
        server.stop()
    return out


def run(say: Callable[[str, str, bool], None]) -> None:
    """The hostile-client steps of the reliability report, each said with its figures."""
    if not shutil.which("nginx"):
        say("slow clients through the proxy", "skipped: nginx is not installed (apt-get install nginx-light)", False)
    else:
        server = Server(workers=5, env={"FAULTPATH_RATE_LIMIT": ""})
        proxy = DeployProxy(server.port)
        try:
            for count, kind in ((80, "header"), (50, "body")):
                answered = slow_clients(proxy.port, count, kind)
                say(f"{count} slow {WORDS[kind]} through deploy/nginx.conf", f"{answered} of 10 probes within 2 s",
                    answered >= 9)  # fmt: skip
            for count, kind in ((80, "header"), (50, "body")):
                answered = slow_clients(server.port, count, kind)
                say(f"{count} slow {WORDS[kind]} against the server alone (5 workers x 8 threads)",
                    f"{answered} of 10 probes within 2 s (the proxy is what holds them)", True)  # fmt: skip
        finally:
            proxy.stop()
            server.stop()
    before, after = held_upload()
    say("150 pictures while a 300 KB upload is held open", f"worker {before:.0f} -> {after:.0f} MB",
        after - before < 100)  # fmt: skip
    for boards, status, seconds, peak in report_bounds([(150, 2000), (500, 20)]):
        say(f"report of a {boards}-board chain", f"{status} in {seconds:.1f} s, worker peak {peak:.0f} MB",
            status in (200, 413, 422) and seconds < 60 and peak < 600)  # fmt: skip
