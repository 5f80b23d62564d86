"""Device characteristics: bounds, inverse, estimates, catalogue and user curves (with hypothesis)."""

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from service.electrical.devices import fuses
from service.electrical.devices.catalogue import catalogue, device_by_id, resolve
from service.electrical.devices.characteristic import Characteristic
from service.electrical.errors import ElectricalError, InvalidInput, UnknownDevice


def all_builtin_devices():
    out = []
    for family in catalogue():
        for rating in family["ratings_a"]:
            out.append(device_by_id(family["device_id"], rating))
    return out


DEVICES = all_builtin_devices()


def test_catalogue_lists_every_family_with_sources():
    ids = {f["device_id"] for f in catalogue()}
    assert {"bs-en-60898-b", "bs-en-61009-d", "bs-88-2-gg", "bs-88-3-gg", "bs-3036", "bs-1362"} <= ids
    for family in catalogue():
        assert family["data"]["source"] and family["data"]["confidence"]
        assert family["ratings_a"]


def test_breaker_envelope_from_bs_en_60898_limits():
    # BS EN 60898-1 Table 7: 1.45 In within 1 h, 2.55 In within 60 s (In <= 32 A), 5 In type B within 0.1 s
    dev = resolve({"standard": "BS EN 60898", "type": "B", "rating_a": 32})
    t, bound = dev.time_at([32 * 1.45, 32 * 2.55, 150, 160, 1000, 40])
    assert t[:5].tolist() == [3600, 60, 60, 0.1, 0.1]
    assert bound.tolist() == ["interpolated"] * 3 + ["at-most", "at-most", "beyond-data"]
    assert dev.region_at([40, 100, 160]).tolist() == ["below-data", "thermal", "instantaneous"]
    ia, _ = dev.current_for([0.05, 0.1, 0.2, 0.4, 1, 5])
    assert np.isnan(ia[0]) and ia[1:].tolist() == [160] * 5  # BS 7671 Table 41.3 takes Ia = 5 In
    big = resolve({"standard": "BS EN 60898", "type": "C", "rating_a": 80})
    assert big.time_at(80 * 2.55)[0][0] == 120 and big.time_at(80 * 1.45)[0][0] == 7200  # In > 32 A / > 63 A


def test_any_breaker_rating_within_the_standard_range():
    # BS EN 60898-1 Table 7: type C trips within 0.1 s at 10 In, so Ia = 130 A for 13 A at 0.4 s
    assert resolve({"standard": "BS EN 60898", "type": "C", "rating_a": 13}).current_for(0.4)[0][0] == 130
    with pytest.raises(UnknownDevice):
        resolve({"standard": "BS EN 60898", "type": "C", "rating_a": 200})
    with pytest.raises(UnknownDevice):
        resolve({"standard": "BS EN 60898", "type": "K", "rating_a": 16})


def test_fuse_ratings_are_only_the_published_ones():
    with pytest.raises(UnknownDevice) as err:
        resolve({"standard": "BS 88-2", "rating_a": 17})
    assert err.value.field == "rating_a"
    with pytest.raises(UnknownDevice):
        resolve({"standard": "BS 3036", "type": "gG", "rating_a": 30})
    with pytest.raises(UnknownDevice):
        resolve({"standard": "BS 9999", "rating_a": 30})


def test_bs3036_below_0_4_s_is_not_shown():
    dev = resolve({"standard": "BS 3036", "rating_a": 30})
    ia, bound = dev.current_for([0.1, 0.2, 0.4])
    assert np.isnan(ia[0]) and np.isnan(ia[1]) and bound[0] == "beyond-data"
    assert ia[2] == 211.0  # BS 7671:2008+A1 Table 41.2 via shared/reference/fuse-operating-currents.csv: 230 V / 1.09 ohm


def test_gg_estimates_are_labelled():
    dev = resolve({"standard": "BS 88-2", "type": "gG", "rating_a": 50})
    ia, bound = dev.current_for([0.1, 0.2, 0.4, 1, 5])
    assert bound.tolist() == ["estimated"] * 4 + ["interpolated"]
    assert any("gate" in n for n in dev.notes)


@pytest.mark.parametrize("dev", DEVICES, ids=lambda d: d.label)
def test_time_falls_as_current_rises_for_every_builtin_device(dev):
    lo = dev.characteristic.min_current_a
    currents = np.geomspace(lo * 0.5, dev.characteristic.current_a[-1] * 3, 400)
    t, _ = dev.time_at(currents)
    assert np.all(t[1:] <= t[:-1])
    assert np.all(np.isinf(t[currents < lo]))


