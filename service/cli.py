"""`python -m service check FILE`: check a whole schedule, or a whole installation, from a JSON or CSV file.

JSON: the body of POST /v1/circuits/check-batch (``{"supply": {...}, "circuits": [...]}``), or of POST
/v1/installations/check (``{"supply": {...}, "boards": [...]}``, :mod:`service.cli_installation`).
CSV: one row a circuit, each with its own supply, in the columns of :data:`CSV_COLUMNS`.
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
from pathlib import Path
from typing import Any, TextIO

from marshmallow import ValidationError

from . import cli_installation
from .api.errors import core_errors, flatten, json_bytes, pointer_of
from .api.fastload import Refused, fast_load
from .api.schemas import CircuitSchema, SupplySchema
from .api.strictjson import strict_loads
from .cli_status import CHUNK, EXIT_UNREADABLE, Progress, exit_status
from .electrical.arrays import paused_gc
from .electrical.circuit import check_circuits
from .electrical.columns import CircuitFailure
from .electrical.verdicts import COUNTED, Verdict

# column -> (where it goes, field, kind); documented in the README
CSV_COLUMNS: dict[str, tuple[str, str, str]] = {
    "id": ("circuit", "id", "text"),
    "earthing": ("supply", "earthing", "text"),
    "u0_v": ("supply", "u0_v", "number"),
    "ze_ohm": ("supply", "ze_ohm", "number"),
    "prospective_fault_current_ka": ("supply", "prospective_fault_current_ka", "number"),
    "electrode_ohm": ("supply", "electrode_ohm", "number"),
    "bonding_complete": ("supply", "bonding_complete", "flag"),
    "line_neutral_loop_ohm": ("supply", "line_neutral_loop_ohm", "number"),
    "role": ("circuit", "role", "text"),
    "load": ("circuit", "load", "text"),
    "design_current_a": ("circuit", "design_current_a", "number"),
    "device_standard": ("device", "standard", "text"),
    "device_type": ("device", "type", "text"),
    "rating_a": ("device", "rating_a", "number"),
    "breaking_capacity_ka": ("device", "breaking_capacity_ka", "number"),
    "energy_limiting_class": ("device", "energy_limiting_class", "integer"),
    "conditional_short_circuit_ka": ("circuit", "conditional_short_circuit_ka", "number"),
    "rcd_residual_current_ma": ("rcd", "residual_current_ma", "number"),
    "rcd_delay": ("rcd", "delay", "text"),
    "material": ("conductors", "material", "text"),
    "insulation": ("conductors", "insulation", "text"),
    "line_csa_mm2": ("conductors", "line_csa_mm2", "number"),
    "cpc_csa_mm2": ("conductors", "cpc_csa_mm2", "number"),
    "length_m": ("conductors", "length_m", "number"),
    "cpc_arrangement": ("conductors", "cpc_arrangement", "text"),
    "ring": ("conductors", "ring", "flag"),
    "parallel_cables": ("conductors", "parallel_cables", "integer"),
    "r1_plus_r2_ohm": ("circuit", "r1_plus_r2_ohm", "number"),
    "neutral_csa_mm2": ("circuit", "neutral_csa_mm2", "number"),
    "cable": ("installation", "cable", "text"),
    "installation_method": ("installation", "installation_method", "text"),
    "ambient_c": ("installation", "ambient_c", "number"),
    "grouping": ("installation", "grouping", "text"),
    "grouped_circuits": ("installation", "grouped_circuits", "integer"),
    "thermal_insulation_mm": ("installation", "thermal_insulation_mm", "number"),
}
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
    "problem",
)

SUPPLY_SCHEMA = SupplySchema()
CIRCUIT_SCHEMA = CircuitSchema()


class ScheduleError(ValueError):
    """A file that is not a schedule at all (exit status 2)."""


class Row:
    """One circuit read from the file: its supply and circuit, or the problem that stopped it."""

    def __init__(
        self,
        index: int,
        ident: str | None,
        base: str,
        supply=None,
        circuit=None,
        problem: list[dict[str, str]] | None = None,
    ):
        self.index, self.id, self.base = index, ident, base
        self.supply, self.circuit, self.problem = supply, circuit, problem
        self.csv = False

    def errors_of(self, failure: CircuitFailure) -> list[dict[str, str]]:
        """A core failure's pointer: into the JSON file, or the CSV row and column."""
        if self.csv:
            return [
                {"pointer": _as_column(pointer_of(failure.path, CSV_ROOTS), self.index), "message": failure.message}
            ]
        return core_errors(failure, {"supply": "/supply", "circuit": self.base})


def _load(schema, raw, base: str):
    try:
        return fast_load(schema, raw), None
    except Refused:
        pass
    try:
        return schema.load(raw), None
    except ValidationError as err:
        return None, flatten(err.messages, base)


def _cell(value: str, kind: str) -> Any:
    """A CSV cell as JSON would carry it; a cell that does not parse stays text, so the schema says why."""
    text = value.strip()
    if kind == "text":
        return text
    if kind == "flag":
        return {"true": True, "yes": True, "1": True, "false": False, "no": False, "0": False}.get(text.lower(), text)
    try:
        number = int(text) if kind == "integer" else float(text)
    except ValueError:
        return text
    return number if number == number and abs(number) != float("inf") else text


_POINTER_OF = {
    "supply": "/supply",
    "circuit": "/circuit",
    "device": "/circuit/device",
    "rcd": "/circuit/device/rcd",
    "conductors": "/circuit/conductors",
    "installation": "/circuit/installation",
}
CSV_ROOTS = {"supply": "/supply", "circuit": "/circuit"}
_COLUMN_OF = {f"{_POINTER_OF[where]}/{name}": column for column, (where, name, _) in CSV_COLUMNS.items()}


