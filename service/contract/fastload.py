"""A fast loader for batch items and schedule rows, compiled from the same marshmallow schemas.

marshmallow spends about 90 microseconds on each circuit of a batch, which for ten thousand circuits
costs more than the computation. This module reads each registered schema once, at import (fields,
bounds, enums, defaults, schema-level validators and post_load), and loads a plain dict in a tight
loop. It only decides: an item it accepts loads to exactly what marshmallow would give; an item it
refuses is handed to marshmallow, so the error messages and pointers stay the ones the contract
documents. A property test holds the two loaders to agreement on every registered schema.

Schemas with ``only`` or ``exclude`` are refused (a plan is made per class). The one place that reads
marshmallow's resolved hooks is :func:`_hooks_of`.
"""

from __future__ import annotations

import math
from typing import Any

from marshmallow import Schema, ValidationError, fields, validate
from marshmallow.decorators import POST_LOAD, VALIDATES_SCHEMA

from service.contract.fields import Flag, Number, Text, WholeNumber, safe_text

_MISSING = object()


class Refused(Exception):
    """The fast loader does not accept this item (marshmallow will say why)."""


class _Plan:
    """What one schema checks, in a form a loop can apply quickly."""

    def __init__(self, schema: Schema):
        if schema.only or schema.exclude:
            raise TypeError(f"fastload does not support {type(schema).__name__} with only= or exclude=")
        self.schema = schema
        # (key in the input, attribute in the output, check)
        self.fields: list[tuple[str, str, Any]] = []
        for name, field in schema.load_fields.items():
            self.fields.append((field.data_key or name, field.attribute or name, _field_check(field)))
        self.names = {key for key, _, _ in self.fields}
        # the same, arranged for a loop over the keys an item has: its check by key, what must be there, the defaults
        self.by_key = {key: (attribute, check[2]) for key, attribute, check in self.fields}
        self.required = frozenset(key for key, _, check in self.fields if check[0])
        self.constants = {a: c[1] for _, a, c in self.fields if c[1] is not _MISSING and not callable(c[1])}
        self.factories = [(a, c[1]) for _, a, c in self.fields if c[1] is not _MISSING and callable(c[1])]
        hooks = _hooks_of(schema)
        for tag in hooks:
            if tag not in (VALIDATES_SCHEMA, POST_LOAD) and hooks[tag]:
                raise TypeError(f"fastload does not support {tag} hooks")
        self.validators = [getattr(schema, attr) for attr, many, _ in hooks[VALIDATES_SCHEMA] if not many]
        self.post_loads = [getattr(schema, attr) for attr, many, _ in hooks[POST_LOAD] if not many]

    def load(self, value: Any) -> Any:
        if not isinstance(value, dict) or not self.required <= value.keys():
            raise Refused
        out: dict[str, Any] = dict(self.constants)
        for attribute, factory in self.factories:
            out[attribute] = factory()
        by_key = self.by_key
        for key, raw in value.items():
            entry = by_key.get(key)
            if entry is None:
                raise Refused
            out[entry[0]] = entry[1](raw)
        for validator in self.validators:
            try:
                validator(out, partial=False, many=False)
            except ValidationError:
                raise Refused from None
        for hook in self.post_loads:
            out = hook(out, partial=False, many=False)
        return out


def _bounds(field: fields.Field) -> tuple[float | None, float | None, tuple | None, int | None]:
    lo = hi = choices = max_len = None
    for v in field.validators:
        if isinstance(v, validate.Range):
            if not (v.min_inclusive and v.max_inclusive):
                raise TypeError("fastload supports inclusive ranges only")
            lo, hi = v.min, v.max
        elif isinstance(v, validate.OneOf):
            choices = tuple(v.choices)
        elif isinstance(v, validate.Length):
            if v.equal is not None:
                raise TypeError("fastload does not support Length(equal=...)")
            max_len = (v.min, v.max)
        else:
            raise TypeError(f"fastload does not know the validator {v!r}")
    return lo, hi, choices, max_len


class _Limits:
    """A field's bounds as its validators give them."""

    def __init__(self, field: fields.Field):
        self.lo, self.hi, self.choices, length = _bounds(field)
        self.min_len, self.max_len = length if length is not None else (None, None)

    def in_range(self, value: float) -> bool:
        return (self.lo is None or value >= self.lo) and (self.hi is None or value <= self.hi)

    def in_length(self, value: Any) -> bool:
        return (self.min_len is None or len(value) >= self.min_len) and (
            self.max_len is None or len(value) <= self.max_len
        )

    def chosen(self, value: Any) -> Any:
        if self.choices is not None and value not in self.choices:
            raise Refused
        return value


