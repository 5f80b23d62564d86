"""The lean table: every figure and check as the full results give it, each text and device said once."""

from service.contract.lean_table import Interned, add_problem, check_table, column_names, empty_columns, extend
from service.electrical.checks import CHECKS
from service.electrical.results.circuit_result import assemble
from tests.electrical.pipeline import B32, BAKERY, KIOSK, RCBO_B16, TWIN_2_5, circuit, run


def test_the_table_holds_what_the_full_results_hold():
    circuits = [circuit(), circuit(RCBO_B16, TWIN_2_5, load="socket-outlets"), circuit(B32, TWIN_2_5)]
    full = assemble(run([BAKERY, KIOSK, BAKERY], *circuits))
    texts, devices = Interned(), Interned()
    part = check_table([BAKERY, KIOSK, BAKERY], circuits, texts, devices)
    table = part.columns
    assert part.good == [0, 1, 2] and set(table) == set(column_names(CHECKS))
    assert len(texts.items) == len(set(texts.items)) and len(devices.items) == 2  # B32 twice: one entry
    for i, result in enumerate(full):
        assert table["verdict"][i] == result.verdict and table["zs_ohm"][i] == result.zs_ohm
        assert devices.items[table["device"][i]] == result.device
        for check in result.checks:
            assert table[f"{check.check}.value"][i] == check.value
            assert texts.items[table[f"{check.check}.basis"][i]] == check.basis
        assert [texts.items[k] for k in table["cautions"][i] or []] == result.cautions[3:]
    assert table["rcd.verdict"][0] is None and table["rcd.verdict"][1] is not None  # the rcd check applies to one


def test_interned_values_keep_their_first_position():
    texts = Interned()
    assert texts.codes(["a", None, "b", "a"]) == [0, None, 1, 0] and texts.codes(["b", "c"]) == [1, 2]


def test_a_problem_row_keeps_the_place_of_its_item():
    table = empty_columns(column_names(CHECKS))
    extend(table, {name: [None] for name in table})
    add_problem(table, 7, "spare", 0)
    assert table["index"] == [None, 7] and table["verdict"][1] == "invalid" and table["problem"][1] == 0
    assert len({len(values) for values in table.values()}) == 1


def test_caution_patterns_are_the_distinct_rows_whatever_the_width():
    import numpy as np

    from service.contract.lean_table import _patterns

    rng = np.random.default_rng(5)
    for width in (1, 3, 62, 63, 70):
        matrix = rng.random((300, width)) < 0.05
        patterns, inverse = _patterns(matrix)
        assert (patterns[inverse] == matrix).all()
        assert len(patterns) == len(np.unique(matrix, axis=0))
