"""Where the time goes, in process: the 10 000-circuit batch stage by stage, and the parts of a single check.

These figures say what the batch and single-check targets would take. The batch: each stage of a lean batch
request as the view runs it, against the standard library's round trip of the same request (json.loads +
json.dumps), and what would be left if reading the items into columns cost nothing. The single check: the
core's cost for a run of 1, 4 and 8 circuits (concurrent checks in a worker are computed together), and, with
the figures bench/run.py takes under load, the best CPU a request that cost allows.

    python bench/budget.py      (bench/run.py prints the same rows in its table, measured in a fresh process)
"""

from __future__ import annotations

import io
import json
import statistics
import subprocess
import sys
import time
from collections.abc import Callable
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from bench.payload import batch  # noqa: E402

Row = Callable[..., None]
STAGES = ("read", "load", "columns", "checks", "table", "write")


def _batch_once(raw: bytes, answer: dict) -> dict[str, float]:
    """One lean batch request's stages, run as the view runs them (seconds each); ``answer`` is the request's
    lean answer, for the writing stage."""
    from service.contract.batch import CHUNK
    from service.contract.circuit_schemas import BatchRequestSchema
    from service.contract.lean_table import Interned, columns_of_checked
    from service.contract.problems import json_bytes
    from service.contract.strictjson import strict_loads
    from service.electrical.circuit_arrays import columns_of, prepare
    from service.electrical.pipeline import check_columns

    t: dict[str, float] = dict.fromkeys(STAGES, 0.0)
    start = time.perf_counter()
    data = strict_loads(raw)
    t["read"] = time.perf_counter() - start
    start = time.perf_counter()
    body = BatchRequestSchema().load(data)
    t["load"] = time.perf_counter() - start
    items, supply = body["circuits"], body["supply"]
    texts, devices = Interned(), Interned()
    for first in range(0, len(items), CHUNK):
        chunk = items[first : first + CHUNK]
        start = time.perf_counter()
        good, _ = prepare([supply] * len(chunk), chunk)
        cols = columns_of([supply] * len(good), [chunk[i] for i in good])
        t["columns"] += time.perf_counter() - start
        start = time.perf_counter()
        checked = check_columns(cols)
        t["checks"] += time.perf_counter() - start
        start = time.perf_counter()
        columns_of_checked(checked, good, texts, devices)
        t["table"] += time.perf_counter() - start
    start = time.perf_counter()
    json_bytes(answer)
    t["write"] = time.perf_counter() - start
    return t


def _wsgi_call(app, path: str, raw: bytes) -> bytes:
    environ = {
        "REQUEST_METHOD": "POST",
        "PATH_INFO": path,
        "QUERY_STRING": "",
        "SERVER_NAME": "127.0.0.1",
        "SERVER_PORT": "80",
        "SERVER_PROTOCOL": "HTTP/1.1",
        "REMOTE_ADDR": "127.0.0.1",
        "CONTENT_TYPE": "application/json",
        "CONTENT_LENGTH": str(len(raw)),
        "wsgi.url_scheme": "http",
        "wsgi.input": io.BytesIO(raw),
        "wsgi.errors": sys.stderr,
    }
    status: list[str] = []
    out = b"".join(app(environ, lambda s, headers, exc_info=None: status.append(s)))
    assert status[0].startswith("200"), (status, out[:300])
    return out


def batch_budget(row: Row, runs: int = 7) -> None:
    """The stages of a 10 000-circuit lean batch in process, each against the stdlib round trip of its request."""
    from service.app import create_app
    from service.contract.circuit_schemas import BatchRequestSchema
    from service.contract.lean import lean_answer
    from service.settings import Settings

    app = create_app({"SETTINGS": Settings()})
    payload = batch(10_000)
    raw = json.dumps(payload).encode()
    _wsgi_call(app, "/v1/circuits/check-batch", raw)
    body = BatchRequestSchema().load(payload)
    answer = lean_answer(body["supply"], body["circuits"], None, body["edition"])
    floors, wholes, stages = [], [], []
    for _ in range(runs):  # alternating, so a slow spell falls on all
        start = time.perf_counter()
        json.dumps(json.loads(raw))
        floors.append(time.perf_counter() - start)
        start = time.perf_counter()
        _wsgi_call(app, "/v1/circuits/check-batch", raw)
        wholes.append(time.perf_counter() - start)
        stages.append(_batch_once(raw, answer))
    floor = statistics.median(floors)
    part = {name: statistics.median(s[name] for s in stages) for name in STAGES}
    words = {
        "read": "reading the body as strict JSON",
        "load": "loading and validating the items (one Python pass per item)",
        "columns": "the items' lookups and columns for the core (per-item Python)",
        "checks": "every check over the columns (the pipeline's steps)",
        "table": "the lean table's columns from the checked arrays",
        "write": "writing the answer (orjson)",
    }
    for name in STAGES:
        row(f"batch budget, in process: {words[name]}", f"{part[name] * 1000:,.0f} ms", "", _x(part[name], floor))
    whole = statistics.median(wholes)
    other = whole - sum(part.values())
    row(
        "batch budget, in process: the rest (Flask, webargs, merging chunks, the collector)",
        f"{other * 1000:,.0f} ms",
        "",
        _x(other, floor),
    )
    row(
        "batch budget, in process: the whole request (Flask, no HTTP)",
        f"{whole * 1000:,.0f} ms",
        f"json.loads + json.dumps of the request {floor * 1000:,.0f} ms",
        _x(whole, floor),
    )
    rest = sum(part[name] for name in ("read", "checks", "table", "write"))
    row(
        "batch budget: what is left if loading and the per-item columns cost nothing (no HTTP)",
        f"{rest * 1000:,.0f} ms",
        "",
        _x(rest, floor),
        "<= 3x over HTTP",
    )


