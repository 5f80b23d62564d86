"""The batch's fast item loader agrees with marshmallow on every item (hypothesis)."""

import copy
import json
from pathlib import Path

from hypothesis import given, settings
from hypothesis import strategies as st
from marshmallow import ValidationError

from service.api.fastload import Refused, fast_load
from service.api.schemas import CircuitSchema

EXAMPLES = json.loads((Path(__file__).resolve().parents[2] / "schemas" / "examples" / "circuits-check-batch.json").read_text())["circuits"]
SCHEMA = CircuitSchema()

values = st.one_of(
    st.none(), st.booleans(), st.integers(-10, 10_000), st.floats(allow_nan=False, allow_infinity=False, width=32),
    st.sampled_from(["", "final", "TN-S", "B", "gG", "copper", "in-cable", "S", "socket-outlets", "x" * 300]),
    st.lists(st.integers(0, 5), max_size=3), st.builds(dict),
    st.fixed_dictionaries({"current_a": st.just(100), "time_s": st.just(1)}),
)


def paths(node, prefix=()):
    if isinstance(node, dict):
        for key, value in node.items():
            yield prefix + (key,)
            yield from paths(value, prefix + (key,))


@st.composite
def items(draw):
    item = copy.deepcopy(draw(st.sampled_from(EXAMPLES)))
    for _ in range(draw(st.integers(0, 3))):
        all_paths = list(paths(item))
        action = draw(st.sampled_from(["set", "delete", "add"]))
        target_path = draw(st.sampled_from(all_paths))
        parent = item
        for key in target_path[:-1]:
            parent = parent[key]
        if not isinstance(parent, dict):
            continue
        if action == "set":
            parent[target_path[-1]] = draw(values)
        elif action == "delete":
            parent.pop(target_path[-1], None)
        else:
            parent[draw(st.sampled_from(["extra", "ring", "rcd", "curve_points", "type", "r1_plus_r2_ohm"]))] = draw(values)
    return item


@given(items())
@settings(max_examples=1500, deadline=None)
def test_fast_loader_agrees_with_marshmallow(item):
    try:
        expected = SCHEMA.load(copy.deepcopy(item))
    except ValidationError:
        expected = None
    try:
        got = fast_load(SCHEMA, copy.deepcopy(item))
    except Refused:
        got = None
    assert got == expected


def test_every_example_item_takes_the_fast_path():
    for item in EXAMPLES:
        assert fast_load(SCHEMA, copy.deepcopy(item)) == SCHEMA.load(copy.deepcopy(item))
