"""What the benchmark and reliability scripts share: servers on loopback, nginx, and load generators.

Every server runs on 127.0.0.1 under gunicorn with deploy/gunicorn.conf.py, on a fresh port, started
with a pidfile and stopped by pid; load runs are bounded in time and stop by themselves.
"""

from __future__ import annotations

import http.client
import json
import os
import re
import shutil
import signal
import socket
import statistics
import subprocess
import sys
import tempfile
import threading
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
PY = sys.executable
CONF = ROOT / "deploy" / "gunicorn.conf.py"


def free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


class Server:
    """gunicorn on 127.0.0.1 with the project's config, started with a pidfile and stopped by pid."""

    def __init__(self, app: str = "service.wsgi:app", workers: int = 2, env: dict | None = None):
        self.port = free_port()
        self.tmp = tempfile.mkdtemp(prefix="faultpath-bench-")
        self.pidfile = os.path.join(self.tmp, "gunicorn.pid")
        environ = dict(os.environ)
        environ.update(
            FAULTPATH_PORT=str(self.port),
            FAULTPATH_WORKERS=str(workers),
            FAULTPATH_RATE_LIMIT="",
            PROMETHEUS_MULTIPROC_DIR=os.path.join(self.tmp, "metrics"),
            FAULTPATH_LOG_LEVEL="warning",
            PYTHONPATH=str(ROOT),
        )
        environ.update(env or {})
        self.proc = subprocess.Popen(
            [PY, "-m", "gunicorn", "-c", str(CONF), "-p", self.pidfile, "--access-logfile", os.devnull, app],
            cwd=ROOT,
            env=environ,
            stdout=subprocess.DEVNULL,
            stderr=subprocess.DEVNULL,
        )
        try:
            self.wait_ready("/ping" if "bare_app" in app else "/healthz")
        except BaseException:  # never leave a server behind
            self.stop()
            raise

    def wait_ready(self, path: str) -> None:
        deadline = time.monotonic() + 30
        while time.monotonic() < deadline:
            try:
                conn = http.client.HTTPConnection("127.0.0.1", self.port, timeout=1)
                conn.request("GET", path)
                if conn.getresponse().status == 200:
                    return
            except OSError:
                time.sleep(0.1)
        raise RuntimeError("server did not start")

    def worker_pids(self) -> list[int]:
        master = self.proc.pid
        pids = []
        for entry in os.listdir("/proc"):
            if entry.isdigit():
                try:
                    stat = Path(f"/proc/{entry}/stat").read_text()
                except OSError:
                    continue
                if int(stat.rsplit(")", 1)[1].split()[1]) == master:
                    pids.append(int(entry))
        return pids

    def stop(self) -> None:
        if self.proc.poll() is None:
            self.proc.send_signal(signal.SIGTERM)
            try:
                self.proc.wait(timeout=30)
            except subprocess.TimeoutExpired:
                self.proc.kill()
        shutil.rmtree(self.tmp, ignore_errors=True)


def cpu_seconds(server: Server) -> float:
    """User and system CPU time the server's workers have used so far, workers replaced meanwhile included
    (their time is added to the master's children's time when it reaps them; from /proc/PID/stat)."""

    def fields(pid: int) -> list[str]:
        try:
            return Path(f"/proc/{pid}/stat").read_text().rsplit(")", 1)[1].split()
        except OSError:  # a worker replaced between the listing and the reading
            return ["0"] * 15

    master = fields(server.proc.pid)
    total = int(master[13]) + int(master[14])
    for pid in server.worker_pids():
        worker = fields(pid)
        total += int(worker[11]) + int(worker[12])
    return total / os.sysconf("SC_CLK_TCK")


def connections_per_worker(server: Server) -> list[int] | None:
    """How many established client connections each worker holds (from `ss`; None where it is missing)."""
    if not shutil.which("ss"):
        return None
    out = subprocess.run(
        ["ss", "-tnpH", "state", "established", f"( sport = :{server.port} )"], capture_output=True, text=True
    ).stdout
    return sorted((out.count(f"pid={pid},") for pid in server.worker_pids()), reverse=True)


def peak_rss_mb(pid: int) -> float:
    for line in Path(f"/proc/{pid}/status").read_text().splitlines():
        if line.startswith("VmHWM:"):
            return int(line.split()[1]) / 1024
    return float("nan")


def metric_values(port: int, names: tuple[str, ...]) -> dict[str, float]:
    """The named series of the server's /metrics (summed over their labels; 0 where absent)."""
    conn = http.client.HTTPConnection("127.0.0.1", port, timeout=10)
    conn.request("GET", "/metrics")
    text = conn.getresponse().read().decode()
    conn.close()
    values = dict.fromkeys(names, 0.0)
    for line in text.splitlines():
        name = line.split("{", 1)[0].split(" ", 1)[0]
        if name in values:
            values[name] += float(line.rsplit(" ", 1)[1])
    return values


def post(port: int, path: str, body: bytes, accept: str = "application/json") -> tuple[int, bytes]:
    conn = http.client.HTTPConnection("127.0.0.1", port, timeout=120)
    conn.request("POST", path, body=body, headers={"Content-Type": "application/json", "Accept": accept})
    response = conn.getresponse()
    data = response.read()
    conn.close()
    return response.status, data


