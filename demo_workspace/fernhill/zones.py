"""Glasshouse zones and the plants growing in them."""

from __future__ import annotations

from dataclasses import dataclass, field


@dataclass
class Zone:
    zone_id: str
    name: str
    glasshouse: str
    crop: str
    target_moisture: float
    valve_ids: list[str] = field(default_factory=list)
    sensor_ids: list[str] = field(default_factory=list)


class ZoneRegistry:
    def __init__(self) -> None:
        self._zones: dict[str, Zone] = {}

    def add(self, zone: Zone) -> None:
        if zone.zone_id in self._zones:
            raise ValueError(f"zone {zone.zone_id} already registered")
        self._zones[zone.zone_id] = zone

    def get(self, zone_id: str) -> Zone:
        zone = self._zones.get(zone_id)
        if zone is None:
            raise KeyError(f"unknown zone {zone_id}")
        return zone

    def remove(self, zone_id: str) -> Zone:
        zone = self.get(zone_id)
        del self._zones[zone_id]
        return zone

    def all(self) -> list[Zone]:
        return sorted(self._zones.values(), key=lambda zone: zone.zone_id)

    def in_glasshouse(self, glasshouse: str) -> list[Zone]:
        return [zone for zone in self.all() if zone.glasshouse == glasshouse]

    def growing(self, crop: str) -> list[Zone]:
        zones = []
        for zone in self.all():
            if zone.crop == crop:
                zones.append(zone)
        return zones

    def zone_for_sensor(self, sensor_id: str) -> Zone | None:
        for zone in self.all():
            if sensor_id in zone.sensor_ids:
                return zone
        return None

    def zone_for_valve(self, valve_id: str) -> Zone | None:
        for zone in self.all():
            if valve_id in zone.valve_ids:
                return zone
        return None

    def attach_sensor(self, zone_id: str, sensor_id: str) -> None:
        zone = self.get(zone_id)
        owner = self.zone_for_sensor(sensor_id)
        if owner is not None and owner.zone_id != zone_id:
            raise ValueError(f"sensor {sensor_id} already belongs to zone {owner.zone_id}")
        if sensor_id not in zone.sensor_ids:
            zone.sensor_ids.append(sensor_id)

    def attach_valve(self, zone_id: str, valve_id: str) -> None:
        zone = self.get(zone_id)
        owner = self.zone_for_valve(valve_id)
        if owner is not None and owner.zone_id != zone_id:
            raise ValueError(f"valve {valve_id} already belongs to zone {owner.zone_id}")
        if valve_id not in zone.valve_ids:
            zone.valve_ids.append(valve_id)

    def crops(self) -> list[str]:
        crops = set()
        for zone in self.all():
            crops.add(zone.crop)
        return sorted(crops)


def load_zones(rows: list[dict]) -> ZoneRegistry:
    registry = ZoneRegistry()
    for row in rows:
        zone = Zone(
            zone_id=row["zone_id"],
            name=row.get("name", row["zone_id"]),
            glasshouse=row["glasshouse"],
            crop=row["crop"],
            target_moisture=float(row.get("target_moisture", 35.0)),
        )
        for sensor_id in row.get("sensors", []):
            zone.sensor_ids.append(sensor_id)
        for valve_id in row.get("valves", []):
            zone.valve_ids.append(valve_id)
        registry.add(zone)
    return registry


def dump_zones(registry: ZoneRegistry) -> list[dict]:
    rows = []
    for zone in registry.all():
        row = {
            "zone_id": zone.zone_id,
            "name": zone.name,
            "glasshouse": zone.glasshouse,
            "crop": zone.crop,
            "target_moisture": zone.target_moisture,
            "sensors": list(zone.sensor_ids),
            "valves": list(zone.valve_ids),
        }
        rows.append(row)
    return rows


def zones_needing_water(registry: ZoneRegistry, moisture_by_zone: dict[str, float]) -> list[Zone]:
    thirsty = []
    for zone in registry.all():
        moisture = moisture_by_zone.get(zone.zone_id)
        if moisture is not None and moisture < zone.target_moisture:
            thirsty.append(zone)
    return thirsty


def moisture_deficit(zone: Zone, moisture: float) -> float:
    deficit = zone.target_moisture - moisture
    return max(deficit, 0.0)
