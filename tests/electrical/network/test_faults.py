"""Loop impedance and fault currents."""

import numpy as np
import pytest

from service.electrical.errors import InvalidInput, UnknownConductor
from service.electrical.inputs import Conductors, Supply
from service.electrical.network import faults


def test_earth_fault_current_uses_cmin():
    # IEC 60909-0 Table 1: cmin 0.95; If = U0 x Cmin / Zs
    assert faults.earth_fault_current_a(230, 1.0) == pytest.approx(218.5)
    assert faults.earth_fault_current_a(230, 1.0, voltage_factor=1) == pytest.approx(230)


def test_loop_impedance_is_ze_plus_r1r2():
    assert faults.loop_impedance_ohm(0.35, [0.1, 0.2]).tolist() == pytest.approx([0.45, 0.55])


def test_prospective_fault_current_is_the_largest_known_and_never_from_ze_in_tt():
    # BS 7671:2018 434.1: the larger of line-neutral and line-earth; IEC 60909-0 Table 1: cmax 1.10 (or 1.05)
    nan = float("nan")
    ka, basis, _ = faults.prospective_fault_current_ka(
        [230] * 4, [0.35] * 4, [False, False, False, True], [nan, 1.6, nan, nan], [nan, nan, 0.2, nan], 1.1
    )
    assert ka[0] == pytest.approx(1.1 * 230 / 0.35 / 1000)  # TN: the line-earth value
    assert ka[1] == 1.6 and basis[1] == "stated"  # stated and larger
    assert ka[2] == pytest.approx(1.1 * 230 / 0.2 / 1000) and basis[2] == "line-neutral"
    assert np.isnan(ka[3]) and basis[3] == "unknown-tt"  # TT with only Ze: not known
    assert faults.origin_fault_level_ka(Supply("TN-S", 230, 0.35, c_max=1.05)) == pytest.approx(
        1.05 * 230 / 0.35 / 1000
    )


def test_the_line_neutral_loop_for_the_smallest_short_circuit():
    # given; else U0 / stated PFC; else (TN) Ze on the safe side; in TT with neither, not known
    from service.electrical.circuit_arrays import columns_of
    from service.electrical.inputs import Circuit, DeviceSpec

    supplies = [
        Supply("TN-S", 230, 0.35, line_neutral_loop_ohm=0.25),
        Supply("TN-S", 230, 0.35, 2.0),
        Supply("TN-S", 230, 0.35),
        Supply("TT", 230, 21, electrode_ohm=20),
    ]
    device = DeviceSpec(rating_a=16, standard="BS EN 60898", type="B")
    cols = columns_of(supplies, [Circuit(device=device, r1_plus_r2_ohm=0.1, load="fixed-equipment")] * 4)
    loop = faults.fault_loop(cols)
    assert loop.zpn_ohm[:3].tolist() == pytest.approx([0.25, 230 / 2000, 0.35]) and np.isnan(loop.zpn_ohm[3])


def test_zero_loop_is_rejected():
    with pytest.raises(InvalidInput):
        faults.earth_fault_current_a(230, 0.0)


def test_fault_current_from_the_supply_and_the_conductors():
    # 6/2.5 mm2 twin and earth, 18 m, 70 degC: R1+R2 = (3.08 + 7.41) x 1.20 x 18 / 1000 = 0.226584 ohm (IEC 60228,
    # BS 7671 Appendix 3 multiplier); Zs = 0.28 + 0.226584; If = 0.95 x 230 / Zs; PFC 1.10 x 230 / 0.28 (IEC 60909-0)
    figures = faults.fault_current(
        supply=Supply("TN-C-S", 230, 0.28), conductors=Conductors("copper", "thermoplastic-70", 6, 2.5, 18)
    )
    assert figures.r1_plus_r2_ohm == pytest.approx(0.226584) and figures.zs_ohm == pytest.approx(0.506584)
    assert figures.earth_fault_current_a == pytest.approx(218.5 / 0.506584)
    assert figures.prospective_fault_current_ka == pytest.approx(1.1 * 230 / 0.28 / 1000)
    with pytest.raises(UnknownConductor) as err:
        faults.fault_current(
            supply=Supply("TN-C-S", 230, 0.28), conductors=Conductors("copper", "thermoplastic-70", 3, 2.5, 18)
        )
    assert err.value.path == ("conductors", "line_csa_mm2")
