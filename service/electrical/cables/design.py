"""Design a whole installation: for every circuit and sub-main that leaves them out, the smallest device rating and
cable sizes that pass every check, chosen for the tree at once.

The judge is the installation check itself (:func:`service.electrical.network.installation.check_installation`):
each round checks the whole tree as one set of arrays, and every circuit that fails a rule a larger size can meet
moves up. Where the check's own figures say how far (the capacity Iz against In, the voltage drop left from the
origin), a circuit moves straight to the smallest size that meets them, read from the same tables; otherwise one
size a round. A circuit whose own sizes cannot help (given, or at the largest) moves its board's feed up instead; a
board that requires selectivity moves its feed's rating up. The rules beyond the calculations are met by the device
they call for (a 30 mA RCD of the right type, an AFDD), and the design says so.

Then the voltage drop is shared: a larger sub-main leaves more of the drop from the origin to the circuits below it,
which may then stay smaller. Each feed is tried one, two and three sizes up; the sizes below are read again from the
same tables, and the change that saves the most material (or cost, with prices) is kept and checked again. Nothing
here re-implements a check: every figure of the answer comes from the last check of the whole tree.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Callable, Mapping
from dataclasses import dataclass
from typing import Any

from service.electrical.cables import capacity as cap
from service.electrical.cables import design_search as search
from service.electrical.cables.design_search import Slot, Unknown, share_drop
from service.electrical.cables.sizing import REQUIREMENT_CHECKS, cpc_for, rating_for
from service.electrical.devices import catalogue
from service.electrical.errors import InvalidInput, NoRule
from service.electrical.inputs import Circuit, Installation
from service.electrical.network import boards as bv
from service.electrical.network.installation import InstallationResult, check_installation
from service.electrical.network.tree import tree_of
from service.electrical.results.circuit_result import CircuitResult
from service.electrical.rules import requirements

MAX_ROUNDS = 12


def _sizes(circuit: Circuit, unknown: Unknown, path: tuple) -> list[tuple[float, float]]:
    """The (line, cpc) sizes a circuit may take: the family's tabulated sizes for its method, each with the cpc the
    family gives (or the one stated), smallest first; the stated size alone where it is not left out."""
    c = circuit.conductors
    if not unknown.line and not unknown.cpc:
        return [(c.line_csa_mm2, c.cpc_csa_mm2)]
    run = circuit.installation
    if run is None:
        raise InvalidInput(path + ("installation",), "give how the cable is run (cable and method) to size it")
    lines = [row.csa_mm2 for row in cap.capacities(run.cable, run.installation_method, circuit.phases)]
    if not unknown.line:
        lines = [c.line_csa_mm2]
    out = []
    for line in lines:
        try:
            out.append((line, cpc_for(run.cable, line) if unknown.cpc else c.cpc_csa_mm2))
        except NoRule:
            continue
    return out


def _ratings(circuit: Circuit, unknown: Unknown, ib: float | None, path: tuple) -> list[float]:
    if not unknown.rating:
        return [circuit.device.rating_a]
    if ib is None:
        raise InvalidInput(path + ("design_current_a",), "give the design current to choose the device's rating")
    ring = circuit.conductors is not None and circuit.conductors.ring
    first = rating_for(circuit.device, ib, ring)
    return [r for r in catalogue.ratings_for(circuit.device.standard) if r >= first - 1e-9]


def slots_of(inst: Installation, unknowns: Mapping[tuple[int, int], Unknown]) -> dict[tuple[int, int], Slot]:
    """Each circuit's slot, by board and circuit position (a feed's design current is its board's demand)."""
    tree = tree_of(inst)
    _, feed_current = bv.demands(inst, tree)
    slots = {}
    for (b, c), unknown in unknowns.items():
        circuit = inst.boards[b].circuits[c]
        path = ("boards", b, "circuits", c)
        ib = feed_current.get((b, c), (circuit.design_current_a, None))[0]
        sizes = _sizes(circuit, unknown, path)
        if not sizes:
            raise InvalidInput(path + ("installation", "cable"), "no size of this cable family has a cpc to give it")
        slots[(b, c)] = Slot(b, c, unknown, _ratings(circuit, unknown, ib, path), sizes)
    return slots


