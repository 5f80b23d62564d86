"""Faultpath benchmarks: one command prints a table of figures and ratios measured in the same run.

    python bench/run.py            (from the project venv: .venv/bin/python bench/run.py)
    python bench/run.py --quick    (shorter load runs, for a smoke test)

Every server runs on 127.0.0.1 under gunicorn with deploy/gunicorn.conf.py, on a fresh port, and is
stopped at the end. Load comes from wrk (Debian package) when installed, else from a bounded Python
load generator. Scale-out uses nginx (Debian package) when installed and says so when it is not.
Ratios compare figures taken in this run on this machine; the machines here are noisy (+-15 %).
"""

from __future__ import annotations

import argparse
import json
import os
import platform
import shutil
import statistics
import subprocess
import sys
import threading
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from bench import budget, papers  # noqa: E402
from bench.harness import (  # noqa: E402
    PY,
    Nginx,
    Server,
    connections_per_worker,
    cpu_seconds,
    load,
    median_time,
    metric_values,
    peak_rss_mb,
    post,
)
from bench.payload import SUPPLY, batch, circuits, flat, installation  # noqa: E402

ROWS: list[tuple[str, str, str, str, str]] = []


def row(name: str, value: str, baseline: str = "", ratio: str = "", target: str = "") -> None:
    ROWS.append((name, value, baseline, ratio, target))
    print(f"  {name}: {value}" + (f" | {baseline}" if baseline else "") + (f" | {ratio}" if ratio else ""), flush=True)


# ---------------------------------------------------------------- 1. engine


def bench_engine() -> None:
    from service.contract.circuit_schemas import CircuitSchema, SupplySchema
    from service.electrical.pipeline import check_circuit, check_circuits

    supply = SupplySchema().load(SUPPLY)
    items = [CircuitSchema().load(c) for c in circuits(2000)]
    check_circuits(supply, items[:10])
    arrays, loops = [], []
    for _ in range(3):  # alternating, so a slow spell of the shared machine falls on both
        arrays.append(median_time(lambda: check_circuits(supply, items), 3))
        loops.append(median_time(lambda: [check_circuit(supply, c) for c in items], 1))
    array_s, loop_s = statistics.median(arrays), statistics.median(loops)
    n = len(items)
    row(
        "engine: circuits per second, array path (2 000 circuits)",
        f"{n / array_s:,.0f}/s",
        f"scalar loop {n / loop_s:,.0f}/s",
        f"{loop_s / array_s:.1f}x",
        ">= 30x",
    )


# ---------------------------------------------------------------- 2. batch over HTTP, 4. memory


def bench_batch(server: Server) -> None:
    payload = batch(10_000)
    body = json.dumps(payload).encode()
    status, data = post(server.port, "/v1/circuits/check-batch", body)
    assert status == 200, data[:300]
    _, full = post(server.port, "/v1/circuits/check-batch?form=full", body)
    floors, serves = [], []
    for _ in range(7):  # the two alternate, so a slow spell of the shared machine falls on both
        floors.append(median_time(lambda: json.dumps(json.loads(body)), 1))
        serves.append(median_time(lambda: post(server.port, "/v1/circuits/check-batch", body), 1))
    floor, served = statistics.median(floors), statistics.median(serves)
    row(
        f"batch of 10 000 circuits over HTTP, lean answer ({len(body) / 1e6:.1f} MB in, {len(data) / 1e6:.1f} MB out)",
        f"{served * 1000:,.0f} ms",
        f"json.loads + json.dumps of the request {floor * 1000:,.0f} ms",
        f"{served / floor:.1f}x",
        "<= 3x",
    )
    whole = median_time(lambda: post(server.port, "/v1/circuits/check-batch?form=full", body), 3)
    row(
        f"same batch, full answer (form=full, {len(full) / 1e6:.1f} MB out)",
        f"{whole * 1000:,.0f} ms",
        "",
        f"{whole / floor:.1f}x",
        "",
    )
    row(
        "answer size per circuit, lean (default) and full",
        f"{len(data) / 10_000:,.0f} bytes lean",
        f"{len(full) / 10_000:,.0f} bytes full",
        f"{len(full) / len(data):.1f}x",
        "<= 1 000 bytes lean",
    )
    streamed = median_time(lambda: post(server.port, "/v1/circuits/check-batch", body, "application/x-ndjson"), 3)
    row(
        "same batch streamed as NDJSON (full form per line)",
        f"{streamed * 1000:,.0f} ms",
        "",
        f"{streamed / floor:.1f}x",
        "",
    )
    peak = max(peak_rss_mb(pid) for pid in server.worker_pids())
    row("peak worker memory after 10 000-circuit batches", f"{peak:,.0f} MB", "", "", "<= 250 MB")


