"""The check of a whole installation: the origin, the boards fed from it and every circuit of every board.

One walk of the tree (:mod:`service.electrical.network.tree`): the demand of each board bottom-up, then each
board's loops, fault currents and voltage drop top-down from the origin (:mod:`service.electrical.network.boards`),
then every circuit of every board through the check pipeline as one set of arrays, each with the values of
its board, the device feeding its board (selectivity, 536.4) and the board's conditional rating. The feeds
run through the pipeline once more beforehand, on their own, for what they add to the loops below them.

A bad tree raises :class:`~service.electrical.errors.InvalidInput` naming the field. A circuit the core
cannot compute becomes a failure in its board's list; the boards below a feed that could not be computed are
reported, with their circuits, as not checked, naming that feed.
"""

from __future__ import annotations

import dataclasses
import math
from collections import Counter
from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from typing import Any

from service.electrical.checks import installation_rules as rules
from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.errors import InvalidInput
from service.electrical.inputs import Circuit, Installation, Supply, Unread
from service.electrical.network import boards as bv
from service.electrical.network.tree import Tree, tree_of
from service.electrical.pipeline import check_circuits, checked_run
from service.electrical.results import precision, verdicts
from service.electrical.results.circuit_result import GENERAL_CAUTIONS, Check, CircuitResult
from service.electrical.results.verdicts import Verdict
from service.electrical.rules import requirements

RATING_BASIS = (
    "BS 7671:2018 536.4.203, BS EN 61439-3: the board's conditional short-circuit rating with its upstream device "
    "at least the largest fault at the board"
)
COMBINED = (
    "Ze and the line-neutral loop: the origin's plus each feed's R1+R2 and R1+Rn hot, moduli added (for the smallest "
    "currents, Cmin 0.95); the largest currents: cmax, the feeds' resistances at 20 degC and reactances summed from "
    "the origin and added to the supply's impedance {how} (IEC 60909-0 method; BS 7671:2018 411.4.4, 434.1)"
)
HOW = {
    "angle": "at the least modulus any supply angle from 0 to 90 degrees allows (supply.x_over_r not given)",
    "x-over-r": "as complex numbers, with the supply's X/R as given",
}
FEED_UNREAD = "the feed could not be read: see its problem"
FEED_NEEDS_CONDUCTORS = "a circuit that feeds a board needs its conductors: the loops below it follow from them"


@dataclass
class BoardResult:
    """One board: where it sits, what it sees, what it draws, its rating check and its circuits' results."""

    id: str
    fed_from: str | None
    fed_by: str | None
    level: int
    phases: int
    ze_ohm: float | None  # the figures are None where the board could not be reached (its feed failed)
    line_neutral_loop_ohm: float | None
    max_fault_current_ka: float | None
    max_earth_fault_current_ka: float | None
    max_line_neutral_fault_current_ka: float | None
    three_phase_fault_current_ka: float | None
    min_earth_fault_current_a: float | None
    min_line_neutral_fault_current_a: float | None
    voltage_drop_percent: float | None
    impedance_basis: str
    demand: dict[str, Any]
    rating: dict[str, Any] | None
    circuits: list[CircuitResult | CircuitFailure | Unread]  # Unread: what the caller could not read, in place
    verdict: Verdict
    not_checked: str | None = None
    cautions: list[str] = field(default_factory=list)
    checks: list[Check] = field(default_factory=list)  # the board's own: demand, rcd-selectivity


FIGURES = tuple(f.name for f in dataclasses.fields(BoardResult) if f.name.endswith(("_ohm", "_ka", "_a", "_percent")))


@dataclass
class InstallationResult:
    id: str | None
    verdict: Verdict
    boards: list[BoardResult]
    summary: dict[str, int]
    cautions: list[str]
    edition: str
    checks: list[Check]  # the installation's own: surge-protection


def _label(inst: Installation, b: int, c: int) -> str:
    circuit = inst.boards[b].circuits[c]
    return circuit.id or f"{inst.boards[b].id} circuit {c + 1}"


def _check_diversity(inst: Installation) -> None:
    """Diversity factors are shares of the demand: above 0 and at most 1."""
    for b, board in enumerate(inst.boards):
        if not 0 < board.diversity <= 1:
            raise InvalidInput(("boards", b, "diversity"), "a diversity factor is above 0 and at most 1")
        for c, circuit in enumerate(board.circuits):
            diversity = getattr(circuit, "diversity", None)
            if diversity is not None and not 0 < diversity <= 1:
                raise InvalidInput(
                    ("boards", b, "circuits", c, "diversity"), "a diversity factor is above 0 and at most 1"
                )


