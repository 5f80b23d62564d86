"""Every data table carries its title and source beside its numbers."""

import json
from importlib import resources

import pytest

from service.electrical.datafiles import core_table, device_table, provenance

TABLES = [
    ("service.electrical", p.name[:-5])
    for p in resources.files("service.electrical").joinpath("data").iterdir()
    if p.name.endswith(".json")
]
TABLES += [
    ("service.electrical.devices", p.name[:-5])
    for p in resources.files("service.electrical.devices").joinpath("data").iterdir()
    if p.name.endswith(".json")
]


@pytest.mark.parametrize("package, name", TABLES, ids=[n for _, n in TABLES])
def test_every_table_names_its_source_and_confidence(package, name):
    table = core_table(name) if package == "service.electrical" else device_table(name)
    assert table["title"] and table["source"], name
    assert "confidence" in json.dumps(table), f"{name} says nowhere how far its numbers are trusted"


def test_provenance_keeps_only_the_source_fields():
    assert set(provenance(core_table("voltage_factors"))) <= {"title", "source", "edition", "confidence", "notes"}
