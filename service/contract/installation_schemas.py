"""Request and response schemas of a whole installation: the supply, its boards and their circuits."""

from __future__ import annotations

from typing import Any

from marshmallow import fields, post_load, validate

from service.contract import fastload
from service.contract.circuit_schemas import CircuitSchema, DeviceSchema, ScopedSchema, SupplySchema
from service.contract.fields import ContractSchema, Flag, Number, Text, choice
from service.contract.item_lists import ItemProblem, PerItemList
from service.contract.problems import failed_item, flatten, invalid_item
from service.contract.result_schemas import (
    BatchItemSchema,
    BatchSummarySchema,
    CheckResultSchema,
    edition_answer,
    nullable_number,
)
from service.electrical.checks.installation_rules import BOARD_CHECKS, INSTALLATION_CHECKS
from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.inputs import Board, Installation, SurgeProtection, Unread, built
from service.electrical.network.installation import InstallationResult
from service.electrical.results.verdicts import VERDICTS
from service.electrical.rules import requirements

MAX_BOARDS = 500


class BoardCircuitSchema(CircuitSchema):
    """A circuit of a board: a circuit as circuits/check takes it, and its place in the installation."""

    feeds_board = Text(max_length=200, metadata={"description": "the id of the board this circuit supplies"})
    diversity = Number(
        minimum=0.01,
        maximum=1,
        metadata={"description": "the share of its design current counted in the board's demand (default 1)"},
    )
    selectivity_limit_a = Number(
        minimum=1,
        maximum=1e6,
        metadata={"description": "the maker's selectivity limit with the device feeding the board: it prevails"},
    )
    selectivity_required = Flag(
        load_default=False,
        metadata={"description": "a fault here must not operate the device feeding the board: selectivity counts"},
    )


class BoardSchema(ContractSchema):
    id = Text(max_length=200, required=True, validate=validate.Length(min=1, max=200))
    fed_from = Text(
        max_length=200,
        allow_none=True,
        load_default=None,
        metadata={"description": "the board above, whose circuit names this one in feeds_board; null: the origin"},
    )
    device = fields.Nested(
        DeviceSchema,
        metadata={"description": "the origin board only: the main fuse or breaker, for its circuits' selectivity"},
    )
    device_id = Text(max_length=200, metadata={"description": "how the results name that device"})
    diversity = Number(
        minimum=0.01, maximum=1, load_default=1.0, metadata={"description": "applied to the board's summed demand"}
    )
    design_current_a = Number(
        minimum=0.01, maximum=10000, metadata={"description": "the board's demand per phase, in place of the sum"}
    )
    conditional_short_circuit_ka = Number(
        minimum=0.1,
        maximum=200,
        metadata={"description": "the assembly's conditional rating with its upstream device (BS EN 61439-3)"},
    )
    selectivity_required = Flag(load_default=False, metadata={"description": "for every circuit of the board"})
    circuits = PerItemList(
        fields.Nested(BoardCircuitSchema),
        load_default=list,
        metadata={"description": "one result or one problem per circuit, in order"},
    )


class SurgeProtectionSchema(ContractSchema):
    fitted = Flag(required=True, metadata={"description": "an SPD protects the installation (443.4, 534)"})
    consequence = choice(
        requirements.choices("surge_consequences"),
        metadata={"description": "of a transient overvoltage: human-life, safety-services, commercial or other"},
    )
    declined_in_writing = Flag(
        load_default=False, metadata={"description": "the owner declined surge protection in writing (other cases)"}
    )

    @post_load
    def make(self, data, **kwargs):
        return built(SurgeProtection, data)


class JobDetailsSchema(ContractSchema):
    """The job the installation is designed for, as the report's cover prints it (each optional)."""

    name = Text(max_length=200, metadata={"description": "the job's name"})
    address = Text(max_length=400, metadata={"description": "where the installation is"})
    reference = Text(max_length=100, metadata={"description": "the job's reference in your system"})
    designer = Text(max_length=200, metadata={"description": "who designed it"})
    date = fields.Date(metadata={"description": "the date of the design (YYYY-MM-DD)"})
    revision = Text(max_length=50, metadata={"description": "the design's revision"})


class InstallationRequestSchema(ScopedSchema):
    id = Text(max_length=200, metadata={"description": "your reference, echoed in the answer"})
    job = fields.Nested(JobDetailsSchema, metadata={"description": "the job, for the report's cover"})
    surge_protection = fields.Nested(
        SurgeProtectionSchema,
        metadata={"description": "protection against transient overvoltages (443.4); not stated: not-verified"},
    )
    supply = fields.Nested(SupplySchema, required=True, metadata={"description": "the supply at the origin"})
    boards = fields.List(fields.Nested(BoardSchema), required=True, validate=validate.Length(min=1, max=MAX_BOARDS))


# ---------------------------------------------------------------- responses


class BoardCheckSchema(CheckResultSchema):
    check = fields.String(required=True, validate=validate.OneOf(BOARD_CHECKS + INSTALLATION_CHECKS))


