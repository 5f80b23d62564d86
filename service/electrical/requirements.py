"""The rules beyond the calculations, per edition of BS 7671, read from ``data/requirements.json``.

Each rule is a row with its clause, its wording and its confidence, under the edition it belongs to; the
checks (:mod:`service.electrical.checks`) read the rows of the edition a request asks for. Adding an edition
is a data change.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Sequence
from dataclasses import dataclass
from functools import cache
from typing import Any

import numpy as np

from .datafiles import core_table
from .devices import residual
from .errors import InvalidInput
from .model import DeviceSpec, EvCharge, Rcd
from .verdicts import Verdict


def _table() -> dict[str, Any]:
    return core_table("requirements")


def editions() -> list[str]:
    """The editions the service applies, the current one first."""
    return list(_table()["editions"])


def default_edition() -> str:
    """The edition in force: what a request that names none is checked against."""
    return str(_table()["default_edition"])


def choices(name: str) -> list[str]:
    """The words of one of the request's choices (``premises``, ``equipment``, ``locations`` ...)."""
    return list(_table()[name])


def number(name: str) -> float:
    return float(_table()[name])


def check_edition(edition: str) -> None:
    if edition not in _table()["editions"]:
        raise InvalidInput("edition", f"the edition is one of {editions()}")


@cache
def rule(edition: str, name: str) -> dict[str, Any]:
    """The row of rule ``name`` under ``edition``, with ``basis``: the edition, the clause and where it comes
    from (``carried forward ...`` until confirmed against the edition)."""
    check_edition(edition)
    entry = _table()["editions"][edition]
    row = dict(entry["rules"][name])
    row["basis"] = f"{edition} {row['clause']} ({entry['carried_forward']})"
    return row


def clause(edition: str, name: str) -> str:
    """'BS 7671:2018+A4:2026 411.3.3': the edition and the clause of rule ``name``."""
    return f"{edition} {rule(edition, name)['clause']}"


def edition_caution(edition: str) -> str:
    """What every result under ``edition`` says about it (clauses carried forward, or a withdrawn edition)."""
    check_edition(edition)
    return str(_table()["editions"][edition]["caution"])


def not_assessed() -> list[str]:
    """What the service does not judge at all: the same list on every result (``verdict_scope.not_assessed``)."""
    return list(_table()["not_assessed"])


def special_locations() -> list[str]:
    """The locations named in a request whose own rules (Part 7) are not modelled."""
    return list(_table()["locations_not_modelled"])


def location_not_modelled(location: str) -> str | None:
    """The Part 7 section whose rules are not modelled for ``location`` (None where they are, or none apply)."""
    return _table()["locations_not_modelled"].get(location)


def _words(values: list[Any]) -> np.ndarray:
    return np.array(values, dtype=object)


@dataclass
class RequirementColumns:
    """What the rules beyond the calculations read, one cell per circuit (None where the request did not say)."""

    edition: np.ndarray
    premises: np.ndarray
    equipment: np.ndarray  # the circuit's equipment; lighting also where the circuit's use is lighting
    socket_outlet_rating_a: np.ndarray  # NaN: not stated (taken as up to 32 A)
    location: np.ndarray
    ev: np.ndarray  # a charge point
    ev_dc_fault_detection: np.ndarray
    ev_earthing_measure: np.ndarray
    concealed_in_wall: np.ndarray
    wall_has_metal_parts: np.ndarray
    earthed_metallic_covering: np.ndarray
    rcd_type: np.ndarray
    rcd_delay: np.ndarray
    afdd: np.ndarray


