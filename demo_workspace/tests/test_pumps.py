from datetime import time, timedelta

import pytest

from fernhill.pumps import (Pump, Tariff, energy_by_zone, energy_report, is_peak, load_pumps, overloaded_pumps,
                            peak_slots, pump_for_zone, weekly_cost, weekly_energy)
from fernhill.schedules import Schedule, Slot
from fernhill.valves import Valve, ValveBank
from fernhill.zones import Zone, ZoneRegistry

TARIFF = Tariff(peak_price=0.30, off_peak_price=0.10)


def make_registry():
    registry = ZoneRegistry()
    registry.add(Zone("n1", "north 1", "north", "tomato", 40.0))
    registry.add(Zone("s1", "south 1", "south", "basil", 30.0))
    return registry


def make_pumps():
    return [Pump("p-north", "north", 1.2, 30.0), Pump("p-south", "south", 0.6, 10.0)]


def make_bank():
    bank = ValveBank(clock=lambda: 0.0)
    bank.add(Valve("n1-v1", "n1", flow_rate=10.0))
    bank.add(Valve("s1-v1", "s1", flow_rate=6.0))
    bank.add(Valve("s1-v2", "s1", flow_rate=6.0))
    return bank


def make_slot(zone_id="n1", start=time(5, 0), minutes=30, weekdays=(0, 3)):
    return Slot(zone_id, start, timedelta(minutes=minutes), frozenset(weekdays))


def test_load_pumps():
    pumps = load_pumps([{"pump_id": "p2", "glasshouse": "east", "kilowatts": "0.8", "litres_per_minute": "20"},
                        {"pump_id": "p1", "glasshouse": "west", "kilowatts": "1", "litres_per_minute": "25"}])
    assert [pump.pump_id for pump in pumps] == ["p1", "p2"]


def test_zone_without_a_pump():
    zone = Zone("e1", "east 1", "east", "lettuce", 35.0)
    with pytest.raises(KeyError):
        pump_for_zone(make_pumps(), zone)


def test_energy_by_zone():
    bank = make_bank()
    bank.get("n1-v1").litres_delivered = 300.0
    energy = energy_by_zone(make_pumps(), make_registry(), bank)
    assert energy == {"n1": pytest.approx(0.2), "s1": 0.0}


def test_weekly_energy():
    schedule = Schedule("summer", [make_slot("n1"), make_slot("s1", minutes=10)])
    totals = weekly_energy(make_pumps(), make_registry(), make_bank(), schedule)
    assert totals["p-north"] == pytest.approx(0.4)
    assert totals["p-south"] == pytest.approx(0.24)


def test_peak_slots():
    early = make_slot(start=time(5, 0))
    late_morning = make_slot(start=time(10, 0))
    into_the_peak = make_slot(start=time(6, 50), minutes=20)
    schedule = Schedule("summer", [early, late_morning])
    assert peak_slots(schedule) == [late_morning]
    assert is_peak(into_the_peak)


def test_weekly_cost():
    schedule = Schedule("summer", [make_slot("n1", start=time(5, 0)), make_slot("n1", start=time(12, 0))])
    assert weekly_cost(make_pumps(), make_registry(), schedule, TARIFF) == pytest.approx(0.48)


def test_overloaded_pumps():
    bank = make_bank()
    bank.open("s1-v1")
    bank.open("n1-v1")
    assert overloaded_pumps(make_pumps(), make_registry(), bank) == []
    bank.open("s1-v2")
    assert overloaded_pumps(make_pumps(), make_registry(), bank) == ["p-south"]


def test_energy_report():
    bank = make_bank()
    bank.get("n1-v1").litres_delivered = 300.0
    bank.get("s1-v1").litres_delivered = 100.0
    report = energy_report(make_pumps(), make_registry(), bank, TARIFF)
    lines = report.splitlines()
    assert lines[2] == "n1         0.20 kWh"
    assert lines[-1] == "total 0.30 kWh, at most 0.09 at the peak price"
