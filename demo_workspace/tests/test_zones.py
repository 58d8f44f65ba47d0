import pytest

from fernhill.zones import Zone, ZoneRegistry, dump_zones, load_zones, moisture_deficit, zones_needing_water


def make_registry():
    registry = ZoneRegistry()
    registry.add(Zone("n1", "north 1", "north", "tomato", 40.0, ["n1-v1"], ["n1-s1"]))
    registry.add(Zone("s1", "south 1", "south", "basil", 30.0, ["s1-v1"], ["s1-s1"]))
    return registry


def test_duplicate_zone_is_refused():
    registry = make_registry()
    with pytest.raises(ValueError):
        registry.add(Zone("n1", "again", "north", "tomato", 40.0))


def test_zone_for_sensor():
    registry = make_registry()
    zone = registry.zone_for_sensor("s1-s1")
    assert zone is not None and zone.zone_id == "s1"


def test_attach_sensor_to_second_zone_is_refused():
    registry = make_registry()
    with pytest.raises(ValueError):
        registry.attach_sensor("n1", "s1-s1")


def test_round_trip():
    registry = make_registry()
    rows = dump_zones(registry)
    loaded = load_zones(rows)
    assert dump_zones(loaded) == rows


def test_zones_needing_water():
    registry = make_registry()
    thirsty = zones_needing_water(registry, {"n1": 35.0, "s1": 31.0})
    assert [zone.zone_id for zone in thirsty] == ["n1"]


def test_moisture_deficit_is_never_negative():
    zone = Zone("n1", "north 1", "north", "tomato", 40.0)
    assert moisture_deficit(zone, 45.0) == 0.0
    assert moisture_deficit(zone, 30.0) == 10.0
