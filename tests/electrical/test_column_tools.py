"""Column helpers: scalars in and out, one lookup per distinct key, groups."""

import numpy as np

from service.electrical.column_tools import finite_or_none, groups, map_column, scalar_io


@scalar_io
def doubled(values, factor=2):
    return np.asarray(values, dtype=float) * factor, np.array(["x"] * np.size(values), dtype=object)


def test_scalars_in_scalars_out_and_arrays_stay_arrays():
    value, label = doubled(1.5)
    assert value == 3.0 and isinstance(value, float) and label == "x"
    values, labels = doubled([1.0, 2.0])
    assert values.tolist() == [2.0, 4.0] and labels.tolist() == ["x", "x"]


def test_map_column_looks_each_key_up_once():
    seen = []
    out = map_column(["a", "b", "a", "a"], 4, lambda k: seen.append(k) or len(seen))
    assert out.tolist() == [1, 2, 1, 1] and seen == ["a", "b"]


def test_groups_keep_the_order_of_first_appearance():
    found = groups(["b", "a", "b", None])
    assert list(found) == ["b", "a", None] and found["b"].tolist() == [0, 2]


def test_finite_or_none():
    assert finite_or_none(np.inf) is None and finite_or_none(np.float64(2.5)) == 2.5


def test_short_column_helpers_answer_as_numpy_does():
    from service.electrical.column_tools import nan_to, one_of

    x = [1.0, np.nan, np.inf, -np.inf]
    assert nan_to(x, 0.0).tolist() == [1.0, 0.0, np.inf, -np.inf]
    assert nan_to(x, np.inf).tolist() == [1.0, np.inf, np.inf, -np.inf]
    methods = ["adiabatic", None, "let-through-data", "conservative-0.1s"]
    options = ("let-through-data", "conservative-0.1s")
    assert one_of(methods, options).tolist() == np.isin(np.array(methods, dtype=object), options).tolist()
    assert one_of(np.array(methods, dtype=object), options).tolist() == [False, False, True, True]
