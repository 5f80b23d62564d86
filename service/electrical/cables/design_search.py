"""The rounds of an installation's design (:mod:`service.electrical.cables.design`): each circuit that fails a rule
a larger size or rating can meet moves up, straight to the size the check's own figures call for where they say."""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field
from typing import Any

from service.electrical.cables import capacity as cap
from service.electrical.cables.sizing import RULE_CHECKS, RULED_OUT_ORDER, ruled_out_by
from service.electrical.inputs import Circuit
from service.electrical.network.tree import tree_of
from service.electrical.results.circuit_result import CircuitResult
from service.electrical.results.verdicts import Verdict


@dataclass(frozen=True)
class Unknown:
    """What a circuit leaves to the design."""

    rating: bool = False
    line: bool = False
    cpc: bool = False


@dataclass
class Slot:
    """One circuit of the tree with something to choose: its candidates, smallest first, and where it stands."""

    board: int
    index: int
    unknown: Unknown
    ratings: list[float]
    sizes: list[tuple[float, float]]  # (line, cpc) in mm2
    r: int = 0
    s: int = 0
    floor: int = 0  # the smallest size index a rule other than the voltage drop allows
    ruled_out: list[dict[str, Any]] = field(default_factory=list)  # each candidate passed over, with its rule
    said: list[str] = field(default_factory=list)

    @property
    def rating(self) -> float:
        return self.ratings[self.r]

    @property
    def size(self) -> tuple[float, float]:
        return self.sizes[self.s]


TRIED_SIZES_UP = 3  # how far up a feed is tried when the drop is shared
MATERIAL_CORES = {1: 2, 3: 4}  # live conductors a circuit's cable carries: L and N, or three lines and N


def mv_per_a_m(circuit: Circuit, line_csa_mm2: float) -> float | None:
    """The cable's tabulated mV/A/m at a size (BS 7671 Appendix 4 tables), None where the request gives its own."""
    run = circuit.installation
    if run is None or run.voltage_drop_mv_per_a_m is not None:
        return None
    value, _ = cap.voltage_drop_mv_per_a_m(
        run.cable, line_csa_mm2, circuit.phases, run.reactance_mohm_per_m, run.installation_method
    )
    return float(value)


def tabulated_it(circuit: Circuit) -> dict[float, float]:
    """It by line size for the circuit's cable family, method and phases (BS 7671 Appendix 4 tables), A."""
    run = circuit.installation
    return {row.csa_mm2: row.it_a for row in cap.capacities(run.cable, run.installation_method, circuit.phases)}


def _capacity_index(slot: Slot, outcome: CircuitResult, circuit: Circuit) -> int | None:
    """The smallest larger size whose tabulated It, derated as this run derates it, reaches what the overload check
    asked (In, or the ring rule's Iz): the check's own Iz / It gives the derating."""
    o, check = outcome.overload, outcome.check("overload")
    if o["it_a"] in (None, 0) or o["iz_a"] is None or check is None or check.value is None:
        return None
    needed_it = check.value / (o["iz_a"] / o["it_a"])  # Iz >= In (or the ring rule's Iz), It x the derating
    tabulated = tabulated_it(circuit)
    for k in range(slot.s + 1, len(slot.sizes)):
        if tabulated.get(slot.sizes[k][0], 0.0) >= needed_it - 1e-9:
            return k
    return None


def drop_index(slot: Slot, circuit: Circuit, circuit_percent: float, allowed_percent: float) -> int | None:
    """The smallest size from the slot's floor whose own drop fits in what the limit leaves: the drop scales with
    the table's mV/A/m (Ib and the length are the circuit's)."""
    now = mv_per_a_m(circuit, slot.size[0])
    if now is None or circuit_percent <= 0 or allowed_percent <= 0:
        return None
    for k in range(slot.floor, len(slot.sizes)):
        if circuit_percent * mv_per_a_m(circuit, slot.sizes[k][0]) / now <= allowed_percent + 1e-9:
            return k
    return None


def _next_index(slot: Slot, rule: str, outcome: CircuitResult, circuit: Circuit) -> int | None:
    if rule == "capacity":
        found = _capacity_index(slot, outcome, circuit)
    elif rule == "voltage-drop":
        vd = outcome.voltage_drop
        allowed = vd["limit_percent"] - vd["upstream_percent"]
        found = drop_index(slot, circuit, vd["circuit_percent"], allowed)
    else:
        found = None
    if found is not None and found > slot.s:
        return found
    return slot.s + 1 if slot.s + 1 < len(slot.sizes) else None


