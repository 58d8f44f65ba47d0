"""Long-run statistics over past readings and waterings."""

from __future__ import annotations

import statistics
from collections import defaultdict
from datetime import date

from .readings import Reading


def daily_averages(readings: list[Reading]) -> dict[date, float]:
    buckets: dict[date, list[float]] = defaultdict(list)
    for reading in readings:
        buckets[reading.taken_at.date()].append(reading.moisture)
    averages = {}
    for day, moistures in sorted(buckets.items()):
        averages[day] = statistics.fmean(moistures)
    return averages


def driest_days(readings: list[Reading], count: int = 3) -> list[date]:
    averages = daily_averages(readings)
    ordered = sorted(averages.items(), key=lambda item: item[1])
    return [day for day, _ in ordered[:count]]


def moisture_range(readings: list[Reading]) -> tuple[float, float]:
    if not readings:
        return 0.0, 0.0
    lowest = min(reading.moisture for reading in readings)
    highest = max(reading.moisture for reading in readings)
    return lowest, highest


def hourly_profile(readings: list[Reading]) -> list[float]:
    buckets: list[list[float]] = [[] for _ in range(24)]
    for reading in readings:
        buckets[reading.taken_at.hour].append(reading.moisture)
    profile = []
    for moistures in buckets:
        profile.append(statistics.fmean(moistures) if moistures else 0.0)
    return profile


def litres_per_week(waterings: list[dict]) -> dict[str, float]:
    totals: dict[str, float] = defaultdict(float)
    for entry in waterings:
        started = date.fromisoformat(entry["started_at"][:10])
        year, week, _ = started.isocalendar()
        totals[f"{year}-W{week:02d}"] += entry["litres"]
    return dict(sorted(totals.items()))


def correlation(readings: list[Reading]) -> float:
    if len(readings) < 2:
        return 0.0
    moistures = [reading.moisture for reading in readings]
    temperatures = [reading.temperature for reading in readings]
    return statistics.correlation(moistures, temperatures)
