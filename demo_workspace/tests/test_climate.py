from datetime import date, datetime, timedelta

import pytest

from fernhill.climate import (ClimateTarget, Heater, Vent, adjust, format_vent, frost_nights, glasshouse_temperatures,
                              heater_kilowatts, load_targets, open_vents, set_vents, target_temperature,
                              vent_opening)
from fernhill.readings import Reading
from fernhill.weather import Forecast
from fernhill.zones import Zone, ZoneRegistry

NOON = datetime(2026, 5, 1, 12, 0)
MIDNIGHT = datetime(2026, 5, 1, 0, 0)
TARGET = ClimateTarget("north", day_temperature=24.0, night_temperature=16.0)


def make_registry():
    registry = ZoneRegistry()
    registry.add(Zone("n1", "north 1", "north", "tomato", 40.0))
    registry.add(Zone("n2", "north 2", "north", "basil", 35.0))
    registry.add(Zone("s1", "south 1", "south", "lettuce", 30.0))
    return registry


def make_reading(zone_id, temperature):
    return Reading(f"{zone_id}-s1", zone_id, 35.0, temperature, NOON - timedelta(minutes=5))


def make_forecast(rain_mm=0.0, low=10.0, humidity=50.0, day=date(2026, 5, 1)):
    return Forecast(day, rain_mm, 22.0, low, humidity)


def test_load_targets():
    targets = load_targets([{"glasshouse": "south", "day": "22", "night": "15"}])
    assert targets["south"].night_temperature == 15.0
    assert targets["south"].max_humidity == 85.0


def test_target_temperature_by_day_and_night():
    assert target_temperature(TARGET, NOON) == 24.0
    assert target_temperature(TARGET, MIDNIGHT) == 16.0


def test_glasshouse_temperatures():
    readings = [make_reading("n1", 26.0), make_reading("n2", 28.0), make_reading("s1", 20.0)]
    assert glasshouse_temperatures(make_registry(), readings) == {"north": 27.0, "south": 20.0}


def test_vent_opening():
    assert vent_opening(TARGET, 22.0, NOON) == 0.0
    assert vent_opening(TARGET, 26.0, NOON) == 40.0
    assert vent_opening(TARGET, 40.0, NOON) == 100.0
    assert vent_opening(TARGET, 26.0, NOON, make_forecast(humidity=90.0)) == 50.0
    assert vent_opening(TARGET, 26.0, NOON, make_forecast(rain_mm=12.0)) == 25.0


def test_set_vents_only_counts_changes():
    vents = [Vent("v1", "north"), Vent("v2", "north", 30.0), Vent("v3", "south")]
    assert set_vents(vents, "north", 30.0) == 1
    assert [vent.opening for vent in vents] == [30.0, 30.0, 0.0]


def test_heater_kilowatts():
    heaters = [Heater("h1", "north", 6.0), Heater("h2", "north", 4.0), Heater("h3", "south", 8.0)]
    assert heater_kilowatts(heaters, "north", 2.5) == pytest.approx(5.0)
    assert heater_kilowatts(heaters, "north", 9.0) == pytest.approx(10.0)


def test_frost_nights():
    forecasts = [make_forecast(low=8.0), make_forecast(low=2.0, day=date(2026, 5, 2))]
    assert frost_nights({"north": TARGET}, forecasts) == {date(2026, 5, 2): ["north"]}


def test_adjust_opens_vents_and_heats():
    vents = [Vent("v1", "north"), Vent("v2", "south")]
    heaters = [Heater("h3", "south", 8.0)]
    targets = {"north": TARGET, "south": ClimateTarget("south", 22.0, 15.0)}
    readings = [make_reading("n1", 26.0), make_reading("s1", 20.0)]
    actions = adjust(targets, vents, heaters, make_registry(), readings, [make_forecast()], NOON)
    assert actions == ["north: vents to 40% at 26.0C", "south: heating at 3.2 kW, 2.0C below target"]
    assert vents[0].opening == 40.0


def test_open_vents_and_format():
    vents = [Vent("v1", "north", 35.0), Vent("v2", "south")]
    assert open_vents(vents) == [vents[0]]
    assert [format_vent(vent) for vent in vents] == ["north/v1 35% open", "south/v2 closed"]
