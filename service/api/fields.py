"""marshmallow fields that refuse what a lenient field would coerce (strings as numbers, etc.)."""

from __future__ import annotations

import math

from marshmallow import fields, validate


class Number(fields.Float):
    """A JSON number (not a string, not a boolean), finite, with the bounds given."""

    default_error_messages = {"invalid": "Not a number.", "special": "Not a finite number."}

    def __init__(self, *, minimum: float, maximum: float, **kwargs):
        extra = kwargs.pop("validate", None)
        checks = [validate.Range(min=minimum, max=maximum)] + ([extra] if extra is not None else [])
        super().__init__(allow_nan=False, validate=checks, **kwargs)

    def _deserialize(self, value, attr, data, **kwargs):
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            raise self.make_error("invalid")
        if isinstance(value, float) and not math.isfinite(value):
            raise self.make_error("special")
        return super()._deserialize(value, attr, data, **kwargs)


class WholeNumber(fields.Integer):
    """A JSON integer (not a string, not a boolean, not 2.5), with the bounds given."""

    def __init__(self, *, minimum: int, maximum: int, **kwargs):
        kwargs.setdefault("validate", validate.Range(min=minimum, max=maximum))
        super().__init__(strict=True, **kwargs)

    def _deserialize(self, value, attr, data, **kwargs):
        if isinstance(value, bool) or not isinstance(value, int):
            raise self.make_error("invalid")
        return super()._deserialize(value, attr, data, **kwargs)


class Flag(fields.Boolean):
    """A JSON true or false only."""

    def _deserialize(self, value, attr, data, **kwargs):
        if not isinstance(value, bool):
            raise self.make_error("invalid")
        return value


class Text(fields.String):
    """A JSON string with a length limit."""

    def __init__(self, *, max_length: int, **kwargs):
        kwargs.setdefault("validate", validate.Length(max=max_length))
        super().__init__(**kwargs)


def choice(values, **kwargs) -> fields.String:
    """A string from a fixed list (documented as an enum)."""
    return fields.String(validate=validate.OneOf(list(values)), **kwargs)
