"""The probe bus: framing, checksums and decoding of sensor messages."""

from __future__ import annotations

import struct
from dataclasses import dataclass
from datetime import datetime

from .calibration import Calibration, moisture_from_raw
from .readings import Reading

FRAME_START = 0x7E
FRAME_LENGTH = 12


class FrameError(ValueError):
    pass


@dataclass(frozen=True)
class Frame:
    sensor_number: int
    raw_moisture: int
    raw_temperature: int
    battery: int


def checksum(payload: bytes) -> int:
    total = 0
    for byte in payload:
        total = (total + byte) & 0xFF
    return (~total) & 0xFF


def decode_frame(data: bytes) -> Frame:
    if len(data) != FRAME_LENGTH:
        raise FrameError(f"frame has {len(data)} bytes, expected {FRAME_LENGTH}")
    if data[0] != FRAME_START:
        raise FrameError("frame does not start with the start byte")
    payload = data[1:-1]
    expected = data[-1]
    if checksum(payload) != expected:
        raise FrameError("checksum mismatch")
    sensor_number, raw_moisture, raw_temperature, battery = struct.unpack(">HHhBxxx", payload)
    return Frame(sensor_number, raw_moisture, raw_temperature, battery)


def encode_frame(frame: Frame) -> bytes:
    payload = struct.pack(">HHhBxxx", frame.sensor_number, frame.raw_moisture, frame.raw_temperature, frame.battery)
    return bytes([FRAME_START]) + payload + bytes([checksum(payload)])


def split_frames(buffer: bytes) -> tuple[list[bytes], bytes]:
    frames = []
    start = buffer.find(bytes([FRAME_START]))
    while start != -1 and len(buffer) - start >= FRAME_LENGTH:
        frames.append(buffer[start:start + FRAME_LENGTH])
        buffer = buffer[start + FRAME_LENGTH:]
        start = buffer.find(bytes([FRAME_START]))
    remainder = buffer[start:] if start != -1 else b""
    return frames, remainder


def frame_to_reading(frame: Frame, zone_by_sensor: dict[str, str], calibrations: dict[str, Calibration],
                     taken_at: datetime) -> Reading:
    sensor_id = f"probe-{frame.sensor_number:03d}"
    zone_id = zone_by_sensor.get(sensor_id, "unassigned")
    calibration = calibrations.get(sensor_id)
    if calibration is None:
        moisture = frame.raw_moisture / 10.0
    else:
        moisture = moisture_from_raw(calibration, frame.raw_moisture)
    temperature = frame.raw_temperature / 10.0
    return Reading(sensor_id, zone_id, moisture, temperature, taken_at)


def decode_stream(buffer: bytes, zone_by_sensor: dict[str, str], calibrations: dict[str, Calibration],
                  taken_at: datetime) -> tuple[list[Reading], bytes, int]:
    readings = []
    errors = 0
    frames, remainder = split_frames(buffer)
    for data in frames:
        try:
            frame = decode_frame(data)
        except FrameError:
            errors += 1
            continue
        readings.append(frame_to_reading(frame, zone_by_sensor, calibrations, taken_at))
    return readings, remainder, errors


def low_battery(frames: list[Frame], limit: int = 20) -> list[int]:
    sensor_numbers = []
    for frame in frames:
        if frame.battery < limit:
            sensor_numbers.append(frame.sensor_number)
    return sorted(set(sensor_numbers))
