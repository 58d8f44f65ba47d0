from datetime import datetime, timedelta

import pytest

from fernhill.readings import (Reading, average_moisture, drop_outliers, group_by_zone, latest_reading,
                               parse_reading, parse_readings, readings_for_zone, stale_sensors)

START = datetime(2026, 5, 1, 6, 0)


def make_reading(zone_id="n1", sensor_id="n1-s1", moisture=35.0, minutes=0):
    return Reading(sensor_id, zone_id, moisture, 21.0, START + timedelta(minutes=minutes))


def test_parse_reading():
    reading = parse_reading("n1-s1,n1,34.5,20.1,2026-05-01T06:00:00")
    assert reading.zone_id == "n1"
    assert reading.moisture == 34.5


def test_parse_reading_rejects_short_lines():
    with pytest.raises(ValueError):
        parse_reading("n1-s1,n1,34.5")


def test_parse_readings_skips_comments():
    lines = ["# header", "", "n1-s1,n1,34.5,20.1,2026-05-01T06:00:00"]
    readings = parse_readings(lines)
    assert len(readings) == 1


def test_average_moisture():
    readings = [make_reading(moisture=30.0), make_reading(moisture=40.0)]
    assert average_moisture(readings) == 35.0


def test_average_moisture_of_nothing():
    assert average_moisture([]) == 0.0


def test_latest_reading():
    readings = [make_reading(minutes=0), make_reading(minutes=30), make_reading(minutes=15)]
    latest = latest_reading(readings)
    assert latest is readings[1]


def test_drop_outliers_keeps_normal_readings():
    readings = [make_reading(moisture=value) for value in (34, 35, 36, 35, 34, 90)]
    kept = drop_outliers(readings, limit=2.0)
    assert all(reading.moisture < 50 for reading in kept)


def test_group_by_zone():
    readings = [make_reading(zone_id="n1"), make_reading(zone_id="s2"), make_reading(zone_id="n1")]
    groups = group_by_zone(readings)
    assert sorted(groups) == ["n1", "s2"]
    assert len(groups["n1"]) == 2


def test_readings_for_zone():
    readings = [make_reading(zone_id="n1"), make_reading(zone_id="s2")]
    assert len(readings_for_zone(readings, "s2")) == 1


def test_stale_sensors():
    readings = [make_reading(sensor_id="a", minutes=0), make_reading(sensor_id="b", minutes=200)]
    now = START + timedelta(minutes=210)
    stale = stale_sensors(readings, now, timedelta(hours=1))
    assert stale == ["a"]
