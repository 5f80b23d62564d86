"""Request and response schemas shared by the resources.

Every number has physically plausible bounds, so that no valid input can overflow a formula;
every choice is an enum; unknown fields are refused (marshmallow's default, RAISE).
Requests load into the core's dataclasses; responses dump the core's results.
"""

from __future__ import annotations

from marshmallow import Schema, ValidationError, fields, post_load, validate, validates_schema

from ..electrical import conductors as cond
from ..electrical import disconnection, protective
from ..electrical.arrays import paused_gc
from ..electrical.checks import CHECKS
from ..electrical.devices import catalogue, residual
from ..electrical.devices.characteristic import BOUNDS
from ..electrical.model import Circuit, Conductors, DeviceSpec, Rcd, Supply
from ..electrical.verdicts import VERDICTS, Verdict
from . import fastload
from .errors import ProblemSchema
from .fastload import Refused, fast_load
from .fields import Flag, Number, Text, WholeNumber, choice

DEVICE_STANDARDS = catalogue.standards()
DEVICE_TYPES = catalogue.types()


def nullable_number(description: str = "", **kwargs) -> fields.Float:
    return fields.Float(allow_none=True, required=True, metadata={"description": description}, **kwargs)


# ---------------------------------------------------------------- requests


class FastSchema(Schema):
    """A request schema loaded by the compiled fast path first (service.api.fastload), marshmallow
    itself only when the fast path refuses: the same result, and marshmallow's messages on errors.

    Used where it pays (measured: about 17 us against 167 us for a single check request): the single
    check; batch items and schedule rows go through :class:`PerItemList` and the CLI."""

    def load(self, data, *, many=None, partial=None, unknown=None):
        with paused_gc():  # a batch's thousands of items would wake the collector again and again
            if not many and not partial and unknown is None:
                try:
                    return fast_load(self, data)
                except Refused:
                    pass
            return super().load(data, many=many, partial=partial, unknown=unknown)


class CurvePointSchema(Schema):
    current_a = Number(minimum=0.001, maximum=1e6, required=True)
    time_s = Number(minimum=0.0001, maximum=1e5, required=True, metadata={"description": "maximum operating time"})


class RcdSchema(Schema):
    residual_current_ma = Number(minimum=1, maximum=3000, required=True, metadata={"description": "IΔn, mA"})
    delay = choice(residual.delays(), load_default="general", metadata={"description": "general, or S (time-delayed)"})

    @post_load
    def make(self, data, **kwargs):
        return Rcd(**data)


class DeviceSchema(Schema):
    standard = choice(
        DEVICE_STANDARDS, metadata={"description": "omit, and give curve_points, for a device of your own"}
    )
    type = choice(
        DEVICE_TYPES, metadata={"description": "B, C or D for circuit-breakers; gG (or omit) for BS 88 fuses"}
    )
    rating_a = Number(minimum=0.1, maximum=1000, required=True, metadata={"description": "In, A"})
    breaking_capacity_ka = Number(
        minimum=0.1, maximum=200, metadata={"description": "rated short-circuit capacity (Icn), kA"}
    )
    curve_points = fields.List(
        fields.Nested(CurvePointSchema),
        validate=validate.Length(min=2, max=100),
        metadata={"description": "maximum operating times, e.g. from the maker's curve"},
    )
    rcd = fields.Nested(RcdSchema, metadata={"description": "the residual part of an RCBO, or an RCD in the circuit"})
    let_through_a2s = Number(
        minimum=1, maximum=1e10, metadata={"description": "maker's let-through I^2 t, A^2 s, for times below 0.1 s"}
    )

    @validates_schema
    def standard_or_points(self, data, **kwargs):
        if ("standard" in data) == ("curve_points" in data):
            raise ValidationError("give either a standard or curve_points", "standard")

    @post_load
    def make(self, data, **kwargs):
        points = data.pop("curve_points", None)
        if points is not None:
            data["curve_points"] = tuple((p["current_a"], p["time_s"]) for p in points)
        return DeviceSpec(**data)