@pytest.mark.parametrize("dev", DEVICES, ids=lambda d: d.label)
def test_inverse_returns_the_current_on_strictly_falling_segments(dev):
    ch = dev.characteristic
    for k in range(len(ch.current_a) - 1):
        if ch.current_a[k + 1] > ch.current_a[k] and ch.time_s[k + 1] < ch.time_s[k]:
            currents = np.geomspace(ch.current_a[k], ch.current_a[k + 1], 9)
            t, _ = dev.time_at(currents)
            back, _ = dev.current_for(t)
            np.testing.assert_allclose(back, currents, rtol=1e-9)


GATED = [d for d in DEVICES if d.standard in ("BS 88-2", "BS 88-3")]


@pytest.mark.parametrize("dev", GATED, ids=lambda d: d.label)
def test_every_estimate_lies_on_the_safe_side_of_the_published_points(dev):
    # An estimated Ia for a time must be at least the published Ia of any longer time, and at least the
    # published 5 s-0.4 s line extended (fuse curves are convex on log-log axes, so the extension lies
    # on the unsafe side of the curve and an estimate must not fall below it). Common practice.
    row = next(r for r in fuses.device_table("fuse_operating_currents")["standards"][dev.standard] if r["rating_a"] == dev.rating_a)
    published = {t: row[k] for t, k in ((5.0, "ia_5s_a"), (0.4, "ia_0_4s_a")) if row[k] is not None}
    for time_s in (0.1, 0.2, 0.4, 1.0):
        ia, bound = dev.current_for(time_s)
        if time_s in published:
            assert bound[0] == "interpolated" and ia[0] == published[time_s]
            continue
        if math.isnan(ia[0]):
            assert bound[0] == "beyond-data"
            continue
        for t_pub, i_pub in published.items():
            if t_pub > time_s:
                assert ia[0] >= i_pub
        if len(published) == 2:
            slope = math.log(published[0.4] / published[5.0]) / math.log(0.4 / 5.0)
            line = published[0.4] * (time_s / 0.4) ** slope
            assert ia[0] >= line * (1 - 1e-9)
        if bound[0] == "estimated":
            assert time_s < 5.0


@st.composite
def user_curves(draw):
    n = draw(st.integers(2, 8))
    currents = sorted(draw(st.lists(st.floats(1, 1e5), min_size=n, max_size=n, unique=True)))
    times = sorted(draw(st.lists(st.floats(0.005, 1e4), min_size=n, max_size=n, unique=True)), reverse=True)
    return list(zip(currents, times))


@given(user_curves(), st.lists(st.floats(0.1, 1e6), min_size=1, max_size=30))
@settings(max_examples=200, deadline=None)
def test_user_curve_time_falls_and_inverse_round_trips(points, currents):
    dev = resolve({"rating_a": 10, "curve_points": [{"current_a": c, "time_s": t} for c, t in points]})
    currents = np.sort(np.asarray(currents))
    t, bound = dev.time_at(currents)
    assert np.all(t[1:] <= t[:-1] * (1 + 1e-12))
    inside = (currents > points[0][0]) & (currents < points[-1][0])
    back, _ = dev.current_for(t[inside])
    np.testing.assert_allclose(back, currents[inside], rtol=1e-7)


def test_user_curve_validation():
    with pytest.raises(ElectricalError):
        resolve({"rating_a": 10, "curve_points": [{"current_a": 50, "time_s": 5}]})
    with pytest.raises(InvalidInput):
        resolve({"rating_a": 10, "curve_points": [{"current_a": 50, "time_s": 5}, {"current_a": 100, "time_s": 8}]})
    with pytest.raises(InvalidInput):
        resolve({"rating_a": 10, "curve_points": [{"current_a": 50, "time_s": 5}, {"current_a": -1, "time_s": 8}]})
    with pytest.raises(UnknownDevice):
        resolve({"rating_a": 10, "standard": "BS 88-2", "curve_points": [{"current_a": 50, "time_s": 5}, {"current_a": 90, "time_s": 1}]})


def test_characteristic_rejects_rising_time():
    with pytest.raises(InvalidInput):
        Characteristic.from_points([(10, 1), (20, 2)])
