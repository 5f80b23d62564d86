"""The registry of device families: every built-in device, its sources, resolving a request's device."""

import numpy as np
import pytest

from service.electrical.devices import catalogue as registry
from service.electrical.devices.catalogue import catalogue, device_by_id, resolve
from service.electrical.errors import UnknownDevice
from service.electrical.inputs import DeviceSpec


def all_builtin_devices():
    out = []
    for family in catalogue():
        for rating in family["ratings_a"]:
            out.append(device_by_id(family["device_id"], rating))
    return out


DEVICES = all_builtin_devices()


def test_catalogue_lists_every_family_with_sources():
    ids = {f["device_id"] for f in catalogue()}
    assert {"bs-en-60898-b", "bs-en-61009-d", "bs-88-2-gg", "bs-88-3-gg", "bs-3036", "bs-1362"} <= ids
    for family in catalogue():
        assert family["data"]["source"] and family["data"]["confidence"]
        assert family["ratings_a"]


def test_fuse_ratings_are_only_the_published_ones():
    with pytest.raises(UnknownDevice) as err:
        resolve(DeviceSpec(rating_a=17, standard="BS 88-2"))
    assert err.value.path == ("rating_a",)
    with pytest.raises(UnknownDevice):
        resolve(DeviceSpec(rating_a=30, standard="BS 3036", type="gG"))
    with pytest.raises(UnknownDevice):
        resolve(DeviceSpec(rating_a=30, standard="BS 9999"))


@pytest.mark.parametrize("dev", DEVICES, ids=lambda d: d.label)
def test_time_falls_as_current_rises_for_every_builtin_device(dev):
    lo = dev.characteristic.min_current_a
    currents = np.geomspace(lo * 0.5, dev.characteristic.current_a[-1] * 3, 400)
    t, _ = dev.time_at(currents)
    assert np.all(t[1:] <= t[:-1])
    assert np.all(np.isinf(t[currents < lo]))


@pytest.mark.parametrize("dev", DEVICES, ids=lambda d: d.label)
def test_inverse_returns_the_current_on_strictly_falling_segments(dev):
    ch = dev.characteristic
    for k in range(len(ch.current_a) - 1):
        if ch.current_a[k + 1] > ch.current_a[k] and ch.time_s[k + 1] < ch.time_s[k]:
            currents = np.geomspace(ch.current_a[k], ch.current_a[k + 1], 9)
            t, _ = dev.time_at(currents)
            back, _ = dev.current_for(t)
            np.testing.assert_allclose(back, currents, rtol=1e-9)


def test_the_registry_answers_for_every_family():
    assert registry.standards()[:6] == ["BS EN 60898", "BS EN 61009", "BS 88-2", "BS 88-3", "BS 3036", "BS 1362"]
    assert registry.standards()[6:] == ["BS EN 60947-2"]
    assert registry.types() == ["B", "C", "D", "gG"]
    assert registry.ratings_for("BS EN 60898")[:3] == [6.0, 10.0, 16.0]
    assert registry.ratings_for("BS 3036") == [5.0, 15.0, 20.0, 30.0, 45.0, 60.0, 100.0]
    with pytest.raises(UnknownDevice) as err:
        registry.family_of("BS 9999")
    assert err.value.path == ("standard",)


def test_overload_factor_of_a_semi_enclosed_fuse():
    # BS 7671 Appendix 4 (433.1.101 in the 2008 numbering): Cc = 0.725 for BS 3036 fuses (A); 1.0 otherwise
    assert registry.overload_factor("BS 3036")[0] == 0.725
    assert registry.overload_factor("BS 88-2") == (1.0, "no device factor")
    assert registry.overload_factor("BS EN 60898")[0] == 1.0 and registry.overload_factor(None)[0] == 1.0


def test_device_by_catalogue_id():
    dev = device_by_id("bs-88-3-gg", 32)
    assert (dev.standard, dev.type, dev.rating_a) == ("BS 88-3", "gG", 32)
    with pytest.raises(UnknownDevice) as err:
        device_by_id("nothing", 32)
    assert err.value.path == ("device_id",)


def test_a_device_needs_a_standard_or_its_points():
    with pytest.raises(UnknownDevice) as err:
        resolve(DeviceSpec(rating_a=32))
    assert err.value.path == ("standard",)
    with pytest.raises(UnknownDevice) as err:
        resolve(DeviceSpec(rating_a=32, standard="BS EN 60898"))
    assert err.value.path == ("type",)
