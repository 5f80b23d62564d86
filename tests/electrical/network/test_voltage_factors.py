"""The voltage factors at low voltage, IEC 60909-0 Table 1: Cmin 0.95; cmax 1.05 (+6 % systems) to 1.10 (+10 %)."""

import pytest

from service.electrical.errors import InvalidInput
from service.electrical.network.voltage_factors import c_max_bounds, c_max_default, c_min, check_c_max


def test_the_factors_of_iec_60909_0_table_1():
    assert c_min() == 0.95 and c_max_default() == 1.10 and c_max_bounds() == (1.05, 1.10)
    check_c_max(1.05)
    with pytest.raises(InvalidInput) as err:
        check_c_max(1.2)
    assert err.value.path == ("c_max",)
