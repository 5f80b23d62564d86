"""What each board of an installation sees: its demand per phase, and its loops and fault currents.

Demand (bottom-up, BS 7671 Appendix 1 leaves diversity to the designer): a board's design current per
phase is the sum of what its circuits draw, each times its own ``diversity``, the whole times the board's
``diversity``; a stated ``design_current_a`` on the board replaces the sum. A three-phase circuit draws on
every phase; a single-phase one on its ``phase``, or, where none is named, on every phase (the safe side for
the feed). A circuit that feeds a board draws its stated Ib (the designer's maximum demand after diversity,
311.1), or, where it states none, that board's demand (a three-phase feed: that board's demand on each phase);
a caution says where the board's sum exceeds the stated Ib. A demand is complete only where every circuit
states its Ib (or the board states its own).

Faults (top-down, IEC 60909-0 method; BS 7671:2018 411.4.4, 434.1): a board's Ze and line-neutral loop are
its parent's plus the feed's R1+R2 and R1+Rn at the temperatures the rules assume, moduli added (an
impedance never underestimated: the smallest fault currents, Cmin, never overestimated). For the largest
currents (cmax) the feeds' resistances at 20 degC and their reactances are summed from the origin and added to
the supply's impedance at the origin (:func:`tightest`): as complex numbers where the supply's X/R is given,
else the least modulus any supply angle from 0 to 90 degrees allows, so the largest currents are never
underestimated and never compounded board by board. A cable reactance given in the feed's installation enters
both. The three-phase loop is the line conductor alone.
"""

from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass, field

import numpy as np

from service.electrical.inputs import Board, Installation, Supply, Unread
from service.electrical.network import faults
from service.electrical.network.tree import Tree

PHASES = ("L1", "L2", "L3")
CAUTIONS = {
    "unallocated": "{n} single-phase circuit(s) name no phase: counted on every phase of the board's demand.",
    "incomplete": "The board's demand is incomplete: {missing} state no design current; the feed's own Ib is used.",
    "below-sum": "The board's summed demand after its stated diversity, {demand:g} A, exceeds the feed's stated design "
    "current {stated:g} A (the designer's maximum demand, 311.1), which its checks use: confirm the diversity.",
    "no-reactance": (
        "The feed's reactance is not given: its loops are resistance only. Above 35 mm2 give "
        "installation.reactance_mohm_per_m (the maker's figure), or the fault currents below it are optimistic."
    ),
}


@dataclass
class Demand:
    """A board's design current per phase (one entry on a single-phase board), and how it is known."""

    per_phase_a: np.ndarray
    complete: bool
    stated: bool
    missing: list[str] = field(default_factory=list)
    unallocated: int = 0

    @property
    def design_current_a(self) -> float:
        return float(self.per_phase_a.max()) if self.complete else math.nan

    def imbalance(self) -> tuple[float | None, float | None]:
        """(largest deviation from the mean phase current over the mean, %; the neutral current, A) on three
        phases, for loads of one power factor and no harmonics (common practice); None on one phase."""
        if len(self.per_phase_a) != 3 or not self.complete:
            return None, None
        i1, i2, i3 = self.per_phase_a.tolist()
        mean = (i1 + i2 + i3) / 3
        spread = float(np.abs(self.per_phase_a - mean).max() / mean * 100) if mean > 0 else 0.0
        neutral = math.sqrt(max(i1 * i1 + i2 * i2 + i3 * i3 - i1 * i2 - i2 * i3 - i3 * i1, 0.0))
        return spread, neutral


def _draw(board_phases: int, circuit_phases: int, phase: str | None, current_a: float) -> tuple[list[float], bool]:
    """What one circuit draws on each phase of its board, and whether it was left without a phase."""
    if board_phases != 3:
        return [current_a], False
    if circuit_phases == 3:
        return [current_a] * 3, False
    if phase in PHASES:
        return [current_a if p == phase else 0.0 for p in PHASES], False
    return [current_a] * 3, True


