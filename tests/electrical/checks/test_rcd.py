"""The rcd check: Zs (TN) or RA (TT) x IΔn <= 50 V (BS 7671:2018 411.4.5, 411.5.3), and the RCD's cautions."""

import pytest

from service.electrical.inputs import Supply
from service.electrical.results.verdicts import VERDICTS
from tests.electrical.pipeline import BAKERY, KIOSK, RCBO_B16, TWIN_2_5, circuit, run, step


def test_applies_only_where_an_rcd_is_fitted():
    c = step(run(KIOSK, circuit(RCBO_B16, TWIN_2_5, load="socket-outlets"), circuit(load="fixed-equipment")), "rcd")
    assert c.applies.tolist() == [True, False]
    # RA = 20 + 12.1 x 1.2 x 25 / 1000 = 20.363 ohm; 50 V / 30 mA = 1666.7 ohm (Table 41.5)
    assert VERDICTS[c.verdict[0]] == "pass" and c.value[0] == pytest.approx(20.363) and "411.5.3" in c.basis[0]


def test_ra_not_given_uses_zs_and_says_so():
    c = step(run(Supply("TT", 230, 21), circuit(RCBO_B16, TWIN_2_5, load="socket-outlets")), "rcd")
    assert "RA not given" in c.note[0]


def test_a_caution_for_an_unstable_electrode():
    # note to Table 41.5: above 200 ohm (whether sockets need a 30 mA RCD is the additional-protection check's)
    wet = Supply("TT", 230, 260, electrode_ohm=250)
    c = step(
        run([wet, BAKERY], circuit(RCBO_B16, TWIN_2_5, load="socket-outlets"), circuit(load="socket-outlets")), "rcd"
    )
    unstable, _ = (mask.tolist() for mask, _ in c.cautions)
    assert unstable == [True, False]