def requirement_columns(supplies: Sequence[Any], circuits: Sequence[Any]) -> RequirementColumns:
    """The columns of :class:`RequirementColumns` for circuits and their supplies (core model objects)."""
    default = default_edition()
    runs = [c.installation for c in circuits]
    evs = [c.ev for c in circuits]
    rcds = [c.device.rcd for c in circuits]
    equipment = [
        c.equipment if c.equipment is not None else ("lighting" if c.use == "lighting" else None) for c in circuits
    ]
    return RequirementColumns(
        edition=_words([default if s.edition is None else s.edition for s in supplies]),
        premises=_words([s.premises for s in supplies]),
        equipment=_words(equipment),
        socket_outlet_rating_a=np.array(
            [np.nan if c.socket_outlet_rating_a is None else c.socket_outlet_rating_a for c in circuits], dtype=float
        ),
        location=_words([c.location for c in circuits]),
        ev=np.array([e == "ev-charge-point" for e in equipment], dtype=bool),
        ev_dc_fault_detection=_words([None if e is None else e.dc_fault_detection for e in evs]),
        ev_earthing_measure=_words([None if e is None else e.earthing_measure for e in evs]),
        concealed_in_wall=_words([None if r is None else r.concealed_in_wall for r in runs]),
        wall_has_metal_parts=_words([None if r is None else r.wall_has_metal_parts for r in runs]),
        earthed_metallic_covering=_words([None if r is None else r.earthed_metallic_covering for r in runs]),
        rcd_type=_words([None if r is None else r.type for r in rcds]),
        rcd_delay=_words([None if r is None else r.delay for r in rcds]),
        afdd=_words([c.device.afdd for c in circuits]),
    )


def circuit_problem(circuit: Any, edition: str | None) -> InvalidInput | None:
    """A combination of the circuit's facts that makes no sense, naming the field (None where all is well)."""
    if edition is not None and edition not in _table()["editions"]:
        return InvalidInput(("supply", "edition"), f"the edition is one of {editions()}")
    for name, allowed in (("equipment", "equipment"), ("location", "locations")):
        value = getattr(circuit, name)
        if value is not None and value not in _table()[allowed]:
            return InvalidInput(("circuit", name), f"{name} is one of {choices(allowed)}")
    if circuit.ev is not None and circuit.equipment != "ev-charge-point":
        return InvalidInput(
            ("circuit", "ev"), "ev describes an EV charge point: give it with equipment ev-charge-point"
        )
    if circuit.socket_outlet_rating_a is not None and circuit.load != "socket-outlets":
        return InvalidInput(("circuit", "socket_outlet_rating_a"), "a socket-outlet rating needs load socket-outlets")
    if circuit.equipment is not None and circuit.role != "final":
        return InvalidInput(("circuit", "equipment"), "equipment describes what a final circuit supplies")
    return None


def required_device(
    device: DeviceSpec, checks: Sequence[Any], equipment: str | None, ev: EvCharge | None
) -> tuple[DeviceSpec, list[str]]:
    """The device the rules call for where ``device`` fails a requirement a device can meet, and what was said.

    A missing or unsuitable RCD where one is required (additional-protection, rcd-type): a general 30 mA RCD
    of type A, or of type B on an EV charge point without d.c. fault detection (722.531.3.101). A missing AFDD
    where one is required (arc-fault-detection): an AFDD.
    """
    failing = {c.check: c for c in checks if c.verdict == Verdict.FAIL}
    said, changes = [], {}
    if "additional-protection" in failing or "rcd-type" in failing:
        dc = ev is not None and ev.dc_fault_detection is True
        kind = "B" if equipment == "ev-charge-point" and not dc else "A"
        limit = residual.additional_protection_max_ma()
        changes["rcd"] = Rcd(limit, "general", kind)
        why = "; ".join(failing[k].basis for k in ("additional-protection", "rcd-type") if k in failing)
        said.append(
            f"The rules call for a {limit:g} mA RCD of type {kind} on this circuit ({why}): it was sized with one. "
            "Fit an RCBO, or supply the circuit through such an RCD."
        )
    if "arc-fault-detection" in failing:
        changes["afdd"] = True
        said.append(f"The rules call for an AFDD on this circuit ({failing['arc-fault-detection'].basis}): fit one.")
    return (dataclasses.replace(device, **changes), said) if changes else (device, [])
