"""A small JSON API over the controller for the dashboard."""

from __future__ import annotations

import json
from dataclasses import asdict
from datetime import datetime, timedelta
from http.server import BaseHTTPRequestHandler
from urllib.parse import parse_qs, urlparse

from .alerts import dry_zone_alerts, stale_sensor_alerts, worst_first
from .readings import Reading, average_moisture, group_by_zone, readings_for_zone, readings_since
from .schedules import format_slot, next_slot
from .valves import ValveBank
from .zones import ZoneRegistry


class ApiState:
    def __init__(self, registry: ZoneRegistry, bank: ValveBank, schedule, readings: list[Reading]) -> None:
        self.registry = registry
        self.bank = bank
        self.schedule = schedule
        self.readings = readings


def zone_payload(state: ApiState, zone_id: str, now: datetime) -> dict:
    zone = state.registry.get(zone_id)
    zone_readings = readings_for_zone(state.readings, zone_id)
    upcoming = next_slot(state.schedule, zone_id, now)
    return {
        "zoneId": zone.zone_id,
        "name": zone.name,
        "crop": zone.crop,
        "glasshouse": zone.glasshouse,
        "targetMoisture": zone.target_moisture,
        "moisture": round(average_moisture(zone_readings), 1),
        "litres": round(state.bank.litres_for_zone(zone_id), 1),
        "nextWatering": upcoming.isoformat() if upcoming else None,
        "slots": [format_slot(slot) for slot in state.schedule.slots_for_zone(zone_id)],
    }


def zones_payload(state: ApiState, now: datetime) -> dict:
    zones = []
    for zone in state.registry.all():
        zones.append(zone_payload(state, zone.zone_id, now))
    return {"zones": zones, "generatedAt": now.isoformat()}


def readings_payload(state: ApiState, zone_id: str, hours: int, now: datetime) -> dict:
    since = now - timedelta(hours=hours)
    recent = readings_since(readings_for_zone(state.readings, zone_id), since)
    points = []
    for reading in sorted(recent, key=lambda reading: reading.taken_at):
        points.append({"at": reading.taken_at.isoformat(), "moisture": reading.moisture,
                       "temperature": reading.temperature, "sensorId": reading.sensor_id})
    return {"zoneId": zone_id, "points": points}


def alerts_payload(state: ApiState, now: datetime) -> dict:
    alerts = dry_zone_alerts(state.registry, state.readings, now)
    alerts += stale_sensor_alerts(state.registry, state.readings, now)
    items = []
    for alert in worst_first(alerts):
        item = asdict(alert)
        item["raised_at"] = alert.raised_at.isoformat()
        items.append(item)
    return {"alerts": items}


def summary_payload(state: ApiState) -> dict:
    summary = {}
    for zone_id, zone_readings in group_by_zone(state.readings).items():
        summary[zone_id] = round(average_moisture(zone_readings), 1)
    return {"moistureByZone": summary}


def route(state: ApiState, path: str, query: dict[str, list[str]], now: datetime) -> tuple[int, dict]:
    parts = [part for part in path.split("/") if part]
    if parts == ["zones"]:
        return 200, zones_payload(state, now)
    if len(parts) == 2 and parts[0] == "zones":
        try:
            return 200, zone_payload(state, parts[1], now)
        except KeyError:
            return 404, {"error": f"no zone {parts[1]}"}
    if len(parts) == 3 and parts[0] == "zones" and parts[2] == "readings":
        hours = int(query.get("hours", ["24"])[0])
        return 200, readings_payload(state, parts[1], hours, now)
    if parts == ["alerts"]:
        return 200, alerts_payload(state, now)
    if parts == ["summary"]:
        return 200, summary_payload(state)
    return 404, {"error": f"no route for {path}"}


class Handler(BaseHTTPRequestHandler):
    state: ApiState

    def do_GET(self) -> None:
        url = urlparse(self.path)
        status, payload = route(self.state, url.path, parse_qs(url.query), datetime.now())
        body = json.dumps(payload).encode()
        self.send_response(status)
        self.send_header("Content-Type", "application/json")
        self.send_header("Content-Length", str(len(body)))
        self.end_headers()
        self.wfile.write(body)

    def log_message(self, format: str, *args) -> None:
        pass