def _upstream(inst: Installation, tree: Tree, b: int) -> tuple[Any, str | None]:
    """The device feeding board ``b`` and its id: the origin board's own device, or the feed's."""
    board = inst.boards[b]
    if tree.feed[b] is None:
        return board.device, board.device_id or (None if board.device is None else f"{board.id} incoming device")
    pb, pc = tree.feed[b]  # type: ignore[misc]
    return getattr(inst.boards[pb].circuits[pc], "device", None), _label(inst, pb, pc)


def _as_checked(inst: Installation, feed_current: dict) -> list[list[Circuit | Unread]]:
    """Each board's circuits as the pipeline checks them: a feed with the design current of the board below."""
    out = [list(board.circuits) for board in inst.boards]
    for (b, c), (current, _) in feed_current.items():
        if not isinstance(out[b][c], Unread):
            out[b][c] = dataclasses.replace(out[b][c], design_current_a=current)  # type: ignore[arg-type]
    return out


def _at_board(inst: Installation, tree: Tree, b: int, supply: Supply) -> Supply:
    """The supply of board ``b``'s circuits with what the board adds: the device feeding it, its requirements."""
    board = inst.boards[b]
    device, device_id = _upstream(inst, tree, b)
    return dataclasses.replace(
        supply,
        upstream_device=device,
        upstream_id=device_id,
        selectivity_required=board.selectivity_required,
        conditional_short_circuit_ka=board.conditional_short_circuit_ka,
    )


def _feed_loops(
    inst: Installation, tree: Tree, circuits: list[list[Circuit]]
) -> tuple[dict[int, bv.FeedLoop], dict[int, str]]:
    """What each feed adds below it, by the board it feeds; why, for the feeds that cannot be computed."""
    fed = [b for b in tree.order if tree.feed[b] is not None]
    loops: dict[int, bv.FeedLoop] = {}
    failed: dict[int, str] = {}
    supplies, items, boards_fed = [], [], []
    for child in fed:
        pb, pc = tree.feed[child]  # type: ignore[misc]
        circuit = circuits[pb][pc]
        if isinstance(circuit, Unread):
            failed[child] = FEED_UNREAD
            continue
        if circuit.conductors is None:
            failed[child] = FEED_NEEDS_CONDUCTORS
            continue
        supplies.append(dataclasses.replace(inst.supply, phases=tree.phases[pb]))
        items.append(circuit)
        boards_fed.append(child)
    good, failures, checked = checked_run(supplies, items)
    for failure in failures:
        failed[boards_fed[failure.index]] = f"{failure.field}: {failure.message}"
    if checked is not None:
        for j, i in enumerate(good):
            loops[boards_fed[i]] = _feed_loop(checked, j)
    return loops, failed


def _feed_loop(checked: Any, j: int) -> bv.FeedLoop:
    c, circuit = checked.cols.conductors, checked.cols.circuits[j]
    share = (0.25 if c.ring[j] else 1.0) * c.length_m[j] / 1000.0 / c.parallel[j]
    run = circuit.installation
    x = math.nan if run is None or run.reactance_mohm_per_m is None else 2 * run.reactance_mohm_per_m * share
    drop = next(k for k in checked.checks if k.check == "voltage-drop").detail[1]["circuit_percent"][j]
    return bv.FeedLoop(
        r1r2_hot=float(checked.loop.r1r2_ohm[j]),
        r1rn_hot=float(c.r1[j] + c.rn[j]),
        r1r2_20=float((c.line_r20[j] + c.cpc_r20[j]) * share),
        r1rn_20=float((c.line_r20[j] + c.neutral_r20[j]) * share),
        r1_20=float(c.line_r20[j] * share),
        x_loop=x,
        three_phase=circuit.phases == 3,
        drop_percent=float(drop),
        large_without_reactance=math.isnan(x) and c.line_csa[j] > 35,
    )


