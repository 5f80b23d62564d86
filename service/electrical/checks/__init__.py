"""The checks of a circuit, one step each, in the order results list them.

A step takes the circuit columns, the fault loop, the devices' response and the checks made before it,
and returns a :class:`~service.electrical.checks.base.CheckColumns`. Adding a check is one function (in a module
of its own here, with its clause texts beside it) and one entry in :data:`STEPS`.
"""

from __future__ import annotations

from .base import CheckColumns, Step
from .breaking_capacity import breaking_capacity
from .disconnection_time import disconnection_time
from .max_zs import max_zs
from .overload import overload
from .protective_conductor import protective_conductor
from .rcd import rcd
from .selectivity import selectivity_check
from .short_circuit import short_circuit
from .voltage_drop import voltage_drop

# the order results list them; a step may read the checks before it (the cpc's Table 54.7 alternative
# stands only where the short-circuit check shows the line conductor protected)
STEPS: tuple[Step, ...] = (
    disconnection_time,
    max_zs,
    short_circuit,
    protective_conductor,
    breaking_capacity,
    overload,
    voltage_drop,
    rcd,
    selectivity_check,
)
CHECKS: tuple[str, ...] = tuple(step.check_name for step in STEPS)  # type: ignore[attr-defined]
UNITS: dict[str, str] = {step.check_name: step.unit for step in STEPS}  # type: ignore[attr-defined]

__all__ = ["CHECKS", "STEPS", "UNITS", "CheckColumns", "Step"]
