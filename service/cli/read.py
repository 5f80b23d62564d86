"""Reading schedules for the CLI: CSV row by row, JSON incrementally, NDJSON line by line.

Each reader yields rows one at a time, every row through the same schemas as the HTTP API (so a bad row gets
the same messages), so a schedule of any length is checked a chunk at a time in flat memory.
"""

from __future__ import annotations

import csv
import io
import json
import mmap
from collections.abc import Iterator
from typing import Any, BinaryIO, TextIO

import ijson
from marshmallow import ValidationError

from service.contract.circuit_schemas import CircuitSchema, SupplySchema
from service.contract.fastload import Refused, fast_load
from service.contract.fields import csv_cell
from service.contract.item_lists import echoed
from service.contract.problems import core_errors, flatten, pointer_of
from service.contract.requirement_schemas import HEAD, JobSchema, with_edition
from service.contract.strictjson import strict_loads
from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.devices import defaults as device_defaults

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
    "edition": ("head", "edition", "text"),
    "premises": ("head", "premises", "text"),
    "equipment": ("circuit", "equipment", "text"),
    "socket_outlet_rating_a": ("circuit", "socket_outlet_rating_a", "number"),
    "location": ("circuit", "location", "text"),
    "rcd_type": ("rcd", "type", "text"),
    "afdd": ("device", "afdd", "flag"),
    "ev_dc_fault_detection": ("ev", "dc_fault_detection", "flag"),
    "ev_earthing_measure": ("ev", "earthing_measure", "text"),
    "concealed_in_wall": ("installation", "concealed_in_wall", "text"),
    "wall_has_metal_parts": ("installation", "wall_has_metal_parts", "flag"),
    "earthed_metallic_covering": ("installation", "earthed_metallic_covering", "flag"),
}

SUPPLY_SCHEMA = SupplySchema()
CIRCUIT_SCHEMA = CircuitSchema()


HEAD_SCHEMA = JobSchema()  # what a schedule says once: the edition, the premises, the maker's data


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
        self.line: int | None = None  # a CSV row: the line of the file it starts on (the header is line 1)

    def errors_of(self, failure: CircuitFailure) -> list[dict[str, str]]:
        """A core failure's pointer: into the JSON file, or the CSV row and column."""
        if self.csv:
            return [{"pointer": _as_column(pointer_of(failure.path, CSV_ROOTS), self.line), "message": failure.message}]
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


_POINTER_OF = {
    "head": "",
    "supply": "/supply",
    "circuit": "/circuit",
    "device": "/circuit/device",
    "rcd": "/circuit/device/rcd",
    "conductors": "/circuit/conductors",
    "installation": "/circuit/installation",
    "ev": "/circuit/ev",
}
CSV_ROOTS = {"supply": "/supply", "circuit": "/circuit"}
_COLUMN_OF = {f"{_POINTER_OF[where]}/{name}": column for column, (where, name, _) in CSV_COLUMNS.items()}


def _as_column(pointer: str, line: int) -> str:
    """A schema pointer (/circuit/conductors/length_m) as the CSV line and column (/3/length_m: line 3 of the file)."""
    column = _COLUMN_OF.get(pointer)
    if column is None:  # a whole object, e.g. /circuit/conductors: name its first column
        column = next(
            (c for p, c in _COLUMN_OF.items() if p.startswith(pointer + "/")), pointer.rsplit("/", 1)[-1] or ""
        )
    return f"/{line}/{column}"


