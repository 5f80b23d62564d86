"""How the devices answer the earth fault: the time that applies, the overcurrent device, the RCD."""

import pytest

from service.electrical.devices.characteristic import AT_MOST, BEYOND_DATA
from service.electrical.devices.response import operating_time
from service.electrical.inputs import DeviceSpec, Rcd
from tests.electrical.pipeline import BAKERY, KIOSK, RCBO_B16, TWIN_2_5, circuit, run


def test_the_overcurrent_device_at_the_earth_fault_current():
    trip = run(BAKERY, circuit()).trip
    # B32 at 431 A: within 0.1 s (BS EN 60898-1 Table 7); Ia for 0.4 s = 160 A (Table 41.3), max Zs 1.3656 ohm
    assert trip.oc_time_s[0] == 0.1 and trip.oc_bound[0] == AT_MOST and trip.region[0] == "instantaneous"
    assert trip.operating_current_a[0] == 160 and trip.max_zs_oc_ohm[0] == pytest.approx(1.365625)
    assert not trip.by_rcd[0] and trip.required_s[0] == 0.4


def test_the_rcd_takes_over_below_the_breakers_data():
    trip = run(KIOSK, circuit(RCBO_B16, TWIN_2_5, load="socket-outlets")).trip
    assert trip.oc_bound[0] == BEYOND_DATA and trip.by_rcd[0] and trip.time_s[0] == 0.04
    assert trip.figures()["disconnected_by"][0] == "rcd" and trip.figures()["disconnection_region"][0] == "residual"


def test_operating_time_question():
    # BS 88-3 32 A at 239.6 A: 0.4 s (BS 7671:2008+A1 Table 41.2 via tests/data/fuse-operating-currents.csv);
    # a 30 mA RCD at 239.6 A residual: within 40 ms (BS EN 61008-1 Table 1, 5 IΔn)
    answer = operating_time(DeviceSpec(rating_a=32, standard="BS 88-3", rcd=Rcd(30)), 239.6)
    assert (answer.time_s, answer.bound, answer.region) == (0.4, "interpolated", "fuse-curve")
    assert answer.rcd_time_s == 0.04 and answer.device["device_id"] == "bs-88-3-gg"
