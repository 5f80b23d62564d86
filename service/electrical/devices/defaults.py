"""The maker's data said once: ``device_defaults`` of a request, given to every device of their standard and type.

A device takes, from the defaults of its standard and type (a default without a type serves every type of the
standard), each of the fields it does not state itself: the rated breaking capacity, the energy-limiting class
and the let-through curve. What a device states always wins.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Sequence
from typing import Any

from service.electrical.errors import InvalidInput
from service.electrical.inputs import DeviceDefaults, DeviceSpec

FIELDS = ("breaking_capacity_ka", "energy_limiting_class", "let_through_curve")


def check_defaults(defaults: Sequence[DeviceDefaults]) -> None:
    """Each standard and type is given once."""
    seen: set[tuple] = set()
    for k, d in enumerate(defaults):
        key = (d.standard, d.type)
        if key in seen:
            raise InvalidInput(("device_defaults", k), f"{d.standard} {d.type or '(any type)'} is given twice")
        seen.add(key)


def with_defaults(spec: DeviceSpec, defaults: Sequence[DeviceDefaults]) -> DeviceSpec:
    """``spec`` with the fields it leaves out taken from the defaults of its standard and type (its own type's
    first, then the standard's without a type)."""
    rows = [d for d in defaults if d.standard == spec.standard and d.type in (spec.type, None)]
    rows.sort(key=lambda d: d.type is None)
    changes: dict[str, Any] = {}
    for name in FIELDS:
        if getattr(spec, name) is None:
            value = next((getattr(d, name) for d in rows if getattr(d, name) is not None), None)
            if value is not None:
                changes[name] = value
    return dataclasses.replace(spec, **changes) if changes else spec


def with_defaults_of(circuit: Any, defaults: Sequence[DeviceDefaults]) -> Any:
    """One circuit with its device completed from the defaults."""
    spec = with_defaults(circuit.device, defaults)
    return circuit if spec is circuit.device else dataclasses.replace(circuit, device=spec)


def apply(items: Sequence[Any], defaults: Sequence[DeviceDefaults]) -> list[Any]:
    """Each circuit (anything with a ``device``; other items as they are) with its device completed from the
    defaults; circuits sharing one device object share the completed one."""
    if not defaults:
        return list(items)
    done: dict[int, DeviceSpec] = {}
    out = []
    for item in items:
        spec = getattr(item, "device", None)
        if not isinstance(spec, DeviceSpec):
            out.append(item)
            continue
        if id(spec) not in done:
            done[id(spec)] = with_defaults(spec, defaults)
        new = done[id(spec)]
        out.append(item if new is spec else dataclasses.replace(item, device=new))
    return out