def iter_csv(stream: TextIO) -> Iterator[Row]:
    """The rows of a CSV schedule, one at a time (each row has its own supply), each with the line of the file it
    starts on (the header is line 1, as a person opening the file counts). A byte-order mark before the header (a
    spreadsheet's "CSV UTF-8") is read past; a repeated column or a cell past the header is refused, never dropped."""
    reader = csv.reader(stream)
    header = next(reader, None)
    if not header:
        raise ScheduleError("the CSV file is empty: its first line is the header, naming the columns")
    header[0] = header[0].removeprefix("\ufeff")
    repeated = sorted({c for c in header if header.count(c) > 1})
    if repeated:
        raise ScheduleError(f"line 1: the columns {repeated} appear more than once; each column is named once")
    unknown = [c for c in header if c not in CSV_COLUMNS]
    if unknown:
        raise ScheduleError(f"line 1: unknown CSV columns {unknown}; the columns are {list(CSV_COLUMNS)}")
    index, line = 0, reader.line_num + 1
    for cells in reader:
        start, line = line, reader.line_num + 1
        if not cells:  # a blank line
            continue
        yield _csv_row(index, start, header, cells)
        index += 1


def _csv_row(index: int, line: int, header: list[str], cells: list[str]) -> Row:
    if len(cells) > len(header):
        message = (
            f"line {line} has {len(cells)} cells and the header {len(header)}: a cell past the header has no column"
        )
        row = Row(index, None, f"/{line}", problem=[{"pointer": f"/{line}", "message": message}])
        row.line, row.csv = line, True
        return row
    parts: dict[str, dict[str, Any]] = {where: {} for where in _POINTER_OF}
    for column, value in zip(header, cells, strict=False):
        if value.strip() == "":
            continue
        where, name, kind = CSV_COLUMNS[column]
        parts[where][name] = csv_cell(value, kind)
    circuit = dict(parts["circuit"], device=dict(parts["device"]))
    if parts["rcd"]:
        circuit["device"]["rcd"] = parts["rcd"]
    for nested in ("conductors", "installation", "ev"):
        if parts[nested]:
            circuit[nested] = parts[nested]
    row = _validated(index, parts["supply"], circuit, "", "/supply", "/circuit", head=parts["head"])
    if row.problem:
        row.problem = [{"pointer": _as_column(e["pointer"], line), "message": e["message"]} for e in row.problem]
    row.base, row.csv, row.line = f"/{line}", True, line
    return row


def _validated(
    index: int,
    supply_raw: Any,
    circuit_raw: Any,
    base: str,
    supply_pointer: str,
    circuit_pointer: str,
    supply_loaded: tuple | None = None,
    head: dict | None = None,
) -> Row:
    raw_id = circuit_raw.get("id") if isinstance(circuit_raw, dict) else None
    ident = echoed(raw_id if isinstance(raw_id, str) else None)
    supply, supply_problems, given = supply_loaded or _supply(supply_raw, supply_pointer, head or {})
    circuit, circuit_problems = _load(CIRCUIT_SCHEMA, circuit_raw, circuit_pointer)
    problems = (supply_problems or []) + (circuit_problems or [])
    if problems:
        return Row(index, ident, base, problem=problems)
    if given:
        circuit = device_defaults.with_defaults_of(circuit, given)
    return Row(index, ident, base, supply, circuit)


def _supply(supply_raw: Any, pointer: str, head: dict) -> tuple:
    """The supply with the schedule's edition and premises on it (the core reads them there), or the problems."""
    supply, problems = _load(SUPPLY_SCHEMA, supply_raw, pointer)
    top, top_problems = _load(HEAD_SCHEMA, head, "")
    if problems or top_problems:
        return None, (problems or []) + (top_problems or []), None
    return with_edition({**top, "supply": supply})["supply"], None, top.get("device_defaults")


def iter_items(supply_raw: Any, items: Iterator[Any], head: dict | None = None) -> Iterator[Row]:
    """The rows of a schedule's circuits on one supply (loaded once, with the schedule's edition and premises),
    one at a time."""
    supply = _supply(supply_raw, "/supply", head or {})
    for i, item in enumerate(items):
        yield _validated(i, supply_raw, item, f"/circuits/{i}", "/supply", f"/circuits/{i}", supply)


SCHEDULE_SHAPE = 'a JSON schedule is {"supply": {...}, "circuits": [...]}, as POST /v1/circuits/check-batch takes'


