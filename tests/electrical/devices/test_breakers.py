"""Circuit-breakers to BS EN 60898-1 and RCBOs to BS EN 61009-1: the envelope of the standard's limits."""

import numpy as np
import pytest

from service.electrical.devices.catalogue import resolve
from service.electrical.errors import UnknownDevice
from service.electrical.inputs import DeviceSpec


def test_breaker_envelope_from_bs_en_60898_limits():
    # BS EN 60898-1 Table 7: 1.45 In within 1 h, 2.55 In within 60 s (In <= 32 A), 5 In type B within 0.1 s
    dev = resolve(DeviceSpec(rating_a=32, standard="BS EN 60898", type="B"))
    t, bound = dev.time_at([32 * 1.45, 32 * 2.55, 150, 160, 1000, 40])
    assert t[:5].tolist() == [3600, 60, 60, 0.1, 0.1]
    assert bound.tolist() == ["interpolated"] * 3 + ["at-most", "at-most", "beyond-data"]
    assert dev.region_at([40, 100, 160]).tolist() == ["below-data", "thermal", "instantaneous"]
    ia, _ = dev.current_for([0.05, 0.1, 0.2, 0.4, 1, 5])
    assert np.isnan(ia[0]) and ia[1:].tolist() == [160] * 5  # BS 7671 Table 41.3 takes Ia = 5 In
    big = resolve(DeviceSpec(rating_a=80, standard="BS EN 60898", type="C"))
    assert big.time_at(80 * 2.55)[0] == 120 and big.time_at(80 * 1.45)[0] == 7200  # In > 32 A / > 63 A


def test_any_breaker_rating_within_the_standard_range():
    # BS EN 60898-1 Table 7: type C trips within 0.1 s at 10 In, so Ia = 130 A for 13 A at 0.4 s
    assert resolve(DeviceSpec(rating_a=13, standard="BS EN 60898", type="C")).current_for(0.4)[0] == 130
    with pytest.raises(UnknownDevice):
        resolve(DeviceSpec(rating_a=200, standard="BS EN 60898", type="C"))
    with pytest.raises(UnknownDevice):
        resolve(DeviceSpec(rating_a=16, standard="BS EN 60898", type="K"))
