"""Sensor calibration: turning raw probe values into moisture percentages."""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Calibration:
    sensor_id: str
    dry_value: int
    wet_value: int


def moisture_from_raw(calibration: Calibration, raw_value: int) -> float:
    span = calibration.dry_value - calibration.wet_value
    if span == 0:
        raise ValueError(f"sensor {calibration.sensor_id} has equal dry and wet values")
    moisture = (calibration.dry_value - raw_value) / span * 100
    return min(max(moisture, 0.0), 100.0)


def calibrate(sensor_id: str, dry_samples: list[int], wet_samples: list[int]) -> Calibration:
    if not dry_samples or not wet_samples:
        raise ValueError("calibration needs dry and wet samples")
    dry_value = round(sum(dry_samples) / len(dry_samples))
    wet_value = round(sum(wet_samples) / len(wet_samples))
    return Calibration(sensor_id, dry_value, wet_value)


def load_calibrations(rows: list[dict]) -> dict[str, Calibration]:
    calibrations = {}
    for row in rows:
        calibration = Calibration(row["sensor_id"], int(row["dry"]), int(row["wet"]))
        calibrations[calibration.sensor_id] = calibration
    return calibrations


def drift(old: Calibration, new: Calibration) -> float:
    old_span = old.dry_value - old.wet_value
    new_span = new.dry_value - new.wet_value
    if old_span == 0:
        return 0.0
    return abs(new_span - old_span) / abs(old_span)


def needs_recalibration(calibrations: dict[str, Calibration], latest: dict[str, Calibration],
                        limit: float = 0.1) -> list[str]:
    sensor_ids = []
    for sensor_id, calibration in calibrations.items():
        fresh = latest.get(sensor_id)
        if fresh is not None and drift(calibration, fresh) > limit:
            sensor_ids.append(sensor_id)
    return sorted(sensor_ids)