def _board_demand(b: int, inst: Installation, tree: Tree, out: list, child_of: dict, feed_current: dict) -> Demand:
    """One board's demand, its feeds' currents recorded in ``feed_current`` (the boards below come first)."""
    board, n = inst.boards[b], (3 if tree.phases[b] == 3 else 1)
    total, complete, missing, unallocated = [0.0] * n, True, [], 0
    for c, circuit in enumerate(board.circuits):
        if isinstance(circuit, Unread):
            complete = False
            missing.append(circuit.id or f"circuit {c + 1}")
            continue
        current, fed = circuit.design_current_a, out[child_of[(b, c)]] if (b, c) in child_of else None
        if (b, c) in child_of:
            current, note = _feed_current(current, fed)
            feed_current[(b, c)] = (current, note)
        if current is None or math.isnan(current):
            complete = False
            missing.append(circuit.id or f"circuit {c + 1}")
            continue
        draw, left = _draw(tree.phases[b], circuit.phases, circuit.phase, current)
        if fed is not None and fed.complete and len(fed.per_phase_a) == len(draw) == 3:
            draw = _feed_draw(fed, current)
        share = 1.0 if circuit.diversity is None else circuit.diversity
        total = [t + d * share for t, d in zip(total, draw, strict=True)]
        unallocated += left
    if board.design_current_a is not None:
        return Demand(np.full(n, float(board.design_current_a)), True, True, missing, unallocated)
    return Demand(np.array(total) * board.diversity, complete, False, missing, unallocated)


def demands(
    inst: Installation, tree: Tree
) -> tuple[list[Demand], dict[tuple[int, int], tuple[float | None, str | None]]]:
    """Each board's :class:`Demand`, and each feed's design current with a caution where it changed."""
    out: list[Demand | None] = [None] * len(inst.boards)
    feed_current: dict[tuple[int, int], tuple[float | None, str | None]] = {}
    child_of = {feed: b for b, feed in enumerate(tree.feed) if feed is not None}
    for b in reversed(tree.order):
        out[b] = _board_demand(b, inst, tree, out, child_of, feed_current)
    return out, feed_current  # type: ignore[return-value]


def _feed_draw(fed: Demand, current: float) -> list[float]:
    """A three-phase feed's draw on each phase: the board's phase currents, scaled down to a stated design current
    below their largest (the stated demand wins), or the stated current on every phase where it is larger."""
    largest, phases = fed.design_current_a, fed.per_phase_a.tolist()
    if current > largest:
        return [current] * 3
    return phases if current == largest else [x * current / largest for x in phases]


def _feed_current(stated: float | None, below: Demand | None) -> tuple[float | None, str | None]:
    """The feed's design current: as stated (the designer's maximum demand after diversity, 311.1), else the
    board's summed demand; a caution where the sum exceeds what was stated."""
    if below is None or not below.complete:
        return stated, None
    demand = below.design_current_a
    if stated is None:
        return demand, None
    if demand > stated * (1 + 1e-9):
        return stated, CAUTIONS["below-sum"].format(stated=round(stated, 1), demand=round(demand, 1))
    return stated, None


@dataclass(frozen=True)
class FeedLoop:
    """What a feed adds to the loops below it, ohm: hot (the rules' temperatures) and at 20 degC, and its drop."""

    r1r2_hot: float
    r1rn_hot: float
    r1r2_20: float
    r1rn_20: float
    r1_20: float
    x_loop: float  # line and return conductor (NaN where not given: taken as 0)
    three_phase: bool
    drop_percent: float
    large_without_reactance: bool = False


def tightest(supply_ohm: float, r_ohm: float, x_ohm: float, x_over_r: float | None) -> float:
    """The least modulus of the supply's impedance at the origin (modulus ``supply_ohm``) plus the feeds' R + jX.

    With the supply's X/R given, the complex sum. Without it, the least over supply angles of 0 to 90 degrees:
    |Zs e^jθ + R + jX|^2 = |Zs|^2 + R^2 + X^2 + 2|Zs|(R cos θ + X sin θ), least at θ = 0 or 90 degrees, so the
    smaller of sqrt(R^2 + (|Zs| + X)^2) and sqrt((|Zs| + R)^2 + X^2) (derived; the first wherever X <= R).
    Never below the true impedance for any angle: the largest fault currents are never underestimated.
    """
    if math.isnan(supply_ohm):
        return math.nan
    if x_over_r is not None:
        angle = math.atan(x_over_r)
        return abs(complex(supply_ohm * math.cos(angle) + r_ohm, supply_ohm * math.sin(angle) + x_ohm))
    return min(math.hypot(r_ohm, supply_ohm + x_ohm), math.hypot(supply_ohm + r_ohm, x_ohm))


