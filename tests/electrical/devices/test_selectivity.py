"""Selectivity of a pair of series devices (BS 7671:2018 536.4 and IEC 60364-5-53, from memory; the rules as
copied in tests/data/installation-rules.md).

I2t: IEC 60269-1 gG pre-arcing and operating values (tests/data: gG-i2t.csv, from memory); gates: IEC 60269-1
(gG-gates.csv, from memory); breaker limits: BS EN 60898-1 Table 7 instantaneous ranges and 1.13/1.45 In
conventional currents; class let-through: BS EN 60898-1 Annex ZA (let-through-energy.csv, from memory).
"""

import math

import numpy as np
import pytest

from service.electrical.devices.selectivity import Selective, pair_limit, rcd_pair, verdicts_of
from service.electrical.inputs import DeviceSpec, Rcd


def gg(rating_a):
    return DeviceSpec(rating_a=rating_a, standard="BS 88-2", type="gG")


def mcb(type_, rating_a, **kwargs):
    return DeviceSpec(rating_a=rating_a, standard="BS EN 60898", type=type_, breaking_capacity_ka=6, **kwargs)


def test_gg_under_gg_is_total_where_the_operating_i2t_does_not_exceed_the_pre_arcing():
    # gG 32 A operates with at most 5 000 A2s; gG 50 A does not melt below 5 000 A2s, gG 80 A below 16 000
    assert pair_limit(gg(32), gg(50)).limit_a == math.inf
    assert pair_limit(gg(32), gg(80)).limit_a == math.inf
    # gG 40 A pre-arcing 3 000 A2s < 5 000: the I2t cannot show it
    shown = pair_limit(gg(32), gg(40))
    assert math.isnan(shown.limit_a) and "maker" in shown.basis


def test_breaker_under_breaker_up_to_the_upstream_lower_instantaneous_limit():
    # C63 does not trip instantaneously below 5 x 63 = 315 A; B16 trips instantaneously by 5 x 16 = 80 A and
    # by 1.45 x 16 = 23.2 A in the overload region, below C63's 1.13 x 63 = 71.2 A non-tripping current
    assert pair_limit(mcb("B", 16), mcb("C", 63)).limit_a == 315
    # B32 needs up to 5 x 32 = 160 A to trip instantaneously; B40 may trip from 3 x 40 = 120 A
    assert pair_limit(mcb("B", 32), mcb("B", 40)).limit_a == 0
    # C16 trips instantaneously by 160 A, below B63's 3 x 63 = 189 A
    assert pair_limit(mcb("C", 16), mcb("B", 63)).limit_a == 189
    # B16 under C20: instantaneous by 80 A < 100 A, but tripping by 1.45 x 16 = 23.2 A in the overload region,
    # where C20 may trip from 1.13 x 20 = 22.6 A
    overload = pair_limit(mcb("B", 16), mcb("C", 20))
    assert overload.limit_a == 0 and "overload region" in overload.basis


def test_an_adjustable_breaker_upstream_uses_0_8_ii():
    # BS EN 60947-2: the instantaneous release within +-20 % of Ii: 0.8 x 2 000 = 1 600 A
    mccb = DeviceSpec(rating_a=250, standard="BS EN 60947-2", ir_a=200, ii_a=2000, breaking_capacity_ka=25)
    assert pair_limit(mcb("C", 32), mccb).limit_a == pytest.approx(1600)


def test_breaker_under_gg_up_to_where_the_class_let_through_reaches_the_pre_arcing():
    # gG 100 A: no melting below 27 000 A2s, nor within 0.1 s below 820 A or within 10 s below 290 A; B32 trips
    # instantaneously by 160 A and by 46.4 A < 1.25 x 100 A. Class 3, 16-32 A type B: 18 000 A2s at 3 kA,
    # 32 000 A2s at 4.5 kA: selective up to 3 kA
    limit = pair_limit(mcb("B", 32), gg(100))
    assert limit.limit_a == 3000 and "class 3" in limit.basis
    # the maker's let-through of 20 000 A2s at its Icn does not reach 27 000 A2s: at any current
    assert pair_limit(mcb("B", 32, let_through_a2s=20000), gg(100)).limit_a == math.inf
    # gG 32 A may melt within 0.1 s from 200 A: B32 needs up to 160 A, but 46.4 A > 1.25 x 32 = 40 A
    assert pair_limit(mcb("B", 32), gg(32)).limit_a == 0


def test_class_data_that_never_stay_below_the_pre_arcing_leave_it_to_the_maker():
    # gG 40 A pre-arcing 3 000 A2s; B6 class 3 lets through 15 000 A2s at 3 kA (up to 16 A, type B)
    limit = pair_limit(mcb("B", 6), gg(40))
    assert math.isnan(limit.limit_a) and "maker" in limit.basis


def test_the_makers_limit_prevails_and_unknown_pairs_are_not_shown():
    assert pair_limit(mcb("B", 32), mcb("B", 40), 1200.0).limit_a == 1200
    rewirable = DeviceSpec(rating_a=30, standard="BS 3036")
    assert math.isnan(pair_limit(mcb("B", 16), rewirable).limit_a)


def test_verdict_words_against_the_largest_fault():
    limit = np.array([math.inf, 315.0, 315.0, 0.0, math.nan, 315.0])
    fault = np.array([5000.0, 300.0, 2000.0, 2000.0, 2000.0, math.nan])
    word, up_to = verdicts_of(limit, fault)
    assert word.tolist() == ["total", "total", "partial", "none", "not-verified", "not-verified"]
    assert np.isnan(up_to[[0, 3, 4]]).all() and up_to[1] == 315


def test_an_rcd_pair_needs_a_delayed_upstream_with_three_times_the_residual_current():
    # common practice: type S upstream, IΔn at least 3 x the downstream's
    assert rcd_pair(Rcd(30), Rcd(100, "S"))[0] is Selective.TOTAL
    assert rcd_pair(Rcd(30), Rcd(100))[0] is Selective.NONE
    assert rcd_pair(Rcd(100), Rcd(100, "S"))[0] is Selective.NONE
    assert rcd_pair(Rcd(30), None) == (None, None)