class BoardValuesSchema(ContractSchema):
    """What the origin's values become at a board (figures null where not known or not reached)."""

    ze_ohm = nullable_number("the origin's plus the feeds' R1+R2, hot")
    line_neutral_loop_ohm = nullable_number("the origin's plus the feeds' R1+Rn, hot; null where not known (TT)")
    max_fault_current_ka = nullable_number("the largest of line-neutral, line-earth and three-phase (434.1)")
    max_earth_fault_current_ka = nullable_number("cmax, conductors at 20 degC")
    max_line_neutral_fault_current_ka = nullable_number("cmax, conductors at 20 degC")
    three_phase_fault_current_ka = nullable_number("symmetrical; null on a single-phase board")
    min_earth_fault_current_a = nullable_number("U0 x Cmin / Ze at the board")
    min_line_neutral_fault_current_a = nullable_number("U0 x Cmin / the line-neutral loop at the board")
    voltage_drop_percent = nullable_number("from the origin to the board; null where a feed's drop is not known")
    impedance_basis = fields.String(required=True, metadata={"description": "how the impedances are combined"})


class DemandSchema(ContractSchema):
    design_current_a = nullable_number("the largest phase's; null where the demand is incomplete")
    phase_current_a = fields.Dict(
        keys=fields.String(), values=fields.Float(), allow_none=True, required=True, metadata={"description": "L1-L3"}
    )
    complete = fields.Boolean(required=True)
    stated = fields.Boolean(required=True, metadata={"description": "the board's design_current_a, not the sum"})
    without_design_current = fields.List(fields.String(), required=True)
    imbalance_percent = nullable_number("the largest deviation from the mean phase current, over the mean")
    neutral_current_a = nullable_number("from the phase currents, one power factor, no harmonics (common practice)")


class RatingSchema(ContractSchema):
    conditional_short_circuit_ka = fields.Float(required=True)
    max_fault_current_ka = nullable_number()
    verdict = fields.String(required=True, validate=validate.OneOf(VERDICTS))
    basis = fields.String(required=True)


class BoardResultSchema(BoardValuesSchema):
    """A board: its place, the values carried down to it (null where it could not be reached), its demand."""

    id = fields.String(required=True)
    fed_from = fields.String(allow_none=True, required=True)
    fed_by = fields.String(allow_none=True, required=True, metadata={"description": "the circuit feeding the board"})
    level = fields.Integer(required=True, metadata={"description": "0 at the origin"})
    phases = fields.Integer(required=True)
    demand = fields.Nested(DemandSchema, required=True)
    rating = fields.Nested(RatingSchema, allow_none=True, required=True)
    circuits = fields.List(fields.Nested(BatchItemSchema), required=True)
    verdict = fields.String(required=True, validate=validate.OneOf(VERDICTS))
    not_checked = fields.String(allow_none=True, required=True, metadata={"description": "why, where not checked"})
    cautions = fields.List(fields.String(), required=True)
    checks = fields.List(
        fields.Nested(BoardCheckSchema),
        required=True,
        metadata={
            "description": "the board's own: demand (311.1), rcd-selectivity (536.4.1.4) where RCDs are in series"
        },
    )


class InstallationSummarySchema(BatchSummarySchema):
    boards = fields.Integer(required=True)


class InstallationResultSchema(ContractSchema):
    id = fields.String(allow_none=True, required=True)
    verdict = fields.String(required=True, validate=validate.OneOf(VERDICTS))
    boards = fields.List(fields.Nested(BoardResultSchema), required=True, metadata={"description": "top-down"})
    summary = fields.Nested(InstallationSummarySchema, required=True)
    cautions = fields.List(fields.String(), required=True)
    edition = edition_answer()
    checks = fields.List(
        fields.Nested(BoardCheckSchema),
        required=True,
        metadata={"description": "the installation's own: surge-protection (443.4)"},
    )


def installation_of(body: dict) -> tuple[Installation, dict[tuple[int, int], ItemProblem]]:
    """The core's installation from a loaded request, and the problem of each circuit that did not validate
    (by board and circuit position; the core holds an :class:`Unread` in its place)."""
    boards, problems = [], {}
    for b, item in enumerate(body["boards"]):
        circuits = []
        for c, circuit in enumerate(item["circuits"]):
            if isinstance(circuit, ItemProblem):
                problems[(b, c)] = circuit
                target = circuit.raw.get("feeds_board") if isinstance(circuit.raw, dict) else None
                circuits.append(Unread(circuit.id, target if isinstance(target, str) else None))
            else:
                circuits.append(circuit)
        boards.append(Board(**{**item, "circuits": tuple(circuits)}))
    return Installation(body["supply"], tuple(boards), body.get("id"), body.get("surge_protection")), problems


def records(inst: Installation, result: InstallationResult, problems: dict) -> dict[str, Any]:
    """The answer: each board with its circuits as results or problems, the pointers into the request."""
    positions = {board.id: b for b, board in enumerate(inst.boards)}
    boards = []
    for board in result.boards:
        b = positions[board.id]
        items = [_item(b, c, item, problems) for c, item in enumerate(board.circuits)]
        boards.append({**vars(board), "circuits": items})
    return {**vars(result), "boards": boards}


def _item(b: int, c: int, item: Any, problems: dict) -> dict[str, Any]:
    base = f"/boards/{b}/circuits/{c}"
    if isinstance(item, Unread):
        problem = problems[(b, c)]
        return invalid_item(c, problem.id, problem.messages, base)
    if isinstance(item, CircuitFailure):
        return failed_item(c, item.id, item, {"supply": "/supply", "circuit": base})
    return {"index": c, "id": item.id, "result": item}


def problem_messages(problems: dict) -> dict[tuple[int, int], list[str]]:
    """Each unreadable circuit's messages as 'pointer: message' lines (for the report)."""
    return {
        key: [f"{e['pointer']}: {e['message']}" for e in flatten(p.messages, f"/boards/{key[0]}/circuits/{key[1]}")]
        for key, p in problems.items()
    }


fastload.register(BoardCircuitSchema)
