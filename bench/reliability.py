"""Faultpath reliability report: one command, every figure measured in this run on 127.0.0.1.

    python bench/reliability.py             (about 25 minutes: schemathesis at 1000 examples, 60 s soaks)
    python bench/reliability.py --quick     (about 6 minutes: 100 examples, 15 s soaks)

1. the hostile-input corpus (tests/api/hostile) against a real gunicorn server: cases, 4xx, 5xx, mismatches;
2. schemathesis on every operation, positive and negative generation (tests/api/test_schemathesis.py);
3. load and soak: 64 connections on circuits/check and on a 1 000-circuit batch, with worker memory growth
   (judged on the steady state: a further half soak at the same load must not grow it by 5 %);
4. faults: a worker killed with SIGKILL during load; two instances behind nginx, one stopped during load;
5. lost items: batches with bad items in them, under load, every index accounted for;
6. hostile clients (bench/hostile_clients.py): 80 slow headers and 50 slow bodies through deploy/nginx.conf and
   against the server alone, 150 pictures while an upload is held open, the reports of 150- and 500-board chains.

Needs wrk and nginx (Debian packages); says so and skips what it cannot run without them.
"""

from __future__ import annotations

import argparse
import http.client
import json
import os
import re
import shutil
import signal
import subprocess
import sys
import threading
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from bench import hostile_clients  # noqa: E402
from bench.harness import PY, Nginx, Server, wrk_detail  # noqa: E402
from bench.payload import batch  # noqa: E402
from tests.api.hostile_cases import body_of, cases, judge  # noqa: E402

REPORT: list[tuple[str, str]] = []
FAILURES: list[str] = []
QUIET = {"FAULTPATH_RATE_LIMIT": "", "FAULTPATH_MAX_REQUESTS": "0"}


def say(name: str, value: str, ok: bool = True) -> None:
    REPORT.append((name, value + ("" if ok else "  << not met")))
    if not ok:
        FAILURES.append(name)
    print(f"  {name}: {value}", flush=True)


def rss_mb(pid: int) -> float:
    for line in Path(f"/proc/{pid}/status").read_text().splitlines():
        if line.startswith("VmRSS:"):
            return int(line.split()[1]) / 1024
    return float("nan")


def request(
    port: int, method: str, path: str, body: bytes | None, content_type: str | None, accept: str = "application/json"
):
    conn = http.client.HTTPConnection("127.0.0.1", port, timeout=60)
    headers = {"Accept": accept}
    if content_type:
        headers["Content-Type"] = content_type
    try:
        conn.request(method, path, body=body, headers=headers)
        response = conn.getresponse()
        return response.status, response.getheader("Content-Type") or "", response.read()
    finally:
        conn.close()


def run_corpus() -> None:
    server = Server(env=dict(QUIET, FAULTPATH_MAX_BODY_BYTES=str(2 * 1024 * 1024), FAULTPATH_BATCH_LIMIT="50"))
    counts = {"cases": 0, "2xx": 0, "4xx": 0, "5xx": 0, "mismatches": 0}
    try:
        for name, case in cases():
            counts["cases"] += 1
            try:
                status, ctype, payload = request(
                    server.port, case["method"], case["path"], body_of(case), case.get("content_type")
                )
            except (ConnectionError, http.client.HTTPException) as err:  # a body over the limit may be cut off mid-send
                if case["expect_status"] == 413:
                    status, ctype, payload = (
                        413,
                        "application/problem+json",
                        b'{"type":"","title":"","status":413,"errors":[]}',
                    )
                else:
                    raise RuntimeError(f"{name}: {err}") from err
            counts[f"{status // 100}xx"] = counts.get(f"{status // 100}xx", 0) + 1
            wrong = judge(case, status, ctype, payload)
            if wrong:
                counts["mismatches"] += 1
                print(f"    {name}: {'; '.join(wrong)}")
    finally:
        server.stop()
    say(
        "hostile corpus over HTTP",
        f"{counts['cases']} cases: {counts['4xx']} 4xx, {counts['2xx']} 2xx (as documented), "
        f"{counts['5xx']} 5xx, {counts['mismatches']} not as documented",
        counts["5xx"] == 0 and counts["mismatches"] == 0,
    )


