"""Glasshouse climate: opening the roof vents and running the heating from sensor temperatures."""

from __future__ import annotations

from dataclasses import dataclass
from datetime import date, datetime, time

from .readings import Reading
from .weather import Forecast, forecast_for
from .zones import ZoneRegistry

DAY_START = time(6, 0)
DAY_END = time(20, 0)


@dataclass(frozen=True)
class ClimateTarget:
    glasshouse: str
    day_temperature: float
    night_temperature: float
    max_humidity: float = 85.0


@dataclass
class Vent:
    vent_id: str
    glasshouse: str
    opening: float = 0.0  # percent


@dataclass(frozen=True)
class Heater:
    heater_id: str
    glasshouse: str
    kilowatts: float


def load_targets(rows: list[dict]) -> dict[str, ClimateTarget]:
    targets = {}
    for row in rows:
        target = ClimateTarget(
            glasshouse=row["glasshouse"],
            day_temperature=float(row["day"]),
            night_temperature=float(row["night"]),
            max_humidity=float(row.get("max_humidity", 85.0)),
        )
        targets[target.glasshouse] = target
    return targets


def target_temperature(target: ClimateTarget, now: datetime) -> float:
    if DAY_START <= now.time() < DAY_END:
        return target.day_temperature
    return target.night_temperature


def glasshouse_temperatures(registry: ZoneRegistry, readings: list[Reading]) -> dict[str, float]:
    buckets: dict[str, list[float]] = {}
    for reading in readings:
        zone = registry.get(reading.zone_id)
        buckets.setdefault(zone.glasshouse, []).append(reading.temperature)
    averages = {}
    for glasshouse, temperatures in sorted(buckets.items()):
        averages[glasshouse] = sum(temperatures) / len(temperatures)
    return averages


def vent_opening(target: ClimateTarget, temperature: float, now: datetime, forecast: Forecast | None = None) -> float:
    excess = temperature - target_temperature(target, now)
    opening = excess * 20
    if forecast is not None and forecast.humidity > target.max_humidity:
        opening += 10
    if forecast is not None and forecast.rain_mm >= 10:
        opening = min(opening, 25)
    return min(max(opening, 0.0), 100.0)


def set_vents(vents: list[Vent], glasshouse: str, opening: float) -> int:
    changed = 0
    for vent in vents:
        if vent.glasshouse != glasshouse or vent.opening == opening:
            continue
        vent.opening = opening
        changed += 1
    return changed


def heating_needed(target: ClimateTarget, temperature: float, now: datetime) -> float:
    shortfall = target_temperature(target, now) - temperature
    return max(shortfall, 0.0)


def heater_kilowatts(heaters: list[Heater], glasshouse: str, shortfall: float, full_at: float = 5.0) -> float:
    capacity = sum(heater.kilowatts for heater in heaters if heater.glasshouse == glasshouse)
    share = min(shortfall / full_at, 1.0)
    return round(capacity * share, 2)


def frost_nights(targets: dict[str, ClimateTarget], forecasts: list[Forecast]) -> dict[date, list[str]]:
    nights: dict[date, list[str]] = {}
    for forecast in forecasts:
        for glasshouse, target in sorted(targets.items()):
            if forecast.low_temperature < target.night_temperature - 10:
                nights.setdefault(forecast.day, []).append(glasshouse)
    return nights


def adjust(targets: dict[str, ClimateTarget], vents: list[Vent], heaters: list[Heater], registry: ZoneRegistry,
           readings: list[Reading], forecasts: list[Forecast], now: datetime) -> list[str]:
    actions = []
    forecast = forecast_for(forecasts, now.date())
    for glasshouse, temperature in glasshouse_temperatures(registry, readings).items():
        target = targets.get(glasshouse)
        if target is None:
            continue
        opening = vent_opening(target, temperature, now, forecast)
        if set_vents(vents, glasshouse, opening):
            actions.append(f"{glasshouse}: vents to {opening:.0f}% at {temperature:.1f}C")
        shortfall = heating_needed(target, temperature, now)
        if shortfall > 0:
            kilowatts = heater_kilowatts(heaters, glasshouse, shortfall)
            actions.append(f"{glasshouse}: heating at {kilowatts:.1f} kW, {shortfall:.1f}C below target")
    return actions


def open_vents(vents: list[Vent]) -> list[Vent]:
    return [vent for vent in vents if vent.opening > 0]


def format_vent(vent: Vent) -> str:
    state = "closed" if vent.opening == 0 else f"{vent.opening:.0f}% open"
    return f"{vent.glasshouse}/{vent.vent_id} {state}"
