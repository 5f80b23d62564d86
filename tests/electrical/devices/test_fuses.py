"""Fuses to BS 88-2, BS 88-3, BS 3036 and BS 1362: published points, gG estimates on the safe side."""

import math

import numpy as np
import pytest

from service.electrical.devices import fuses
from service.electrical.devices.catalogue import catalogue, device_by_id, resolve
from service.electrical.inputs import DeviceSpec


def test_bs3036_below_0_4_s_is_not_shown():
    dev = resolve(DeviceSpec(rating_a=30, standard="BS 3036"))
    ia, bound = dev.current_for([0.1, 0.2, 0.4])
    assert np.isnan(ia[0]) and np.isnan(ia[1]) and bound[0] == "beyond-data"
    assert ia[2] == 211.0  # BS 7671:2008+A1 Table 41.2 via tests/data/fuse-operating-currents.csv: 230 V / 1.09 ohm


def test_gg_estimates_are_labelled():
    dev = resolve(DeviceSpec(rating_a=50, standard="BS 88-2", type="gG"))
    ia, bound = dev.current_for([0.1, 0.2, 0.4, 1, 5])
    assert bound.tolist() == ["estimated"] * 4 + ["interpolated"]
    assert any("gate" in n for n in dev.notes)


def all_builtin_devices():
    out = []
    for family in catalogue():
        for rating in family["ratings_a"]:
            out.append(device_by_id(family["device_id"], rating))
    return out


DEVICES = all_builtin_devices()

GATED = [d for d in DEVICES if d.standard in ("BS 88-2", "BS 88-3")]


@pytest.mark.parametrize("dev", GATED, ids=lambda d: d.label)
def test_every_estimate_lies_on_the_safe_side_of_the_published_points(dev):
    # An estimated Ia for a time must be at least the published Ia of any longer time, and at least the
    # published 5 s-0.4 s line extended (fuse curves are convex on log-log axes, so the extension lies
    # on the unsafe side of the curve and an estimate must not fall below it). Common practice.
    row = next(
        r
        for r in fuses.device_table("fuse_operating_currents")["standards"][dev.standard]
        if r["rating_a"] == dev.rating_a
    )
    published = {t: row[k] for t, k in ((5.0, "ia_5s_a"), (0.4, "ia_0_4s_a")) if row[k] is not None}
    for time_s in (0.1, 0.2, 0.4, 1.0):
        ia, bound = dev.current_for(time_s)
        if time_s in published:
            assert bound == "interpolated" and ia == published[time_s]
            continue
        if math.isnan(ia):
            assert bound == "beyond-data"
            continue
        for t_pub, i_pub in published.items():
            if t_pub > time_s:
                assert ia >= i_pub
        if len(published) == 2:
            slope = math.log(published[0.4] / published[5.0]) / math.log(0.4 / 5.0)
            line = published[0.4] * (time_s / 0.4) ** slope
            assert ia >= line * (1 - 1e-9)
        if bound == "estimated":
            assert time_s < 5.0
