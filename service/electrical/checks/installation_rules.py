"""The checks of a board and of a whole installation (not of one circuit): each a function returning one
:class:`~service.electrical.results.circuit_result.Check`, its clause from data/requirements.json under the edition
asked.

- ``demand`` (311.1): a board's demand after diversity within the rating of the device feeding it; at the origin,
  within the supply's rated current (and the main device's rating, where given).
- ``rcd-selectivity`` (536.4.1.4): an RCD on a circuit of a board fed through an RCD is selective with it only
  where the upstream one is time-delayed (S) and its IΔn at least three times the downstream one's.
- ``surge-protection`` (443.4): fitted, or not required by the stated consequence, or declined in writing
  where that is allowed.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np

from service.electrical.checks.base import margin_percent
from service.electrical.column_tools import finite_or_none
from service.electrical.devices import selectivity
from service.electrical.devices.catalogue import resolve
from service.electrical.devices.selectivity import Selective
from service.electrical.inputs import Circuit, DeviceSpec, Installation, SurgeProtection, Unread
from service.electrical.results import precision
from service.electrical.results.circuit_result import Check
from service.electrical.results.verdicts import Verdict
from service.electrical.rules import requirements

BOARD_CHECKS = ("demand", "rcd-selectivity")
INSTALLATION_CHECKS = ("surge-protection",)
SURGE_REQUIRED = ("human-life", "safety-services", "commercial")


def _check(name: str, verdict: Verdict, value, limit, unit: str, edition: str, rule: str, note: str) -> Check:
    """One :class:`Check`, its margin as every check's (:func:`~service.electrical.checks.base.margin_percent`, to the
    precision margins carry)."""
    margin = margin_percent(np.nan if value is None else value, np.nan if limit is None else limit)
    rounded = precision.rounded(margin, precision.RULES["margin_percent"])
    return Check(
        name, verdict, value, limit, unit, finite_or_none(rounded[()]), requirements.rule(edition, rule)["basis"], note
    )


def demand_check(
    demand_a: float, missing: Sequence[str], feed: DeviceSpec | None, rated_a: float | None, edition: str, origin: bool
) -> Check:
    """A board's demand after diversity (A, the largest phase's) against what feeds it (BS 7671:2018 311.1).

    ``feed`` is the device feeding the board (the sub-main's, or the origin's main device); ``rated_a`` the
    supply's rated current at the origin. Not-verified where the demand is incomplete or nothing rates the feed.
    """
    limits = []
    if feed is not None:
        limits.append((resolve(feed).overload_current_a, "the rating of the device feeding the board"))
    if origin and rated_a is not None:
        limits.append((float(rated_a), "the supply's rated current"))
    limit, what = min(limits) if limits else (None, "")
    demand = None if math.isnan(demand_a) else round(demand_a, 1)
    if demand is None:
        note = "not stated: give design_current_a for " + ", ".join(missing) + " (or the board's design_current_a)"
        return _check("demand", Verdict.NOT_VERIFIED, None, limit, "A", edition, "demand", note)
    if limit is None:
        field = "supply.rated_current_a" if origin else "the feeding circuit's device"
        note = f"not stated: give {field} to judge the demand"
        return _check("demand", Verdict.NOT_VERIFIED, demand, None, "A", edition, "demand", note)
    verdict = Verdict.PASS if demand <= limit * (1 + 1e-9) else Verdict.FAIL
    note = f"the demand after diversity against {what}"
    return _check("demand", verdict, demand, round(limit, 1), "A", edition, "demand", note)


def rcd_selectivity_check(
    upstream: DeviceSpec | None, circuits: Sequence[Circuit | Unread], edition: str
) -> Check | None:
    """RCDs in series (536.4.1.4), each pair by :func:`service.electrical.devices.selectivity.rcd_pair`; None where
    the board is not fed through an RCD or none of its circuits has one."""
    if upstream is None or upstream.rcd is None:
        return None
    below = [c for c in circuits if not isinstance(c, Unread) and c.device.rcd is not None]
    if not below:
        return None
    pairs = [(c, *selectivity.rcd_pair(c.device.rcd, upstream.rcd)) for c in below]
    bad = [c.id or "a circuit" for c, word, _ in pairs if word != Selective.TOTAL]
    # the value is what the upstream IΔn must reach (the ratio times the largest IΔn below), the limit what it is
    needed = selectivity.rcd_ratio() * max(c.device.rcd.residual_current_ma for c in below)
    value, limit = needed, upstream.rcd.residual_current_ma
    if not bad:
        return _check("rcd-selectivity", Verdict.PASS, value, limit, "mA", edition, "rcd-selectivity", pairs[0][2])
    note = (
        f"{pairs[0][2] if len(bad) == len(pairs) else 'some pairs fail'}: a fault on {', '.join(bad)} may trip it too"
    )
    return _check("rcd-selectivity", Verdict.FAIL, value, limit, "mA", edition, "rcd-selectivity", note)


def surge_protection_check(surge: SurgeProtection | None, edition: str) -> Check:
    """Protection against transient overvoltages (BS 7671:2018 443.4), as the request states it."""
    rule = "surge"
    if surge is None:
        note = "not stated: give surge_protection (fitted, and the consequence of an overvoltage)"
        return _check("surge-protection", Verdict.NOT_VERIFIED, None, None, "", edition, rule, note)
    if surge.fitted:
        return _check("surge-protection", Verdict.PASS, None, None, "", edition, rule, "surge protection is fitted")
    if surge.consequence is None:
        note = "not fitted, and not stated: give surge_protection.consequence"
        return _check("surge-protection", Verdict.NOT_VERIFIED, None, None, "", edition, rule, note)
    if surge.consequence in SURGE_REQUIRED:
        note = f"required where the consequence is {surge.consequence}, and not fitted"
        return _check("surge-protection", Verdict.FAIL, None, None, "", edition, rule, note)
    if surge.declined_in_writing:
        note = "not fitted: the owner declined it in writing, as allowed for this consequence"
        return _check("surge-protection", Verdict.PASS, None, None, "", edition, rule, note)
    note = "required unless the owner declines it in writing: not fitted and not declined"
    return _check("surge-protection", Verdict.FAIL, None, None, "", edition, rule, note)


def edition_of(inst: Installation) -> str:
    return inst.supply.edition or requirements.default_edition()