def median_time(fn, runs: int = 5) -> float:
    times = []
    for _ in range(runs):
        start = time.perf_counter()
        fn()
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def wrk_run(port: int, path: str, body: bytes, seconds: int, connections: int) -> tuple[float, float, float]:
    script = tempfile.NamedTemporaryFile("w", suffix=".lua", delete=False)
    script.write(
        'wrk.method = "POST"\nwrk.headers["Content-Type"] = "application/json"\nwrk.body = '
        + json.dumps(body.decode())
        + "\n"
    )
    script.close()
    out = subprocess.run(
        [
            "wrk",
            "-t2",
            f"-c{connections}",
            f"-d{seconds}s",
            "--latency",
            "-s",
            script.name,
            f"http://127.0.0.1:{port}{path}",
        ],
        capture_output=True,
        text=True,
        timeout=seconds + 30,
    ).stdout
    os.unlink(script.name)
    rps = float(re.search(r"Requests/sec:\s+([\d.]+)", out).group(1))

    def pct(p: str) -> float:
        m = re.search(rf"^\s+{p}%\s+([\d.]+)(us|ms|s)\s*$", out, re.M)
        value, unit = float(m.group(1)), m.group(2)
        return value * {"us": 0.001, "ms": 1.0, "s": 1000.0}[unit]

    errors = re.search(r"Non-2xx or 3xx responses: (\d+)", out)
    if errors:
        raise RuntimeError(f"{errors.group(1)} non-2xx answers under load")
    return rps, pct("50"), pct("99")


def wrk_detail(port: int, path: str, body: bytes, seconds: int, connections: int, timeout_s: int = 10) -> dict:
    """A wrk run with every figure it reports: requests, rate, p50/p99 (ms), socket errors, non-2xx answers."""
    script = tempfile.NamedTemporaryFile("w", suffix=".lua", delete=False)
    script.write(
        'wrk.method = "POST"\nwrk.headers["Content-Type"] = "application/json"\nwrk.body = '
        + json.dumps(body.decode())
        + "\n"
    )
    script.close()
    threads = max(1, min(2, connections))
    out = subprocess.run(
        [
            "wrk",
            f"-t{threads}",
            f"-c{connections}",
            f"-d{seconds}s",
            f"--timeout={timeout_s}s",
            "--latency",
            "-s",
            script.name,
            f"http://127.0.0.1:{port}{path}",
        ],
        capture_output=True,
        text=True,
        timeout=seconds + 60,
    ).stdout
    os.unlink(script.name)

    def pct(p: str) -> float:
        m = re.search(rf"^\s+{p}%\s+([\d.]+)(us|ms|s)\s*$", out, re.M)
        return float(m.group(1)) * {"us": 0.001, "ms": 1.0, "s": 1000.0}[m.group(2)] if m else float("nan")

    sock = re.search(r"Socket errors: connect (\d+), read (\d+), write (\d+), timeout (\d+)", out)
    non2xx = re.search(r"Non-2xx or 3xx responses: (\d+)", out)
    return {
        "requests": int(re.search(r"(\d+) requests in", out).group(1)),
        "rps": float(re.search(r"Requests/sec:\s+([\d.]+)", out).group(1)),
        "p50_ms": pct("50"),
        "p99_ms": pct("99"),
        "socket_errors": sum(int(x) for x in sock.groups()) if sock else 0,
        "non_2xx": int(non2xx.group(1)) if non2xx else 0,
    }


def python_load(port: int, path: str, body: bytes, seconds: int, connections: int) -> tuple[float, float, float]:
    latencies: list[float] = []
    lock = threading.Lock()
    stop_at = time.monotonic() + seconds

    def worker():
        mine = []
        while time.monotonic() < stop_at:
            start = time.perf_counter()
            status, _ = post(port, path, body)
            if status != 200:
                raise RuntimeError(f"answer {status} under load")
            mine.append((time.perf_counter() - start) * 1000)
        with lock:
            latencies.extend(mine)

    threads = [threading.Thread(target=worker) for _ in range(connections)]
    for t in threads:
        t.start()
    for t in threads:
        t.join()
    latencies.sort()
    return len(latencies) / seconds, latencies[len(latencies) // 2], latencies[int(len(latencies) * 0.99)]


def load(port: int, path: str, body: bytes, seconds: int, connections: int = 16):
    if shutil.which("wrk"):
        return wrk_run(port, path, body, seconds, connections)
    return python_load(port, path, body, seconds, min(connections, 8))


NGINX_CONF = """
worker_processes 1;
pid {tmp}/nginx.pid;
error_log {tmp}/error.log warn;
events {{ worker_connections 1024; }}
http {{
  access_log off;
  client_body_temp_path {tmp}/body;
  proxy_temp_path {tmp}/proxy;
  fastcgi_temp_path {tmp}/fastcgi;
  uwsgi_temp_path {tmp}/uwsgi;
  scgi_temp_path {tmp}/scgi;
  client_max_body_size 16m;
  upstream faultpath {{ {servers} }}
  server {{
    listen 127.0.0.1:{port};
    location / {{
      proxy_pass http://faultpath;
      proxy_next_upstream error timeout http_502 http_503 non_idempotent;
      proxy_next_upstream_tries 2;
      proxy_connect_timeout 1s;
    }}
  }}
}}
"""


class Nginx:
    def __init__(self, backend_ports: list[int]):
        self.tmp = tempfile.mkdtemp(prefix="faultpath-nginx-")
        self.port = free_port()
        servers = " ".join(f"server 127.0.0.1:{p} max_fails=1 fail_timeout=2s;" for p in backend_ports)
        conf = os.path.join(self.tmp, "nginx.conf")
        Path(conf).write_text(NGINX_CONF.format(tmp=self.tmp, servers=servers, port=self.port))
        subprocess.run(["nginx", "-c", conf, "-p", self.tmp], check=True, capture_output=True)
        time.sleep(0.3)

    def stop(self) -> None:
        pid_file = Path(self.tmp) / "nginx.pid"
        if pid_file.exists():
            os.kill(int(pid_file.read_text()), signal.SIGTERM)
            time.sleep(0.3)
        shutil.rmtree(self.tmp, ignore_errors=True)
