"""marshmallow fields that refuse what a lenient field would coerce (strings as numbers, etc.)."""

from __future__ import annotations

import math
import re

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


# control characters (C0, DEL, C1) and the bidirectional overrides and isolates: never part of an id or a name, and
# never to reach a report raw (a right-to-left override makes "lights.exe" read as "exe.sthgil")
UNSAFE = re.compile("[\x00-\x1f\x7f-\x9f\u200e\u200f\u202a-\u202e\u2066-\u2069]")


def safe_text(value: str) -> bool:
    """Text with no control or bidirectional-override character and no lone surrogate."""
    if UNSAFE.search(value):
        return False
    try:
        value.encode("utf-8")
    except UnicodeEncodeError:
        return False
    return True


class Text(fields.String):
    """A JSON string with a length limit, and no control, bidirectional-override or lone surrogate character."""

    default_error_messages = {
        "unsafe": "contains a control or bidirectional-override character, or a lone surrogate: not text to show"
    }

    def __init__(self, *, max_length: int, **kwargs):
        kwargs.setdefault("validate", validate.Length(max=max_length))
        super().__init__(**kwargs)

    def _deserialize(self, value, attr, data, **kwargs):
        text = super()._deserialize(value, attr, data, **kwargs)
        if not safe_text(text):
            raise self.make_error("unsafe")
        return text


def choice(values, **kwargs) -> fields.String:
    """A string from a fixed list (documented as an enum)."""
    return fields.String(validate=validate.OneOf(list(values)), **kwargs)