def _number(field: fields.Field, limits: _Limits):
    def check(raw):
        if type(raw) is not float and type(raw) is not int:
            raise Refused
        value = float(raw)
        if not math.isfinite(value) or not limits.in_range(value):
            raise Refused
        return limits.chosen(value)

    return check


def _whole_number(field: fields.Field, limits: _Limits):
    def check(raw):
        if type(raw) is not int or not limits.in_range(raw):
            raise Refused
        return limits.chosen(raw)

    return check


def _flag(field: fields.Field, limits: _Limits):
    def check(raw):
        if type(raw) is not bool:
            raise Refused
        return raw

    return check


def _text(field: fields.Field, limits: _Limits):
    guarded = isinstance(field, Text)  # ids and names: no control or bidirectional-override character

    def check(raw):
        if type(raw) is not str or not limits.in_length(raw) or (guarded and not safe_text(raw)):
            raise Refused
        return limits.chosen(raw)

    return check


CACHED = 2048  # distinct nested objects remembered per field: a schedule repeats its devices and cable runs


def _nested(field: fields.Field, limits: _Limits):
    """A nested object's loader; an object of plain values seen before loads to the same (immutable) result."""
    plan = _Plan(field.schema)
    seen: dict[tuple, Any] = {}

    def check(raw):
        if not isinstance(raw, dict):
            raise Refused
        try:  # with each value's type: 1, 1.0 and True are equal in Python, not in the schema
            key = tuple([(k, v.__class__, v) for k, v in raw.items()])
            hit = seen.get(key, _MISSING)
        except TypeError:  # a nested list or object inside: not remembered
            return plan.load(raw)
        if hit is _MISSING:
            hit = plan.load(raw)
            if len(seen) >= CACHED:
                seen.clear()
            seen[key] = hit
        return hit

    return check


def _nested_list(field: fields.Field, limits: _Limits):
    inner = _Plan(field.inner.schema)

    def check(raw):
        if type(raw) is not list or not limits.in_length(raw):
            raise Refused
        return [inner.load(item) for item in raw]

    return check


def _text_list(field: fields.Field, limits: _Limits):
    inner = _text(field.inner, _Limits(field.inner))

    def check(raw):
        if type(raw) is not list or not limits.in_length(raw):
            raise Refused
        return [inner(item) for item in raw]

    return check


def _kind(field: fields.Field):
    """Which check builder serves this field (an exact list: a field type it does not know is refused)."""
    if isinstance(field, Number):
        return _number
    if isinstance(field, WholeNumber):
        return _whole_number
    if isinstance(field, Flag):
        return _flag
    if type(field) in (fields.String, Text):
        return _text
    if isinstance(field, fields.Nested):
        return _nested
    if isinstance(field, fields.List) and isinstance(field.inner, fields.Nested):
        return _nested_list
    if isinstance(field, fields.List) and type(field.inner) in (fields.String, Text):
        return _text_list
    raise TypeError(f"fastload does not know the field {type(field).__name__}")


def _field_check(field: fields.Field):
    """(required, load_default, check) for one field; check(raw) returns the loaded value or raises Refused."""
    if field.allow_none:
        raise TypeError("fastload does not support nullable request fields")
    default = field.load_default if field.load_default is not fields.missing_ else _MISSING
    return (field.required, default, _kind(field)(field, _Limits(field)))


def _hooks_of(schema: Schema) -> dict:
    """marshmallow's resolved hooks of a schema: tag -> [(attribute, many, options)] (its only internal read here)."""
    return schema._hooks


_PLANS: dict[type[Schema], _Plan] = {}


def register(*schemas: type[Schema]) -> None:
    """Compile the plans of these schema classes (at import, so that a schema it cannot serve fails at once)."""
    for cls in schemas:
        _PLANS[cls] = _Plan(cls())


def registered() -> tuple[type[Schema], ...]:
    """The schema classes with a compiled plan."""
    return tuple(_PLANS)


def fast_load(schema: Schema, item: Any) -> Any:
    """What ``schema.load(item)`` returns, or :class:`Refused` where marshmallow would raise (or might).

    Only a registered schema class, used without ``only`` or ``exclude``, takes the fast path.
    """
    plan = _PLANS.get(type(schema))
    if plan is None or schema.only or schema.exclude:
        raise Refused
    return plan.load(item)
