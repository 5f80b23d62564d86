"""The request and answer schemas of circuits/size and circuits/max-length."""

from __future__ import annotations

from marshmallow import ValidationError, fields, post_load, validate, validates_schema

from service.contract.circuit_schemas import (
    DEVICE_STANDARDS,
    DEVICE_TYPES,
    CircuitSchema,
    InstallationSchema,
    RcdSchema,
    SupplySchema,
    check_phases,
    energy_class_field,
    phases_field,
)
from service.contract.fields import ContractSchema, Flag, Number, Text, WholeNumber, choice
from service.contract.requirement_schemas import CircuitFactsSchema, JobSchema, curve_of, let_through_curve_field
from service.contract.result_schemas import (
    CheckResultSchema,
    CircuitResultSchema,
    FactorSchema,
    edition_answer,
    nullable_number,
)
from service.electrical.cables import capacity as cap
from service.electrical.cables.sizing import CPC_CHOICES, RULED_OUT_ORDER
from service.electrical.inputs import DeviceSpec
from service.electrical.rules import disconnection


class SizeDeviceSchema(ContractSchema):
    standard = choice(DEVICE_STANDARDS, required=True)
    type = choice(DEVICE_TYPES)
    breaking_capacity_ka = Number(minimum=0.1, maximum=200)
    rcd = fields.Nested(RcdSchema)
    energy_limiting_class = energy_class_field()
    afdd = Flag(metadata={"description": "an AFDD at the circuit's origin (421.1.7)"})
    let_through_curve = let_through_curve_field()

    @post_load
    def make(self, data, **kwargs):
        if "let_through_curve" in data:
            data["let_through_curve"] = curve_of(data["let_through_curve"])
        return DeviceSpec(rating_a=1.0, **data)


class SizeRequestSchema(CircuitFactsSchema, JobSchema):
    supply = fields.Nested(SupplySchema, required=True)
    id = Text(max_length=200)
    role = choice(disconnection.ROLES, load_default="final")
    load = choice(disconnection.LOADS, metadata={"description": "final circuits: what it supplies"})
    design_current_a = Number(minimum=0.1, maximum=1000, metadata={"description": "Ib; or give power_kw"})
    power_kw = Number(minimum=0.01, maximum=1000)
    power_factor = Number(minimum=0.1, maximum=1, load_default=1.0)
    phases = phases_field("1 or 3")
    use = choice(cap.USES, load_default="other", metadata={"description": "for the voltage drop limit"})
    supply_kind = choice(cap.SUPPLY_KINDS, load_default="public")
    voltage_drop_limit_percent = Number(minimum=0.5, maximum=20)
    length_m = Number(minimum=0.1, maximum=5000, required=True)
    installation = fields.Nested(InstallationSchema, required=True)
    device = fields.Nested(
        SizeDeviceSchema, required=True, metadata={"description": "the family; the rating is chosen"}
    )
    conditional_short_circuit_ka = Number(
        minimum=0.1, maximum=200, metadata={"description": "the board's conditional short-circuit rating, if any"}
    )
    parallel_cables = WholeNumber(
        minimum=1, maximum=12, load_default=1, metadata={"description": "equal cables in parallel (523.7)"}
    )
    ring = Flag(load_default=False, metadata={"description": "a ring final circuit: length_m is the whole ring"})
    cpc = choice(
        CPC_CHOICES,
        load_default="cable",
        metadata={"description": "the family's own cpc (a core, the twin-and-earth cpc, Table 54.7), or the armour"},
    )
    cores = WholeNumber(minimum=2, maximum=5, metadata={"description": "an armoured cable's cores, for armour as cpc"})

    @validates_schema
    def complete(self, data, **kwargs):
        check_phases(data)
        if data.get("ring") and data.get("parallel_cables", 1) > 1:
            raise ValidationError("a ring final circuit is not run in parallel cables: give one or the other", "ring")
        if ("design_current_a" in data) == ("power_kw" in data):
            raise ValidationError("give either design_current_a or power_kw", "design_current_a")
        if data.get("role") == "final" and "load" not in data:
            raise ValidationError("a final circuit needs its load: socket-outlets or fixed-equipment", "load")


class CapacitySchema(ContractSchema):
    it_a = fields.Float(required=True, metadata={"description": "tabulated capacity"})
    iz_a = fields.Float(required=True, metadata={"description": "It x Ca x Cg x Ci x Cc"})
    factors = fields.Dict(keys=fields.String(), values=fields.Nested(FactorSchema), required=True)
    confidence = fields.String(required=True)


class VoltageDropSchema(ContractSchema):
    mv_per_a_m = fields.Float(required=True)
    basis = fields.String(required=True)
    drop_v = fields.Float(required=True)
    percent = fields.Float(required=True)
    limit_percent = fields.Float(required=True)
    limit_basis = fields.String(required=True)


