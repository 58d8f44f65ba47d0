"""Alerts for the growers: dry zones, stale sensors, valves left open."""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime, timedelta

from .readings import Reading, average_moisture, group_by_zone, stale_sensors
from .valves import ValveBank
from .zones import ZoneRegistry

WARNING = "warning"
CRITICAL = "critical"


@dataclass(frozen=True)
class Alert:
    level: str
    zone_id: str
    message: str
    raised_at: datetime


def dry_zone_alerts(registry: ZoneRegistry, readings: list[Reading], now: datetime) -> list[Alert]:
    alerts = []
    for zone_id, zone_readings in group_by_zone(readings).items():
        valve = registry.get(zone_id)
        moisture = average_moisture(zone_readings)
        deficit = valve.target_moisture - moisture
        if deficit > 15:
            alerts.append(Alert(CRITICAL, zone_id, f"moisture {moisture:.0f}% is far below target", now))
        elif deficit > 5:
            alerts.append(Alert(WARNING, zone_id, f"moisture {moisture:.0f}% is below target", now))
    return alerts


def stale_sensor_alerts(registry: ZoneRegistry, readings: list[Reading], now: datetime,
                        max_age: timedelta = timedelta(hours=2)) -> list[Alert]:
    alerts = []
    for sensor_id in stale_sensors(readings, now, max_age):
        zone = registry.zone_for_sensor(sensor_id)
        zone_id = zone.zone_id if zone else "unknown"
        alerts.append(Alert(WARNING, zone_id, f"sensor {sensor_id} has not reported since {max_age}", now))
    return alerts


def open_valve_alerts(bank: ValveBank, now: datetime, max_minutes: float = 45.0) -> list[Alert]:
    alerts = []
    for valve in bank.open_valves():
        minutes = bank.minutes_open(valve.valve_id)
        if minutes > max_minutes:
            message = f"valve {valve.valve_id} has been open for {minutes:.0f} minutes"
            alerts.append(Alert(CRITICAL, valve.zone_id, message, now))
    return alerts


def worst_first(alerts: list[Alert]) -> list[Alert]:
    order = {CRITICAL: 0, WARNING: 1}
    return sorted(alerts, key=lambda alert: (order.get(alert.level, 2), alert.zone_id))


def alerts_for_zone(alerts: list[Alert], zone_id: str) -> list[Alert]:
    return [alert for alert in alerts if alert.zone_id == zone_id]


def format_alert(alert: Alert) -> str:
    stamp = alert.raised_at.strftime("%H:%M")
    return f"[{alert.level}] {stamp} zone {alert.zone_id}: {alert.message}"


def deduplicate(alerts: list[Alert]) -> list[Alert]:
    seen = set()
    unique = []
    for alert in alerts:
        key = (alert.level, alert.zone_id, alert.message)
        if key in seen:
            continue
        seen.add(key)
        unique.append(alert)
    return unique


def count_by_level(alerts: list[Alert]) -> dict[str, int]:
    counts: dict[str, int] = {}
    for alert in alerts:
        counts[alert.level] = counts.get(alert.level, 0) + 1
    return counts
