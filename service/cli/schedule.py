"""`python -m service check FILE`: check a whole schedule, or a whole installation, from a JSON or CSV file.

JSON: the body of POST /v1/circuits/check-batch (``{"supply": {...}, "circuits": [...]}``), or of POST
/v1/installations/check (``{"supply": {...}, "boards": [...]}``, :mod:`service.cli.installation`).
CSV: one row a circuit, each with its own supply, in the columns of :data:`service.cli.read.CSV_COLUMNS`.
NDJSON: a first line ``{"supply": {...}}``, then one circuit per line. Every form is read a row at a time
(:mod:`service.cli.read`) and checked a chunk at a time, so memory stays flat for a file of any length.
Input goes through the same schemas as the HTTP API, so a bad row gets the same messages.

Exit status: 0 only when every circuit passes; 1 when any fails; 3 when some rows could not be checked
(and none failed); 4 when some circuits are not-verified (and none failed or could not be checked); 2 for a
file that cannot be read.
"""

from __future__ import annotations

import argparse
import csv
import io
import itertools
import json
import sys
from collections.abc import Iterable
from pathlib import Path
from typing import Any, TextIO

from service.cli.read import Row, ScheduleError, iter_csv, iter_json, iter_ndjson, top_level_kind
from service.cli.status import CHUNK, EXIT_UNREADABLE, Progress, exit_status
from service.contract.problems import json_bytes
from service.contract.strictjson import strict_loads
from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.pipeline import check_circuits
from service.electrical.results.circuit_result import GENERAL_CAUTIONS
from service.electrical.results.verdicts import COUNTED, Verdict

RESULT_COLUMNS = (
    "index",
    "id",
    "verdict",
    "r1_plus_r2_ohm",
    "zs_ohm",
    "max_zs_ohm",
    "zs_margin_percent",
    "earth_fault_current_a",
    "disconnection_time_s",
    "disconnection_time_bound",
    "max_disconnection_time_s",
    "min_cpc_csa_mm2",
    "cpc_csa_mm2",
    "failed_checks",
    "not_verified_checks",
    "cautions",
    "problem",
)


def run_chunks(rows: Iterable[Row], progress: Progress):
    """The records of the rows, in order, a chunk at a time: rows are read as the chunks need them, so a file
    of any length is checked in flat memory."""
    done = 0
    rows = iter(rows)
    while True:
        chunk = list(itertools.islice(rows, CHUNK))
        if not chunk:
            return
        records = _chunk(chunk)
        done += len(records)
        progress.update(done)
        yield records


def _chunk(chunk: list[Row]) -> list[dict[str, Any]]:
    """One record per row of a chunk, in order: a result, or the problem that stopped it."""
    ready = [row for row in chunk if row.problem is None]
    outcomes = iter(check_circuits([r.supply for r in ready], [r.circuit for r in ready]) if ready else [])
    records = []
    for row in chunk:
        if row.problem is not None:
            records.append({"index": row.index, "id": row.id, "problem": {"status": 422, "errors": row.problem}})
            continue
        outcome = next(outcomes)
        if isinstance(outcome, CircuitFailure):
            records.append(
                {"index": row.index, "id": row.id, "problem": {"status": 422, "errors": row.errors_of(outcome)}}
            )
        else:
            records.append({"index": row.index, "id": row.id, "result": outcome})
    return records


def _own_cautions(result) -> list[str]:
    """A result's own cautions and the notes of its failing or unverified checks, in words (the general cautions
    are the same on every row and left out)."""
    said = [f"{c.check}: {c.verdict}: {c.note}" for c in result.checks if c.verdict != Verdict.PASS and c.note]
    return said + [text for text in result.cautions if text not in GENERAL_CAUTIONS]


class Tally:
    def __init__(self):
        self.counts = {"circuits": 0, **{str(v): 0 for v in COUNTED}, "invalid": 0}

    def add(self, records) -> None:
        for r in records:
            self.counts["circuits"] += 1
            self.counts[r["result"].verdict if "result" in r else "invalid"] += 1


def csv_writer(stream: TextIO) -> csv.DictWriter:
    writer = csv.DictWriter(stream, fieldnames=RESULT_COLUMNS, lineterminator="\n")
    writer.writeheader()
    return writer


