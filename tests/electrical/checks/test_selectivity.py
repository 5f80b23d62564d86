"""The selectivity step: shown where the upstream device is known, counted where selectivity is required.

Pair rules: tests/electrical/test_selectivity.py. BS 7671:2018 536.4; 434.1 for the largest fault (the board's
prospective fault current).
"""

import dataclasses

from service.electrical.inputs import DeviceSpec, Rcd
from service.electrical.results.circuit_result import assemble
from service.electrical.results.verdicts import VERDICTS
from tests.electrical.pipeline import B32, BAKERY, RCBO_B16, TWIN_2_5, circuit, run, step

C63 = DeviceSpec(rating_a=63, standard="BS EN 60898", type="C", breaking_capacity_ka=10)
GG_100 = DeviceSpec(rating_a=100, standard="BS 88-3", type="gG")


def below(upstream, **kwargs):
    """The bakery's supply as a board below ``upstream`` sees it."""
    return dataclasses.replace(BAKERY, upstream_device=upstream, upstream_id="board feed", **kwargs)


def test_shown_only_with_an_upstream_device_and_counted_only_where_required():
    alone = circuit(B32)
    under = circuit(RCBO_B16, TWIN_2_5, load="socket-outlets")
    required = dataclasses.replace(under, selectivity_required=True)
    supplies = [BAKERY, below(C63), below(C63)]
    c = step(run(supplies, alone, under, required), "selectivity")
    assert c.applies.tolist() == [False, True, True] and c.counts.tolist() == [False, False, True]
    # C63 holds up to 5 x 63 = 315 A; the bakery's 2.1 kA can exceed it: partial, a fail where it counts
    assert [VERDICTS[v] for v in c.verdict[1:]] == ["fail", "fail"] and c.limit[1] == 315
    results = assemble(run(supplies, alone, under, required))
    assert results[0].selectivity is None
    assert results[1].selectivity["verdict"] == "partial" and results[1].selectivity["up_to_a"] == 315
    assert "selectivity" in results[1].verdict_scope["left_out"] and results[1].check("selectivity").verdict == "fail"
    assert "selectivity" in results[2].verdict_scope["covered"] and results[2].verdict == "fail"


def test_total_below_the_limit_and_the_rcd_pair_counts_too():
    # B32 class 3 under a gG 100 A cut-out: selective up to 3 kA; the bakery's 2.1 kA stays below it
    c = step(run(below(GG_100, selectivity_required=True), circuit(B32)), "selectivity")
    assert VERDICTS[c.verdict[0]] == "pass" and c.limit[0] == 3000 and c.value[0] == 2100
    # both with RCDs: a general 30 mA RCBO under a general 100 mA RCD is not selective
    rcd_up = dataclasses.replace(GG_100, rcd=Rcd(100))
    rcbo = dataclasses.replace(B32, rcd=Rcd(30))
    c = step(run(below(rcd_up), circuit(rcbo, selectivity_required=True)), "selectivity")
    assert VERDICTS[c.verdict[0]] == "fail" and c.detail[1]["residual"][0] == "none"


def test_not_verified_where_the_data_cannot_show_it():
    rewirable = DeviceSpec(rating_a=60, standard="BS 3036")
    c = step(run(below(rewirable), circuit(B32, selectivity_required=True)), "selectivity")
    assert VERDICTS[c.verdict[0]] == "not-verified" and "maker" in c.note[0]


def test_required_without_an_upstream_device_is_not_verified_not_skipped():
    c = step(run(BAKERY, circuit(B32, selectivity_required=True)), "selectivity")
    assert c.applies.tolist() == [True] and VERDICTS[c.verdict[0]] == "not-verified"
    assert "not known" in c.note[0]
