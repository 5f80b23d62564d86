"""A device from the user's own curve points (hypothesis)."""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from service.electrical.devices.catalogue import resolve
from service.electrical.errors import ElectricalError, InvalidInput, UnknownDevice
from service.electrical.inputs import DeviceSpec


@st.composite
def user_curves(draw):
    n = draw(st.integers(2, 8))
    currents = sorted(draw(st.lists(st.floats(1, 1e5), min_size=n, max_size=n, unique=True)))
    times = sorted(draw(st.lists(st.floats(0.005, 1e4), min_size=n, max_size=n, unique=True)), reverse=True)
    return list(zip(currents, times, strict=False))


@given(user_curves(), st.lists(st.floats(0.1, 1e6), min_size=1, max_size=30))
@settings(max_examples=200, deadline=None)
def test_user_curve_time_falls_and_inverse_round_trips(points, currents):
    # The inverse is the smallest current that operates within the time. On a segment whose times are
    # equal within rounding (a near-flat run), that is the segment's lower end, not the current read
    # from: the round trip then holds as 'at most', and exactly where the time falls measurably.
    dev = resolve(DeviceSpec(rating_a=10, curve_points=tuple(points)))
    currents = np.sort(np.asarray(currents))
    t, bound = dev.time_at(currents)
    assert np.all(t[1:] <= t[:-1] * (1 + 1e-12))
    inside = (currents > points[0][0]) & (currents < points[-1][0])
    back, _ = dev.current_for(t[inside])
    assert np.all(back <= currents[inside] * (1 + 1e-9))
    again, _ = dev.time_at(back)
    np.testing.assert_allclose(again, t[inside], rtol=1e-9)
    ch = dev.characteristic
    seg = np.searchsorted(ch.current_a, currents[inside], side="right") - 1
    falls = np.log(ch.time_s[seg] / ch.time_s[seg + 1]) > 1e-6 * np.log(ch.current_a[seg + 1] / ch.current_a[seg])
    np.testing.assert_allclose(back[falls], currents[inside][falls], rtol=1e-6)


def test_user_curve_near_flat_segment_found_once():
    # the case hypothesis once found: times 10 s and 10 s less a rounding step between 1.5 A and 2 A
    dev = resolve(DeviceSpec(rating_a=10, curve_points=((1.0, 20.0), (1.5, 10.0), (2.0, 10.0 - 1e-14), (3.0, 1.0))))
    t, _ = dev.time_at(2.0)
    back, _ = dev.current_for(t)
    assert back <= 2.0 and dev.time_at(back)[0] == pytest.approx(t)


def test_user_curve_validation():
    with pytest.raises(ElectricalError):
        resolve(DeviceSpec(rating_a=10, curve_points=((50, 5),)))
    with pytest.raises(InvalidInput):
        resolve(DeviceSpec(rating_a=10, curve_points=((50, 5), (100, 8))))
    with pytest.raises(InvalidInput) as err:
        resolve(DeviceSpec(rating_a=10, curve_points=((50, 5), (-1, 8))))
    assert err.value.path == ("curve_points", 1)  # the point as given, not as sorted
    with pytest.raises(UnknownDevice):
        resolve(DeviceSpec(rating_a=10, standard="BS 88-2", curve_points=((50, 5), (90, 1))))