class ConductorsSchema(Schema):
    material = choice(cond.MATERIALS, required=True)
    insulation = choice(cond.insulation_names(), required=True)
    line_csa_mm2 = Number(minimum=0.5, maximum=630, required=True)
    cpc_csa_mm2 = Number(
        minimum=0.5, maximum=630, required=True, metadata={"description": "cpc size; for armour, its cross-section"}
    )
    length_m = Number(
        minimum=0, maximum=5000, required=True, metadata={"description": "route length; for a ring, the whole ring"}
    )
    cpc_arrangement = choice(protective.ARRANGEMENTS, load_default="in-cable")
    ring = Flag(load_default=False)
    parallel_cables = WholeNumber(minimum=1, maximum=20, load_default=1)
    conductor_class = WholeNumber(
        minimum=1, maximum=2, load_default=2, metadata={"description": "IEC 60228 class: 1 solid, 2 stranded"}
    )
    cpc_material = choice(
        protective.CPC_MATERIALS,
        metadata={"description": "default: the line material; steel for armour, sheath or conduit"},
    )
    cpc_resistance_mohm_per_m = Number(
        minimum=0.01, maximum=1000, metadata={"description": "maker's cpc (e.g. armour) resistance at 20 degC"}
    )
    bare_condition = choice(protective.BARE_CONDITIONS, metadata={"description": "for a bare cpc (Table 54.6)"})

    @post_load
    def make(self, data, **kwargs):
        return Conductors(**data)


class SupplySchema(Schema):
    earthing = choice(disconnection.EARTHING, required=True)
    u0_v = Number(minimum=50, maximum=1000, required=True, metadata={"description": "nominal line to earth voltage"})
    ze_ohm = Number(
        minimum=0.001,
        maximum=2000,
        required=True,
        metadata={"description": "external loop impedance; for TT including RA"},
    )
    prospective_fault_current_ka = Number(
        minimum=0.001, maximum=200, metadata={"description": "largest at the origin; if omitted, U0 x cmax / Ze"}
    )
    c_max = Number(
        minimum=1.05,
        maximum=1.10,
        validate=validate.OneOf([1.05, 1.10]),
        metadata={"description": "IEC 60909-0 cmax, 1.05 or 1.10 (default 1.10)"},
    )
    electrode_ohm = Number(minimum=0.01, maximum=10000, metadata={"description": "TT: earth electrode resistance RA"})
    bonding_complete = Flag(
        load_default=False,
        metadata={
            "description": "TT: protective equipotential bonding complete (allows TN times for overcurrent devices)"
        },
    )
    current_kind = choice(disconnection.CURRENT_KINDS, load_default="ac")
    reduced_low_voltage = Flag(load_default=False, metadata={"description": "a reduced low voltage system (411.8)"})

    @post_load
    def make(self, data, **kwargs):
        return Supply(**data)


class CircuitSchema(Schema):
    id = Text(max_length=200, metadata={"description": "your reference, echoed in the result"})
    role = choice(disconnection.ROLES, required=True)
    load = choice(disconnection.LOADS, metadata={"description": "final circuits: what it supplies"})
    design_current_a = Number(minimum=0.01, maximum=10000, metadata={"description": "Ib, A"})
    device = fields.Nested(DeviceSchema, required=True)
    conductors = fields.Nested(ConductorsSchema)
    r1_plus_r2_ohm = Number(
        minimum=0,
        maximum=100,
        metadata={"description": "a known R1+R2 at operating temperature, in place of the conductor calculation"},
    )

    @validates_schema
    def complete(self, data, **kwargs):
        if "conductors" not in data and "r1_plus_r2_ohm" not in data:
            raise ValidationError("give the conductors, or a known r1_plus_r2_ohm", "conductors")
        if data.get("role") == "final" and "load" not in data:
            raise ValidationError("a final circuit needs its load: socket-outlets or fixed-equipment", "load")

    @post_load
    def make(self, data, **kwargs):
        return Circuit(**data)


class CheckRequestSchema(FastSchema):
    supply = fields.Nested(SupplySchema, required=True)
    circuit = fields.Nested(CircuitSchema, required=True)


class ItemProblem:
    """A batch item that did not validate: its place, its id if readable, and its messages."""

    def __init__(self, index: int, messages, raw):
        self.index = index
        self.messages = messages
        self.id = raw.get("id") if isinstance(raw, dict) and isinstance(raw.get("id"), str) else None


class PerItemList(fields.List):
    """A list whose items are validated one by one: a bad item becomes an ItemProblem, never a 422."""

    def _deserialize(self, value, attr, data, **kwargs):
        if not isinstance(value, list):
            raise self.make_error("invalid")
        out = []
        schema = self.inner.schema
        for index, item in enumerate(value):
            try:
                out.append(fast_load(schema, item))
                continue
            except Refused:
                pass
            try:  # marshmallow itself: the same answer, with the documented messages
                out.append(self.inner.deserialize(item, **kwargs))
            except ValidationError as err:
                out.append(ItemProblem(index, err.messages, item))
        return out