def write_csv_rows(writer: csv.DictWriter, records: list[dict[str, Any]]) -> None:
    for record in records:
        row: dict[str, Any] = {"index": record["index"], "id": record["id"]}
        if "problem" in record:
            row["verdict"] = "invalid"
            row["problem"] = "; ".join(f"{e['pointer']}: {e['message']}" for e in record["problem"]["errors"])
        else:
            r = record["result"]
            row.update(
                verdict=r.verdict,
                r1_plus_r2_ohm=r.r1_plus_r2_ohm,
                zs_ohm=r.zs_ohm,
                max_zs_ohm=r.max_zs_ohm,
                zs_margin_percent=r.zs_margin_percent,
                earth_fault_current_a=r.earth_fault_current_a,
                disconnection_time_s=r.disconnection_time_s,
                disconnection_time_bound=r.disconnection_time_bound,
                max_disconnection_time_s=r.max_disconnection_time_s,
                min_cpc_csa_mm2=r.protective_conductor["min_csa_mm2"],
                cpc_csa_mm2=r.protective_conductor["csa_mm2"],
                failed_checks=" ".join(c.check for c in r.checks if c.verdict == Verdict.FAIL),
                not_verified_checks=" ".join(c.check for c in r.checks if c.verdict == Verdict.NOT_VERIFIED),
                cautions=" | ".join(_own_cautions(r)),
            )
        writer.writerow({k: ("" if v is None else v) for k, v in row.items()})


def main(args: argparse.Namespace) -> int:
    path = Path(args.file)
    kind = args.input_format or {".csv": "csv", ".ndjson": "ndjson"}.get(path.suffix.lower(), "json")
    try:
        with path.open("rb") as stream:
            if kind == "json" and top_level_kind(stream) == "boards":
                return _installation(strict_loads(stream.read()), path, args)
            if args.report:
                raise ScheduleError("--report needs an installation file (the body of POST /v1/installations/check)")
            text = None if kind == "json" else io.TextIOWrapper(stream, encoding="utf-8", newline="")
            rows = {"csv": iter_csv, "ndjson": iter_ndjson}[kind](text) if text else iter_json(stream)
            return _checked(rows, args, _count(path, kind))
    except (OSError, UnicodeDecodeError, json.JSONDecodeError, ScheduleError) as err:
        print(f"cannot read {path}: {err}", file=sys.stderr)
        return EXIT_UNREADABLE


def _count(path: Path, kind: str) -> int | None:
    """How many circuits a line-based file holds (for the bar); None for JSON (read incrementally)."""
    if kind == "json":
        return None
    with path.open("rb") as stream:
        return max(sum(1 for line in stream if line.strip()) - 1, 0)


def _checked(rows: Iterable[Row], args: argparse.Namespace, total: int | None) -> int:
    """Check the rows a chunk at a time, write the records as they come, and return the exit status."""
    out_format = args.format or ("csv" if args.output and args.output.lower().endswith(".csv") else "json")
    tally = Tally()
    sink = open(args.output, "wb") if args.output else sys.stdout.buffer
    try:
        progress = Progress(total, sys.stderr)
        chunks = run_chunks(rows, progress)
        if out_format == "csv":
            text = io.TextIOWrapper(sink, encoding="utf-8", newline="", write_through=True)
            writer = csv_writer(text)
            for records in chunks:
                tally.add(records)
                write_csv_rows(writer, records)
            text.detach()
        else:
            sink.write(b'{"results":[')
            first = True
            for records in chunks:
                tally.add(records)
                if records:
                    sink.write((b"" if first else b",") + b",".join(json_bytes(r) for r in records))
                    first = False
            sink.write(b'],"summary":' + json_bytes(tally.counts) + b"}\n")
        progress.close()
    finally:
        if args.output:
            sink.close()
        else:
            sink.flush()
    counts = tally.counts
    print(" ".join(f"{k}={v}" for k, v in counts.items()), file=sys.stderr)
    return exit_status(counts)


def _installation(body: dict, path: Path, args: argparse.Namespace) -> int:
    if args.format == "csv" or (args.output or "").lower().endswith(".csv"):
        raise ScheduleError("an installation's answer is JSON (and --report writes the HTML report)")
    # the installation's schemas and report: imported only for one
    from service.cli import installation as cli_installation

    return cli_installation.run(body, path, args, lambda total: Progress(total, sys.stderr))


def add_parser(sub) -> None:
    p = sub.add_parser("check", help="check a schedule of circuits from a JSON or CSV file")
    p.add_argument("file", help="a .json schedule (the check-batch body) or a .csv with one row a circuit")
    p.add_argument("--input-format", choices=["json", "csv", "ndjson"], help="default: from the file's extension")
    p.add_argument("--format", choices=["json", "csv"], help="output format (default: json, or csv for a .csv output)")
    p.add_argument("-o", "--output", help="write the results here (default: standard output)")
    p.add_argument("--report", metavar="FILE.html", help="an installation file: write the printable report here too")
    p.add_argument(
        "--strict", action="store_true", help="no effect: not-verified circuits always exit 4 (kept for scripts)"
    )
    p.set_defaults(func=main)
