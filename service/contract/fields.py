"""marshmallow fields that refuse what a lenient field would coerce (strings as numbers, etc.)."""

from __future__ import annotations

import math
import re
from typing import Any

from marshmallow import Schema, fields, validate


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


def csv_cell(value: str, kind: str) -> Any:
    """A CSV cell as JSON would carry it; a cell that does not parse stays text, so the schema says why."""
    text = value.strip()
    if kind == "text":
        return text
    if kind == "flag":
        return {"true": True, "yes": True, "1": True, "false": False, "no": False, "0": False}.get(text.lower(), text)
    try:
        number = int(text) if kind == "integer" else float(text)
    except ValueError:
        return text
    return number if number == number and abs(number) != float("inf") else text


def choice(values, **kwargs) -> fields.String:
    """A string from a fixed list (documented as an enum)."""
    return fields.String(validate=validate.OneOf(list(values)), **kwargs)


# ------------------------------------------------------------------------------------------ the project's words
# marshmallow's stock sentences, said in the project's words on the fields themselves: each message sits beside
# the pointer of the field it is about, so it says what the field must be
FIELD_WORDS: tuple[tuple[type[fields.Field], dict[str, str]], ...] = (
    (fields.Boolean, {"invalid": "must be true or false"}),
    (fields.Date, {"invalid": "must be a date, YYYY-MM-DD"}),
    (fields.Integer, {"invalid": "must be a whole number"}),
    (fields.Float, {"invalid": "must be a number", "special": "must be a finite number"}),
    (fields.String, {"invalid": "must be a string"}),
    (fields.List, {"invalid": "must be a list"}),
    (fields.Dict, {"invalid": "must be an object"}),
    (fields.Nested, {"type": "must be an object"}),
)
EVERY_FIELD_WORDS = {
    "required": "required: give this field",
    "null": "may not be null: give a value, or leave the field out where it is optional",
    "validator_failed": "not an allowed value",
}


def _range_words(v: validate.Range) -> str:
    if v.min is not None and v.max is not None:
        return "must be from {min} to {max}"
    return "must be at least {min}" if v.min is not None else "must be at most {max}"


def _length_words(v: validate.Length) -> str:
    if v.equal is not None:
        return "must hold exactly {equal} items or characters"
    if v.min is not None and v.max is not None:
        return "must hold from {min} to {max} items or characters"
    return (
        "must hold at least {min} items or characters"
        if v.min is not None
        else "must hold at most {max} items or characters"
    )


VALIDATOR_WORDS = (
    (validate.Range, _range_words),
    (validate.Length, _length_words),
    (validate.OneOf, lambda v: "must be one of: {choices}"),
    (validate.Equal, lambda v: "must be {other}"),
)


def in_our_words(field: fields.Field) -> None:
    """Set the field's messages, and its validators', in the project's words (and those of the fields inside it)."""
    field.error_messages = {**field.error_messages, **EVERY_FIELD_WORDS}
    for kind, words in FIELD_WORDS:
        if isinstance(field, kind):
            field.error_messages.update((key, text) for key, text in words.items() if key in field.error_messages)
    for validator in field.validators:
        for kind, words_of in VALIDATOR_WORDS:
            if isinstance(validator, kind) and validator.error in (None, getattr(kind, "default_message", None)):
                validator.error = words_of(validator)
    for inner in (
        getattr(field, "inner", None),
        getattr(field, "key_field", None),
        getattr(field, "value_field", None),
    ):
        if isinstance(inner, fields.Field):
            in_our_words(inner)


class ContractSchema(Schema):
    """Every request schema's base: an unknown field or a wrong type said in the project's words, and each field's
    messages set as the field is bound (:func:`in_our_words`)."""

    error_messages = {
        "unknown": "not a field of this object: /openapi.json lists its fields",
        "type": "must be an object",
    }

    def on_bind_field(self, field_name: str, field_obj: fields.Field) -> None:
        in_our_words(field_obj)
