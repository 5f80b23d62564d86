"""Response schemas shared by the resources: they document what the core's results carry (the views write
the results themselves; tests and schemathesis check that the answers conform). A circuit's result and its
parts are made from the core's dataclasses (:func:`service.contract.shapes.schema_of`)."""

from __future__ import annotations

from marshmallow import fields, validate

from service.contract.fields import ContractSchema
from service.contract.problems import ProblemSchema
from service.contract.shapes import schema_of
from service.electrical.checks.overload import Factor, OverloadResult
from service.electrical.checks.protective_conductor import ProtectiveConductorResult
from service.electrical.checks.selectivity import SelectivityResult
from service.electrical.checks.short_circuit import ShortCircuitResult
from service.electrical.checks.voltage_drop import VoltageDropResult
from service.electrical.results.circuit_result import Check, CircuitResult, DeviceSummary, VerdictScope
from service.electrical.results.verdicts import Verdict
from service.electrical.rules import requirements


def nullable_number(description: str = "", **kwargs) -> fields.Float:
    return fields.Float(allow_none=True, required=True, metadata={"description": description}, **kwargs)


# made from the core's result dataclasses (service.electrical.results.shapes): declared there, once
CheckResultSchema = schema_of(Check)
DeviceSummarySchema = schema_of(DeviceSummary)
ProtectiveConductorResultSchema = schema_of(ProtectiveConductorResult)
ShortCircuitResultSchema = schema_of(ShortCircuitResult)
FactorSchema = schema_of(Factor)
OverloadResultSchema = schema_of(OverloadResult)
VoltageDropResultSchema = schema_of(VoltageDropResult)
SelectivityResultSchema = schema_of(SelectivityResult)
VerdictScopeSchema = schema_of(VerdictScope)
CircuitResultSchema = schema_of(CircuitResult)


def edition_answer() -> fields.String:
    return fields.String(
        required=True,
        validate=validate.OneOf(requirements.editions()),
        metadata={"description": "the edition of BS 7671 the answer applied"},
    )


class CheckAnswerSchema(CircuitResultSchema):
    """The answer of circuits/check: the circuit's result and the edition applied."""

    edition = edition_answer()


class BatchItemSchema(ContractSchema):
    index = fields.Integer(required=True)
    id = fields.String(allow_none=True, required=True)
    result = fields.Nested(CircuitResultSchema, metadata={"description": "present when the item was checked"})
    problem = fields.Nested(ProblemSchema, metadata={"description": "present when the item could not be checked"})


class BatchSummarySchema(ContractSchema):
    circuits = fields.Integer(required=True)
    passed = fields.Integer(required=True, data_key=Verdict.PASS)
    failed = fields.Integer(required=True, data_key=Verdict.FAIL)
    not_verified = fields.Integer(required=True, data_key=Verdict.NOT_VERIFIED)
    invalid = fields.Integer(required=True)


class BatchResultSchema(ContractSchema):
    results = fields.List(fields.Nested(BatchItemSchema), required=True)
    summary = fields.Nested(BatchSummarySchema, required=True)
    edition = edition_answer()
