from datetime import datetime, timedelta

from fernhill.alerts import CRITICAL, WARNING, Alert, count_by_level, deduplicate, dry_zone_alerts, worst_first
from fernhill.readings import Reading
from fernhill.zones import Zone, ZoneRegistry

NOW = datetime(2026, 5, 1, 12, 0)


def make_registry():
    registry = ZoneRegistry()
    registry.add(Zone("n1", "north 1", "north", "tomato", 40.0))
    registry.add(Zone("s1", "south 1", "south", "basil", 30.0))
    return registry


def make_reading(zone_id, moisture):
    return Reading(f"{zone_id}-s1", zone_id, moisture, 20.0, NOW - timedelta(minutes=5))


def test_dry_zone_alerts():
    registry = make_registry()
    readings = [make_reading("n1", 20.0), make_reading("s1", 29.0)]
    alerts = dry_zone_alerts(registry, readings, NOW)
    assert [(alert.zone_id, alert.level) for alert in alerts] == [("n1", CRITICAL)]


def test_worst_first():
    alerts = [Alert(WARNING, "b", "dry", NOW), Alert(CRITICAL, "a", "very dry", NOW)]
    ordered = worst_first(alerts)
    assert ordered[0].level == CRITICAL


def test_deduplicate():
    alert = Alert(WARNING, "a", "dry", NOW)
    assert deduplicate([alert, alert]) == [alert]


def test_count_by_level():
    alerts = [Alert(WARNING, "a", "x", NOW), Alert(WARNING, "b", "y", NOW), Alert(CRITICAL, "c", "z", NOW)]
    counts = count_by_level(alerts)
    assert counts == {WARNING: 2, CRITICAL: 1}