def _walk(inst: Installation, tree: Tree, loops: dict[int, bv.FeedLoop], failed: dict[int, str]):
    """Each board's values and supply top-down; why, for the boards that cannot be reached."""
    values: dict[int, bv.BoardFaults] = {tree.origin: bv.origin_faults(inst.supply)}
    supplies: dict[int, Supply] = {tree.origin: _at_board(inst, tree, tree.origin, inst.supply)}
    unreachable: dict[int, str] = {}
    for b in tree.order[1:]:
        parent, (pb, pc) = tree.parent[b], tree.feed[b]  # type: ignore[misc]
        if parent in unreachable:
            unreachable[b] = f"not checked: board {inst.boards[parent].id!r} above it could not be checked"
        elif b in failed:
            unreachable[b] = f"not checked: its feed {_label(inst, pb, pc)!r} could not be computed ({failed[b]})"
        else:
            values[b] = bv.below(values[parent], loops[b])
            extra = (bv.CAUTIONS["no-reactance"],) if loops[b].large_without_reactance else ()
            below = bv.board_supply(inst.supply, inst.boards[b], values[b], tree.phases[b], extra)
            supplies[b] = _at_board(inst, tree, b, below)
    return values, supplies, unreachable


def _run(
    circuits: list[list[Circuit]],
    supplies: dict[int, Supply],
    unreachable: dict[int, str],
    scope,
    exact,
    progress,
    chunk,
) -> list[list[CircuitResult | CircuitFailure]]:
    """Every circuit of every reachable board through the pipeline as one set of arrays (``chunk`` circuits a run
    where ``progress`` wants to hear of them), in board order."""
    where = [(b, c) for b in sorted(supplies) for c, item in enumerate(circuits[b]) if not isinstance(item, Unread)]
    step = chunk if progress and chunk else max(len(where), 1)
    done: list[Any] = []
    for start in range(0, len(where), step):
        part = where[start : start + step]
        done += check_circuits([supplies[b] for b, _ in part], [circuits[b][c] for b, c in part], scope, exact)
        if progress:
            progress(len(done))
    out: list[list[Any]] = [list(board) for board in circuits]  # Unread items stay, for the caller to report
    for b, reason in unreachable.items():
        for c, item in enumerate(circuits[b]):
            if not isinstance(item, Unread):
                out[b][c] = CircuitFailure(c, item.id, ("circuit",), reason)
    for (b, c), result in zip(where, done, strict=True):
        out[b][c] = dataclasses.replace(result, index=c) if isinstance(result, CircuitFailure) else result
    return out


def check_installation(
    inst: Installation,
    scope: Sequence[str] | None = None,
    exact: bool = False,
    progress: Callable[[int], None] | None = None,
    chunk: int | None = None,
) -> InstallationResult:
    """Check every board and circuit of ``inst`` (see the module's text); ``scope`` and ``exact`` as for circuits;
    ``progress`` is told how many circuits are done, ``chunk`` circuits at a time (all at once where not given)."""
    tree = tree_of(inst)
    _check_diversity(inst)
    demand, feed_current = bv.demands(inst, tree)
    circuits = _as_checked(inst, feed_current)
    loops, failed = _feed_loops(inst, tree, circuits)
    values, supplies, unreachable = _walk(inst, tree, loops, failed)
    results = _run(circuits, supplies, unreachable, scope, exact, progress, chunk)
    for (b, c), (_, note) in feed_current.items():
        if note and isinstance(results[b][c], CircuitResult):
            results[b][c].cautions.append(note)
    out = [
        _board_result(inst, tree, b, values.get(b), demand[b], results[b], unreachable.get(b), exact)
        for b in tree.order
    ]
    edition = rules.edition_of(inst)
    own = [rules.surge_protection_check(inst.surge_protection, edition)]
    return InstallationResult(
        id=inst.id,
        verdict=verdicts.overall([board.verdict for board in out] + [c.verdict for c in own]),
        boards=out,
        summary=_summary(out),
        cautions=list(GENERAL_CAUTIONS) + [requirements.edition_caution(edition)],
        edition=edition,
        checks=own,
    )


