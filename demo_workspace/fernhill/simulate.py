"""A simulated glasshouse for trying the controller without hardware."""

from __future__ import annotations

import random
from datetime import datetime, timedelta

from .readings import Reading
from .zones import Zone, ZoneRegistry

CROPS = ["tomato", "basil", "pepper", "lettuce", "strawberry"]


def make_registry(glasshouses: list[str], zones_per_glasshouse: int, seed: int = 0) -> ZoneRegistry:
    rng = random.Random(seed)
    registry = ZoneRegistry()
    for glasshouse in glasshouses:
        for index in range(zones_per_glasshouse):
            zone_id = f"{glasshouse[0]}{index + 1}"
            crop = rng.choice(CROPS)
            zone = Zone(zone_id, f"{glasshouse} {index + 1}", glasshouse, crop, rng.uniform(30, 45))
            for sensor_index in range(2):
                zone.sensor_ids.append(f"{zone_id}-s{sensor_index + 1}")
            zone.valve_ids.append(f"{zone_id}-v1")
            registry.add(zone)
    return registry


def simulate_readings(registry: ZoneRegistry, start: datetime, hours: int, seed: int = 0) -> list[Reading]:
    rng = random.Random(seed)
    readings = []
    moisture_by_zone = {zone.zone_id: zone.target_moisture for zone in registry.all()}
    for step in range(hours * 4):
        taken_at = start + timedelta(minutes=15 * step)
        for zone in registry.all():
            moisture = moisture_by_zone[zone.zone_id] - rng.uniform(0.0, 0.6)
            if moisture < zone.target_moisture - 10:
                moisture += rng.uniform(8.0, 12.0)
            moisture_by_zone[zone.zone_id] = moisture
            for sensor_id in zone.sensor_ids:
                noise = rng.gauss(0.0, 0.8)
                temperature = 18 + 8 * rng.random()
                readings.append(Reading(sensor_id, zone.zone_id, moisture + noise, temperature, taken_at))
    return readings


def drop_sensor(readings: list[Reading], sensor_id: str, after: datetime) -> list[Reading]:
    kept = []
    for reading in readings:
        if reading.sensor_id == sensor_id and reading.taken_at > after:
            continue
        kept.append(reading)
    return kept
