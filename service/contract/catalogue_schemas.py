"""The answer schemas of the catalogues (devices, cables) and of a device's characteristic."""

from __future__ import annotations

from marshmallow import fields, validate

from service.contract.fields import ContractSchema
from service.contract.result_schemas import DeviceSummarySchema


class RatingRangeSchema(ContractSchema):
    min_a = fields.Float(required=True)
    max_a = fields.Float(required=True)


class ProvenanceSchema(ContractSchema):
    title = fields.String(required=True)
    source = fields.String(required=True)
    edition = fields.String()
    confidence = fields.String()
    notes = fields.String()


class DeviceFamilySchema(ContractSchema):
    device_id = fields.String(required=True)
    kind = fields.String(required=True)
    standard = fields.String(required=True)
    type = fields.String(allow_none=True, required=True)
    title = fields.String(required=True)
    ratings_a = fields.List(fields.Float(), required=True)
    any_rating = fields.Nested(RatingRangeSchema, allow_none=True, required=True)
    residual = fields.Boolean(required=True)
    data = fields.Nested(ProvenanceSchema, required=True)
    estimates = fields.Nested(ProvenanceSchema, allow_none=True)


class CatalogueSchema(ContractSchema):
    devices = fields.List(fields.Nested(DeviceFamilySchema), required=True)


class PointSchema(ContractSchema):
    current_a = fields.Float(required=True)
    time_s = fields.Float(required=True)
    estimated = fields.Boolean(required=True)


class RegionSchema(ContractSchema):
    from_current_a = fields.Float(required=True)
    region = fields.String(required=True)


class CharacteristicSchema(ContractSchema):
    device = fields.Nested(DeviceSummarySchema, required=True)
    rating_a = fields.Float(required=True)
    points = fields.List(
        fields.Nested(PointSchema),
        required=True,
        metadata={"description": "maximum operating times, straight lines on log-log axes between them"},
    )
    regions = fields.List(fields.Nested(RegionSchema), required=True)


class CableMethodSchema(ContractSchema):
    method = fields.String(required=True, metadata={"description": "the installation method, as installation_method"})
    description = fields.String(required=True)
    sizes_mm2 = fields.Dict(
        keys=fields.String(validate=validate.OneOf(["single-phase", "three-phase"])),
        values=fields.List(fields.Float()),
        required=True,
        metadata={"description": "the sizes with a tabulated capacity, by the loaded conductors"},
    )


class CableFamilySchema(ContractSchema):
    cable = fields.String(required=True, metadata={"description": "as installation.cable"})
    title = fields.String(required=True)
    material = fields.String(required=True)
    insulation = fields.String(required=True, metadata={"description": "as conductors.insulation"})
    conductor_operating_c = fields.Float(required=True)
    methods = fields.List(fields.Nested(CableMethodSchema), required=True)
    cpc = fields.String(
        required=True,
        validate=validate.OneOf(["core", "fixed", "separate-by-selection", "sheath"]),
        metadata={"description": "the cpc sizing takes: a core, the cable's own, Table 54.7, or the sheath (maker's)"},
    )
    voltage_drop_table = fields.Boolean(required=True, metadata={"description": "false: worked from resistance"})
    data = fields.Nested(ProvenanceSchema, required=True)


class CableCatalogueSchema(ContractSchema):
    cables = fields.List(fields.Nested(CableFamilySchema), required=True)
