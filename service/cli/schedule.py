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
import json
import sys
from collections.abc import Iterable
from pathlib import Path
from typing import Any, TextIO

from service.cli.read import Row, ScheduleError, iter_csv, iter_json, iter_ndjson, top_level_kind
from service.cli.status import EXIT_UNREADABLE, Progress, exit_status
from service.contract import batch
from service.contract.strictjson import strict_loads
from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.pipeline import check_circuits
from service.electrical.results.circuit_result import GENERAL_CAUTIONS, CircuitResult
from service.electrical.results.shapes import csv_figures
from service.electrical.results.verdicts import Verdict

# the figures of a result the CSV answer carries, as its shape declares them (csv=...), between the row's place
# and what the CLI says of the checks
FIGURE_COLUMNS = csv_figures(CircuitResult)
RESULT_COLUMNS = (
    "index",
    "line",
    "id",
    "verdict",
    *(column for column, _ in FIGURE_COLUMNS),
    "failed_checks",
    "not_verified_checks",
    "cautions",
    "problem",
)


def run_chunks(rows: Iterable[Row], progress: Progress):
    """The records of the rows, in order, a chunk at a time (:func:`service.contract.batch.chunks`): rows are read
    as the chunks need them, so a file of any length is checked in flat memory."""
    done = 0
    for offset, chunk in batch.chunks(rows):
        records = batch.records(chunk, offset, _run, _unreadable, _failed)
        for row, record in zip(chunk, records, strict=True):
            if row.line is not None:  # a CSV row: the line of the file it starts on
                record["line"] = row.line
        done += len(records)
        progress.update(done)
        yield records


def _run(rows: list[Row]) -> list[Any]:
    return check_circuits([r.supply for r in rows], [r.circuit for r in rows])


def _unreadable(index: int, row: Row) -> dict[str, Any] | None:
    return (
        None
        if row.problem is None
        else {"index": index, "id": row.id, "problem": {"status": 422, "errors": row.problem}}
    )


def _failed(index: int, row: Row, failure: CircuitFailure) -> dict[str, Any]:
    return {"index": index, "id": row.id, "problem": {"status": 422, "errors": row.errors_of(failure)}}


def _own_cautions(result) -> list[str]:
    """A result's own cautions and the notes of its failing or unverified checks, in words (the general cautions
    are the same on every row and left out)."""
    said = [f"{c.check}: {c.verdict}: {c.note}" for c in result.checks if c.verdict != Verdict.PASS and c.note]
    return said + [text for text in result.cautions if text not in GENERAL_CAUTIONS]


def csv_writer(stream: TextIO) -> csv.DictWriter:
    writer = csv.DictWriter(stream, fieldnames=RESULT_COLUMNS, lineterminator="\n")
    writer.writeheader()
    return writer


def _figure(result: CircuitResult, path: tuple[str, ...]) -> Any:
    value: Any = getattr(result, path[0])
    for key in path[1:]:
        value = None if value is None else value[key]
    return value


def write_csv_rows(writer: csv.DictWriter, records: list[dict[str, Any]]) -> None:
    for record in records:
        row: dict[str, Any] = {"index": record["index"], "line": record.get("line"), "id": record["id"]}
        if "problem" in record:
            row["verdict"] = "invalid"
            row["problem"] = "; ".join(f"{e['pointer']}: {e['message']}" for e in record["problem"]["errors"])
        else:
            r = record["result"]
            row["verdict"] = r.verdict
            row.update((column, _figure(r, path)) for column, path in FIGURE_COLUMNS)
            row.update(
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
            # utf-8-sig: a byte-order mark (a spreadsheet's "CSV UTF-8") is read past
            text = None if kind == "json" else io.TextIOWrapper(stream, encoding="utf-8-sig", newline="")
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
    counts = batch.Counts()
    sink = open(args.output, "wb") if args.output else sys.stdout.buffer
    try:
        progress = Progress(total, sys.stderr)
        chunks = run_chunks(rows, progress)
        if out_format == "csv":
            text = io.TextIOWrapper(sink, encoding="utf-8", newline="", write_through=True)
            writer = csv_writer(text)
            for records in chunks:
                counts.add(records)
                write_csv_rows(writer, records)
            text.detach()
        else:
            for part in batch.full_json(chunks, counts, {}, end=b"\n"):
                sink.write(part)
        progress.close()
    finally:
        if args.output:
            sink.close()
        else:
            sink.flush()
    summary = counts.summary()
    print(" ".join(f"{k}={v}" for k, v in summary.items()), file=sys.stderr)
    return exit_status(summary)


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
