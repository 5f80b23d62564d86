"""Time-current characteristics: log-log interpolation, its inverse, and the bounds outside the data."""

import numpy as np
import pytest

from service.electrical.devices.characteristic import (
    AT_MOST,
    BEYOND_DATA,
    ESTIMATED,
    INTERPOLATED,
    Bound,
    Characteristic,
    bound_names,
)
from service.electrical.errors import InvalidInput

# an invented curve: 100 A within 10 s, 1000 A within 0.1 s (two decades of time over one of current)
CURVE = Characteristic.from_points([(100, 10), (1000, 0.1)])


def test_log_log_interpolation_between_points():
    # straight on log-log axes: at 316.23 A (half a decade) the time is 1 s (half of two decades), common practice
    t, bound = CURVE.time_at(10**2.5)
    assert t == pytest.approx(1.0) and bound == Bound.INTERPOLATED


def test_nothing_is_extrapolated():
    t, bound = CURVE.time_at([50, 100, 1000, 5000])
    assert np.isinf(t[0]) and t[1:].tolist() == [10, 0.1, 0.1]
    # at and above the last point the device operates within 'at most' the shortest time given
    assert bound.tolist() == ["beyond-data", "interpolated", "at-most", "at-most"]


def test_inverse():
    ia, bound = CURVE.current_for([20, 10, 1, 0.1, 0.05])
    assert ia[:4] == pytest.approx([100, 100, 10**2.5, 1000]) and np.isnan(ia[4])
    assert bound.tolist() == ["at-most", "interpolated", "interpolated", "interpolated", "beyond-data"]


def test_codes_are_the_array_form_of_the_bounds():
    t, codes = CURVE.time_codes([50, 500, 5000])
    assert codes.dtype == np.int8 and codes.tolist() == [BEYOND_DATA, INTERPOLATED, AT_MOST]
    assert bound_names(codes).tolist() == ["beyond-data", "interpolated", "at-most"]


def test_estimated_points_mark_every_reading_that_rests_on_them():
    ch = Characteristic.from_points([(100, 10), (1000, 0.1)], estimated=[False, True])
    _, codes = ch.time_codes([100, 300, 1000, 2000])
    assert codes.tolist() == [INTERPOLATED, ESTIMATED, ESTIMATED, ESTIMATED]


def test_one_point_gives_at_most_that_time_above_it():
    ch = Characteristic.from_points([(200, 0.1)])
    t, bound = ch.time_at([100, 200, 400])
    assert np.isinf(t[0]) and t[1:].tolist() == [0.1, 0.1]
    assert bound.tolist() == ["beyond-data", "interpolated", "at-most"]


def test_a_vertical_step_takes_the_lower_time():
    ch = Characteristic.from_points([(46.4, 3600), (81.6, 60), (160, 60), (160, 0.1)])  # a B32 envelope, BS EN 60898-1
    assert ch.time_at(160)[0] == 0.1 and ch.time_at(159.9)[0] == 60


def test_characteristic_rejects_rising_time():
    with pytest.raises(InvalidInput):
        Characteristic.from_points([(10, 1), (20, 2)])
    with pytest.raises(InvalidInput):
        Characteristic.from_points([(10, 1), (10, 1)])
    with pytest.raises(InvalidInput):
        Characteristic.from_points([(-10, 1)])
