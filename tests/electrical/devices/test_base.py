"""What every device offers: its label, summary and regions."""

from service.electrical.devices.catalogue import resolve
from service.electrical.inputs import DeviceSpec


def test_label_summary_and_regions_of_a_breaker():
    dev = resolve(DeviceSpec(rating_a=32, standard="BS EN 60898", type="B"))
    assert dev.label == "BS EN 60898 B 32 A"
    summary = dev.summary()
    assert summary["device_id"] == "bs-en-60898-b" and summary["source"].startswith("BS EN 60898-1")
    # BS EN 60898-1 Table 7: thermal from 1.45 In, instantaneous from 5 In (type B)
    assert dev.region_names() == ("below-data", "thermal", "instantaneous")
    assert dev.region_at([40, 46.4, 100, 160]).tolist() == ["below-data", "thermal", "thermal", "instantaneous"]
    assert dev.region_at(200) == "instantaneous"


def test_a_user_curve_says_where_its_data_come_from():
    dev = resolve(DeviceSpec(rating_a=16, curve_points=((50, 10), (200, 0.1))))
    assert dev.label == "user curve 16 A" and dev.summary()["source"] == "curve points given in the request"
    assert dev.region_at([10, 100, 500]).tolist() == ["below-data", "user-curve", "above-data"]