def _x(seconds: float, floor: float) -> str:
    return f"{seconds / floor:.2f}x"


def _cpu_per_call(fn: Callable[[], object], calls: int, runs: int = 7) -> float:
    """Median CPU seconds per call of ``fn`` (process time, so a busy neighbour does not count)."""
    for _ in range(calls // 4):
        fn()
    samples = []
    for _ in range(runs):
        start = time.process_time()
        for _ in range(calls):
            fn()
        samples.append((time.process_time() - start) / calls)
    return statistics.median(samples)


def single_parts() -> dict[str, float]:
    """CPU ms of the core for runs of 1, 4 and 8 circuits (the bench's single check request, in process)."""
    from service.app import create_app
    from service.contract.circuit_schemas import CheckRequestSchema
    from service.electrical.pipeline import check_circuits
    from service.settings import Settings

    app = create_app({"SETTINGS": Settings()})
    raw = (ROOT / "schemas" / "examples" / "circuits-check.json").read_bytes()
    with app.app_context():
        body = CheckRequestSchema().load(json.loads(raw))
    supply, circuit = body["supply"], body["circuit"]
    return {
        f"core{n}": _cpu_per_call(lambda n=n: check_circuits([supply] * n, [circuit] * n), 200) * 1000
        for n in (1, 4, 8)
    }


def core_row(row: Row, parts: dict[str, float]) -> None:
    """The core's CPU for a run of 1, 4 and 8 circuits, in process."""
    row(
        "single check budget, in process: the core for a run of 1, 4 and 8 circuits (CPU)",
        f"{parts['core1']:.2f}, {parts['core4']:.2f}, {parts['core8']:.2f} ms",
        "",
        f"{parts['core8'] / 8:.2f} ms a check at 8",
    )


def single_budget(row: Row, parts: dict[str, float], bare_cpu_ms: float, ceiling_cpu_ms: float) -> None:
    """The core's runs in process, and the best CPU a request they allow: the ceiling's CPU a request under load
    (bench/ceiling_app.py: everything but the core) plus the core's share with 8 checks a run (the most the
    bench's 16 connections on 2 workers allow), against bare Flask's CPU a request under the same load."""
    core_row(row, parts)
    best = ceiling_cpu_ms + parts["core8"] / 8
    row(
        "single check budget: CPU a request at best (the ceiling's + the core's share at 8 a run, in process)",
        f"{best:.2f} ms",
        f"bare Flask {bare_cpu_ms:.2f} ms",
        f"{bare_cpu_ms / best:.2f}x",
        ">= 0.5x in req/s",
    )


def measured() -> dict:
    """The batch's budget rows and the core's runs, in this process set up as a worker is when it starts (the app,
    then matplotlib, then the runtime policy: deploy/gunicorn.conf.py's post_worker_init)."""
    from service.picture import warm
    from service.serving import runtime

    rows: list[tuple[str, ...]] = []
    warm()
    runtime.apply()
    batch_budget(lambda *cells: rows.append(cells))
    return {"rows": rows, "single": single_parts()}


def in_fresh_process() -> dict:
    """:func:`measured` in a new Python process (what bench/run.py prints)."""
    done = subprocess.run([sys.executable, __file__, "--json"], cwd=ROOT, capture_output=True, text=True, check=True)
    return json.loads(done.stdout)


def main() -> int:
    figures = measured()
    if "--json" in sys.argv:
        print(json.dumps(figures))
        return 0

    def row(*cells: str) -> None:
        print(f"  {cells[0]}: {cells[1]}" + "".join(f" | {c}" for c in cells[2:] if c))

    for cells in figures["rows"]:
        row(*cells)
    core_row(row, figures["single"])
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