def _passed_over(slot: Slot, rule: str, value: Any, limit: Any, unit: Any, upto: int) -> None:
    """Each size passed over, with the rule that ruled it out and the figures of the one the check judged."""
    for k in range(slot.s, upto):
        line, cpc = slot.sizes[k]
        judged = k == slot.s
        slot.ruled_out.append({
            "rating_a": slot.rating, "line_csa_mm2": line, "cpc_csa_mm2": cpc, "check": rule,
            "value": value if judged else None, "limit": limit if judged else None, "unit": unit,
            "judged": "checked" if judged else "passed over: a smaller size than one the check's figures rule out",
        })  # fmt: skip


def blocking(outcome: CircuitResult) -> tuple[str | None, Any, Any, Any]:
    """The first rule a size or a rating can meet that the circuit fails, in the order sizing tries them, with its
    figures; a check that is only not-verified (a fact not stated, data that cannot show it) moves nothing."""
    return ruled_out_by(outcome, lenient=frozenset(RULED_OUT_ORDER))


def move_up(slot: Slot, outcome: CircuitResult, circuit: Circuit) -> str | None:
    """The slot's next size for the rule its circuit fails, or None where its sizes cannot help (none left, or not
    the design's to choose). Returns the rule."""
    rule, value, limit, unit = blocking(outcome)
    if rule is None or not (slot.unknown.line or slot.unknown.cpc):
        return None
    k = _next_index(slot, rule, outcome, circuit)
    if k is None:
        return None
    _passed_over(slot, rule, value, limit, unit, k)
    slot.s = k
    if rule != "voltage-drop":
        slot.floor = max(slot.floor, k)
    return rule


def rating_up(slot: Slot, why: str) -> bool:
    """The slot's next standard rating (selectivity with the devices below, or a load above the first one)."""
    if not slot.unknown.rating or slot.r + 1 >= len(slot.ratings):
        return False
    slot.ruled_out.append({"rating_a": slot.rating, "line_csa_mm2": slot.size[0], "cpc_csa_mm2": slot.size[1],
                           "check": why, "value": None, "limit": None, "unit": None, "judged": "checked"})  # fmt: skip
    slot.r += 1
    return True


def failing(outcomes: Mapping[tuple[int, int], Any]) -> list[tuple[tuple[int, int], CircuitResult]]:
    """The circuits that fail a check, or whose required selectivity is not shown, in the tree's order (any other
    not-verified check is not the design's to mend: the fact it names is)."""
    return [
        (k, o)
        for k, o in outcomes.items()
        if isinstance(o, CircuitResult) and (o.verdict == Verdict.FAIL or selectivity_fails(o))
    ]


def selectivity_fails(outcome: CircuitResult) -> bool:
    """Selectivity the board requires and the data do not show (it fails, or it cannot be shown: a larger device
    above may show it)."""
    check = outcome.check("selectivity")
    return check is not None and check.verdict != Verdict.PASS and check.check in outcome.verdict_scope["covered"]


def material_mm2_m(circuit: Circuit, line: float, cpc: float) -> float:
    """Copper (or aluminium) in the run, mm2 x m: the live conductors and the cpc over the length (a ring's whole
    length, cables in parallel each), the measure the design keeps least where no prices are given."""
    c = circuit.conductors
    cores = MATERIAL_CORES.get(circuit.phases, 2)
    return (cores * line + cpc) * c.length_m * c.parallel_cables


def _subtree(tree: Any, board: int) -> set[int]:
    out, todo = set(), [board]
    while todo:
        b = todo.pop()
        out.add(b)
        todo += tree.children(b)
    return out


def _gain_of(feed: Slot, circuit: Circuit, own_percent: float, k: int) -> float:
    """How much of the drop from the origin a feed at size ``k`` frees for everything below it, %."""
    now, then = mv_per_a_m(circuit, feed.size[0]), mv_per_a_m(circuit, feed.sizes[k][0])
    return own_percent * (1 - then / now) if now and then else 0.0


