"""The site test sheet (POST /v1/installations/test-sheet): a checked installation's circuits in the very shape
test-results/verify takes, each with the limits a tester must meet (``expected``) and its measured values left
empty; as JSON, or as CSV for a spreadsheet, which verify reads back (:func:`verify_body_of_csv`).

Each circuit keeps its design as the request gave it; a circuit on a board below the origin carries the supply
as its board sees it (Ze, the line-neutral loop and the largest fault there), so verify works out the very
limits the sheet shows.
"""

from __future__ import annotations

import csv
import dataclasses
import io
import json
from typing import Any

from marshmallow import fields

from service.contract.circuit_schemas import CircuitSchema, SupplySchema
from service.contract.fields import ContractSchema, Text
from service.contract.measurement_schemas import COLUMNS
from service.contract.requirement_schemas import HEAD, JobSchema
from service.contract.shapes import schema_of
from service.electrical.inputs import Circuit, Installation
from service.electrical.network.installation import InstallationResult
from service.electrical.results.circuit_result import CircuitResult
from service.electrical.testing.measured import Measured
from service.electrical.testing.sheet import SiteLimits, site_limits

BOARD_ONLY = ("feeds_board", "diversity", "selectivity_limit_a", "selectivity_required")  # not a circuit's own
EVERY_CIRCUIT = ("zs_ohm", "r1_plus_r2_ohm", "insulation_resistance_megohm", "insulation_test_voltage_v")
RING = ("ring_r1_ohm", "ring_rn_ohm", "ring_r2_ohm")
RCD = ("rcd_time_ms_at_idn", "rcd_time_ms_at_5idn", "rcd_tripped_at_half_idn")


def _board_supply(origin: dict[str, Any], board: Any) -> dict[str, Any]:
    """The supply as a board's circuits see it: the origin's, with the values carried down to the board."""
    if board.fed_from is None:
        return origin
    carried = {
        "ze_ohm": board.ze_ohm,
        "line_neutral_loop_ohm": board.line_neutral_loop_ohm,
        "prospective_fault_current_ka": board.max_fault_current_ka,
        "phases": board.phases,
    }
    supply = {k: v for k, v in origin.items() if k not in carried}
    return supply | {k: v for k, v in carried.items() if v is not None}


def _measured(circuit: dict[str, Any], temperature_c: float) -> dict[str, Any]:
    """The measured values a tester fills in for this circuit, empty (null)."""
    names = list(EVERY_CIRCUIT) + ["polarity_confirmed"]
    if (circuit.get("conductors") or {}).get("ring"):
        names += RING
    if (circuit.get("device") or {}).get("rcd"):
        names += RCD
    return {"temperature_c": temperature_c, "circuit_voltage": Measured.circuit_voltage, **dict.fromkeys(names)}


def sheet_items(raw: dict[str, Any], result: InstallationResult, temperature_c: float) -> list[dict[str, Any]]:
    """One item per circuit that was checked, in the order of the body: its board, the supply where it is not the
    origin's, the circuit as given and its empty measurements (the limits are added by :func:`with_limits`)."""
    boards = {board.id: board for board in result.boards}
    items = []
    for board_raw in raw["boards"]:
        board = boards[board_raw["id"]]
        supply = _board_supply(raw["supply"], board)
        for circuit_raw, outcome in zip(board_raw.get("circuits", []), board.circuits, strict=True):
            if not isinstance(outcome, CircuitResult):
                continue
            circuit = {k: v for k, v in circuit_raw.items() if k not in BOARD_ONLY}
            item = {"board": board.id, "circuit": circuit, "measured": _measured(circuit, temperature_c)}
            if supply is not raw["supply"]:
                item = {"board": board.id, "supply": supply, **item}
            items.append(item)
    return items


def body_of(raw: dict[str, Any], items: list[dict[str, Any]]) -> dict[str, Any]:
    """The sheet as a verify body: the request's edition, premises and maker's data, the origin's supply, the items."""
    return {**{k: raw[k] for k in HEAD if k in raw}, "supply": raw["supply"], "circuits": items}


def with_limits(sheet: dict[str, Any], limits: list[Any]) -> dict[str, Any]:
    """Each item with the limits the core worked out for it (``expected``), placed before its measurements."""
    out = []
    for item, limit in zip(sheet["circuits"], limits, strict=True):
        measured = item["measured"]
        rest = {k: v for k, v in item.items() if k != "measured"}
        expected = dataclasses.asdict(limit) if isinstance(limit, SiteLimits) else None
        out.append({**rest, **({"expected": expected} if expected else {}), "measured": measured})
    return {**sheet, "circuits": out}


