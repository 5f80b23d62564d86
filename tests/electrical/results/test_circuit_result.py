"""One result per circuit, built from the pipeline's arrays by one function."""

import numpy as np

from service.electrical.results.circuit_result import GENERAL_CAUTIONS, CircuitResult, assemble, lists_of
from tests.electrical.pipeline import BAKERY, RCBO_B16, TWIN_2_5, circuit, run


def test_lists_of_turns_nan_and_infinity_into_none_and_keeps_the_order():
    out = lists_of(
        {"b": np.array([1.0, np.nan]), "a": np.array(["x", None], dtype=object), "c": np.array([np.inf, 2.0])}
    )
    assert list(out) == ["b", "a", "c"] and out["b"] == [1.0, None] and out["c"] == [None, 2.0]


def test_results_carry_every_field_and_only_the_checks_that_apply():
    results = assemble(run(BAKERY, circuit(id="oven"), circuit(RCBO_B16, TWIN_2_5, load="socket-outlets", id="ring")))
    oven, ring = results
    assert isinstance(oven, CircuitResult) and (oven.id, ring.id) == ("oven", "ring")
    assert oven.check("rcd") is None and ring.check("rcd") is not None
    assert oven.cautions[:3] == list(GENERAL_CAUTIONS)
    assert oven.protective_conductor["verdict"] == "pass" and oven.rcd_max_zs_ohm is None
    assert oven.verdict == "not-verified"  # no design current or installation: overload cannot be checked
    assert oven.check("overload").verdict == "not-verified" and ring.device["device_id"] == "bs-en-61009-b"
