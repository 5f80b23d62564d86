"""Response schemas shared by the resources: they document what the core's results carry (the views write
the results themselves; tests and schemathesis check that the answers conform)."""

from __future__ import annotations

from marshmallow import Schema, fields, validate

from service.contract.problems import ProblemSchema
from service.electrical.cables import protective
from service.electrical.checks import CHECKS
from service.electrical.devices.characteristic import BOUNDS
from service.electrical.devices.selectivity import SELECTIVE
from service.electrical.results.verdicts import VERDICTS, Verdict
from service.electrical.rules import requirements


def nullable_number(description: str = "", **kwargs) -> fields.Float:
    return fields.Float(allow_none=True, required=True, metadata={"description": description}, **kwargs)


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
    energy_a2s = nullable_number("the larger of the energies at the smallest and the largest earth fault")
    energy_basis = fields.String(
        allow_none=True,
        required=True,
        validate=validate.OneOf(protective.ENERGY_METHODS),
        metadata={"description": "how the energy was found"},
    )
    energy_data = fields.String(
        allow_none=True, required=True, metadata={"description": "which standard limit, if any"}
    )
    verdict = fields.String(required=True, validate=validate.OneOf(VERDICTS))
    basis = fields.String(required=True)


class ShortCircuitResultSchema(Schema):
    k = nullable_number("k of the line conductor (BS 7671 Table 43.1)")
    csa_mm2 = nullable_number("the line conductor, all cables in parallel together")
    withstand_a2s = nullable_number("k^2 S^2")
    line_neutral_loop_ohm = nullable_number("at the origin")
    line_neutral_loop_basis = fields.String(allow_none=True, required=True)
    max_current_a = nullable_number("the largest short-circuit current, at the origin of the circuit")
    max_energy_a2s = nullable_number("what the device lets through at it")
    max_energy_basis = fields.String(allow_none=True, required=True)
    min_current_a = nullable_number("the smallest, a line-neutral fault at the far end (Cmin, conductors hot)")
    min_time_s = nullable_number("the device's time at it")
    min_time_bound = fields.String(allow_none=True, required=True)
    allowed_time_s = nullable_number("the smaller of 5 s and k^2 S^2 / I^2 at the smallest current")
    min_energy_a2s = nullable_number()
    min_energy_basis = fields.String(allow_none=True, required=True)
    let_through_data = fields.String(
        allow_none=True, required=True, metadata={"description": "which standard limit, if any"}
    )
    verdict = fields.String(required=True, validate=validate.OneOf(VERDICTS))
    basis = fields.String(required=True)


class OverloadResultSchema(Schema):
    design_current_a = nullable_number("Ib")
    rating_a = nullable_number("In")
    it_a = nullable_number("tabulated capacity")
    iz_a = nullable_number("It x Ca x Cg x Ci x Cc, times the cables in parallel")
    factors = fields.Dict(keys=fields.String(), values=fields.Nested("FactorSchema"), allow_none=True, required=True)
    capacity_confidence = fields.String(allow_none=True, required=True)
    capacity_basis = fields.String(allow_none=True, required=True, metadata={"description": "where It comes from"})
    verdict = fields.String(required=True, validate=validate.OneOf(VERDICTS))
    basis = fields.String(required=True)


class VoltageDropResultSchema(Schema):
    mv_per_a_m = nullable_number("the cable's voltage drop per ampere and metre (Appendix 4 tables, or given)")
    mv_basis = fields.String(allow_none=True, required=True)
    drop_v = nullable_number("mV/A/m x Ib x L / 1000 (a ring: a quarter of the loop)")
    circuit_percent = nullable_number("of the nominal voltage (U0 single-phase, U0 x √3 three-phase)")
    upstream_percent = fields.Float(required=True, metadata={"description": "the drop from the origin to the board"})
    from_origin_percent = nullable_number()
    limit_percent = nullable_number("Appendix 4 Table 4Ab, or the request's limit")
    limit_basis = fields.String(allow_none=True, required=True)
    verdict = fields.String(required=True, validate=validate.OneOf(VERDICTS))
    basis = fields.String(required=True)


