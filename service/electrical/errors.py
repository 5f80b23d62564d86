"""Typed errors of the calculation core.

The core never raises HTTP errors. Each error names the input field at fault (a dotted path
relative to the object the caller passed, e.g. ``conductors.line_csa_mm2``) so that the HTTP face
can turn it into a JSON pointer.
"""

from __future__ import annotations


class ElectricalError(ValueError):
    """Base class: an input the core cannot compute with."""

    def __init__(self, field: str, message: str):
        super().__init__(f"{field}: {message}")
        self.field = field
        self.message = message


class UnknownConductor(ElectricalError):
    """A conductor size, class or material that the resistance table does not hold."""


class UnknownDevice(ElectricalError):
    """A protective device standard, type or rating that the catalogue does not hold."""


class InvalidInput(ElectricalError):
    """A value outside what the rules or the data cover (e.g. U0 at or below 50 V a.c.)."""


class NoRule(ElectricalError):
    """A combination for which no table row or rule exists (e.g. k for a steel core in a cable)."""
