"""Typed errors with a path, wrapped without losing their subclass."""

from service.electrical.errors import InvalidInput, UnknownDevice, as_path


def test_a_path_from_a_name_or_a_sequence():
    assert as_path("u0_v") == ("u0_v",) and as_path(("curve_points", 2)) == ("curve_points", 2)


def test_within_prefixes_the_path_and_keeps_the_subclass():
    err = UnknownDevice("rating_a", "no such rating").within("circuit", "device")
    assert type(err) is UnknownDevice and err.path == ("circuit", "device", "rating_a")
    assert err.field == "circuit.device.rating_a" and str(err) == "circuit.device.rating_a: no such rating"
    assert err.within("circuit", "device") is err  # wrapping twice changes nothing


def test_every_error_is_a_value_error():
    assert isinstance(InvalidInput("x", "y"), ValueError)