def _shrunk(under: list, outcomes: Mapping, circuits: Mapping, gain: float) -> dict:
    """The size each circuit below could take with ``gain`` more of the drop left to it (only smaller ones)."""
    out = {}
    for key, slot in under:
        vd = outcomes[key].voltage_drop
        allowed = vd["limit_percent"] - vd["upstream_percent"] + gain
        k = drop_index(slot, circuits[key], vd["circuit_percent"], allowed)
        if k is not None and k < slot.s:
            out[key] = k
    return out


def share_drop(inst: Any, slots: dict, feeds: dict, outcomes: Mapping, cost: Any) -> list[dict[str, Any]]:
    """Each feed tried up to three sizes up, top-down: the circuits below it whose size the voltage drop set may
    then stay smaller; the change that saves the most is kept. Returns each trade: the feed, the size it had, the
    sizes the circuits below had, and what was traded, in words."""
    tree, said = tree_of(inst), []
    circuits = {key: inst.boards[key[0]].circuits[key[1]] for key in slots}
    for b in tree.order:
        feed = slots.get(feeds.get(b))
        outcome = outcomes.get(feeds.get(b))
        if feed is None or not feed.unknown.line or not isinstance(outcome, CircuitResult):
            continue
        below = _subtree(tree, b)
        under = [(k, s) for k, s in slots.items() if s.board in below and s.unknown.line and s.s > s.floor
                 and isinstance(outcomes.get(k), CircuitResult)]  # fmt: skip
        fc = circuits[feeds[b]]
        base = cost(fc, *feed.size) + sum(cost(circuits[k], *s.size) for k, s in under)
        best = (1e-9, None, {})
        for k in range(feed.s + 1, min(feed.s + 1 + TRIED_SIZES_UP, len(feed.sizes))):
            new = _shrunk(under, outcomes, circuits, _gain_of(feed, fc, outcome.voltage_drop["circuit_percent"], k))
            total = cost(fc, *feed.sizes[k]) + sum(cost(circuits[q], *s.sizes[new.get(q, s.s)]) for q, s in under)
            if base - total > best[0]:
                best = (base - total, k, new)
        if best[1] is not None:
            trade = {"feed": feeds[b], "was": feed.s, "shrunk": {key: slots[key].s for key in best[2]}}
            trade["said"] = _traded(inst, b, feed.size[0], feed.sizes[best[1]][0], best, fc)
            feed.s = best[1]
            for key, k in best[2].items():
                slots[key].s = k
            said.append(trade)
    return said


def _traded(inst: Any, b: int, old: float, line: float, best: tuple, circuit: Circuit) -> str:
    saving, _, new = best
    return (
        f"Board {inst.boards[b].id}: its feed {circuit.id or ''} at {line:g} mm2 instead of {old:g} mm2 leaves "
        f"more of the voltage drop to the circuits below, and {len(new)} of them "
        f"{'stays' if len(new) == 1 else 'stay'} smaller: {saving:,.0f} less in all"
    )


CABLE_CHECKS = tuple(RULE_CHECKS.get(name, name) for name in RULED_OUT_ORDER)
RANK = {Verdict.PASS: 0, Verdict.NOT_VERIFIED: 1, Verdict.FAIL: 2}


def standing(outcome: Any) -> dict[str, int]:
    """How each check a size answers for stands (0 pass, 1 not-verified, 2 fail)."""
    if not isinstance(outcome, CircuitResult):
        return {}
    return {c.check: RANK[c.verdict] for c in outcome.checks if c.check in CABLE_CHECKS}


def kept_worse(slots: dict, trades: list[dict[str, Any]], before: dict, outcomes: Mapping) -> bool:
    """After the drop was shared: a trade whose smaller circuits now stand worse than they did (a cpc that passed is
    not-verified at the smaller size, say) is undone, the feed and the circuits below back to their sizes, and
    dropped from ``trades``. Whether any was undone."""
    undone = [
        trade
        for trade in trades
        if any(
            any(standing(outcomes.get(key)).get(name, 0) > rank for name, rank in before.get(key, {}).items())
            for key in trade["shrunk"]
        )
    ]
    for trade in undone:
        slots[trade["feed"]].s = trade["was"]
        for key, size in trade["shrunk"].items():
            slots[key].s = size
        trades.remove(trade)
    return bool(undone)