@dataclass(frozen=True)
class BoardFaults:
    """A board's loops (ohm) and fault currents (A), and its drop from the origin (%).

    ``ze_ohm``/``zpn_ohm``: moduli added, hot (for the smallest currents). For the largest currents, the supply's
    impedances at the origin (``origin_min_ohm``: earth loop, line-neutral loop, three-phase, each the least it can
    be) and the feeds' sums from the origin (``r_ohm``, ``x_ohm``, conductors at 20 degC, in the same order);
    ``*_min_ohm`` is what :func:`tightest` makes of them. ``pfc_a`` is the larger of line-neutral, line-earth (not
    in TT) and, on three phases, the symmetrical three-phase current (434.1).
    """

    ze_ohm: float
    zpn_ohm: float
    origin_min_ohm: tuple[float, float, float]
    c_max: float
    u0_v: float
    tt: bool
    three_phase: bool
    voltage_drop_percent: float
    cautions: tuple[str, ...] = ()
    r_ohm: tuple[float, float, float] = (0.0, 0.0, 0.0)
    x_ohm: tuple[float, float, float] = (0.0, 0.0, 0.0)
    x_over_r: float | None = None

    def _least(self, k: int) -> float:
        return tightest(self.origin_min_ohm[k], self.r_ohm[k], self.x_ohm[k], self.x_over_r)

    @property
    def ze_min_ohm(self) -> float:
        return self._least(0)

    @property
    def zpn_min_ohm(self) -> float:
        return self._least(1)

    @property
    def z3_min_ohm(self) -> float:
        return self._least(2) if self.three_phase else math.nan

    @property
    def phase_fault_a(self) -> float:
        """The larger of the line-neutral and line-earth (not in TT) currents: what a single-pole device sees."""
        known = [
            x for x in (self.max_line_neutral_a, math.nan if self.tt else self.max_earth_fault_a) if not math.isnan(x)
        ]
        return max(known) if known else math.nan

    def _current(self, factor: float, impedance: float) -> float:
        return factor * self.u0_v / impedance if impedance > 0 else math.nan

    @property
    def max_earth_fault_a(self) -> float:
        return self._current(self.c_max, self.ze_min_ohm)

    @property
    def max_line_neutral_a(self) -> float:
        return self._current(self.c_max, self.zpn_min_ohm)

    @property
    def three_phase_a(self) -> float:
        return self._current(self.c_max, self.z3_min_ohm) if self.three_phase else math.nan

    @property
    def pfc_a(self) -> float:
        known = [x for x in (self.phase_fault_a, self.three_phase_a) if not math.isnan(x)]
        return max(known) if known else math.nan

    @property
    def min_earth_fault_a(self) -> float:
        return self._current(faults.c_min(), self.ze_ohm)

    @property
    def min_line_neutral_a(self) -> float:
        return self._current(faults.c_min(), self.zpn_ohm)


