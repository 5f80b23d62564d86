"""Loop impedance and fault currents."""

import pytest

from service.electrical import faults
from service.electrical.errors import InvalidInput


def test_earth_fault_current_uses_cmin():
    # IEC 60909-0 Table 1: cmin 0.95; If = U0 x Cmin / Zs
    assert faults.earth_fault_current_a(230, 1.0)[0] == pytest.approx(218.5)
    assert faults.earth_fault_current_a(230, 1.0, voltage_factor=1)[0] == pytest.approx(230)


def test_loop_impedance_is_ze_plus_r1r2():
    assert faults.loop_impedance_ohm(0.35, [0.1, 0.2]).tolist() == pytest.approx([0.45, 0.55])


def test_prospective_fault_current_stated_or_from_ze():
    # IEC 60909-0 Table 1: cmax 1.10 (or 1.05) at low voltage
    assert faults.prospective_fault_current_ka(230, 0.35)[0] == pytest.approx(230 * 1.1 / 0.35 / 1000)
    assert faults.prospective_fault_current_ka(230, 0.35, c_max=1.05)[0] == pytest.approx(230 * 1.05 / 0.35 / 1000)
    assert faults.prospective_fault_current_ka(230, 0.35, 1.6)[0] == 1.6
    with pytest.raises(InvalidInput):
        faults.prospective_fault_current_ka(230, 0.35, c_max=1.2)


def test_zero_loop_is_rejected():
    with pytest.raises(InvalidInput):
        faults.earth_fault_current_a(230, 0.0)
