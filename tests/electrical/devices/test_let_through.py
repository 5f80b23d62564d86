"""Let-through energy below 0.1 s: BS EN 60898-1 Annex ZA classes and IEC 60269-1 gG I2t (tests/data, from memory)."""

import numpy as np
import pytest

from service.electrical.devices import let_through
from service.electrical.devices.catalogue import resolve
from service.electrical.errors import InvalidInput
from service.electrical.inputs import DeviceSpec
from tests.reference import rows


def test_every_class_cell_of_the_reference():
    # tests/data/let-through-energy.csv: BS EN 60898-1 Annex ZA (M)
    for row in rows("let-through-energy.csv"):
        rating = 16 if row["rating_band"] == "in<=16" else 32
        current = float(row["icn_a"])
        for energy_class in (2, 3):
            for type_ in "BC":
                got = let_through.class_let_through_a2s(type_, rating, energy_class, current)
                assert got[0] == float(row[f"class{energy_class}_type_{type_.lower()}_a2s"])


def test_the_column_at_or_above_the_current_and_nothing_beyond():
    energy = let_through.class_let_through_a2s("B", 32, 3, [500, 3000, 3001, 10_000, 10_001])
    assert energy[:4].tolist() == [18_000, 18_000, 32_000, 90_000] and np.isnan(energy[4])
    assert np.isnan(let_through.class_let_through_a2s("B", 32, 1, 1000)[0])  # class 1 sets no limit
    assert np.isnan(let_through.class_let_through_a2s("D", 32, 3, 1000)[0])  # types B and C only
    with pytest.raises(InvalidInput):
        let_through.class_let_through_a2s("B", 32, 4, 1000)


def test_gg_operating_and_pre_arcing_energies():
    # tests/data/gG-i2t.csv (IEC 60269-1, M): 63 A operating 27 000 A2s; 17 A takes 20 A's (the next larger)
    for row in rows("gG-i2t.csv"):
        assert let_through.gg_operating_a2s(float(row["rating_a"]))[0] == float(row["operating_max_a2s"])
        assert let_through.gg_pre_arcing_a2s(float(row["rating_a"])) == float(row["pre_arcing_min_a2s"])
    assert let_through.gg_operating_a2s(17)[0] == 1800
    assert let_through.gg_pre_arcing_a2s(17) == 300  # for selectivity the next smaller rating's (the safe side)


def test_families_answer_for_their_devices():
    b16 = resolve(DeviceSpec(rating_a=16, standard="BS EN 60898", type="B"))
    energy, basis = let_through.__name__, None
    from service.electrical.devices.catalogue import let_through as of

    energy, basis = of(b16, [1000.0], None)
    assert energy[0] == 15_000 and "class 3" in basis
    energy, _ = of(resolve(DeviceSpec(rating_a=63, standard="BS 88-2")), [1000.0])
    assert energy[0] == 27_000
    energy, basis = of(resolve(DeviceSpec(rating_a=30, standard="BS 3036")), [1000.0])
    assert np.isnan(energy[0]) and basis is None  # no data: the maker's figure, or the stand-in


CURVE = ((200.0, 900.0), (1000.0, 2000.0), (3000.0, 4500.0))  # an invented maker's curve (demo data)


def test_a_makers_curve_is_read_on_log_log_axes_and_never_extrapolated():
    # between points, straight on log-log axes (DESIGN.md, as a designer reads the printed graph): at 2 000 A,
    # ln E = ln 2000 + (ln 2000 - ln 1000) / (ln 3000 - ln 1000) x (ln 4500 - ln 2000)
    expected = np.exp(np.log(2000) + np.log(2) / np.log(3) * np.log(4500 / 2000))
    got = let_through.curve_a2s(CURVE, [100, 200, 2000, 3000, 3001])
    assert got[0] == 900 and got[1] == 900  # below the first point: its energy, never less
    assert got[2] == pytest.approx(expected) and got[3] == pytest.approx(4500) and np.isnan(got[4])


def test_a_curves_limit_against_an_energy():
    # crossing 3 000 A2s between 1 000 A (2 000 A2s) and 3 000 A (4 500 A2s) on log-log axes
    crossing = np.exp(np.log(1000) + np.log(3000 / 2000) / np.log(4500 / 2000) * np.log(3))
    assert let_through.curve_limit_a(CURVE, 3000) == pytest.approx(crossing)
    assert let_through.curve_limit_a(CURVE, 10_000) == 3000  # the curve's last point, never beyond
    assert let_through.curve_limit_a(CURVE, 500) == 0.0


def test_a_curve_must_rise():
    with pytest.raises(InvalidInput):
        let_through.check_curve(((1000.0, 2000.0), (500.0, 3000.0)))
    with pytest.raises(InvalidInput):
        let_through.check_curve(((1000.0, 2000.0), (2000.0, 1000.0)))
    with pytest.raises(InvalidInput):
        let_through.check_curve(((1000.0, 2000.0),))
