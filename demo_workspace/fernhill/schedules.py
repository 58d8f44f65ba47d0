"""Watering schedules: when each zone is watered and for how long."""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime, time, timedelta


@dataclass(frozen=True)
class Slot:
    zone_id: str
    start_time: time
    duration: timedelta
    weekdays: frozenset[int]


@dataclass
class Schedule:
    name: str
    slots: list[Slot]

    def slots_for_zone(self, zone_id: str) -> list[Slot]:
        return [slot for slot in self.slots if slot.zone_id == zone_id]

    def add_slot(self, slot: Slot) -> None:
        for existing in self.slots_for_zone(slot.zone_id):
            if overlaps(existing, slot):
                raise ValueError(f"slot at {slot.start_time} overlaps one at {existing.start_time}")
        self.slots.append(slot)

    def remove_zone(self, zone_id: str) -> int:
        before = len(self.slots)
        self.slots = [slot for slot in self.slots if slot.zone_id != zone_id]
        return before - len(self.slots)


def slot_end(slot: Slot) -> time:
    start = datetime.combine(datetime.min, slot.start_time)
    return (start + slot.duration).time()


def overlaps(first: Slot, second: Slot) -> bool:
    if not first.weekdays & second.weekdays:
        return False
    first_start = datetime.combine(datetime.min, first.start_time)
    second_start = datetime.combine(datetime.min, second.start_time)
    return first_start < second_start + second.duration and second_start < first_start + first.duration


def parse_slot(text: str) -> Slot:
    zone_id, start_text, minutes_text, days_text = text.split()
    hours, minutes = start_text.split(":")
    weekdays = frozenset(int(day) for day in days_text.split(","))
    return Slot(
        zone_id=zone_id,
        start_time=time(int(hours), int(minutes)),
        duration=timedelta(minutes=int(minutes_text)),
        weekdays=weekdays,
    )


def parse_schedule(name: str, lines: list[str]) -> Schedule:
    schedule = Schedule(name=name, slots=[])
    for line in lines:
        line = line.strip()
        if not line or line.startswith("#"):
            continue
        slot = parse_slot(line)
        schedule.add_slot(slot)
    return schedule


def due_slots(schedule: Schedule, now: datetime) -> list[Slot]:
    due = []
    for slot in schedule.slots:
        if now.weekday() not in slot.weekdays:
            continue
        start = datetime.combine(now.date(), slot.start_time)
        if start <= now < start + slot.duration:
            due.append(slot)
    return due


def next_slot(schedule: Schedule, zone_id: str, now: datetime) -> datetime | None:
    soonest = None
    for slot in schedule.slots_for_zone(zone_id):
        for days_ahead in range(8):
            day = now.date() + timedelta(days=days_ahead)
            if day.weekday() not in slot.weekdays:
                continue
            start = datetime.combine(day, slot.start_time)
            if start < now:
                continue
            if soonest is None or start < soonest:
                soonest = start
            break
    return soonest


def weekly_minutes(schedule: Schedule, zone_id: str) -> float:
    total = 0.0
    for slot in schedule.slots_for_zone(zone_id):
        total += slot.duration.total_seconds() / 60 * len(slot.weekdays)
    return total


def stretch(schedule: Schedule, zone_id: str, factor: float) -> Schedule:
    slots = []
    for slot in schedule.slots:
        if slot.zone_id == zone_id:
            duration = timedelta(seconds=slot.duration.total_seconds() * factor)
            slot = Slot(slot.zone_id, slot.start_time, duration, slot.weekdays)
        slots.append(slot)
    return Schedule(name=schedule.name, slots=slots)


def format_slot(slot: Slot) -> str:
    minutes = int(slot.duration.total_seconds() // 60)
    days = ",".join(str(day) for day in sorted(slot.weekdays))
    return f"{slot.zone_id} {slot.start_time:%H:%M} {minutes} {days}"