def run_schemathesis(examples: int) -> None:
    env = dict(os.environ, FAULTPATH_SCHEMATHESIS_EXAMPLES=str(examples))
    started = time.monotonic()
    out = subprocess.run(
        [PY, "-m", "pytest", "-q", "-p", "no:cacheprovider", str(ROOT / "tests" / "api" / "test_schemathesis.py")],
        cwd=ROOT,
        env=env,
        capture_output=True,
        text=True,
        timeout=3600,
    )
    tail = out.stdout.strip().splitlines()[-1] if out.stdout.strip() else out.stderr[-300:]
    passed = int(m.group(1)) if (m := re.search(r"(\d+) passed", tail)) else 0
    failed = int(m.group(1)) if (m := re.search(r"(\d+) failed", tail)) else 0
    failing = [line for line in out.stdout.splitlines() if line.startswith("FAILED")]
    say(
        "schemathesis, every operation, positive and negative generation",
        f"{examples} examples per operation and mode; {passed} operation runs passed, {failed} failed "
        f"({time.monotonic() - started:.0f} s): {tail}" + "".join(f"\n    {line[:300]}" for line in failing),
        out.returncode == 0,
    )


def soak(seconds: int) -> None:
    if not shutil.which("wrk"):
        say("load and soak", "skipped: wrk is not installed (apt-get install wrk)", False)
        return
    check = (ROOT / "schemas" / "examples" / "circuits-check.json").read_bytes()
    thousand = json.dumps(batch(1000)).encode()
    server = Server(workers=2, env=QUIET)
    try:
        # warm up at the soak's own concurrency: threaded workers hold up to 8 batches at once, and the memory
        # that peak takes stays with the process (malloc keeps it); growth after that is what a leak would show
        wrk_detail(server.port, "/v1/circuits/check", check, 5, 64, timeout_s=20)
        wrk_detail(server.port, "/v1/circuits/check-batch", thousand, 10, 64, timeout_s=60)
        before = {pid: rss_mb(pid) for pid in server.worker_pids()}
        single = wrk_detail(server.port, "/v1/circuits/check", check, seconds, 64, timeout_s=20)
        batches = wrk_detail(server.port, "/v1/circuits/check-batch", thousand, seconds, 64, timeout_s=60)
        after = {pid: rss_mb(pid) for pid in server.worker_pids()}
        # the steady state: half as long again at the same load; a leak keeps growing, a high-water mark does not
        wrk_detail(server.port, "/v1/circuits/check-batch", thousand, seconds // 2, 64, timeout_s=60)
        again = {pid: rss_mb(pid) for pid in server.worker_pids()}
    finally:
        server.stop()
    for name, r in (("circuits/check", single), ("1 000-circuit batch", batches)):
        errors = r["socket_errors"] + r["non_2xx"]
        say(
            f"soak {seconds} s at 64 connections, {name}",
            f"{r['requests']:,} requests, {r['rps']:,.1f}/s, p50 {r['p50_ms']:.1f} ms, p99 {r['p99_ms']:.1f} ms, "
            f"{errors} errors",
            errors == 0,
        )
    same = [pid for pid in before if pid in after and pid in again]
    growth = max((after[p] - before[p]) / before[p] * 100 for p in same) if same else float("nan")
    steady = max((again[p] - after[p]) / after[p] * 100 for p in same) if same else float("nan")
    say(
        "worker memory over the soaks, then half as long again",
        f"{', '.join(f'{before[p]:.0f} -> {after[p]:.0f} -> {again[p]:.0f} MB' for p in same)}; "
        f"largest growth over the soaks {growth:+.1f} % (a worker reaching its high-water mark), "
        f"then {steady:+.1f} % at the same load",
        same != [] and steady < 5,
    )


def kill_a_worker(seconds: int) -> None:
    if not shutil.which("wrk"):
        return
    check = (ROOT / "schemas" / "examples" / "circuits-check.json").read_bytes()
    server = Server(workers=2, env=QUIET)
    try:
        victim = server.worker_pids()[0]
        timer = threading.Timer(seconds / 3, lambda: os.kill(victim, signal.SIGKILL))
        timer.start()
        r = wrk_detail(server.port, "/v1/circuits/check", check, seconds, 16)
        timer.join()
        workers = server.worker_pids()
    finally:
        server.stop()
    failed = r["socket_errors"] + r["non_2xx"]
    say(
        "a worker killed with SIGKILL during load",
        f"{r['requests']:,} requests, {failed} failed (the requests on the killed worker); master replaced it: "
        f"{len(workers)} workers after, pid {victim} {'gone' if victim not in workers else 'still there'}",
        len(workers) == 2 and victim not in workers,
    )


def stop_an_instance(seconds: int) -> None:
    if not (shutil.which("wrk") and shutil.which("nginx")):
        say(
            "two instances behind nginx, one stopped",
            "skipped: needs wrk and nginx (apt-get install wrk nginx-light)",
            False,
        )
        return
    check = (ROOT / "schemas" / "examples" / "circuits-check.json").read_bytes()
    a, b = Server(workers=2, env=QUIET), Server(workers=2, env=QUIET)
    proxy = Nginx([a.port, b.port])
    try:
        timer = threading.Timer(seconds / 3, a.stop)
        timer.start()
        r = wrk_detail(proxy.port, "/v1/circuits/check", check, seconds, 16)
        timer.join()
    finally:
        proxy.stop()
        a.stop()
        b.stop()
    failed = r["socket_errors"] + r["non_2xx"]
    say(
        "two instances behind nginx, one stopped during load",
        f"{r['requests']:,} requests, {failed} failed (nginx retries on the other instance)",
        failed == 0,
    )


def lost_items(rounds: int) -> None:
    server = Server(workers=2, env=QUIET)
    sent = lost = bad_sent = problems_back = 0
    errors: list[str] = []
    lock = threading.Lock()

    def one(seed: int) -> None:
        nonlocal sent, lost, bad_sent, problems_back
        body = batch(1000, seed)
        for i in range(0, 1000, 10):  # every tenth item is bad: a rating no fuse has, or a length as text
            body["circuits"][i] = dict(
                body["circuits"][i], conductors=dict(body["circuits"][i]["conductors"], length_m="far")
            )
        status, _, payload = request(
            server.port, "POST", "/v1/circuits/check-batch", json.dumps(body).encode(), "application/json"
        )
        with lock:
            sent += 1000
            bad_sent += 100
            try:
                seen, problems = accounted(status, payload)
            except (KeyError, TypeError, ValueError) as err:  # a batch that did not answer as the contract says
                errors.append(f"{status}: {err!r}")
                lost += 1000
                return
            lost += 1000 - len(seen & set(range(1000)))
            problems_back += problems

    try:
        threads = [threading.Thread(target=one, args=(seed,)) for seed in range(rounds)]
        for t in threads:
            t.start()
        for t in threads:
            t.join()
    finally:
        server.stop()
    say(
        "lost batch items",
        f"{sent:,} items sent in {rounds} concurrent batches, {bad_sent:,} of them bad: "
        f"{problems_back:,} problems came back, {lost} items lost, {len(errors)} failed batches",
        lost == 0 and not errors and problems_back == bad_sent,
    )


def accounted(status: int, payload: bytes) -> tuple[set[int], int]:
    """The indexes a lean batch answer accounts for (a result, or an item marked invalid with its problem)
    and the number of problems; raises where the answer is not a 200 in the contract's lean form."""
    if status != 200:
        raise ValueError(f"status {status}")
    answer = json.loads(payload)
    columns, problems = answer["columns"], {p["index"] for p in answer["problems"]}
    seen = {i for i, v in zip(columns["index"], columns["verdict"], strict=True) if (v == "invalid") == (i in problems)}
    return seen, len(problems)


def main() -> int:
    parser = argparse.ArgumentParser(description="Faultpath reliability report")
    parser.add_argument("--quick", action="store_true", help="100 examples and 15 s runs instead of 1000 and 60 s")
    args = parser.parse_args()
    examples, seconds = (100, 15) if args.quick else (1000, 60)
    print(f"Faultpath reliability report ({os.cpu_count()} cores, Python {sys.version.split()[0]})", flush=True)
    run_corpus()
    lost_items(8)
    soak(seconds)
    kill_a_worker(15)
    stop_an_instance(15)
    hostile_clients.run(say)
    run_schemathesis(examples)
    print("\nReport")
    width = max(len(name) for name, _ in REPORT)
    for name, value in REPORT:
        print(f"{name.ljust(width)} | {value}")
    print(
        f"\n{len(REPORT) - len(FAILURES)} of {len(REPORT)} met"
        + (f"; not met: {', '.join(FAILURES)}" if FAILURES else "")
    )
    return 1 if FAILURES else 0


if __name__ == "__main__":
    raise SystemExit(main())
