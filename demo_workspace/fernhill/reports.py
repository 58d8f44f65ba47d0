"""Daily and weekly reports for the growers."""

from __future__ import annotations

from datetime import date, datetime, timedelta

from .alerts import Alert, count_by_level, format_alert, worst_first
from .readings import Reading, average_moisture, group_by_zone, moisture_trend, readings_since
from .valves import ValveBank
from .zones import ZoneRegistry


def zone_lines(registry: ZoneRegistry, readings: list[Reading]) -> list[str]:
    lines = []
    for zone_id, zone_readings in sorted(group_by_zone(readings).items()):
        zone = registry.get(zone_id)
        moisture = average_moisture(zone_readings)
        trend = moisture_trend(zone_readings)
        arrow = "up" if trend > 0.1 else "down" if trend < -0.1 else "steady"
        lines.append(f"{zone.name:20} {moisture:5.1f}% (target {zone.target_moisture:.0f}%) {arrow}")
    return lines


def alert_lines(alerts: list[Alert]) -> list[str]:
    lines = []
    for alert in worst_first(alerts):
        lines.append(format_alert(alert))
    counts = count_by_level(alerts)
    if counts:
        summary = ", ".join(f"{count} {level}" for level, count in sorted(counts.items()))
        lines.append(f"alerts: {summary}")
    return lines


def daily_report(registry: ZoneRegistry, readings: list[Reading], alerts: list[Alert], day: date) -> str:
    since = datetime.combine(day, datetime.min.time())
    todays = readings_since(readings, since)
    lines = [f"Fernhill daily report for {day:%A %d %B %Y}", ""]
    lines.extend(zone_lines(registry, todays))
    lines.append("")
    lines.extend(alert_lines(alerts))
    return "\n".join(lines)


def weekly_report(registry: ZoneRegistry, readings: list[Reading], end: date) -> str:
    lines = [f"Fernhill week ending {end:%d %B %Y}", ""]
    for offset in range(6, -1, -1):
        day = end - timedelta(days=offset)
        start = datetime.combine(day, datetime.min.time())
        stop = start + timedelta(days=1)
        day_readings = [reading for reading in readings if start <= reading.taken_at < stop]
        if not day_readings:
            lines.append(f"{day:%a}: no readings")
            continue
        moisture = average_moisture(day_readings)
        lines.append(f"{day:%a}: {moisture:.1f}% over {len(day_readings)} readings")
    lines.append("")
    for sensor in registry.all():
        lines.append(f"{sensor.name}: {sensor.crop} in {sensor.glasshouse}")
    return "\n".join(lines)


def crop_table(registry: ZoneRegistry) -> list[tuple[str, int]]:
    table = []
    for crop in registry.crops():
        zones = registry.growing(crop)
        table.append((crop, len(zones)))
    return table


def valve_lines(bank: ValveBank) -> list[str]:
    lines = []
    for valve in bank.open_valves():
        minutes = bank.minutes_open(valve.valve_id)
        lines.append(f"{valve.valve_id} (zone {valve.zone_id}): open {minutes:.0f} min")
    return lines
