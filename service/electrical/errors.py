"""Typed errors of the calculation core.

The core never raises HTTP errors. Each error carries the *path* of the input at fault, a tuple of
names (and list indices) relative to the object the caller passed, e.g. ``("conductors",
"line_csa_mm2")`` or ``("curve_points", 1)``. A caller that wraps the object in a larger one adds its
own segments in front with :meth:`ElectricalError.within`, which keeps the subclass. The HTTP face
turns a path into a JSON pointer in one place (``service.contract.problems.pointer_of``).
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Self

PathSegment = str | int
Path = tuple[PathSegment, ...]


def as_path(where: PathSegment | Sequence[PathSegment]) -> Path:
    """A path from one segment or a sequence of them."""
    if isinstance(where, (str, int)):
        return (where,)
    return tuple(where)


class ElectricalError(ValueError):
    """Base class: an input the core cannot compute with."""

    def __init__(self, where: PathSegment | Sequence[PathSegment], message: str):
        self.path: Path = as_path(where)
        self.message = message
        super().__init__(f"{self.field}: {message}")

    @property
    def field(self) -> str:
        """The path written with dots, for logs and messages."""
        return ".".join(str(p) for p in self.path)

    def within(self, *prefix: PathSegment) -> Self:
        """The same error, of the same subclass, with ``prefix`` in front of its path.

        A path that already starts with the prefix is left as it is, so wrapping twice is harmless.
        """
        if self.path[: len(prefix)] == prefix:
            return self
        return type(self)(prefix + self.path, self.message)


class UnknownConductor(ElectricalError):
    """A conductor size, class or material that the resistance table does not hold."""


class UnknownDevice(ElectricalError):
    """A protective device standard, type or rating that the catalogue does not hold."""


class InvalidInput(ElectricalError):
    """A value outside what the rules or the data cover (e.g. U0 at or below 50 V a.c.)."""


class NoRule(ElectricalError):
    """A combination for which no table row or rule exists (e.g. k for a steel core in a cable)."""


class NoSolution(ElectricalError):
    """A question the rules cannot answer for these inputs (e.g. no size passes)."""
