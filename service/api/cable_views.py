"""GET /v1/cables: the cable families, their methods and sizes, and where each table comes from."""

from __future__ import annotations

from marshmallow import Schema, fields, validate

from service.api.base import Blueprint
from service.api.device_views import ProvenanceSchema
from service.api.errors import json_response
from service.electrical.cables import capacity

blp = Blueprint("cables", __name__, url_prefix="/v1/cables", description="The cable families the tables hold")


class CableMethodSchema(Schema):
    method = fields.String(required=True, metadata={"description": "the installation method, as installation_method"})
    description = fields.String(required=True)
    sizes_mm2 = fields.Dict(
        keys=fields.String(validate=validate.OneOf(["single-phase", "three-phase"])),
        values=fields.List(fields.Float()),
        required=True,
        metadata={"description": "the sizes with a tabulated capacity, by the loaded conductors"},
    )


class CableFamilySchema(Schema):
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


class CableCatalogueSchema(Schema):
    cables = fields.List(fields.Nested(CableFamilySchema), required=True)


@blp.route("", methods=["GET"])
@blp.response(200, CableCatalogueSchema)
def cables():
    """The cable families

    Each family's conductor material and insulation, its installation methods with the sizes tabulated for
    each, how sizing takes its cpc, and the source and confidence of its table, so that a form can offer only
    what exists.
    """
    response = json_response({"cables": capacity.families()})
    response.headers["Cache-Control"] = "public, max-age=3600"
    return response
