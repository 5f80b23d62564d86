"""Response schemas made from the core's result dataclasses (:mod:`service.electrical.results.shapes`): one
marshmallow schema per shape, named after it, each field required, typed by its annotation and described
by its declaration."""

from __future__ import annotations

import dataclasses
import functools
import types
import typing
from typing import Any

from marshmallow import Schema, fields, validate

SCALARS = {bool: fields.Boolean, float: fields.Float, int: fields.Integer, str: fields.String}


@functools.cache
def schema_of(shape: type) -> type[Schema]:
    """The schema of a result dataclass (``CircuitResult`` -> ``CircuitResultSchema``), made once."""
    hints = typing.get_type_hints(shape)
    declared = {f.name: _field(hints[f.name], f.metadata) for f in dataclasses.fields(shape)}
    return Schema.from_dict(declared, name=f"{getattr(shape, 'SCHEMA_NAME', shape.__name__)}Schema")


def _field(annotation: Any, declared: typing.Mapping[str, Any]) -> fields.Field:
    nullable = declared.get("nullable", True)
    kwargs: dict[str, Any] = {"required": True}
    if nullable:
        kwargs["allow_none"] = True
    if declared.get("key"):
        kwargs["data_key"] = declared["key"]
    if declared.get("description"):
        kwargs["metadata"] = {"description": declared["description"]}
    kind = _without_none(annotation)
    origin = typing.get_origin(kind)
    choices = declared.get("choices")
    shape = declared.get("shape")
    if shape is not None or dataclasses.is_dataclass(kind):
        return fields.Nested(schema_of(shape or kind), **kwargs)
    if declared.get("values") is not None:
        return fields.Dict(keys=fields.String(), values=fields.Nested(schema_of(declared["values"])), **kwargs)
    if origin is dict:
        _, value = typing.get_args(kind)
        return fields.Dict(keys=fields.String(), values=_scalar(value)(), **kwargs)
    if origin is list:
        (item,) = typing.get_args(kind)
        if dataclasses.is_dataclass(item):
            return fields.List(fields.Nested(schema_of(item)), **kwargs)
        return fields.List(_scalar(item)(validate=validate.OneOf(choices) if choices else None), **kwargs)
    if choices:
        kwargs["validate"] = validate.OneOf(choices)
    return _scalar(kind)(**kwargs)


def _scalar(kind: type) -> type[fields.Field]:
    """The field of a scalar type (a str enum, such as a verdict, is a string)."""
    return next(
        field for base, field in SCALARS.items() if issubclass(kind, base) and not (base is int and kind is bool)
    )


def _without_none(annotation: Any) -> Any:
    if isinstance(annotation, types.UnionType) or typing.get_origin(annotation) is typing.Union:
        rest = [a for a in typing.get_args(annotation) if a is not type(None)]
        return rest[0] if len(rest) == 1 else annotation
    return annotation
