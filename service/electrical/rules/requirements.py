"""The rules beyond the calculations, per edition of BS 7671, read from ``data/requirements.json``.

Each rule is a row with its clause, its wording and its confidence, under the edition it belongs to; the
checks (:mod:`service.electrical.checks`) read the rows of the edition a request asks for. Adding an edition
is a data change.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Sequence
from dataclasses import dataclass
from functools import cache, lru_cache
from typing import Any

import numpy as np

from service.electrical.datafiles import core_table
from service.electrical.devices import residual
from service.electrical.errors import InvalidInput
from service.electrical.inputs import DeviceSpec, EvCharge, Rcd
from service.electrical.results.verdicts import Verdict


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
    row = dict(_table()["editions"][edition]["rules"][name])
    row["basis"] = basis(edition, [name])
    return row


def basis(edition: str, names: Sequence[str]) -> str:
    """'BS 7671:2018+A4:2026 411.3.3, 701.411.3.3 (carried forward ...)': the clauses of rules ``names``, each once."""
    rules = _table()["editions"][edition]["rules"]
    clauses = ", ".join(dict.fromkeys(rules[name]["clause"] for name in names))
    return f"{edition} {clauses} ({_table()['editions'][edition]['carried_forward']})"


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


@dataclass
class RequirementColumns:
    """What the rules beyond the calculations read, one row per distinct combination of facts among the circuits
    (``n`` rows; ``inverse`` gives each circuit's row), so that the rules run once per combination, not once per
    circuit. A fact not stated is None."""

    n: int
    inverse: np.ndarray  # circuit -> row
    role: np.ndarray
    load: np.ndarray
    phases: np.ndarray
    current_kind: np.ndarray
    earthing: np.ndarray
    has_rcd: np.ndarray
    residual_ma: np.ndarray
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


def _key(s: Any, c: Any) -> tuple:
    """What decides the rules for one circuit (objects by identity: the loaders share equal nested objects)."""
    return (id(s), c.role, c.load, c.phases, c.use, c.equipment, c.socket_outlet_rating_a, c.location,
            id(c.ev), id(c.installation), id(c.device.rcd), c.device.afdd)  # fmt: skip


def _facts(s: Any, c: Any) -> list[Any]:
    run, ev, rcd = c.installation, c.ev, c.device.rcd
    equipment = c.equipment if c.equipment is not None else ("lighting" if c.use == "lighting" else None)
    return [
        c.role, c.load, c.phases, s.current_kind, s.earthing, rcd is not None,
        np.inf if rcd is None else rcd.residual_current_ma,
        default_edition() if s.edition is None else s.edition, s.premises, equipment,
        np.nan if c.socket_outlet_rating_a is None else c.socket_outlet_rating_a, c.location,
        equipment == "ev-charge-point",
        None if ev is None else ev.dc_fault_detection, None if ev is None else ev.earthing_measure,
        None if run is None else run.concealed_in_wall, None if run is None else run.wall_has_metal_parts,
        None if run is None else run.earthed_metallic_covering,
        None if rcd is None else rcd.type, None if rcd is None else rcd.delay, c.device.afdd,
    ]  # fmt: skip


_KINDS = {"phases": np.int8, "has_rcd": bool, "residual_ma": float, "socket_outlet_rating_a": float, "ev": bool}


def requirement_columns(supplies: Sequence[Any], circuits: Sequence[Any]) -> RequirementColumns:
    """The :class:`RequirementColumns` of circuits and their supplies (core model objects): one Python pass for
    the key of each circuit, the facts read once per distinct key."""
    rows: dict[tuple, int] = {}
    firsts: list[int] = []
    inverse = np.empty(len(circuits), dtype=np.intp)
    for i, key in enumerate(map(_key, supplies, circuits)):
        at = rows.get(key)
        if at is None:
            at = rows[key] = len(firsts)
            firsts.append(i)
        inverse[i] = at
    table = [_facts(supplies[i], circuits[i]) for i in firsts]
    names = [f.name for f in dataclasses.fields(RequirementColumns)][2:]
    columns = {}
    for k, name in enumerate(names):
        values = [row[k] for row in table]
        columns[name] = np.array(values, dtype=_KINDS.get(name, object))
    return RequirementColumns(n=len(firsts), inverse=inverse, **columns)


def circuit_problem(circuit: Any, edition: str | None) -> InvalidInput | None:
    """A combination of the circuit's facts that makes no sense, naming the field (None where all is well)."""
    c = circuit
    return _problem(edition, c.role, c.load, c.equipment, c.location, c.ev is not None, c.socket_outlet_rating_a)


@lru_cache(maxsize=1024)
def _problem(
    edition: str | None, role: str, load: str | None, equipment: str | None, location: str | None, ev: bool, sockets
) -> InvalidInput | None:
    if edition is not None and edition not in _table()["editions"]:
        return InvalidInput(("supply", "edition"), f"the edition is one of {editions()}")
    for name, value, allowed in (("equipment", equipment, "equipment"), ("location", location, "locations")):
        if value is not None and value not in _table()[allowed]:
            return InvalidInput(("circuit", name), f"{name} is one of {choices(allowed)}")
    if ev and equipment != "ev-charge-point":
        return InvalidInput(
            ("circuit", "ev"), "ev describes an EV charge point: give it with equipment ev-charge-point"
        )
    if sockets is not None and load != "socket-outlets":
        return InvalidInput(("circuit", "socket_outlet_rating_a"), "a socket-outlet rating needs load socket-outlets")
    if equipment is not None and role != "final":
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
