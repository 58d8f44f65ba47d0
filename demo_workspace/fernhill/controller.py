"""The controller loop: read sensors, decide, open and close valves."""

from __future__ import annotations

import logging
from dataclasses import dataclass, field
from datetime import datetime, timedelta

from .readings import Reading, average_moisture, drop_outliers, readings_for_zone, readings_in_window
from .schedules import Schedule, due_slots
from .valves import ValveBank, water_zone
from .weather import Forecast, rain_expected, watering_factor
from .zones import ZoneRegistry, moisture_deficit

log = logging.getLogger(__name__)

LITRES_PER_DEFICIT_POINT = 2.5


@dataclass
class Decision:
    zone_id: str
    litres: float
    reason: str


@dataclass
class Controller:
    registry: ZoneRegistry
    bank: ValveBank
    schedule: Schedule
    forecasts: list[Forecast] = field(default_factory=list)
    window: timedelta = timedelta(minutes=30)

    def decide(self, readings: list[Reading], now: datetime) -> list[Decision]:
        decisions = []
        if rain_expected(self.forecasts, now.date()):
            log.info("rain expected today; skipping scheduled watering")
            return decisions
        factor = watering_factor(self.forecasts, now.date())
        recent = readings_in_window(readings, now, self.window)
        for slot in due_slots(self.schedule, now):
            zone = self.registry.get(slot.zone_id)
            zone_readings = drop_outliers(readings_for_zone(recent, zone.zone_id))
            if not zone_readings:
                decisions.append(Decision(zone.zone_id, 0.0, "no recent readings"))
                continue
            moisture = average_moisture(zone_readings)
            deficit = moisture_deficit(zone, moisture)
            if deficit <= 0:
                decisions.append(Decision(zone.zone_id, 0.0, "moist enough"))
                continue
            litres = deficit * LITRES_PER_DEFICIT_POINT * factor
            decisions.append(Decision(zone.zone_id, litres, f"deficit {deficit:.1f}"))
        return decisions

    def apply(self, decisions: list[Decision]) -> float:
        longest = 0.0
        for decision in decisions:
            if decision.litres <= 0:
                continue
            minutes = water_zone(self.bank, decision.zone_id, decision.litres)
            longest = max(longest, minutes)
            log.info("watering zone %s with %.1f litres", decision.zone_id, decision.litres)
        return longest

    def step(self, readings: list[Reading], now: datetime) -> list[Decision]:
        decisions = self.decide(readings, now)
        self.apply(decisions)
        return decisions

    def stop(self) -> float:
        litres = self.bank.close_all()
        log.info("stopped; %.1f litres delivered in the last run", litres)
        return litres


def summarise_decisions(decisions: list[Decision]) -> str:
    parts = []
    total = 0.0
    for decision in decisions:
        total += decision.litres
        parts.append(f"{decision.zone_id}: {decision.litres:.1f} l ({decision.reason})")
    parts.append(f"total {total:.1f} l")
    return "; ".join(parts)
