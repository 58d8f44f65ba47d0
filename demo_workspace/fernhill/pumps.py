"""Pumps and energy: which pump feeds each glasshouse, how long it runs and what it costs."""

from __future__ import annotations

from dataclasses import dataclass
from datetime import time

from .schedules import Schedule, Slot, slot_end, weekly_minutes
from .valves import ValveBank
from .zones import Zone, ZoneRegistry

PEAK_START = time(7, 0)
PEAK_END = time(21, 0)


@dataclass(frozen=True)
class Pump:
    pump_id: str
    glasshouse: str
    kilowatts: float
    litres_per_minute: float


@dataclass(frozen=True)
class Tariff:
    peak_price: float  # per kilowatt hour
    off_peak_price: float


def load_pumps(rows: list[dict]) -> list[Pump]:
    pumps = []
    for row in rows:
        pump = Pump(row["pump_id"], row["glasshouse"], float(row["kilowatts"]), float(row["litres_per_minute"]))
        pumps.append(pump)
    return sorted(pumps, key=lambda pump: pump.pump_id)


def pump_for_glasshouse(pumps: list[Pump], glasshouse: str) -> Pump | None:
    for pump in pumps:
        if pump.glasshouse == glasshouse:
            return pump
    return None


def pump_for_zone(pumps: list[Pump], zone: Zone) -> Pump:
    pump = pump_for_glasshouse(pumps, zone.glasshouse)
    if pump is None:
        raise KeyError(f"no pump feeds glasshouse {zone.glasshouse} (zone {zone.zone_id})")
    return pump


def kilowatt_hours(pump: Pump, minutes: float) -> float:
    return pump.kilowatts * minutes / 60


def pumping_minutes(pump: Pump, litres: float) -> float:
    if pump.litres_per_minute <= 0:
        raise ValueError(f"pump {pump.pump_id} moves no water")
    return litres / pump.litres_per_minute


def zone_flow(bank: ValveBank, zone_id: str) -> float:
    total = 0.0
    for valve in bank.valves_in_zone(zone_id):
        total += valve.flow_rate
    return total


def energy_by_zone(pumps: list[Pump], registry: ZoneRegistry, bank: ValveBank) -> dict[str, float]:
    totals = {}
    for zone in registry.all():
        pump = pump_for_zone(pumps, zone)
        litres = bank.litres_for_zone(zone.zone_id)
        minutes = pumping_minutes(pump, litres)
        totals[zone.zone_id] = round(kilowatt_hours(pump, minutes), 3)
    return totals


def weekly_energy(pumps: list[Pump], registry: ZoneRegistry, bank: ValveBank, schedule: Schedule) -> dict[str, float]:
    totals: dict[str, float] = {}
    for zone in registry.all():
        pump = pump_for_zone(pumps, zone)
        litres = weekly_minutes(schedule, zone.zone_id) * zone_flow(bank, zone.zone_id)
        minutes = pumping_minutes(pump, litres)
        totals[pump.pump_id] = totals.get(pump.pump_id, 0.0) + kilowatt_hours(pump, minutes)
    return totals


def is_peak(slot: Slot) -> bool:
    end = slot_end(slot)
    return PEAK_START <= slot.start_time < PEAK_END or PEAK_START < end <= PEAK_END


def peak_slots(schedule: Schedule) -> list[Slot]:
    return [slot for slot in schedule.slots if is_peak(slot)]


def slot_cost(slot: Slot, pump: Pump, tariff: Tariff) -> float:
    minutes = slot.duration.total_seconds() / 60 * len(slot.weekdays)
    price = tariff.peak_price if is_peak(slot) else tariff.off_peak_price
    return kilowatt_hours(pump, minutes) * price


def weekly_cost(pumps: list[Pump], registry: ZoneRegistry, schedule: Schedule, tariff: Tariff) -> float:
    total = 0.0
    for slot in schedule.slots:
        zone = registry.get(slot.zone_id)
        pump = pump_for_zone(pumps, zone)
        total += slot_cost(slot, pump, tariff)
    return round(total, 2)


def overloaded_pumps(pumps: list[Pump], registry: ZoneRegistry, bank: ValveBank) -> list[str]:
    demand: dict[str, float] = {}
    for valve in bank.open_valves():
        zone = registry.get(valve.zone_id)
        demand[zone.glasshouse] = demand.get(zone.glasshouse, 0.0) + valve.flow_rate
    overloaded = []
    for pump in pumps:
        if demand.get(pump.glasshouse, 0.0) > pump.litres_per_minute:
            overloaded.append(pump.pump_id)
    return overloaded


def energy_report(pumps: list[Pump], registry: ZoneRegistry, bank: ValveBank, tariff: Tariff) -> str:
    lines = ["Pump energy by zone", ""]
    total = 0.0
    for zone_id, energy in sorted(energy_by_zone(pumps, registry, bank).items()):
        total += energy
        lines.append(f"{zone_id:8} {energy:6.2f} kWh")
    lines.append(f"total {total:.2f} kWh, at most {total * tariff.peak_price:.2f} at the peak price")
    return "\n".join(lines)
