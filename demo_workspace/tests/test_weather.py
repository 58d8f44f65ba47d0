from datetime import date

from fernhill.weather import Forecast, frost_days, heat_factor, parse_forecasts, rain_expected, watering_factor


def make_forecast(day=date(2026, 7, 1), rain_mm=0.0, high=22.0, low=12.0, humidity=50.0):
    return Forecast(day, rain_mm, high, low, humidity)


def test_parse_forecasts_sorts_by_day():
    rows = [{"day": "2026-07-02", "high": 20, "low": 10}, {"day": "2026-07-01", "high": 21, "low": 11}]
    forecasts = parse_forecasts(rows)
    assert [forecast.day.day for forecast in forecasts] == [1, 2]


def test_rain_expected():
    forecasts = [make_forecast(rain_mm=8.0)]
    assert rain_expected(forecasts, date(2026, 7, 1))
    assert not rain_expected(forecasts, date(2026, 7, 2))


def test_heat_factor():
    assert heat_factor(make_forecast(high=33)) == 1.5
    assert heat_factor(make_forecast(high=10)) == 0.7


def test_heavy_rain_stops_watering():
    forecasts = [make_forecast(rain_mm=12.0)]
    assert watering_factor(forecasts, date(2026, 7, 1)) == 0.0


def test_frost_days():
    forecasts = [make_forecast(low=-1.0), make_forecast(day=date(2026, 7, 2), low=3.0)]
    assert frost_days(forecasts) == [date(2026, 7, 1)]
