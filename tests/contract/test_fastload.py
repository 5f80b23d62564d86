"""The fast loader agrees with marshmallow on every schema it serves (hypothesis), and refuses what it cannot serve."""

import copy
import json

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from marshmallow import Schema, ValidationError, fields

from service.contract import fastload
from service.contract.circuit_schemas import CheckRequestSchema, CircuitSchema, SupplySchema
from service.contract.fastload import Refused, fast_load
from service.contract.fields import Number
from service.contract.installation_schemas import BoardCircuitSchema
from tests.paths import EXAMPLES


def example(name):
    return json.loads((EXAMPLES / name).read_text())


# every registered schema, with the example items it is held to marshmallow on
SAMPLES = {
    SupplySchema: [example(n)["supply"] for n in ("circuits-check.json", "test-results-verify.json")]
    + [{"earthing": "TT", "u0_v": 230, "ze_ohm": 21, "electrode_ohm": 20, "bonding_complete": True, "c_max": 1.05}],
    CircuitSchema: example("circuits-check-batch.json")["circuits"] + [example("circuits-check.json")["circuit"]],
    CheckRequestSchema: [example("circuits-check.json")],
    BoardCircuitSchema: [c for board in example("installations-check.json")["boards"] for c in board["circuits"]],
}

values = st.one_of(
    st.none(),
    st.booleans(),
    st.integers(-10, 10_000),
    st.floats(allow_nan=False, allow_infinity=False, width=32),
    st.sampled_from(["", "final", "TN-S", "TT", "B", "gG", "copper", "in-cable", "S", "socket-outlets", "x" * 300]),
    st.lists(st.integers(0, 5), max_size=3),
    st.builds(dict),
    st.fixed_dictionaries({"current_a": st.just(100), "time_s": st.just(1)}),
)


def paths(node, prefix=()):
    if isinstance(node, dict):
        for key, value in node.items():
            yield prefix + (key,)
            yield from paths(value, prefix + (key,))


@st.composite
def mutated(draw, samples):
    item = copy.deepcopy(draw(st.sampled_from(samples)))
    for _ in range(draw(st.integers(0, 3))):
        all_paths = list(paths(item))
        if not all_paths:
            break
        target_path = draw(st.sampled_from(all_paths))
        parent = item
        for key in target_path[:-1]:
            parent = parent[key]
        if not isinstance(parent, dict):
            continue
        action = draw(st.sampled_from(["set", "delete", "add"]))
        if action == "set":
            parent[target_path[-1]] = draw(values)
        elif action == "delete":
            parent.pop(target_path[-1], None)
        else:
            extra = draw(
                st.sampled_from(["extra", "ring", "rcd", "curve_points", "type", "r1_plus_r2_ohm", "c_max", "phase"])
            )
            parent[extra] = draw(values)
    return item


def test_every_registered_schema_has_samples():
    served = {cls for cls in fastload.registered() if cls.__module__.startswith("service.")}
    assert served == set(SAMPLES), "every schema the service registers is held to marshmallow on samples here"


@pytest.mark.parametrize("cls", list(SAMPLES), ids=lambda c: c.__name__)
def test_fast_loader_agrees_with_marshmallow(cls):
    schema = cls()

    @given(mutated(SAMPLES[cls]))
    @settings(max_examples=600, deadline=None)
    def agree(item):
        try:
            expected = Schema.load(schema, copy.deepcopy(item))
        except ValidationError:
            expected = None
        try:
            got = fast_load(schema, copy.deepcopy(item))
        except Refused:
            got = None
        assert got == expected

    agree()


@pytest.mark.parametrize("cls", list(SAMPLES), ids=lambda c: c.__name__)
def test_every_sample_takes_the_fast_path(cls):
    for item in SAMPLES[cls]:
        assert fast_load(cls(), copy.deepcopy(item)) == Schema.load(cls(), copy.deepcopy(item))


class WireNames(Schema):
    """A schema whose input key differs from its attribute (data_key), as marshmallow loads it."""

    rating = Number(minimum=0, maximum=100, data_key="rating_a", required=True)


def test_a_data_key_field_comes_out_under_its_attribute():
    fastload.register(WireNames)
    assert fast_load(WireNames(), {"rating_a": 32}) == WireNames().load({"rating_a": 32}) == {"rating": 32.0}


def test_only_and_exclude_are_refused():
    with pytest.raises(Refused):
        fast_load(CircuitSchema(only=("id",)), {"id": "a"})

    class Partial(Schema):
        inner = fields.Nested(SupplySchema(only=("earthing",)))

    with pytest.raises(TypeError):
        fastload.register(Partial)


def test_a_remembered_nested_object_is_not_confused_with_an_equal_value_of_another_type():
    # 1 == 1.0 == True in Python: the schema tells them apart, and so must the loader's memory
    item = example("circuits-check-batch.json")["circuits"][0]
    first = copy.deepcopy(item)
    first["conductors"]["ring"] = True
    fast_load(CircuitSchema(), first)
    second = copy.deepcopy(item)
    second["conductors"]["ring"] = 1
    with pytest.raises(Refused):
        fast_load(CircuitSchema(), second)
