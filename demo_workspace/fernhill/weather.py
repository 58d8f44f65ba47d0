"""Weather forecasts: skip watering before rain, water more in a heat wave."""

from __future__ import annotations

from dataclasses import dataclass
from datetime import date


@dataclass(frozen=True)
class Forecast:
    day: date
    rain_mm: float
    high_temperature: float
    low_temperature: float
    humidity: float


def parse_forecast(row: dict) -> Forecast:
    return Forecast(
        day=date.fromisoformat(row["day"]),
        rain_mm=float(row.get("rain_mm", 0.0)),
        high_temperature=float(row["high"]),
        low_temperature=float(row["low"]),
        humidity=float(row.get("humidity", 50.0)),
    )


def parse_forecasts(rows: list[dict]) -> list[Forecast]:
    forecasts = []
    for row in rows:
        forecast = parse_forecast(row)
        forecasts.append(forecast)
    return sorted(forecasts, key=lambda forecast: forecast.day)


def forecast_for(forecasts: list[Forecast], day: date) -> Forecast | None:
    for forecast in forecasts:
        if forecast.day == day:
            return forecast
    return None


def rain_expected(forecasts: list[Forecast], day: date, limit: float = 5.0) -> bool:
    forecast = forecast_for(forecasts, day)
    if forecast is None:
        return False
    count = forecast.rain_mm
    return count >= limit


def heat_factor(forecast: Forecast) -> float:
    if forecast.high_temperature >= 32:
        return 1.5
    if forecast.high_temperature >= 27:
        return 1.2
    if forecast.high_temperature <= 12:
        return 0.7
    return 1.0


def humidity_factor(forecast: Forecast) -> float:
    humidity = forecast.humidity
    if humidity >= 85:
        return 0.8
    if humidity <= 30:
        return 1.15
    return 1.0


def watering_factor(forecasts: list[Forecast], day: date) -> float:
    forecast = forecast_for(forecasts, day)
    if forecast is None:
        return 1.0
    if forecast.rain_mm >= 10:
        return 0.0
    factor = heat_factor(forecast) * humidity_factor(forecast)
    return round(factor, 2)


def total_rain(forecasts: list[Forecast], start: date, end: date) -> float:
    total = 0.0
    for forecast in forecasts:
        if start <= forecast.day <= end:
            total += forecast.rain_mm
    return total


def hottest_day(forecasts: list[Forecast]) -> Forecast | None:
    hottest = None
    for forecast in forecasts:
        if hottest is None or forecast.high_temperature > hottest.high_temperature:
            hottest = forecast
    return hottest


def frost_days(forecasts: list[Forecast]) -> list[date]:
    days = []
    for forecast in forecasts:
        if forecast.low_temperature <= 0:
            days.append(forecast.day)
    return days