def _as_column(pointer: str, index: int) -> str:
    """A schema pointer (/circuit/conductors/length_m) as the CSV row and column (/3/length_m)."""
    column = _COLUMN_OF.get(pointer)
    if column is None:  # a whole object, e.g. /circuit/conductors: name its first column
        column = next(
            (c for p, c in _COLUMN_OF.items() if p.startswith(pointer + "/")), pointer.rsplit("/", 1)[-1] or ""
        )
    return f"/{index}/{column}"


def read_csv(stream: TextIO) -> list[Row]:
    reader = csv.DictReader(stream)
    unknown = [c for c in (reader.fieldnames or []) if c not in CSV_COLUMNS]
    if unknown:
        raise ScheduleError(f"unknown CSV columns {unknown}; the columns are {list(CSV_COLUMNS)}")
    rows: list[Row] = []
    with paused_gc():
        _read_rows(reader, rows)
    return rows


def _read_rows(reader: csv.DictReader, rows: list[Row]) -> None:
    for index, record in enumerate(reader):
        parts: dict[str, dict[str, Any]] = {where: {} for where in _POINTER_OF}
        for column, value in record.items():
            if column is None or value is None or value.strip() == "":
                continue
            where, name, kind = CSV_COLUMNS[column]
            parts[where][name] = _cell(value, kind)
        circuit = dict(parts["circuit"], device=dict(parts["device"]))
        if parts["rcd"]:
            circuit["device"]["rcd"] = parts["rcd"]
        for nested in ("conductors", "installation"):
            if parts[nested]:
                circuit[nested] = parts[nested]
        row = _validated(index, parts["supply"], circuit, "", "/supply", "/circuit")
        if row.problem:
            row.problem = [{"pointer": _as_column(e["pointer"], index), "message": e["message"]} for e in row.problem]
        row.base, row.csv = f"/{index}", True
        rows.append(row)


def _validated(
    index: int,
    supply_raw: Any,
    circuit_raw: Any,
    base: str,
    supply_pointer: str,
    circuit_pointer: str,
    supply_loaded: tuple | None = None,
) -> Row:
    ident = circuit_raw.get("id") if isinstance(circuit_raw, dict) and isinstance(circuit_raw.get("id"), str) else None
    supply, supply_problems = supply_loaded or _load(SUPPLY_SCHEMA, supply_raw, supply_pointer)
    circuit, circuit_problems = _load(CIRCUIT_SCHEMA, circuit_raw, circuit_pointer)
    problems = (supply_problems or []) + (circuit_problems or [])
    if problems:
        return Row(index, ident, base, problem=problems)
    return Row(index, ident, base, supply, circuit)


def read_json(stream: TextIO) -> list[Row]:
    return rows_of(strict_loads(stream.read()))


def rows_of(body: Any) -> list[Row]:
    """The rows of a JSON schedule already parsed."""
    if not isinstance(body, dict) or not isinstance(body.get("circuits"), list) or "supply" not in body:
        raise ScheduleError(
            'a JSON schedule is {"supply": {...}, "circuits": [...]}, as POST /v1/circuits/check-batch takes'
        )
    supply = _load(SUPPLY_SCHEMA, body["supply"], "/supply")  # one supply for the whole schedule
    with paused_gc():
        return [
            _validated(i, body["supply"], item, f"/circuits/{i}", "/supply", f"/circuits/{i}", supply)
            for i, item in enumerate(body["circuits"])
        ]


def run_chunks(rows: list[Row], progress: Progress):
    """The records of the rows, in order, a chunk at a time (so a large file never sits whole in memory)."""
    for start in range(0, len(rows), CHUNK):
        with paused_gc():
            records = _chunk(rows[start : start + CHUNK])
        progress.update(start + len(records))
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
            )
        writer.writerow({k: ("" if v is None else v) for k, v in row.items()})


def main(args: argparse.Namespace) -> int:
    path = Path(args.file)
    kind = args.input_format or ("csv" if path.suffix.lower() == ".csv" else "json")
    try:
        with path.open(encoding="utf-8", newline="") as stream:
            body = None if kind == "csv" else strict_loads(stream.read())
            if cli_installation.is_installation(body):
                return _installation(body, path, args)
            if args.report:
                raise ScheduleError("--report needs an installation file (the body of POST /v1/installations/check)")
            rows = read_csv(stream) if kind == "csv" else rows_of(body)
    except (OSError, UnicodeDecodeError, json.JSONDecodeError, ScheduleError) as err:
        print(f"cannot read {path}: {err}", file=sys.stderr)
        return EXIT_UNREADABLE
    out_format = args.format or ("csv" if args.output and args.output.lower().endswith(".csv") else "json")
    tally = Tally()
    sink = open(args.output, "wb") if args.output else sys.stdout.buffer
    try:
        chunks = run_chunks(rows, Progress(len(rows), sys.stderr))
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
    return cli_installation.run(body, path, args, lambda total: Progress(total, sys.stderr))


def add_parser(sub) -> None:
    p = sub.add_parser("check", help="check a schedule of circuits from a JSON or CSV file")
    p.add_argument("file", help="a .json schedule (the check-batch body) or a .csv with one row a circuit")
    p.add_argument("--input-format", choices=["json", "csv"], help="default: from the file's extension")
    p.add_argument("--format", choices=["json", "csv"], help="output format (default: json, or csv for a .csv output)")
    p.add_argument("-o", "--output", help="write the results here (default: standard output)")
    p.add_argument("--report", metavar="FILE.html", help="an installation file: write the printable report here too")
    p.add_argument(
        "--strict", action="store_true", help="no effect: not-verified circuits always exit 4 (kept for scripts)"
    )
    p.set_defaults(func=main)