class SelectivityResultSchema(Schema):
    with_ = fields.String(
        allow_none=True, required=True, data_key="with", metadata={"description": "the upstream device's id"}
    )
    up_to_a = nullable_number("only the downstream device operates up to this current; null: at any or none")
    max_fault_current_a = nullable_number("the largest fault at the downstream device (the board's PFC)")
    basis = fields.String(allow_none=True, required=True, metadata={"description": "how the pair's limit is known"})
    residual = fields.String(
        allow_none=True,
        required=True,
        validate=validate.OneOf(SELECTIVE),
        metadata={"description": "where both devices have an RCD"},
    )
    residual_basis = fields.String(allow_none=True, required=True)
    verdict = fields.String(
        required=True,
        validate=validate.OneOf(SELECTIVE),
        metadata={"description": "total, partial (up to up_to_a), none, or not-verified; the check says pass or fail"},
    )


class FactorSchema(Schema):
    factor = fields.Float(required=True)
    basis = fields.String(required=True)


class VerdictScopeSchema(Schema):
    covered = fields.List(fields.String(validate=validate.OneOf(CHECKS)), required=True)
    left_out = fields.List(fields.String(validate=validate.OneOf(CHECKS)), required=True)
    not_assessed = fields.List(
        fields.String(),
        required=True,
        metadata={"description": "what the service does not judge at all (the same on every result): a pass never "
                  "covers these"},
    )  # fmt: skip


class CircuitResultSchema(Schema):
    id = fields.String(allow_none=True, required=True)
    r1_plus_r2_ohm = nullable_number()
    zs_ohm = fields.Float(required=True)
    earth_fault_current_a = fields.Float(required=True, metadata={"description": "U0 x Cmin / Zs, Cmin 0.95"})
    earth_fault_current_nominal_a = fields.Float(required=True, metadata={"description": "U0 / Zs"})
    prospective_fault_current_ka = nullable_number(
        "the larger of line-neutral and line-earth at the origin (434.1); null where it cannot be known (TT)"
    )
    prospective_fault_current_basis = fields.String(required=True)
    line_neutral_loop_ohm = nullable_number("at the origin, as used for the smallest short circuit")
    min_short_circuit_current_a = nullable_number("a line-neutral fault at the far end, Cmin, conductors hot")
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
    short_circuit = fields.Nested(ShortCircuitResultSchema, required=True)
    overload = fields.Nested(OverloadResultSchema, required=True)
    three_phase_fault_current_ka = nullable_number("symmetrical, at the origin of the circuit; null where unknown")
    voltage_drop_from_origin_percent = nullable_number("the board's drop from the origin plus the circuit's")
    voltage_drop = fields.Nested(VoltageDropResultSchema, required=True)
    selectivity = fields.Nested(
        SelectivityResultSchema,
        allow_none=True,
        required=True,
        metadata={"description": "against the device feeding the circuit's board; null where that is not known"},
    )
    checks = fields.List(fields.Nested(CheckResultSchema), required=True)
    verdict = fields.String(
        required=True,
        validate=validate.OneOf(VERDICTS),
        metadata={
            "description": "fail if a check in scope fails, else not-verified if one could not be made, else pass"
        },
    )
    verdict_scope = fields.Nested(VerdictScopeSchema, required=True)
    cautions = fields.List(fields.String(), required=True)


def edition_answer() -> fields.String:
    return fields.String(
        required=True,
        validate=validate.OneOf(requirements.editions()),
        metadata={"description": "the edition of BS 7671 the answer applied"},
    )


class CheckAnswerSchema(CircuitResultSchema):
    """The answer of circuits/check: the circuit's result and the edition applied."""

    edition = edition_answer()


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
    edition = edition_answer()