# ---------------------------------------------------------------- a whole installation


def bench_installation(server: Server) -> None:
    body = installation()
    sent, as_batch = json.dumps(body).encode(), json.dumps(flat(body)).encode()
    status, data = post(server.port, "/v1/installations/check", sent)
    assert status == 200, data[:300]
    whole = median_time(lambda: post(server.port, "/v1/installations/check", sent), 5)
    batch_s = median_time(lambda: post(server.port, "/v1/circuits/check-batch?form=full", as_batch), 5)
    boards, n = len(body["boards"]), sum(len(b["circuits"]) for b in body["boards"])
    row(
        f"installation of {boards} boards and {n:,} circuits over HTTP, end to end",
        f"{whole * 1000:,.0f} ms",
        f"the same circuits as a flat batch (full form, as the installation answers) {batch_s * 1000:,.0f} ms",
        f"{whole / batch_s:.2f}x",
        "<= 1.5x",
    )


# ---------------------------------------------------------------- 3. single check under load


def _loaded(server: Server, path: str, body: bytes, seconds: int) -> tuple[float, float, float, float, str]:
    """req/s, p50 and p99 (ms), the workers' CPU time per request (ms) and their connections under the load."""
    before = cpu_seconds(server)
    spread: list[list[int] | None] = []
    sampler = threading.Timer(seconds / 2, lambda: spread.append(connections_per_worker(server)))
    sampler.start()
    rps, p50, p99 = load(server.port, path, body, seconds)
    sampler.join()
    cpu_ms = (cpu_seconds(server) - before) / (rps * seconds) * 1000
    held = "/".join(map(str, spread[0])) if spread and spread[0] is not None else "n/a"
    return rps, p50, p99, cpu_ms, held


RUNS = ("faultpath_single_check_run_circuits_sum", "faultpath_single_check_run_circuits_count")
CORE_CPU = "faultpath_single_check_core_cpu_seconds_total"


