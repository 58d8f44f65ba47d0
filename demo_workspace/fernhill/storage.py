"""Keeping readings and watering logs on disk as CSV and JSON."""

from __future__ import annotations

import csv
import json
import os
import tempfile
from datetime import datetime
from pathlib import Path

from .readings import Reading


def write_readings(path: Path, readings: list[Reading]) -> None:
    temporary = path.with_suffix(".tmp")
    with temporary.open("w", newline="") as stream:
        writer = csv.writer(stream)
        writer.writerow(["sensor_id", "zone_id", "moisture", "temperature", "taken_at"])
        for reading in readings:
            writer.writerow([reading.sensor_id, reading.zone_id, reading.moisture, reading.temperature,
                             reading.taken_at.isoformat()])
    os.replace(temporary, path)


def read_readings(path: Path) -> list[Reading]:
    readings = []
    with path.open(newline="") as stream:
        reader = csv.DictReader(stream)
        for row in reader:
            reading = Reading(
                sensor_id=row["sensor_id"],
                zone_id=row["zone_id"],
                moisture=float(row["moisture"]),
                temperature=float(row["temperature"]),
                taken_at=datetime.fromisoformat(row["taken_at"]),
            )
            readings.append(reading)
    return readings


def append_reading(path: Path, reading: Reading) -> None:
    is_new = not path.exists()
    with path.open("a", newline="") as stream:
        writer = csv.writer(stream)
        if is_new:
            writer.writerow(["sensor_id", "zone_id", "moisture", "temperature", "taken_at"])
        writer.writerow([reading.sensor_id, reading.zone_id, reading.moisture, reading.temperature,
                         reading.taken_at.isoformat()])


def write_json(path: Path, payload: dict) -> None:
    directory = path.parent
    directory.mkdir(parents=True, exist_ok=True)
    handle, temporary = tempfile.mkstemp(dir=directory, suffix=".tmp")
    with os.fdopen(handle, "w") as stream:
        json.dump(payload, stream, indent=2, sort_keys=True)
    os.replace(temporary, path)


def read_json(path: Path, default: dict | None = None) -> dict:
    if not path.exists():
        return dict(default or {})
    with path.open() as stream:
        payload = json.load(stream)
    if not isinstance(payload, dict):
        raise ValueError(f"{path} does not hold a JSON object")
    return payload


def log_watering(path: Path, zone_id: str, litres: float, started_at: datetime) -> None:
    payload = read_json(path, {"waterings": []})
    entry = {"zone_id": zone_id, "litres": round(litres, 2), "started_at": started_at.isoformat()}
    payload["waterings"].append(entry)
    write_json(path, payload)


def waterings_for_zone(path: Path, zone_id: str) -> list[dict]:
    payload = read_json(path, {"waterings": []})
    return [entry for entry in payload["waterings"] if entry["zone_id"] == zone_id]


def litres_by_zone(path: Path) -> dict[str, float]:
    payload = read_json(path, {"waterings": []})
    totals: dict[str, float] = {}
    for entry in payload["waterings"]:
        totals[entry["zone_id"]] = totals.get(entry["zone_id"], 0.0) + entry["litres"]
    return totals


def archive(path: Path, archive_dir: Path) -> Path:
    archive_dir.mkdir(parents=True, exist_ok=True)
    stamp = datetime.now().strftime("%Y%m%d-%H%M%S")
    target = archive_dir / f"{path.stem}-{stamp}{path.suffix}"
    os.replace(path, target)
    return target