def origin_faults(supply: Supply) -> BoardFaults:
    """The origin's values, by the same rules as a circuit's origin (:mod:`service.electrical.network.faults`)."""
    one = lambda v: np.array([math.nan if v is None else v], dtype=float)  # noqa: E731
    tt = np.array([supply.earthing == "TT"])
    c_max = faults.c_max_default() if supply.c_max is None else supply.c_max
    zpn, zpn_key = faults.line_neutral_origin(
        one(supply.line_neutral_loop_ohm), one(supply.prospective_fault_current_ka), one(supply.u0_v),
        one(supply.ze_ohm), tt,
    )  # fmt: skip
    pfc_ka, pfc_key, _ = faults.prospective_fault_current_ka(
        supply.u0_v,
        supply.ze_ohm,
        tt,
        one(supply.prospective_fault_current_ka),
        one(supply.line_neutral_loop_ohm),
        c_max,
    )
    ik3, twice = faults.three_phase_a(
        one(supply.three_phase_fault_current_ka), np.array([supply.phases]), pfc_ka * 1000
    )
    ef_max = c_max * supply.u0_v / supply.ze_ohm
    if supply.max_earth_fault_current_ka is not None:
        ef_max = supply.max_earth_fault_current_ka * 1000.0
    cautions = [faults.CAUTIONS[k] for k in (zpn_key[0],) if k in ("zpn-from-pfc", "zpn-from-ze")]
    if supply.prospective_fault_current_ka is None and supply.line_neutral_loop_ohm is None and not tt[0]:
        cautions.append(faults.CAUTIONS["pfc-from-ze"])  # only Ze known: the line-neutral value may be higher
    if twice[0]:
        cautions.append(faults.CAUTIONS["ik3-twice"])
    impedance = lambda current: c_max * supply.u0_v / current if current > 0 else math.nan  # noqa: E731
    # the line-neutral loop at its least: as given; else the stated fault level (the larger of the two, so the
    # line-neutral value is no higher); else, in TN, Ze (said in a caution)
    if supply.line_neutral_loop_ohm is not None:
        zpn_min = supply.line_neutral_loop_ohm
    else:
        zpn_min = impedance(float(pfc_ka[0]) * 1000.0)
    return BoardFaults(
        ze_ohm=supply.ze_ohm,
        zpn_ohm=float(zpn[0]),
        origin_min_ohm=(impedance(ef_max), zpn_min, impedance(float(ik3[0]))),
        x_over_r=supply.x_over_r,
        c_max=c_max,
        u0_v=supply.u0_v,
        tt=bool(tt[0]),
        three_phase=supply.phases == 3,
        voltage_drop_percent=supply.voltage_drop_percent,
        cautions=tuple(cautions),
    )


def below(parent: BoardFaults, feed: FeedLoop) -> BoardFaults:
    """The values at the board a feed supplies (the module's text says how the impedances combine)."""
    x = 0.0 if math.isnan(feed.x_loop) else feed.x_loop
    cautions = parent.cautions
    if not feed.three_phase:
        cautions = tuple(c for c in cautions if c != faults.CAUTIONS["ik3-twice"])
    r, xs = parent.r_ohm, parent.x_ohm
    return dataclasses.replace(
        parent,
        ze_ohm=parent.ze_ohm + math.hypot(feed.r1r2_hot, x),
        zpn_ohm=parent.zpn_ohm + math.hypot(feed.r1rn_hot, x),
        r_ohm=(r[0] + feed.r1r2_20, r[1] + feed.r1rn_20, r[2] + feed.r1_20),
        x_ohm=(xs[0] + x, xs[1] + x, xs[2] + x / 2),
        three_phase=feed.three_phase,
        voltage_drop_percent=parent.voltage_drop_percent + feed.drop_percent,
        cautions=cautions,
    )


def board_supply(origin: Supply, board: Board, values: BoardFaults, phases: int, extra: tuple[str, ...]) -> Supply:
    """The supply as the circuits of a board below the origin see it: the values carried down to it."""

    def known(value: float, scale: float = 1.0) -> float | None:
        return None if math.isnan(value) else value / scale

    return dataclasses.replace(
        origin,
        ze_ohm=values.ze_ohm,
        # what a single-pole device sees; a three-phase circuit adds the three-phase value (faults.fault_loop)
        prospective_fault_current_ka=known(values.phase_fault_a, 1000.0),
        line_neutral_loop_ohm=known(values.zpn_ohm),
        phases=phases,
        three_phase_fault_current_ka=known(values.three_phase_a, 1000.0),
        max_earth_fault_current_ka=known(values.max_earth_fault_a, 1000.0),
        voltage_drop_percent=values.voltage_drop_percent,
        board=board.id,
        cautions=tuple(dict.fromkeys(origin.cautions + values.cautions + extra)),
    )