class SelectedSchema(ContractSchema):
    line_csa_mm2 = fields.Float(required=True)
    cpc_csa_mm2 = fields.Float(
        required=True, metadata={"description": "the armour's cross-section where cpc is armour"}
    )
    cpc = fields.String(required=True, validate=validate.OneOf(CPC_CHOICES))
    parallel_cables = fields.Integer(required=True)
    ring = fields.Boolean(required=True)
    material = fields.String(required=True)
    insulation = fields.String(required=True)
    capacity = fields.Nested(CapacitySchema, required=True)
    voltage_drop = fields.Nested(VoltageDropSchema, required=True)
    check = fields.Nested(CircuitResultSchema, required=True)


class TriedSchema(ContractSchema):
    line_csa_mm2 = fields.Float(required=True)
    cpc_csa_mm2 = fields.Float(required=True)
    verdict = fields.String(required=True)
    ruled_out_by = fields.String(
        allow_none=True, required=True, metadata={"description": f"one of {list(RULED_OUT_ORDER)}, or a field"}
    )
    value = nullable_number()
    limit = nullable_number()
    unit = fields.String(allow_none=True, required=True)


class LengthLimitSchema(ContractSchema):
    check = fields.String(required=True)
    max_length_m = nullable_number("the longest run its closed form allows; null where it cannot limit the run")
    note = fields.String(required=True)


class MaxLengthResultSchema(ContractSchema):
    max_length_m = nullable_number("null where no length passes")
    limited_by = fields.String(
        allow_none=True, required=True, metadata={"description": "the check that fails just beyond it"}
    )
    closed_form_m = fields.Dict(keys=fields.String(), values=fields.Float(), required=True)
    method = fields.String(required=True)
    requirements = fields.List(
        fields.Nested(CheckResultSchema),
        required=True,
        metadata={"description": "the rules beyond the calculations for the circuit (they do not depend on length)"},
    )
    breakdown = fields.List(
        fields.Nested(LengthLimitSchema),
        required=True,
        metadata={"description": "per check with a closed form: the longest run it allows, or why it cannot limit it"},
    )
    note = fields.String(allow_none=True, required=True, metadata={"description": "where no length passes: what would"})
    cautions = fields.List(fields.String(), required=True)


class RcdAnswerSchema(ContractSchema):
    residual_current_ma = fields.Float(required=True)
    delay = fields.String(required=True)
    type = fields.String(allow_none=True, required=True)


class DeviceChosenSchema(ContractSchema):
    standard = fields.String(required=True)
    type = fields.String(allow_none=True, required=True)
    rating_a = fields.Float(required=True)
    rcd = fields.Nested(
        RcdAnswerSchema,
        allow_none=True,
        required=True,
        metadata={"description": "the RCD, as given, or as the rules call for it (the cautions say so)"},
    )
    afdd = fields.Boolean(allow_none=True, required=True, metadata={"description": "an AFDD, as given or required"})


class SizeResultSchema(ContractSchema):
    design_current_a = fields.Float(required=True)
    device = fields.Nested(DeviceChosenSchema, required=True)
    selected = fields.Nested(SelectedSchema, allow_none=True, required=True)
    tried = fields.List(
        fields.Nested(TriedSchema),
        required=True,
        metadata={"description": "each smaller size, with the check that ruled it out"},
    )
    max_length = fields.Nested(MaxLengthResultSchema, allow_none=True, required=True)
    cautions = fields.List(fields.String(), required=True)
    requirements = fields.List(
        fields.Nested(CheckResultSchema),
        required=True,
        metadata={"description": "the rules beyond the calculations for the design (they do not depend on size)"},
    )
    edition = edition_answer()


class MaxLengthRequestSchema(JobSchema):
    supply = fields.Nested(SupplySchema, required=True)
    circuit = fields.Nested(
        CircuitSchema,
        required=True,
        metadata={"description": "with its conductors; the length given is where the search starts"},
    )
    installation = fields.Nested(
        InstallationSchema, metadata={"description": "adds the voltage drop rule (with the circuit's design_current_a)"}
    )
    phases = phases_field("1 or 3")
    use = choice(cap.USES, load_default="other")
    supply_kind = choice(cap.SUPPLY_KINDS, load_default="public")
    voltage_drop_limit_percent = Number(minimum=0.5, maximum=20)

    @validates_schema
    def has_conductors(self, data, **kwargs):
        check_phases(data)
        circuit = data.get("circuit")
        if circuit is not None and circuit.conductors is None:
            raise ValidationError("the longest run needs the circuit's conductors", "circuit")
