"""Ring final circuit continuity (BS 7671:2018 643.2.1; the 0.05 ohm tolerance is common practice)."""

import pytest

from service.electrical.errors import InvalidInput
from service.electrical.inputs import Conductors
from service.electrical.testing.measured import Measured
from service.electrical.testing.ring import TOLERANCE_OHM, end_to_end_ohm, judge_ring

RING = Conductors("copper", "thermoplastic-70", 2.5, 1.5, 64, ring=True)


def test_end_to_end_values_at_20_degc():
    # IEC 60228 Table 1, class 2 copper at 20 degC: 2.5 mm2 7.41 mohm/m, 1.5 mm2 12.1 mohm/m; 64 m of ring
    r1, rn, r2 = end_to_end_ohm(RING, 20.0)
    assert r1 == pytest.approx(0.064 * 7.41, rel=1e-3) and rn == pytest.approx(r1)
    assert r2 == pytest.approx(0.064 * 12.1, rel=1e-3)
    # 1 + 0.004 (theta - 20) (BS 7671 Appendix 3 approach): at 10 degC each is 0.96 of the 20 degC value
    assert end_to_end_ohm(RING, 10.0)[0] == pytest.approx(r1 * 0.96)


def test_each_rule_is_judged_on_its_difference():
    # r1 0.474 and rn 0.53 are 0.056 ohm apart: more than the 0.05 allowed (common practice)
    (ends,) = judge_ring(Measured(ring_r1_ohm=0.474, ring_rn_ohm=0.53), RING)
    assert ends.verdict == "fail" and ends.measured == pytest.approx(0.056) and ends.limit == TOLERANCE_OHM
    assert ends.rule == "line and neutral ends within 0.05 ohm of each other" and "rn 0.53" in ends.note
    # r2 0.774 against r1 x 2.5/1.5 = 0.790: 0.016 apart, a pass
    (cpc,) = judge_ring(Measured(ring_r1_ohm=0.474, ring_r2_ohm=0.774), RING)
    assert cpc.verdict == "pass" and cpc.measured == pytest.approx(0.016) and "2.5/1.5" in cpc.rule


def test_readings_on_a_circuit_that_is_no_ring_are_refused():
    radial = Conductors("copper", "thermoplastic-70", 2.5, 1.5, 20)
    with pytest.raises(InvalidInput) as err:
        judge_ring(Measured(ring_r1_ohm=0.2), radial)
    assert err.value.path == ("measured", "ring_r1_ohm")
    assert judge_ring(Measured(zs_ohm=0.5), radial) == []
