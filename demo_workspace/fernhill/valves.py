"""Watering valves: opening, closing and keeping track of how long they ran."""

from __future__ import annotations

import logging
import time
from dataclasses import dataclass, field

log = logging.getLogger(__name__)


class ValveError(Exception):
    pass


@dataclass
class Valve:
    valve_id: str
    zone_id: str
    flow_rate: float  # litres per minute
    is_open: bool = False
    opened_at: float | None = None
    litres_delivered: float = 0.0
    history: list[tuple[float, float]] = field(default_factory=list)


class ValveBank:
    def __init__(self, clock=time.monotonic) -> None:
        self._valves: dict[str, Valve] = {}
        self._clock = clock

    def add(self, valve: Valve) -> None:
        self._valves[valve.valve_id] = valve

    def get(self, valve_id: str) -> Valve:
        valve = self._valves.get(valve_id)
        if valve is None:
            raise ValveError(f"unknown valve {valve_id}")
        return valve

    def open(self, valve_id: str) -> None:
        valve = self.get(valve_id)
        if valve.is_open:
            return
        valve.is_open = True
        valve.opened_at = self._clock()
        log.info("opened valve %s in zone %s", valve.valve_id, valve.zone_id)

    def close(self, valve_id: str) -> float:
        valve = self.get(valve_id)
        if not valve.is_open or valve.opened_at is None:
            return 0.0
        now = self._clock()
        minutes = (now - valve.opened_at) / 60
        litres = minutes * valve.flow_rate
        valve.litres_delivered += litres
        valve.history.append((valve.opened_at, now))
        valve.is_open = False
        valve.opened_at = None
        log.info("closed valve %s after %.1f minutes", valve.valve_id, minutes)
        return litres

    def close_all(self) -> float:
        total = 0.0
        for valve in self._valves.values():
            if valve.is_open:
                total += self.close(valve.valve_id)
        return total

    def open_valves(self) -> list[Valve]:
        return [valve for valve in self._valves.values() if valve.is_open]

    def valves_in_zone(self, zone_id: str) -> list[Valve]:
        valves = []
        for valve in self._valves.values():
            if valve.zone_id == zone_id:
                valves.append(valve)
        return valves

    def litres_for_zone(self, zone_id: str) -> float:
        total = 0.0
        for valve in self.valves_in_zone(zone_id):
            total += valve.litres_delivered
        return total

    def minutes_open(self, valve_id: str) -> float:
        valve = self.get(valve_id)
        minutes = 0.0
        for opened_at, closed_at in valve.history:
            minutes += (closed_at - opened_at) / 60
        if valve.is_open and valve.opened_at is not None:
            minutes += (self._clock() - valve.opened_at) / 60
        return minutes

    def reset(self, valve_id: str) -> None:
        valve = self.get(valve_id)
        valve.litres_delivered = 0.0
        valve.history.clear()


def minutes_for_litres(valve: Valve, litres: float) -> float:
    if valve.flow_rate <= 0:
        raise ValveError(f"valve {valve.valve_id} has no flow")
    return litres / valve.flow_rate


def water_zone(bank: ValveBank, zone_id: str, litres: float) -> float:
    valves = bank.valves_in_zone(zone_id)
    if not valves:
        raise ValveError(f"zone {zone_id} has no valves")
    share = litres / len(valves)
    longest = 0.0
    for valve in valves:
        minutes = minutes_for_litres(valve, share)
        longest = max(longest, minutes)
        bank.open(valve.valve_id)
    return longest