class _NoRepeats(dict):
    """An object of the incremental reader that refuses a repeated key, as the strict reader does."""

    def __setitem__(self, key: str, value: Any) -> None:
        if key in self:
            raise ValueError(f"duplicate key {key[:60]!r}")
        dict.__setitem__(self, key, value)


def top_level_kind(stream: BinaryIO) -> str | None:
    """Which body a JSON file holds, read incrementally: ``circuits`` (a schedule), ``boards`` (an
    installation), or None; the stream is left at its start."""
    try:
        for prefix, event, value in ijson.parse(stream):
            if prefix == "" and event == "map_key" and value in ("circuits", "boards"):
                return value
            if prefix == "" and event in ("start_array", "string", "number", "boolean", "null"):
                break
    except ijson.JSONError as err:
        raise ScheduleError(f"not JSON: {err}") from None
    finally:
        stream.seek(0)
    return None


def iter_json(stream: BinaryIO) -> Iterator[Row]:
    """The rows of a large JSON schedule, its circuits read one at a time (ijson): memory stays flat.

    Strict as the API: NaN and Infinity are not JSON, and a repeated key is refused.
    """
    supply = _incremental(lambda: next(ijson.items(stream, "supply", use_float=True, map_type=_NoRepeats), None))
    if supply is None:
        raise ScheduleError(SCHEDULE_SHAPE)
    head = {}
    for key in _named(stream, HEAD):  # a scan each, and only for a key the file names at all
        stream.seek(0)
        value = _incremental(lambda key=key: next(ijson.items(stream, key, use_float=True), _END))
        if value is not _END:
            head[key] = value
    stream.seek(0)
    items = ijson.items(stream, "circuits.item", use_float=True, map_type=_NoRepeats)
    return iter_items(supply, _plain(items), head)


def _named(stream: BinaryIO, keys: tuple[str, ...]) -> list[str]:
    """The keys whose quoted names appear anywhere in the file: a byte search (memchr speed) that spares a full
    parse for each key a schedule does not name (three scans of a 100 000-circuit file took 1.9 s)."""
    try:
        with mmap.mmap(stream.fileno(), 0, access=mmap.ACCESS_READ) as data:
            return [key for key in keys if data.find(f'"{key}"'.encode()) != -1]
    except (OSError, ValueError, io.UnsupportedOperation):  # not a mapped file (a pipe, an empty file): look for each
        return list(keys)


def _plain(items: Iterator[Any]) -> Iterator[Any]:
    while True:
        item = _incremental(lambda: next(items, _END))
        if item is _END:
            return
        yield item


_END = object()


def _incremental(read):
    """One step of the incremental reader, its errors as the file's (the C reader wraps ours in SystemError)."""
    try:
        return read()
    except (ijson.JSONError, ValueError, SystemError) as err:
        cause = err
        while cause.__cause__ or cause.__context__:  # the first error of the chain is what went wrong
            cause = cause.__cause__ or cause.__context__
        raise ScheduleError(f"not a strict JSON schedule: {cause}") from None


def iter_ndjson(stream: TextIO) -> Iterator[Row]:
    """The rows of an NDJSON schedule: a first line ``{"supply": {...}}``, then one circuit per line."""
    first = stream.readline()
    head = _line(first, 1)
    if not isinstance(head, dict) or "supply" not in head or not set(head) <= {"supply", *HEAD}:
        raise ScheduleError(
            'an NDJSON schedule starts with a line {"supply": {...}} (with edition and premises if need be), then one '
            "circuit per line"
        )
    lines = (_line(line, n) for n, line in enumerate(stream, 2) if line.strip())
    return iter_items(head["supply"], lines, {k: head[k] for k in HEAD if k in head})


def _line(text: str, number: int) -> Any:
    try:
        return strict_loads(text)
    except json.JSONDecodeError as err:
        raise ScheduleError(f"line {number}: {err.msg}") from None
