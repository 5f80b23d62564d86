"""Reading stated facts, and the clause texts per circuit (common practice: a fact not stated is None)."""

import numpy as np

from service.electrical.checks.facts import among, bases, joined, stated, unknown


def test_stated_facts_and_unstated_ones():
    values = np.array([True, False, None, "A"], dtype=object)
    assert stated(values, True).tolist() == [True, False, False, False]
    assert stated(values, False).tolist() == [False, True, False, False]
    assert unknown(values).tolist() == [False, False, True, False]
    assert among(values, ("A", "B")).tolist() == [False, False, False, True]


def test_bases_name_the_edition_and_each_clause_once():
    editions = np.array(["BS 7671:2018+A4:2026", "BS 7671:2018+A2:2022", "BS 7671:2018+A4:2026"], dtype=object)
    masks = [np.array([True, True, False]), np.array([True, False, False])]
    out = bases(editions, masks, ["sockets", "bathroom"], "rcd-counts")
    assert out[0].startswith("BS 7671:2018+A4:2026 411.3.3, 701.411.3.3 (carried forward")
    assert out[1] == "BS 7671:2018+A2:2022 411.3.3 (BS 7671:2018+A2:2022 (as read in public summaries))"
    assert out[2].startswith("BS 7671:2018+A4:2026 415.1.1")  # none holds: the default rule


def test_joined_names_every_missing_fact_once_per_circuit():
    out = joined([np.array([True, False, True]), np.array([True, False, False])], ["a", "b"], "give ", ".")
    assert out.tolist() == ["give a; b.", None, "give a."]
