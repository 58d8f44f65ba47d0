"""Maintenance of sensors and valves: what needs servicing, cleaning or recalibrating, and when."""

from __future__ import annotations

from dataclasses import dataclass
from datetime import date, datetime, timedelta

from .calibration import Calibration, needs_recalibration
from .readings import Reading, group_by_sensor, stale_sensors
from .sensors import Frame, low_battery
from .valves import ValveBank
from .zones import ZoneRegistry

VALVE = "valve"
SENSOR = "sensor"


@dataclass(frozen=True)
class Task:
    kind: str
    target_id: str
    zone_id: str
    reason: str
    due_on: date


def zone_of_sensor(registry: ZoneRegistry, sensor_id: str) -> str:
    zone = registry.zone_for_sensor(sensor_id)
    return zone.zone_id if zone else "unassigned"


def valve_tasks(bank: ValveBank, zone_ids: list[str], serviced_on: dict[str, date], today: date,
                interval: timedelta = timedelta(days=90), max_litres: float = 20000.0) -> list[Task]:
    tasks = []
    for zone_id in zone_ids:
        for valve in bank.valves_in_zone(zone_id):
            last = serviced_on.get(valve.valve_id)
            if last is None or today - last >= interval:
                tasks.append(Task(VALVE, valve.valve_id, zone_id, "service interval reached", today))
            elif valve.litres_delivered >= max_litres:
                reason = f"{valve.litres_delivered:.0f} litres since last service"
                tasks.append(Task(VALVE, valve.valve_id, zone_id, reason, today))
    return tasks


def stale_sensor_tasks(registry: ZoneRegistry, readings: list[Reading], now: datetime,
                       max_age: timedelta = timedelta(hours=6)) -> list[Task]:
    tasks = []
    for sensor_id in stale_sensors(readings, now, max_age):
        zone_id = zone_of_sensor(registry, sensor_id)
        tasks.append(Task(SENSOR, sensor_id, zone_id, f"no reading for over {max_age}", now.date()))
    return tasks


def stuck_sensors(readings: list[Reading], limit: float = 0.2, minimum: int = 4) -> list[str]:
    stuck = []
    for sensor_id, sensor_readings in group_by_sensor(readings).items():
        if len(sensor_readings) < minimum:
            continue
        moistures = [reading.moisture for reading in sensor_readings]
        if max(moistures) - min(moistures) <= limit:
            stuck.append(sensor_id)
    return sorted(stuck)


def stuck_sensor_tasks(registry: ZoneRegistry, readings: list[Reading], today: date) -> list[Task]:
    tasks = []
    for sensor_id in stuck_sensors(readings):
        zone_id = zone_of_sensor(registry, sensor_id)
        tasks.append(Task(SENSOR, sensor_id, zone_id, "moisture has not changed; clean the probe", today))
    return tasks


def battery_tasks(registry: ZoneRegistry, frames: list[Frame], today: date, limit: int = 20) -> list[Task]:
    tasks = []
    for sensor_number in low_battery(frames, limit):
        sensor_id = f"probe-{sensor_number:03d}"
        zone_id = zone_of_sensor(registry, sensor_id)
        tasks.append(Task(SENSOR, sensor_id, zone_id, f"battery below {limit}%", today))
    return tasks


def recalibration_tasks(registry: ZoneRegistry, calibrations: dict[str, Calibration],
                        latest: dict[str, Calibration], today: date) -> list[Task]:
    tasks = []
    for sensor_id in needs_recalibration(calibrations, latest):
        zone_id = zone_of_sensor(registry, sensor_id)
        due_on = today + timedelta(days=7)
        tasks.append(Task(SENSOR, sensor_id, zone_id, "calibration has drifted", due_on))
    return tasks


def merge_tasks(tasks: list[Task]) -> list[Task]:
    merged: dict[tuple[str, str], Task] = {}
    for task in tasks:
        key = (task.kind, task.target_id)
        earlier = merged.get(key)
        if earlier is None or task.due_on < earlier.due_on:
            merged[key] = task
    return sorted(merged.values(), key=lambda task: (task.due_on, task.zone_id, task.target_id))


def tasks_for_zone(tasks: list[Task], zone_id: str) -> list[Task]:
    return [task for task in tasks if task.zone_id == zone_id]


def overdue(tasks: list[Task], today: date) -> list[Task]:
    return [task for task in tasks if task.due_on < today]


def plan_days(tasks: list[Task], start: date, per_day: int = 4) -> dict[date, list[Task]]:
    if per_day <= 0:
        raise ValueError("at least one task a day is needed")
    by_day: dict[date, list[Task]] = {}
    day = start
    for task in merge_tasks(tasks):
        day = max(day, task.due_on)
        while len(by_day.get(day, [])) >= per_day:
            day += timedelta(days=1)
        by_day.setdefault(day, []).append(task)
    return by_day


def format_task(task: Task) -> str:
    return f"{task.due_on:%d %b} {task.kind} {task.target_id} (zone {task.zone_id}): {task.reason}"