def bench_single(server: Server, bare: Server, seconds: int, parts: dict[str, float]) -> None:
    body = (ROOT / "schemas" / "examples" / "circuits-check.json").read_bytes()
    load(server.port, "/v1/circuits/check", body, 2)
    before = metric_values(server.port, (*RUNS, CORE_CPU))
    rps, p50, p99, cpu, held = _loaded(server, "/v1/circuits/check", body, seconds)
    after = metric_values(server.port, (*RUNS, CORE_CPU))
    b_rps, b_p50, b_p99, b_cpu, b_held = _loaded(bare, "/echo", body, seconds)
    tool = "wrk" if shutil.which("wrk") else "Python load generator"
    row(
        f"single circuit check under load ({tool}, 16 connections, {seconds} s)",
        f"{rps:,.0f} req/s, p50 {p50:.1f} ms, p99 {p99:.1f} ms",
        f"bare Flask JSON {b_rps:,.0f} req/s, p50 {b_p50:.1f} ms, p99 {b_p99:.1f} ms",
        f"{rps / b_rps:.2f}x",
        ">= 0.5x",
    )
    row(
        "single check: workers' CPU time per request, connections held by each worker",
        f"{cpu:.2f} ms, {held}",
        f"bare Flask {b_cpu:.2f} ms, {b_held}",
        f"{b_cpu / cpu:.2f}x",
        "",
    )
    checks, runs = (after[name] - before[name] for name in RUNS)
    core_ms = (after[CORE_CPU] - before[CORE_CPU]) * 1000
    row(
        "single check under load: checks a core run, the core's CPU a run and a check",
        f"{checks / runs:.1f} a run, {core_ms / runs:.2f} ms a run, {core_ms / checks:.2f} ms a check",
        f"in process, 8 a run: {parts['core8']:.2f} ms a run, {parts['core8'] / 8:.2f} ms a check",
        f"{core_ms / checks / (parts['core8'] / 8):.1f}x",
        "",
    )
    ceiling = Server(app="bench.ceiling_app:app", workers=2)
    try:
        load(ceiling.port, "/v1/circuits/check", body, 2)
        c_rps, _, c_p99, c_cpu, _ = _loaded(ceiling, "/v1/circuits/check", body, seconds)
    finally:
        ceiling.stop()
    row(
        "single check ceiling: the same service with the core's answer given ready (bench/ceiling_app.py)",
        f"{c_rps:,.0f} req/s, p99 {c_p99:.1f} ms, CPU {c_cpu:.2f} ms a request",
        f"bare Flask {b_rps:,.0f} req/s",
        f"{c_rps / b_rps:.2f}x",
        "",
    )
    budget.single_budget(row, parts, b_cpu, c_cpu)


# ---------------------------------------------------------------- 4. worker start


def bench_start() -> None:
    code = (
        "import time; t=time.perf_counter(); from service.app import create_app; create_app(); "
        "print(time.perf_counter()-t)"
    )
    times = [
        float(subprocess.run([PY, "-c", code], cwd=ROOT, capture_output=True, text=True, check=True).stdout)
        for _ in range(3)
    ]
    row("worker start: import and create_app", f"{statistics.median(times) * 1000:,.0f} ms", "", "", "<= 1 s")


# ---------------------------------------------------------------- the picture


def bench_picture() -> None:
    from service.app import create_app
    from service.settings import Settings

    client = create_app({"SETTINGS": Settings()}).test_client()
    body = json.loads((ROOT / "schemas" / "examples" / "circuits-check.json").read_text())
    client.post("/v1/circuits/picture", json=body)  # the worker's first picture imports matplotlib
    seconds = median_time(lambda: client.post("/v1/circuits/picture", json=body), 5)
    row(
        "time-current picture of a checked circuit (SVG, warm worker)", f"{seconds * 1000:,.0f} ms", "", "", "<= 300 ms"
    )


# ---------------------------------------------------------------- 5. growth


def _cli_run(path: Path) -> tuple[float, float]:
    """Seconds and peak memory (MB) of `python -m service check FILE` writing its JSON answer to /dev/null.

    The peak is the process's own high-water mark after exec (VmHWM): ru_maxrss would count the bench's own
    memory, inherited through fork."""
    code = (
        "import sys, time; from service.__main__ import main; t = time.perf_counter(); "
        "sys.stdout = open('/dev/null', 'w'); rc = main(['check', sys.argv[1], '-o', '/dev/null']); "
        "peak = [l for l in open('/proc/self/status') if l.startswith('VmHWM')][0].split()[1]; "
        "print(time.perf_counter() - t, int(peak) / 1024, file=sys.stderr)"
    )
    done = subprocess.run([PY, "-c", code, str(path)], cwd=ROOT, capture_output=True, text=True)
    seconds, peak = done.stderr.strip().splitlines()[-1].split()
    return float(seconds), float(peak)


