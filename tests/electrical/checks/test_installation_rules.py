"""The checks of a board and of an installation. Sources: BS 7671:2018+A2:2022 311.1 (maximum demand with
diversity; derived), 536.4.1.4 (RCDs in series: upstream type S with three times the IΔn; common practice, from
memory), 443.4 (surge protection; from memory), as in tests/data/requirements-rules.md."""

import math

from service.electrical.checks.installation_rules import demand_check, rcd_selectivity_check, surge_protection_check
from service.electrical.inputs import Circuit, DeviceSpec, Rcd, SurgeProtection, Unread
from tests.electrical.pipeline import TWIN_2_5

A4 = "BS 7671:2018+A4:2026"
FUSE_63 = DeviceSpec(rating_a=63, standard="BS 88-2", type="gG")


def test_demand_against_the_feed_and_the_supply():
    # a house whose circuits add up to 150 A after diversity on a 63 A supply fails; 60 A passes
    assert demand_check(150.0, [], None, 63.0, A4, origin=True).verdict == "fail"
    ok = demand_check(60.0, [], None, 63.0, A4, origin=True)
    assert ok.verdict == "pass" and ok.limit == 63 and ok.margin_percent == round(3 / 63 * 100, 1)
    # the smaller of the supply's rating and the main fuse's
    assert demand_check(60.0, [], DeviceSpec(rating_a=45, standard="BS 88-3"), 100.0, A4, origin=True).limit == 45
    # a sub-main: the device feeding the board
    assert demand_check(70.0, [], FUSE_63, None, A4, origin=False).verdict == "fail"


def test_demand_that_cannot_be_judged_names_what_to_give():
    missing = demand_check(math.nan, ["cooker"], FUSE_63, None, A4, origin=False)
    assert missing.verdict == "not-verified" and "cooker" in missing.note
    unrated = demand_check(50.0, [], None, None, A4, origin=True)
    assert unrated.verdict == "not-verified" and "supply.rated_current_a" in unrated.note


def rcd_circuit(ma, ident="sockets"):
    device = DeviceSpec(rating_a=32, standard="BS EN 61009", type="B", rcd=Rcd(ma, type="A"))
    return Circuit(device, TWIN_2_5, id=ident, load="socket-outlets")


def test_rcds_in_series():
    s_100 = DeviceSpec(rating_a=63, standard="BS 88-2", type="gG", rcd=Rcd(100, delay="S", type="A"))
    general_100 = DeviceSpec(rating_a=63, standard="BS 88-2", type="gG", rcd=Rcd(100, type="A"))
    s_60 = DeviceSpec(rating_a=63, standard="BS 88-2", type="gG", rcd=Rcd(60, delay="S", type="A"))
    below = [rcd_circuit(30), Unread("x")]
    assert rcd_selectivity_check(s_100, below, A4).verdict == "pass"
    bad = rcd_selectivity_check(general_100, below, A4)
    assert bad.verdict == "fail" and "time-delayed (type S)" in bad.note and "sockets" in bad.note
    # the value is what the upstream IΔn must reach (3 x 30 mA), the limit the upstream's own 100 mA
    assert (bad.value, bad.limit) == (90, 100)
    assert rcd_selectivity_check(s_60, below, A4).verdict == "fail"  # 60 < 3 x 30 mA
    assert rcd_selectivity_check(FUSE_63, below, A4) is None  # no RCD above: nothing in series
    assert rcd_selectivity_check(s_100, [Unread("x")], A4) is None


def test_surge_protection():
    assert surge_protection_check(None, A4).verdict == "not-verified"
    assert surge_protection_check(SurgeProtection(True), A4).verdict == "pass"
    assert surge_protection_check(SurgeProtection(False, "commercial"), A4).verdict == "fail"
    assert surge_protection_check(SurgeProtection(False, "other"), A4).verdict == "fail"
    assert surge_protection_check(SurgeProtection(False, "other", declined_in_writing=True), A4).verdict == "pass"
    assert surge_protection_check(SurgeProtection(False, "human-life", declined_in_writing=True), A4).verdict == "fail"
    assert "443.4" in surge_protection_check(None, A4).basis
