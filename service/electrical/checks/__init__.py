"""The checks of a circuit, one step each, in the order results list them.

A step takes the circuit columns, the fault loop, the devices' response and the checks made before it,
and returns a :class:`~service.electrical.checks.base.CheckColumns`. Adding a check is one function (in a module
of its own here, with its clause texts beside it) and one entry in :data:`STEPS`.
"""

from __future__ import annotations

from service.electrical.checks.additional_protection import additional_protection
from service.electrical.checks.arc_fault import arc_fault_detection
from service.electrical.checks.base import CheckColumns, Step
from service.electrical.checks.breaking_capacity import breaking_capacity
from service.electrical.checks.disconnection_time import disconnection_time
from service.electrical.checks.ev_earthing import ev_earthing
from service.electrical.checks.max_zs import max_zs
from service.electrical.checks.overload import overload
from service.electrical.checks.protective_conductor import protective_conductor
from service.electrical.checks.rcd import rcd
from service.electrical.checks.rcd_type import rcd_type
from service.electrical.checks.selectivity import selectivity_check
from service.electrical.checks.short_circuit import short_circuit
from service.electrical.checks.voltage_drop import voltage_drop

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
    additional_protection,
    rcd_type,
    arc_fault_detection,
    ev_earthing,
    selectivity_check,
)
CHECKS: tuple[str, ...] = tuple(step.check_name for step in STEPS)  # type: ignore[attr-defined]
UNITS: dict[str, str] = {step.check_name: step.unit for step in STEPS}  # type: ignore[attr-defined]

__all__ = ["CHECKS", "STEPS", "UNITS", "CheckColumns", "Step"]