# ------------------------------------------------------------------------------------------ CSV
def sheet_csv(sheet: dict[str, Any]) -> str:
    """The sheet for a spreadsheet: one row a circuit, its limits, a cell for each measurement, and its design (the
    circuit, its supply and the request's head as JSON, to be left as it is: verify reads it back)."""
    out = io.StringIO()
    writer = csv.DictWriter(out, fieldnames=COLUMNS, lineterminator="\r\n")
    writer.writeheader()
    head = {k: sheet[k] for k in HEAD if k in sheet}
    for item in sheet["circuits"]:
        row = {"board": item.get("board"), "id": item["circuit"].get("id")}
        row |= {name: value for name, value in (item.get("expected") or {}).items()}
        row |= {f"measured_{name}": value for name, value in item["measured"].items()}
        design = {**head, "supply": item.get("supply", sheet["supply"]), "circuit": item["circuit"]}
        row["design"] = json.dumps(design, ensure_ascii=False, separators=(",", ":"))
        writer.writerow({k: _text(v) for k, v in row.items()})
    return out.getvalue()


def _text(value: Any) -> str:
    if value is None:
        return ""
    if isinstance(value, bool):
        return "yes" if value else "no"
    return str(value)


# ------------------------------------------------------------------------------------------ the answer's schemas
class SheetItemSchema(ContractSchema):
    board = Text(max_length=200, required=True, metadata={"description": "the board the circuit is on"})
    supply = fields.Nested(SupplySchema, metadata={"description": "the supply at the board, below the origin"})
    circuit = fields.Nested(
        CircuitSchema, required=True, metadata={"description": "the circuit as the request gave it"}
    )
    expected = fields.Nested(schema_of(SiteLimits), required=True, metadata={"description": "what to find on site"})
    measured = fields.Dict(
        required=True,
        metadata={"description": "test-results/verify's measured fields for this circuit, null: to fill in on site"},
    )


class TestSheetSchema(JobSchema):
    supply = fields.Nested(SupplySchema, required=True, metadata={"description": "the supply at the origin"})
    circuits = fields.List(fields.Nested(SheetItemSchema), required=True)


def sheet_of(
    raw: dict[str, Any], inst: Installation, result: InstallationResult, temperature_c: float = 20.0
) -> dict[str, Any]:
    """The test sheet of a checked installation (``raw``: its body as sent, ``inst`` as loaded): the verify body with
    each circuit's limits, worked out from the very circuit and supply verify will read from the sheet (the loaded
    circuit without its place in the tree; a board's supply as the sheet writes it, loaded as verify loads it), so
    that a filled sheet is judged by the same limits."""
    items = sheet_items(raw, result, temperature_c)
    body = body_of(raw, items)
    supplies, circuits, loaded = [], [], {}
    positions = {board.id: b for b, board in enumerate(inst.boards)}
    for key, item in zip(_checked_keys(raw, result), items, strict=True):
        if "supply" in item and item["board"] not in loaded:
            edition = {"edition": inst.supply.edition, "premises": inst.supply.premises}  # the request's, loaded
            loaded[item["board"]] = dataclasses.replace(SUPPLY.load(item["supply"]), **edition)
        supplies.append(loaded.get(item["board"], inst.supply))
        circuit = inst.boards[positions[item["board"]]].circuits[key[1]]
        circuits.append(dataclasses.replace(circuit, **OWN_PLACE))
    return with_limits(body, site_limits(supplies, circuits, temperature_c))


SUPPLY = SupplySchema()
# a circuit's place in the tree, which the sheet leaves out: verify sees the circuit without it
OWN_PLACE = {f.name: f.default for f in dataclasses.fields(Circuit) if f.name in BOARD_ONLY}


def _checked_keys(raw: dict[str, Any], result: InstallationResult) -> list[tuple[int, int]]:
    """Board and circuit positions of the circuits on the sheet, in its order (as :func:`sheet_items` takes them)."""
    boards = {board.id: board for board in result.boards}
    return [
        (b, c)
        for b, board_raw in enumerate(raw["boards"])
        for c, outcome in enumerate(boards[board_raw["id"]].circuits)
        if isinstance(outcome, CircuitResult)
    ]
