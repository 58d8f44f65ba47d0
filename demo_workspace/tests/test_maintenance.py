from datetime import date, datetime, timedelta

from fernhill.calibration import Calibration
from fernhill.maintenance import (SENSOR, VALVE, Task, battery_tasks, format_task, merge_tasks, overdue, plan_days,
                                  recalibration_tasks, stale_sensor_tasks, stuck_sensors, tasks_for_zone, valve_tasks)
from fernhill.readings import Reading
from fernhill.sensors import Frame
from fernhill.valves import Valve, ValveBank
from fernhill.zones import Zone, ZoneRegistry

NOW = datetime(2026, 5, 1, 12, 0)
TODAY = NOW.date()


def make_registry():
    registry = ZoneRegistry()
    registry.add(Zone("n1", "north 1", "north", "tomato", 40.0, ["n1-v1"], ["probe-001", "n1-s2"]))
    registry.add(Zone("s1", "south 1", "south", "basil", 30.0, ["s1-v1"], ["probe-002"]))
    return registry


def make_reading(sensor_id="probe-001", moisture=35.0, minutes=0):
    return Reading(sensor_id, "n1", moisture, 20.0, NOW - timedelta(minutes=minutes))


def make_task(target_id="n1-v1", due_on=TODAY, kind=VALVE):
    return Task(kind, target_id, "n1", "check", due_on)


def test_valve_tasks():
    bank = ValveBank(clock=lambda: 0.0)
    bank.add(Valve("n1-v1", "n1", flow_rate=10.0))
    bank.add(Valve("s1-v1", "s1", flow_rate=10.0, litres_delivered=25000.0))
    serviced_on = {"n1-v1": TODAY - timedelta(days=10), "s1-v1": TODAY - timedelta(days=10)}
    tasks = valve_tasks(bank, ["n1", "s1"], serviced_on, TODAY)
    assert [task.target_id for task in tasks] == ["s1-v1"]
    assert "25000 litres" in tasks[0].reason


def test_stale_sensor_tasks_name_the_zone():
    readings = [make_reading("probe-001", minutes=600), make_reading("probe-002", minutes=5)]
    tasks = stale_sensor_tasks(make_registry(), readings, NOW)
    assert [(task.target_id, task.zone_id, task.kind) for task in tasks] == [("probe-001", "n1", SENSOR)]


def test_stuck_sensors():
    readings = [make_reading("probe-001", 35.0, minutes) for minutes in (0, 15, 30, 45)]
    readings += [make_reading("probe-002", 30.0 + minutes / 15, minutes) for minutes in (0, 15, 30, 45)]
    assert stuck_sensors(readings) == ["probe-001"]


def test_battery_tasks():
    frames = [Frame(1, 500, 200, 15), Frame(2, 500, 200, 80), Frame(9, 500, 200, 5)]
    tasks = battery_tasks(make_registry(), frames, TODAY)
    assert [(task.target_id, task.zone_id) for task in tasks] == [("probe-001", "n1"), ("probe-009", "unassigned")]


def test_recalibration_is_due_within_a_week():
    calibrations = {"probe-002": Calibration("probe-002", 800, 300)}
    latest = {"probe-002": Calibration("probe-002", 800, 450)}
    tasks = recalibration_tasks(make_registry(), calibrations, latest, TODAY)
    assert tasks[0].zone_id == "s1"
    assert tasks[0].due_on == TODAY + timedelta(days=7)


def test_merge_keeps_the_earliest_task():
    tasks = [make_task(due_on=TODAY + timedelta(days=3)), make_task(due_on=TODAY), make_task("s1-v1")]
    merged = merge_tasks(tasks)
    assert [(task.target_id, task.due_on) for task in merged] == [("n1-v1", TODAY), ("s1-v1", TODAY)]


def test_overdue():
    tasks = [make_task(due_on=TODAY - timedelta(days=1)), make_task("s1-v1", due_on=TODAY)]
    assert overdue(tasks, TODAY) == [tasks[0]]


def test_plan_days_spreads_the_work():
    tasks = [make_task(f"v{number}") for number in range(5)]
    by_day = plan_days(tasks, TODAY, per_day=2)
    assert [len(by_day[day]) for day in sorted(by_day)] == [2, 2, 1]
    assert max(by_day) == date(2026, 5, 3)


def test_tasks_for_zone_and_format():
    tasks = [make_task(), Task(SENSOR, "probe-002", "s1", "battery below 20%", TODAY)]
    zone_tasks = tasks_for_zone(tasks, "s1")
    assert len(zone_tasks) == 1
    assert format_task(zone_tasks[0]) == "01 May sensor probe-002 (zone s1): battery below 20%"
