"""The max-zs check: Zs <= U0 x Cmin / Ia (411.4.4, 411.5.4), or the RCD's 50 V / IΔn (411.4.5, 411.5.3)."""

import pytest

from service.electrical.inputs import Conductors
from service.electrical.results.verdicts import VERDICTS
from tests.electrical.pipeline import BAKERY, KIOSK, RCBO_B16, TWIN_2_5, circuit, run, step


def test_against_the_breakers_limit():
    # B32: 0.95 x 230 / 160 = 1.3656 ohm (BS 7671:2018 Table 41.3: 1.37); oven Zs 0.5066 passes, 60 m run 1.6847 fails
    long = circuit(conductors=Conductors("copper", "thermoplastic-70", 2.5, 1.5, 60))
    c = step(run(BAKERY, circuit(), long), "max-zs")
    assert c.limit.tolist() == pytest.approx([1.365625, 1.365625])
    assert [VERDICTS[v] for v in c.verdict] == ["pass", "fail"] and "411.4.4" in c.basis[0]


def test_credited_to_the_rcd_with_its_own_basis():
    # TT kiosk: the breaker's 2.73 ohm is far below Zs 21.6 ohm; RA 20.363 ohm x 30 mA = 0.61 V <= 50 V (411.5.3)
    checked = run(KIOSK, circuit(RCBO_B16, TWIN_2_5, load="socket-outlets"))
    c = step(checked, "max-zs")
    assert VERDICTS[c.verdict[0]] == "pass" and "411.5.3" in c.basis[0] and "RCD provides" in c.note[0]
    assert c.value[0] == pytest.approx(20.363) and c.limit[0] == pytest.approx(1666.67, abs=0.01)
    assert checked.trip.max_zs_oc_ohm[0] == pytest.approx(218.5 / 80)  # the breaker's own limit is kept apart
