"""Controller settings from a TOML file, with defaults."""

from __future__ import annotations

import tomllib
from dataclasses import dataclass, field
from pathlib import Path


@dataclass
class Settings:
    data_dir: Path = Path("data")
    poll_seconds: int = 60
    window_minutes: int = 30
    max_valve_minutes: float = 45.0
    glasshouses: list[str] = field(default_factory=lambda: ["north", "south", "east"])


def load_settings(path: Path) -> Settings:
    settings = Settings()
    if not path.exists():
        return settings
    with path.open("rb") as stream:
        payload = tomllib.load(stream)
    controller = payload.get("controller", {})
    if "data_dir" in controller:
        settings.data_dir = Path(controller["data_dir"])
    if "poll_seconds" in controller:
        settings.poll_seconds = int(controller["poll_seconds"])
    if "window_minutes" in controller:
        settings.window_minutes = int(controller["window_minutes"])
    if "max_valve_minutes" in controller:
        settings.max_valve_minutes = float(controller["max_valve_minutes"])
    glasshouses = payload.get("glasshouses")
    if glasshouses:
        settings.glasshouses = [str(glasshouse) for glasshouse in glasshouses]
    return settings


def validate(settings: Settings) -> list[str]:
    problems = []
    if settings.poll_seconds < 5:
        problems.append("poll_seconds must be at least 5")
    if settings.window_minutes <= 0:
        problems.append("window_minutes must be positive")
    if settings.max_valve_minutes <= 0:
        problems.append("max_valve_minutes must be positive")
    if not settings.glasshouses:
        problems.append("at least one glasshouse is needed")
    return problems
