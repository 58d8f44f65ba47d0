from datetime import date

import pytest

from fernhill.harvests import (Harvest, best_zone, expected_harvests, first_grade_share, harvest_report,
                               kilograms_by_crop, late_zones, litres_per_kilogram, parse_harvests, weekly_kilograms)
from fernhill.zones import Zone, ZoneRegistry


def make_registry():
    registry = ZoneRegistry()
    registry.add(Zone("n1", "north 1", "north", "tomato", 40.0))
    registry.add(Zone("s1", "south 1", "south", "basil", 30.0))
    return registry


def make_harvest(zone_id="n1", crop="tomato", kilograms=10.0, picked_on=date(2026, 8, 3), grade="first"):
    return Harvest(zone_id, crop, kilograms, picked_on, grade)


def test_parse_harvests_sorts_by_day():
    rows = [{"zone_id": "n1", "crop": "tomato", "kilograms": "12.5", "picked_on": "2026-08-04"},
            {"zone_id": "s1", "crop": "basil", "kilograms": "3", "picked_on": "2026-08-01", "grade": "second"}]
    harvests = parse_harvests(rows)
    assert [harvest.zone_id for harvest in harvests] == ["s1", "n1"]
    assert harvests[0].grade == "second"


def test_negative_weight_is_refused():
    with pytest.raises(ValueError):
        parse_harvests([{"zone_id": "n1", "crop": "tomato", "kilograms": "-1", "picked_on": "2026-08-04"}])


def test_best_zone():
    harvests = [make_harvest("n1", kilograms=10.0), make_harvest("s1", "basil", 4.0), make_harvest("n1", kilograms=2.0)]
    assert best_zone(harvests) == "n1"
    assert best_zone([]) is None


def test_kilograms_by_crop():
    harvests = [make_harvest(kilograms=10.0), make_harvest("s1", "basil", 4.0), make_harvest(kilograms=2.0)]
    assert kilograms_by_crop(harvests) == {"basil": 4.0, "tomato": 12.0}


def test_first_grade_share():
    harvests = [make_harvest(kilograms=3.0), make_harvest(kilograms=1.0, grade="second")]
    assert first_grade_share(harvests) == pytest.approx(0.75)


def test_litres_per_kilogram_skips_zones_without_water():
    harvests = [make_harvest("n1", kilograms=20.0), make_harvest("s1", "basil", 5.0)]
    assert litres_per_kilogram(harvests, {"n1": 500.0}) == {"n1": 25.0}


def test_weekly_kilograms():
    harvests = [make_harvest(picked_on=date(2026, 8, 3)), make_harvest(picked_on=date(2026, 8, 9)),
                make_harvest(picked_on=date(2026, 8, 10))]
    assert weekly_kilograms(harvests) == {"2026-W32": 20.0, "2026-W33": 10.0}


def test_expected_harvests_follow_the_crop_plan():
    registry = make_registry()
    expected = expected_harvests(registry, {"n1": date(2026, 4, 1)})
    assert expected == {"n1": date(2026, 7, 26)}


def test_late_zones():
    registry = make_registry()
    plantings = {"n1": date(2026, 4, 1), "s1": date(2026, 4, 1)}
    harvests = [make_harvest("s1", "basil", 2.0, date(2026, 6, 25))]
    assert late_zones(registry, harvests, plantings, date(2026, 8, 10)) == ["n1"]


def test_harvest_report():
    registry = make_registry()
    harvests = [make_harvest("n1", kilograms=8.0), make_harvest("s1", "basil", 2.0, grade="second")]
    report = harvest_report(registry, harvests, {"n1": 200.0})
    lines = report.splitlines()
    assert lines[2].startswith("north 1") and lines[2].endswith("25.0 l/kg")
    assert lines[3].endswith("no water logged")
    assert lines[-1] == "total 10.0 kg, 80% first grade"