def completed(inst: Installation, slots: Mapping[tuple[int, int], Slot]) -> Installation:
    """The installation with each slot's current choice in place (only the circuits whose choice changed since the
    installation given are made again)."""
    boards = list(inst.boards)
    changed: dict[int, list] = {}
    for (b, c), slot in slots.items():
        circuit = boards[b].circuits[c]
        line, cpc = slot.size
        same = circuit.device.rating_a == slot.rating and circuit.conductors.line_csa_mm2 == line
        if same and circuit.conductors.cpc_csa_mm2 == cpc:
            continue
        circuits = changed.setdefault(b, list(boards[b].circuits))
        conductors = dataclasses.replace(circuit.conductors, line_csa_mm2=line, cpc_csa_mm2=cpc)
        device = dataclasses.replace(circuit.device, rating_a=slot.rating)
        circuits[c] = dataclasses.replace(circuit, device=device, conductors=conductors)
    for b, circuits in changed.items():
        boards[b] = dataclasses.replace(boards[b], circuits=tuple(circuits))
    return dataclasses.replace(inst, boards=tuple(boards)) if changed else inst


def _start(inst: Installation, slots: Mapping[tuple[int, int], Slot]) -> None:
    """Each slot's first size: the smallest whose tabulated It, derated for its run, reaches its rating (BS 7671
    433.1.1, Appendix 4), before anything is checked; the check then judges it like any other."""
    for (b, c), slot in slots.items():
        circuit = inst.boards[b].circuits[c]
        run = circuit.installation
        if run is None or not slot.unknown.line or run.capacity_a is not None:
            continue
        insulation = cap.cable_table(run.cable)["insulation"]
        product, _ = cap.derating(run, insulation, circuit.device.standard, 0.0)
        tabulated = search.tabulated_it(circuit)
        parallel = circuit.conductors.parallel_cables
        for k, (line, _) in enumerate(slot.sizes):
            if tabulated.get(line, 0.0) * product * parallel >= slot.rating - 1e-9:
                slot.s = k
                break


def outcomes_of(result: InstallationResult, inst: Installation) -> dict[tuple[int, int], Any]:
    """Each circuit's result (or failure) by board and circuit position in the body."""
    position = {board.id: b for b, board in enumerate(inst.boards)}
    return {(position[board.id], c): item for board in result.boards for c, item in enumerate(board.circuits)}


@dataclass
class Design:
    """What the design chose: the completed installation, its check, each slot, and what was traded or said."""

    installation: Installation
    result: InstallationResult
    slots: dict[tuple[int, int], Slot]
    devices_added: dict[tuple[int, int], list[str]]
    traded: list[str]
    feasible: bool


def _required_devices(inst: Installation, outcomes: Mapping) -> tuple[Installation, dict]:
    """Each circuit given the device the rules beyond the calculations call for (a 30 mA RCD of the right type, an
    AFDD), and what was said of it (:func:`requirements.required_device`)."""
    said: dict[tuple[int, int], list[str]] = {}
    boards = [list(board.circuits) for board in inst.boards]
    for (b, c), outcome in outcomes.items():
        if not isinstance(outcome, CircuitResult):
            continue
        circuit = boards[b][c]
        checks = [check for check in outcome.checks if check.check in REQUIREMENT_CHECKS]
        device, words = requirements.required_device(circuit.device, checks, circuit.equipment, circuit.ev)
        if words:
            boards[b][c], said[(b, c)] = dataclasses.replace(circuit, device=device), words
    new = tuple(dataclasses.replace(board, circuits=tuple(boards[b])) for b, board in enumerate(inst.boards))
    return dataclasses.replace(inst, boards=new), said


def _feeds(inst: Installation) -> dict[int, tuple[int, int]]:
    """The circuit feeding each board below the origin, by the board's position."""
    ids = {board.id: b for b, board in enumerate(inst.boards)}
    return {
        ids[circuit.feeds_board]: (b, c)
        for b, board in enumerate(inst.boards)
        for c, circuit in enumerate(board.circuits)
        if isinstance(circuit, Circuit) and circuit.feeds_board in ids
    }


