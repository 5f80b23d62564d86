"""RCD break times (BS EN 61008-1 / 61009-1 Table 1) and the 50 V limits (BS 7671:2018 Table 41.5)."""

import numpy as np
import pytest

from service.electrical.devices import residual
from service.electrical.errors import UnknownDevice


@pytest.mark.parametrize("idn_ma, published", [(30, 1667), (100, 500), (300, 167), (500, 100)])
def test_rcd_limits_table_41_5(idn_ma, published):
    # BS 7671:2018 Table 41.5: maximum Zs / RA for RCDs, 50 V / IΔn
    assert residual.rcd_max_loop_ohm(idn_ma) == pytest.approx(published, abs=0.5)


@pytest.mark.parametrize("delay, times", [("general", (0.3, 0.15, 0.04)), ("S", (0.5, 0.2, 0.15))])
def test_rcd_break_times(delay, times):
    # BS EN 61008-1 / 61009-1 Table 1 maximum break times at 1, 2, 5 IΔn (tests/data/devices.md, A)
    ch = residual.rcd_characteristic(30, delay)
    t, _ = ch.time_at([0.03, 0.06, 0.15, 0.5])
    assert t.tolist() == pytest.approx([times[0], times[1], times[2], times[2]])
    t_below, bound = ch.time_at(0.02)
    assert np.isinf(t_below) and bound == "beyond-data"


def test_unknown_delay_or_zero_residual_current_name_the_field():
    with pytest.raises(UnknownDevice) as err:
        residual.rcd_characteristic(30, "slow")
    assert err.value.path == ("rcd", "delay")
    with pytest.raises(UnknownDevice) as err:
        residual.rcd_characteristic(0)
    assert err.value.path == ("rcd", "residual_current_ma")


def test_rcd_limits_of_additional_protection_and_electrode_stability():
    # BS 7671:2018 415.1.1 (at most 30 mA for additional protection); note to Table 41.5 (200 ohm)
    assert residual.additional_protection_max_ma() == 30 and residual.stable_resistance_limit_ohm() == 200