def _figures(values: bv.BoardFaults | None, exact: bool) -> dict[str, Any]:
    """The board's figures under the names of its result (None each where it could not be reached)."""

    def known(x: float) -> float | None:
        return None if math.isnan(x) or math.isinf(x) else x

    if values is None:
        return {name: None for name in FIGURES} | {"impedance_basis": COMBINED.format(how=HOW["angle"])}
    figures = {
        "ze_ohm": known(values.ze_ohm),
        "line_neutral_loop_ohm": known(values.zpn_ohm),
        "max_fault_current_ka": known(values.pfc_a / 1000.0),
        "max_earth_fault_current_ka": known(values.max_earth_fault_a / 1000.0),
        "max_line_neutral_fault_current_ka": known(values.max_line_neutral_a / 1000.0),
        "three_phase_fault_current_ka": known(values.three_phase_a / 1000.0),
        "min_earth_fault_current_a": known(values.min_earth_fault_a),
        "min_line_neutral_fault_current_a": known(values.min_line_neutral_a),
        "voltage_drop_percent": known(values.voltage_drop_percent),
        "impedance_basis": COMBINED.format(how=HOW["angle" if values.x_over_r is None else "x-over-r"]),
    }
    return figures if exact else precision.rounded_record(figures)


def _demand_record(demand: bv.Demand, phases: int, exact: bool) -> dict[str, Any]:
    spread, neutral = demand.imbalance()
    per_phase = dict(zip(bv.PHASES, demand.per_phase_a.tolist(), strict=False)) if phases == 3 else None
    record = {
        "design_current_a": None if math.isnan(demand.design_current_a) else demand.design_current_a,
        "phase_current_a": per_phase if demand.complete else None,
        "complete": demand.complete,
        "stated": demand.stated,
        "without_design_current": demand.missing,
        "imbalance_percent": spread,
        "neutral_current_a": neutral,
    }
    return record if exact else precision.rounded_record(record)


def _rating(board, values: bv.BoardFaults | None) -> dict[str, Any] | None:
    """The board's conditional short-circuit rating against the largest fault at it, where a rating is stated."""
    if board.conditional_short_circuit_ka is None:
        return None
    fault_ka = math.nan if values is None else values.pfc_a / 1000.0
    verdict = Verdict.NOT_VERIFIED if math.isnan(fault_ka) else Verdict.PASS
    if verdict is Verdict.PASS and fault_ka > board.conditional_short_circuit_ka * (1 + 1e-9):
        verdict = Verdict.FAIL
    return {
        "conditional_short_circuit_ka": board.conditional_short_circuit_ka,
        "max_fault_current_ka": None if math.isnan(fault_ka) else round(fault_ka, 3),
        "verdict": verdict,
        "basis": RATING_BASIS,
    }


def _board_checks(inst: Installation, tree: Tree, b: int, demand: bv.Demand) -> list[Check]:
    """The board's own checks: its demand against what feeds it, and RCDs in series with the one feeding it."""
    edition, feed = rules.edition_of(inst), _upstream(inst, tree, b)[0]
    origin = tree.feed[b] is None
    out = [
        rules.demand_check(demand.design_current_a, demand.missing, feed, inst.supply.rated_current_a, edition, origin)
    ]
    rcds = rules.rcd_selectivity_check(feed, inst.boards[b].circuits, edition)
    return out + ([rcds] if rcds is not None else [])


def _board_result(inst, tree, b, values, demand, results, not_checked, exact) -> BoardResult:
    board = inst.boards[b]
    rating = _rating(board, values)
    own = _board_checks(inst, tree, b, demand)
    circuit_verdicts = [r.verdict if isinstance(r, CircuitResult) else Verdict.NOT_VERIFIED for r in results]
    circuit_verdicts += [c.verdict for c in own]
    cautions = list(dict.fromkeys(values.cautions if values is not None else ()))
    if demand.unallocated:
        cautions.append(bv.CAUTIONS["unallocated"].format(n=demand.unallocated))
    if not demand.complete and tree.feed[b] is not None:
        cautions.append(bv.CAUTIONS["incomplete"].format(missing=", ".join(demand.missing)))
    return BoardResult(
        id=board.id,
        fed_from=board.fed_from,
        fed_by=None if tree.feed[b] is None else _label(inst, *tree.feed[b]),
        level=tree.depth[b],
        phases=tree.phases[b],
        **_figures(values, exact),
        demand=_demand_record(demand, tree.phases[b], exact),
        rating=rating,
        circuits=results,
        verdict=verdicts.overall(circuit_verdicts + ([rating["verdict"]] if rating else [])),
        not_checked=not_checked,
        cautions=cautions,
        checks=own,
    )


def _summary(out: list[BoardResult]) -> dict[str, int]:
    items = [r for board in out for r in board.circuits]
    counted = [r.verdict for r in items if isinstance(r, CircuitResult)]
    return {"boards": len(out), **verdicts.summary(Counter(counted), len(items))}
