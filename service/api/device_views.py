"""GET /v1/devices and /v1/devices/{device_id}/{rating_a}/characteristic."""

from __future__ import annotations

import flask
from marshmallow import Schema, fields

from service.api.base import Blueprint
from service.api.helpers import SVG, svg_response
from service.contract.result_schemas import DeviceSummarySchema
from service.electrical.devices.catalogue import catalogue, device_by_id
from service.electrical.errors import ElectricalError
from service.picture import characteristic_svg

blp = Blueprint(
    "devices", __name__, url_prefix="/v1/devices", description="The built-in protective devices and their curves"
)


class RatingRangeSchema(Schema):
    min_a = fields.Float(required=True)
    max_a = fields.Float(required=True)


class ProvenanceSchema(Schema):
    title = fields.String(required=True)
    source = fields.String(required=True)
    edition = fields.String()
    confidence = fields.String()
    notes = fields.String()


class DeviceFamilySchema(Schema):
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


class CatalogueSchema(Schema):
    devices = fields.List(fields.Nested(DeviceFamilySchema), required=True)


class PointSchema(Schema):
    current_a = fields.Float(required=True)
    time_s = fields.Float(required=True)
    estimated = fields.Boolean(required=True)


class RegionSchema(Schema):
    from_current_a = fields.Float(required=True)
    region = fields.String(required=True)


class CharacteristicSchema(Schema):
    device = fields.Nested(DeviceSummarySchema, required=True)
    rating_a = fields.Float(required=True)
    points = fields.List(
        fields.Nested(PointSchema),
        required=True,
        metadata={"description": "maximum operating times, straight lines on log-log axes between them"},
    )
    regions = fields.List(fields.Nested(RegionSchema), required=True)


@blp.route("", methods=["GET"])
@blp.response(200, CatalogueSchema)
def list_devices():
    """The built-in devices: standard, type, ratings, and each data table's source and confidence"""
    return {"devices": catalogue()}


@blp.route("/<string:device_id>/<number:rating_a>/characteristic", methods=["GET"])
@blp.response(200, CharacteristicSchema)
@blp.alt_response(404, description="No such device or rating")
def characteristic(device_id, rating_a):
    """The time-current points of one device at one rating; as a picture with `Accept: image/svg+xml`"""
    try:
        dev = device_by_id(device_id, rating_a)
    except ElectricalError as err:
        flask.abort(404, description=err.message)
    if flask.request.accept_mimetypes.best_match(["application/json", SVG]) == SVG:
        return svg_response(characteristic_svg(dev), cache_seconds=86400)
    return {
        "device": dev.summary(),
        "rating_a": dev.rating_a,
        "points": dev.characteristic.points(),
        "regions": [{"from_current_a": lo, "region": name} for lo, name in dev.regions],
    }