class BatchRequestSchema(FastSchema):
    supply = fields.Nested(SupplySchema, required=True)
    circuits = PerItemList(
        fields.Nested(CircuitSchema),
        required=True,
        validate=validate.Length(min=1),
        metadata={
            "description": "one result or one problem per item, in order; the size limit is the server's batch limit"
        },
    )


# ---------------------------------------------------------------- responses


fastload.register(SupplySchema, CircuitSchema, CheckRequestSchema)


class CheckResultSchema(Schema):
    check = fields.String(required=True, validate=validate.OneOf(CHECKS))
    verdict = fields.String(required=True, validate=validate.OneOf(VERDICTS))
    value = nullable_number()
    limit = nullable_number()
    unit = fields.String(required=True)
    margin_percent = nullable_number("(limit - value) / limit x 100; for the cpc, (size - minimum) / size x 100")
    basis = fields.String(required=True, metadata={"description": "the clause or table the verdict rests on"})
    note = fields.String(allow_none=True, required=True)


class DeviceSummarySchema(Schema):
    device_id = fields.String(required=True)
    label = fields.String(required=True)
    source = fields.String(required=True)
    confidence = fields.String(required=True)
    notes = fields.List(fields.String(), required=True)


class ProtectiveConductorResultSchema(Schema):
    k = nullable_number("the k used: tabulated where the case is a table row, else the formula")
    k_formula = nullable_number("IEC 60364-5-54 Annex A")
    k_basis = fields.String(allow_none=True, required=True)
    min_csa_mm2 = nullable_number()
    csa_mm2 = nullable_number("the cpc in the circuit")
    next_standard_csa_mm2 = nullable_number()
    selection_csa_mm2 = nullable_number("BS 7671 Table 54.7")
    energy_a2s = nullable_number()
    energy_basis = fields.String(allow_none=True, required=True)
    verdict = fields.String(required=True, validate=validate.OneOf(VERDICTS))
    basis = fields.String(required=True)


class CircuitResultSchema(Schema):
    id = fields.String(allow_none=True, required=True)
    r1_plus_r2_ohm = nullable_number()
    zs_ohm = fields.Float(required=True)
    earth_fault_current_a = fields.Float(required=True, metadata={"description": "U0 x Cmin / Zs, Cmin 0.95"})
    earth_fault_current_nominal_a = fields.Float(required=True, metadata={"description": "U0 / Zs"})
    prospective_fault_current_ka = fields.Float(required=True)
    prospective_fault_current_basis = fields.String(required=True)
    device = fields.Nested(DeviceSummarySchema, required=True)
    disconnection_time_s = nullable_number("null where no disconnection is shown")
    disconnection_time_bound = fields.String(required=True, validate=validate.OneOf(BOUNDS))
    disconnection_region = fields.String(required=True)
    disconnected_by = fields.String(
        allow_none=True, required=True, validate=validate.OneOf(["overcurrent-device", "rcd"])
    )
    max_disconnection_time_s = nullable_number()
    max_disconnection_basis = fields.String(required=True)
    operating_current_a = nullable_number("Ia for the required time")
    operating_current_bound = fields.String(required=True, validate=validate.OneOf(BOUNDS))
    max_zs_ohm = nullable_number(
        "U0 x Cmin / Ia of the overcurrent device; null where its data show no Ia for the time"
    )
    zs_margin_percent = nullable_number("(max_zs_ohm - zs_ohm) / max_zs_ohm x 100")
    rcd_max_zs_ohm = nullable_number("where an RCD is fitted: 50 V / IΔn, the largest Zs (TN) or RA (TT) it protects")
    protective_conductor = fields.Nested(ProtectiveConductorResultSchema, required=True)
    checks = fields.List(fields.Nested(CheckResultSchema), required=True)
    verdict = fields.String(required=True, validate=validate.OneOf(VERDICTS))
    cautions = fields.List(fields.String(), required=True)


class BatchItemSchema(Schema):
    index = fields.Integer(required=True)
    id = fields.String(allow_none=True, required=True)
    result = fields.Nested(CircuitResultSchema, metadata={"description": "present when the item was checked"})
    problem = fields.Nested(ProblemSchema, metadata={"description": "present when the item could not be checked"})


class BatchSummarySchema(Schema):
    circuits = fields.Integer(required=True)
    passed = fields.Integer(required=True, data_key=Verdict.PASS)
    failed = fields.Integer(required=True, data_key=Verdict.FAIL)
    not_verified = fields.Integer(required=True, data_key=Verdict.NOT_VERIFIED)
    invalid = fields.Integer(required=True)


class BatchResultSchema(Schema):
    results = fields.List(fields.Nested(BatchItemSchema), required=True)
    summary = fields.Nested(BatchSummarySchema, required=True)
