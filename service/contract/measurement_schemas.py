"""The request and answer schemas of test-results/verify: measured values, and each judged against its limit."""

from __future__ import annotations

from marshmallow import fields, post_load, validate

from service.contract.circuit_schemas import CircuitSchema, FastSchema, SupplySchema
from service.contract.fields import ContractSchema, Flag, Number, choice
from service.contract.item_lists import PerItemList
from service.contract.requirement_schemas import JobSchema
from service.contract.result_schemas import edition_answer, nullable_number
from service.electrical.devices import defaults as device_defaults
from service.electrical.results.verdicts import VERDICTS
from service.electrical.verification import CIRCUIT_VOLTAGES, Measured


class MeasuredSchema(ContractSchema):
    temperature_c = Number(
        minimum=-20, maximum=60, load_default=20.0, metadata={"description": "conductor temperature when measured"}
    )
    zs_ohm = Number(minimum=0.001, maximum=2000)
    r1_plus_r2_ohm = Number(minimum=0.0001, maximum=100)
    insulation_resistance_megohm = Number(minimum=0, maximum=100000)
    insulation_test_voltage_v = Number(minimum=50, maximum=5000)
    circuit_voltage = choice(CIRCUIT_VOLTAGES, load_default="up-to-500v")
    rcd_time_ms_at_idn = Number(minimum=0, maximum=10000)
    rcd_time_ms_at_5idn = Number(minimum=0, maximum=10000)
    polarity_confirmed = Flag()
    ze_ohm = Number(minimum=0.001, maximum=2000, metadata={"description": "against the Ze the design assumed"})
    prospective_fault_current_ka = Number(
        minimum=0.001, maximum=200, metadata={"description": "against the device's breaking capacity"}
    )
    ring_r1_ohm = Number(minimum=0.0001, maximum=100, metadata={"description": "ring: line, end to end"})
    ring_rn_ohm = Number(minimum=0.0001, maximum=100, metadata={"description": "ring: neutral, end to end"})
    ring_r2_ohm = Number(minimum=0.0001, maximum=100, metadata={"description": "ring: cpc, end to end"})
    rcd_tripped_at_half_idn = Flag(metadata={"description": "did the RCD trip at half IΔn (it must not)"})

    @post_load
    def make(self, data, **kwargs):
        return Measured(**data)


class VerifyItemSchema(ContractSchema):
    circuit = fields.Nested(CircuitSchema, required=True)
    measured = fields.Nested(MeasuredSchema, required=True)


class VerifyRequestSchema(FastSchema, JobSchema):
    supply = fields.Nested(SupplySchema, required=True)
    circuits = PerItemList(fields.Nested(VerifyItemSchema), required=True)

    def complete_devices(self, data: dict, given: list) -> None:
        """Each item's circuit (an item that did not validate stays as it is)."""
        for item in data["circuits"]:
            if isinstance(item, dict):
                item["circuit"] = device_defaults.with_defaults_of(item["circuit"], given)


class JudgementSchema(ContractSchema):
    test = fields.String(required=True)
    verdict = fields.String(required=True, validate=validate.OneOf(VERDICTS))
    measured = nullable_number()
    limit = nullable_number("for the value as measured")
    unit = fields.String(required=True)
    basis = fields.String(required=True)
    note = fields.String(allow_none=True, required=True)
    rule_of_thumb_limit = nullable_number("the 0.8 rule, beside the temperature-corrected limit")
    corrected_value = nullable_number("the measured value corrected to operating temperature")


class VerificationSchema(ContractSchema):
    id = fields.String(allow_none=True, required=True)
    design_max_zs_ohm = nullable_number()
    design_r1_plus_r2_ohm = nullable_number()
    operating_temperature_c = fields.Float(required=True)
    judgements = fields.List(fields.Nested(JudgementSchema), required=True)
    verdict = fields.String(required=True, validate=validate.OneOf(VERDICTS))
    cautions = fields.List(fields.String(), required=True)


class VerifyItemResultSchema(ContractSchema):
    index = fields.Integer(required=True)
    id = fields.String(allow_none=True, required=True)
    result = fields.Nested(VerificationSchema)
    problem = fields.Nested("ProblemSchema")


class VerifyResultSchema(ContractSchema):
    results = fields.List(fields.Nested(VerifyItemResultSchema), required=True)
    edition = edition_answer()