def _round(inst: Installation, slots: dict, feeds: dict, outcomes: Mapping) -> bool:
    """One round: every failing circuit moves up, or moves its board's feed up. Whether anything moved."""
    moved, feed_moved = False, set()
    for (b, c), outcome in search.failing(outcomes):
        slot, circuit = slots.get((b, c)), inst.boards[b].circuits[c]
        if slot is not None and search.move_up(slot, outcome, circuit):
            moved = True
            continue
        feed = slots.get(feeds.get(b))
        if feed is None or feeds[b] in feed_moved:
            continue
        if search.selectivity_fails(outcome):
            moved |= search.rating_up(feed, "selectivity")
        elif feed.s + 1 < len(feed.sizes) and (feed.unknown.line or feed.unknown.cpc):
            rule = search.blocking(outcome)[0] or "the circuits below"
            feed.ruled_out.append({"rating_a": feed.rating, "line_csa_mm2": feed.size[0], "cpc_csa_mm2": feed.size[1],
                                   "check": f"{rule} of {circuit.id or 'a circuit'} on board {inst.boards[b].id}",
                                   "value": None, "limit": None, "unit": None, "judged": "checked"})  # fmt: skip
            feed.s += 1
            moved = True
        feed_moved.add(feeds[b])
    return moved


def design_installation(
    inst: Installation,
    unknowns: Mapping[tuple[int, int], Unknown],
    cost: Callable[[Circuit, float, float], float] | None = None,
    scope: Any = None,
    progress: Callable[[int], None] | None = None,
) -> Design:
    """Choose every left-out rating and size (see the module's text). ``cost(circuit, line, cpc)`` prices a run;
    without it the material (mm2 x m) is kept least. The installation check judges every round (``progress`` is
    told as it goes)."""
    slots = slots_of(inst, unknowns)
    _start(inst, slots)
    feeds = _feeds(inst)
    added: dict[tuple[int, int], list[str]] = {}
    trades: list[dict[str, Any]] = []
    rounds, shared, current, before = 0, False, inst, {}
    while rounds < MAX_ROUNDS:
        rounds += 1
        current = completed(current, slots)
        result = check_installation(current, scope, progress=progress, chunk=None)
        outcomes = outcomes_of(result, current)
        if rounds == 1:  # the devices the rules call for, from the first check: then checked with the sizes
            current, added = _required_devices(current, outcomes)
        if before and search.kept_worse(slots, trades, before, outcomes):
            before = {}  # a trade's smaller circuit shows less than it did: the trade is undone and checked again
            continue
        if not search.failing(outcomes) and not (rounds == 1 and added):
            if shared:
                break
            shared = True  # once feasible, share the drop; then check again
            before = {key: search.standing(outcomes.get(key)) for key in slots}
            trades = share_drop(current, slots, feeds, outcomes, cost or search.material_mm2_m)
            if not trades:
                break
            continue
        if not _round(current, slots, feeds, outcomes) and not (rounds == 1 and added):
            break
    feasible = not search.failing(outcomes)
    for slot in slots.values():  # a size the drop's sharing let a circuit keep is no longer ruled out
        slot.ruled_out = [
            r for r in slot.ruled_out if not (r["rating_a"] == slot.rating and r["line_csa_mm2"] >= slot.size[0])
        ]
    return Design(current, result, slots, added, [trade["said"] for trade in trades], feasible)


# what would let a circuit pass where no size or rating the design may choose does, by the rule it fails
WOULD = {
    "capacity": "another installation method (a cooler route, less grouping) or cables in parallel",
    "voltage-drop": "a shorter run, a larger cable upstream (give the sub-main's size to the design), or a drop "
    "limit agreed for this use",
    "disconnection-time": "an RCD, a shorter run, or a lower Ze at the origin (a larger supply)",
    "max-zs": "an RCD, a shorter run, or a lower Ze at the origin (a larger supply)",
    "rcd": "an RCD of lower IΔn, or a lower earth electrode resistance",
    "short-circuit": "a device that lets through less energy (a lower rating, or a better energy-limiting class)",
    "protective-conductor": "a larger cpc (a separate one) or a device that lets through less energy",
    "breaking-capacity": "a device of higher breaking capacity, or a board with a conditional rating",
    "selectivity": "a larger upstream device, or the maker's selectivity table",
}


def failures(design: Design) -> list[dict[str, Any]]:
    """Where no design passes: each circuit that still fails, the check and its figures, and what would pass."""
    out = []
    for (b, _), outcome in search.failing(outcomes_of(design.result, design.installation)):
        rule, value, limit, unit = search.blocking(outcome)
        if rule is None:
            failed = next((x for x in outcome.checks if x.verdict == outcome.verdict), None)
            rule, value, limit, unit = (
                (failed.check, failed.value, failed.limit, failed.unit) if failed else (None,) * 4
            )
        out.append({
            "board": design.installation.boards[b].id, "id": outcome.id, "check": rule, "value": value,
            "limit": limit, "unit": unit, "would": WOULD.get(rule, "a change to this circuit's design: see its checks"),
        })  # fmt: skip
    return out
