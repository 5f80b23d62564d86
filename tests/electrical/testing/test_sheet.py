"""The limits a tester must meet on site (service.electrical.testing.sheet)."""

import pytest

from service.electrical.circuit_arrays import CircuitFailure
from service.electrical.inputs import Circuit, Conductors, DeviceSpec, Rcd
from service.electrical.testing.sheet import SiteLimits, site_limits
from tests.electrical.pipeline import BAKERY, KIOSK

# Invented demo scenario: Larkspur Bakery (TN-C-S, Ze 0.28 ohm) and its TT garden kiosk (tests/electrical/pipeline.py)
HEATER = Circuit(
    id="heater",
    role="final",
    load="fixed-equipment",
    device=DeviceSpec(rating_a=20, standard="BS EN 60898", type="B", breaking_capacity_ka=6),
    conductors=Conductors("copper", "thermoplastic-70", 2.5, 1.5, 20),
)
RCBO = DeviceSpec(rating_a=16, standard="BS EN 61009", type="B", breaking_capacity_ka=6, rcd=Rcd(30, "S", "A"))


def test_the_largest_zs_at_the_test_temperature():
    (limits,) = site_limits(BAKERY, [HEATER])
    assert isinstance(limits, SiteLimits)
    # BS 7671:2018 Table 41.3: B20 at 0.4 s 2.19 ohm at 70 degC; at 20 degC x 1/(1 + 0.004 x 50) (Appendix 3)
    assert limits.max_zs_ohm == pytest.approx(2.19 / 1.2, abs=0.005)
    # IEC 60228: 7.41 + 12.1 mohm/m over 20 m at 20 degC; Ze + that is the reading to expect, 1.5 x it the ceiling
    r1r2 = 0.020 * (7.41 + 12.1)
    assert limits.expected_r1_plus_r2_ohm == pytest.approx(r1r2, rel=2e-3)
    assert limits.expected_zs_ohm == pytest.approx(0.28 + r1r2, rel=2e-3)
    assert limits.continuity_max_zs_ohm == pytest.approx(1.5 * (0.28 + r1r2), rel=2e-3)
    assert limits.ring_r1_ohm is None and limits.rcd_residual_current_ma is None


def test_the_rcd_to_test_in_tt():
    kiosk = Circuit(id="kiosk", role="final", load="socket-outlets", device=RCBO, conductors=HEATER.conductors)
    (limits,) = site_limits(KIOSK, [kiosk])
    # TT: no metallic loop to expect; a time-delayed (S) RCD: 130 to 500 ms at IΔn, at most 150 ms at 5 IΔn
    # (BS EN 61008-1 / 61009-1 Table 1)
    assert limits.expected_zs_ohm is None and limits.continuity_max_zs_ohm is None
    assert (limits.rcd_residual_current_ma, limits.rcd_type) == (30, "A")
    assert (limits.rcd_min_time_ms_at_idn, limits.rcd_max_time_ms_at_idn, limits.rcd_max_time_ms_at_5idn) == (
        130,
        500,
        150,
    )


def test_a_circuit_that_cannot_be_checked_has_no_limits():
    bad = Circuit(id="bad", role="final", load="fixed-equipment", device=DeviceSpec(rating_a=7, standard="BS 88-2"))
    (failure,) = site_limits(BAKERY, [bad])
    assert isinstance(failure, CircuitFailure)
