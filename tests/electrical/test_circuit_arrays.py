"""Circuits as columns, and the per-item lookups that turn one bad circuit into a failure naming its path."""

import numpy as np

from service.electrical.circuit_arrays import columns_of, prepare
from service.electrical.errors import InvalidInput, UnknownConductor, UnknownDevice
from service.electrical.inputs import Conductors, DeviceSpec, Supply
from tests.electrical.pipeline import B32, BAKERY, RCBO_B16, TWIN_6, circuit


def test_columns_group_devices_and_rcds():
    items = [circuit(), circuit(RCBO_B16), circuit(), circuit(conductors=None, r1_plus_r2_ohm=0.3)]
    cols = columns_of([BAKERY] * 4, items)
    assert cols.n == 4 and len(cols.device_groups) == 2 and list(cols.rcd_groups) == [(30, "general")]
    assert cols.has_rcd.tolist() == [False, True, False, False]
    assert np.isnan(cols.r1r2_given_ohm[:3]).all() and cols.r1r2_given_ohm[3] == 0.3
    assert cols.conductors.present.tolist() == [True, True, True, False]
    assert cols.devices[0] is cols.devices[2]


def test_failures_name_their_path_and_type():
    items = [
        circuit(conductors=None),
        circuit(DeviceSpec(rating_a=17, standard="BS 88-2")),
        circuit(conductors=Conductors("copper", "thermoplastic-70", 3, 1.5, 10)),
        circuit(DeviceSpec(rating_a=16, standard="BS EN 61009", type="B")),
        circuit(B32, TWIN_6),
    ]
    supplies = [BAKERY] * 4 + [Supply("TN-S", 48, 0.3)]
    good, failures = prepare(supplies, items)
    assert good == []
    found = [(f.index, f.path, f.error) for f in failures]
    assert found == [
        (0, ("circuit", "conductors"), InvalidInput),
        (1, ("circuit", "device", "rating_a"), UnknownDevice),
        (2, ("circuit", "conductors", "line_csa_mm2"), UnknownConductor),
        (3, ("circuit", "device", "rcd"), InvalidInput),
        (4, ("supply", "u0_v"), InvalidInput),  # Table 41.1 covers U0 above 50 V a.c.
    ]


def test_device_columns_read_each_spec_once_and_group_equal_ones_in_order_of_appearance():
    import dataclasses

    twin = dataclasses.replace(B32)  # equal to B32, another object
    items = [circuit(RCBO_B16), circuit(), circuit(twin), circuit(RCBO_B16), circuit(conductors=None, r1_plus_r2_ohm=1)]
    cols = columns_of([BAKERY] * 5, items)
    assert list(cols.device_groups) == [RCBO_B16.curve_key, B32.curve_key]
    assert [g.tolist() for g in cols.device_groups.values()] == [[0, 3], [1, 2, 4]]
    assert cols.devices[2] is cols.devices[1] and cols.devices[3] is cols.devices[0]
    assert cols.rating_a.tolist() == [16, 32, 32, 16, 32]
    assert [g.tolist() for g in cols.rcd_groups.values()] == [[0, 3]]
    assert cols.energy_class == [c.device.energy_limiting_class for c in items]
    expected = [np.nan if c.device.breaking_capacity_ka is None else c.device.breaking_capacity_ka for c in items]
    np.testing.assert_array_equal(cols.breaking_capacity_ka, expected)