def bench_growth(largest: int = 1_000_000) -> None:
    """The CLI on JSON schedules of growing size, each in its own process: per-circuit cost and peak memory."""
    import tempfile

    from bench.payload import write_schedule

    sizes = [n for n in (1_000, 10_000, 100_000, 1_000_000) if n <= largest]
    figures = {}
    with tempfile.TemporaryDirectory() as tmp:
        for n in sizes:
            path = Path(tmp) / f"schedule-{n}.json"
            write_schedule(path, n)
            seconds, peak = _cli_run(path)
            figures[n] = (seconds / n * 1e6, peak)
            row(
                f"growth: {n:,} circuits through the CLI (a JSON file read incrementally, answer to /dev/null)",
                f"{seconds:,.1f} s, peak {peak:,.0f} MB",
                "",
                f"{seconds / n * 1e6:.1f} us per circuit",
                "< 300 MB at 1M" if n == 1_000_000 else "",
            )
            path.unlink()
    if 10_000 in figures and 100_000 in figures:
        ratio = figures[100_000][0] / figures[10_000][0]
        growth = (figures[max(sizes)][1] - figures[10_000][1]) * 1024 * 1024 / (max(sizes) - 10_000)
        row("growth: per-circuit cost, 100 000 against 10 000", "", "", f"{ratio:.2f}x", "<= 1.2x")
        row(
            f"growth: peak memory per circuit, {max(sizes):,} against 10 000",
            f"{growth:,.0f} bytes per circuit",
            "",
            "",
            "<= 200 bytes",
        )


# ---------------------------------------------------------------- scale-out


def bench_scale_out(seconds: int) -> None:
    if not shutil.which("nginx"):
        row("scale-out: two instances behind nginx", "skipped: nginx is not installed (apt-get install nginx-light)")
        return
    body = (ROOT / "schemas" / "examples" / "circuits-check.json").read_bytes()
    a, b = Server(workers=2), Server(workers=2)
    try:
        one = Nginx([a.port])
        try:
            rps1, p50_1, p99_1 = load(one.port, "/v1/circuits/check", body, seconds)
        finally:
            one.stop()
        two = Nginx([a.port, b.port])
        try:
            rps2, p50_2, p99_2 = load(two.port, "/v1/circuits/check", body, seconds)
        finally:
            two.stop()
    finally:
        a.stop()
        b.stop()
    row(
        f"scale-out: two instances behind nginx ({os.cpu_count()} cores shared by all)",
        f"{rps2:,.0f} req/s, p99 {p99_2:.1f} ms",
        f"one instance {rps1:,.0f} req/s, p99 {p99_1:.1f} ms",
        f"{rps2 / rps1:.2f}x",
        "",
    )


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true", help="3 s load runs instead of 10 s")
    args = parser.parse_args()
    seconds = 3 if args.quick else 10
    print(
        f"Faultpath bench on {platform.node()}: {os.cpu_count()} cores, {platform.processor() or platform.machine()}, "
        f"Python {platform.python_version()}",
        flush=True,
    )
    bench_engine()
    bench_start()
    bench_picture()
    for cells in papers.report_rows() + papers.design_rows():
        row(*cells)
    figures = budget.in_fresh_process()
    for cells in figures["rows"]:
        row(*cells)
    server = Server(workers=2)
    bare = Server(app="bench.bare_app:app", workers=2)
    try:
        bench_batch(server)
        bench_installation(server)
        bench_single(server, bare, seconds, figures["single"])
    finally:
        server.stop()
        bare.stop()
    bench_scale_out(seconds)
    bench_growth()
    width = [
        max(len(r[i]) for r in ROWS + [("figure", "value", "baseline (same run)", "ratio", "target")]) for i in range(5)
    ]
    print()
    header = ("figure", "value", "baseline (same run)", "ratio", "target")
    for r in [header, tuple("-" * w for w in width)] + ROWS:
        print(" | ".join(cell.ljust(w) for cell, w in zip(r, width, strict=False)))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
