"""Soil sensor readings: parsing, cleaning and summarising."""

from __future__ import annotations

import statistics
from dataclasses import dataclass
from datetime import datetime, timedelta


@dataclass(frozen=True)
class Reading:
    sensor_id: str
    zone_id: str
    moisture: float
    temperature: float
    taken_at: datetime


def parse_reading(line: str) -> Reading:
    fields = line.strip().split(",")
    if len(fields) != 5:
        raise ValueError(f"expected 5 fields, got {len(fields)}")
    sensor_id, zone_id, moisture, temperature, taken_at = fields
    return Reading(
        sensor_id=sensor_id,
        zone_id=zone_id,
        moisture=float(moisture),
        temperature=float(temperature),
        taken_at=datetime.fromisoformat(taken_at),
    )


def parse_readings(lines: list[str]) -> list[Reading]:
    readings = []
    for line in lines:
        if not line.strip() or line.startswith("#"):
            continue
        reading = parse_reading(line)
        readings.append(reading)
    return readings


def readings_for_zone(readings: list[Reading], zone_id: str) -> list[Reading]:
    return [reading for reading in readings if reading.zone_id == zone_id]


def latest_reading(readings: list[Reading]) -> Reading | None:
    latest = None
    for reading in readings:
        if latest is None or reading.taken_at > latest.taken_at:
            latest = reading
    return latest


def average_moisture(readings: list[Reading]) -> float:
    if not readings:
        return 0.0
    total = 0.0
    for reading in readings:
        total += reading.moisture
    return total / len(readings)


def median_moisture(readings: list[Reading]) -> float:
    moistures = [reading.moisture for reading in readings]
    if not moistures:
        return 0.0
    return statistics.median(moistures)


def drop_outliers(readings: list[Reading], limit: float = 3.0) -> list[Reading]:
    if len(readings) < 3:
        return list(readings)
    moistures = [reading.moisture for reading in readings]
    mean = statistics.fmean(moistures)
    spread = statistics.pstdev(moistures) or 1.0
    kept = []
    for reading in readings:
        if abs(reading.moisture - mean) / spread <= limit:
            kept.append(reading)
    return kept


def readings_since(readings: list[Reading], since: datetime) -> list[Reading]:
    recent = []
    for reading in readings:
        if reading.taken_at >= since:
            recent.append(reading)
    return recent


def readings_in_window(readings: list[Reading], end: datetime, window: timedelta) -> list[Reading]:
    start = end - window
    return [reading for reading in readings if start <= reading.taken_at <= end]


def group_by_zone(readings: list[Reading]) -> dict[str, list[Reading]]:
    groups: dict[str, list[Reading]] = {}
    for reading in readings:
        groups.setdefault(reading.zone_id, []).append(reading)
    return groups


def group_by_sensor(readings: list[Reading]) -> dict[str, list[Reading]]:
    groups: dict[str, list[Reading]] = {}
    for reading in readings:
        groups.setdefault(reading.sensor_id, []).append(reading)
    return groups


def zone_summary(readings: list[Reading]) -> dict[str, float]:
    summary = {}
    for zone_id, zone_readings in group_by_zone(readings).items():
        summary[zone_id] = average_moisture(zone_readings)
    return summary


def stale_sensors(readings: list[Reading], now: datetime, max_age: timedelta) -> list[str]:
    stale = []
    for sensor_id, sensor_readings in group_by_sensor(readings).items():
        latest = latest_reading(sensor_readings)
        if latest is None or now - latest.taken_at > max_age:
            stale.append(sensor_id)
    return sorted(stale)


def hottest_zone(readings: list[Reading]) -> str | None:
    hottest = None
    highest = float("-inf")
    for zone_id, zone_readings in group_by_zone(readings).items():
        temperature = max(reading.temperature for reading in zone_readings)
        if temperature > highest:
            highest = temperature
            hottest = zone_id
    return hottest


def format_reading(reading: Reading) -> str:
    stamp = reading.taken_at.strftime("%Y-%m-%d %H:%M")
    return f"{reading.zone_id}/{reading.sensor_id} {reading.moisture:.1f}% {reading.temperature:.1f}C at {stamp}"


def moisture_trend(readings: list[Reading]) -> float:
    ordered = sorted(readings, key=lambda reading: reading.taken_at)
    if len(ordered) < 2:
        return 0.0
    first = ordered[0]
    last = ordered[-1]
    hours = (last.taken_at - first.taken_at).total_seconds() / 3600 or 1.0
    return (last.moisture - first.moisture) / hours
