from datetime import datetime, time, timedelta

import pytest

from fernhill.schedules import Schedule, Slot, due_slots, next_slot, overlaps, parse_schedule, parse_slot, weekly_minutes


def make_slot(zone_id="n1", start=time(6, 0), minutes=20, weekdays=(0, 2, 4)):
    return Slot(zone_id, start, timedelta(minutes=minutes), frozenset(weekdays))


def test_parse_slot():
    slot = parse_slot("n1 06:30 15 0,3")
    assert slot.start_time == time(6, 30)
    assert slot.duration == timedelta(minutes=15)
    assert slot.weekdays == frozenset({0, 3})


def test_overlapping_slots_are_refused():
    schedule = Schedule("spring", [make_slot()])
    with pytest.raises(ValueError):
        schedule.add_slot(make_slot(start=time(6, 10)))


def test_slots_on_other_days_do_not_overlap():
    first = make_slot(weekdays=(0,))
    second = make_slot(weekdays=(1,))
    assert not overlaps(first, second)


def test_due_slots():
    schedule = Schedule("spring", [make_slot()])
    monday = datetime(2026, 5, 4, 6, 5)
    due = due_slots(schedule, monday)
    assert len(due) == 1


def test_next_slot_skips_past_starts():
    schedule = Schedule("spring", [make_slot(weekdays=(0,))])
    monday_noon = datetime(2026, 5, 4, 12, 0)
    upcoming = next_slot(schedule, "n1", monday_noon)
    assert upcoming == datetime(2026, 5, 11, 6, 0)


def test_weekly_minutes():
    schedule = parse_schedule("spring", ["n1 06:00 20 0,2,4", "n1 18:00 10 0"])
    assert weekly_minutes(schedule, "n1") == 70
