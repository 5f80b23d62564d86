"""Adjustable breakers to BS EN 60947-2 from their settings (data/adjustable_breakers.json, from memory)."""

import numpy as np
import pytest

from service.electrical.devices import adjustable
from service.electrical.devices.catalogue import device_by_id, resolve
from service.electrical.errors import InvalidInput
from service.electrical.inputs import DeviceSpec

FRAME = DeviceSpec(rating_a=250, standard="BS EN 60947-2", ir_a=200, ii_a=2000, isd_a=1200, tsd_s=0.2)


def test_the_envelope_of_the_settings():
    # BS EN 60947-2: trips within the conventional time (2 h above 63 A) from 1.30 Ir; pickups taken at +20 %
    dev = resolve(FRAME)
    t, bound = dev.time_at([200, 260, 1000, 1440, 2000, 2400, 5000])
    assert np.isinf(t[0]) and bound[0] == "beyond-data"
    assert t[1:].tolist() == [7200, 7200, 0.2, 0.2, 0.1, 0.1]
    assert dev.region_at([300, 1500, 2500]).tolist() == ["thermal", "short-time", "instantaneous"]
    assert dev.overload_current_a == 200  # Ir is what Ib <= In <= Iz reads


def test_ia_for_a_required_time_is_the_pickup_at_its_upper_tolerance():
    # for 0.4 s: 1.2 x Isd = 1440 A (within tsd 0.2 s); for 0.1 s: 1.2 x Ii = 2400 A; for 5 s also 1440 A
    ia, _ = resolve(FRAME).current_for([0.4, 0.1, 5.0])
    assert ia.tolist() == [1440, 2400, 1440]


def test_the_makers_thermal_points_replace_the_flat_envelope():
    maker = DeviceSpec(
        rating_a=250,
        standard="BS EN 60947-2",
        ir_a=200,
        ii_a=2000,
        curve_points=((260.0, 3000.0), (600.0, 60.0), (1200.0, 8.0)),
    )
    t, _ = resolve(maker).time_at([600, 1200])
    assert t.tolist() == [60, 8]


def test_settings_are_checked():
    with pytest.raises(InvalidInput) as err:
        resolve(DeviceSpec(rating_a=250, standard="BS EN 60947-2", ir_a=200))
    assert err.value.path == ("ii_a",)
    with pytest.raises(InvalidInput) as err:
        resolve(DeviceSpec(rating_a=250, standard="BS EN 60947-2", ir_a=300, ii_a=2000))
    assert err.value.path == ("ir_a",)
    with pytest.raises(InvalidInput) as err:
        resolve(DeviceSpec(rating_a=250, standard="BS EN 60947-2", ii_a=2000, isd_a=1200))
    assert err.value.path == ("tsd_s",)


def test_selectivity_limit_and_catalogue():
    assert adjustable.selective_limit_a(FRAME) == pytest.approx(1600)  # 0.8 x Ii
    dev = device_by_id("bs-en-60947-2", 400)  # typical settings Ir = In, Ii = 10 In for a picture
    assert dev.rating_a == 400 and dev.characteristic.current_a[-1] == pytest.approx(1.2 * 4000)
