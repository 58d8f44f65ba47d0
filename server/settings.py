"""The language server's settings: one typed object, documented defaults, parsed once."""

from __future__ import annotations

import re
from dataclasses import dataclass, field, fields

from cognomen.model.languages import LANGUAGES

SEVERITIES = ("error", "warning", "information", "hint")
LEVELS = ("warning", "error")


@dataclass
class ServerSettings:
    """What an editor may set, under `cognomen` in initializationOptions or workspace settings."""

    model_dir: str | None = None
    """Model store to use; default: `.cognomen` at the workspace root."""
    severity: str = "information"
    """Diagnostic severity for a name that does not fit: error, warning, information or hint."""
    minimum_level: str = "warning"
    """Show every flagged name (warning) or only the clearest cases (error)."""
    threshold: float | None = None
    """Oddness above which a name is flagged; default: the threshold calibrated at training."""
    languages: list[str] = field(default_factory=lambda: list(LANGUAGES))
    """Languages to give hints for."""
    max_file_size: int = 1 << 20
    """Documents larger than this many characters get no hints."""
    debounce_ms: int = 50
    """Quiet time after an edit before the document is checked again."""
    allow_public_parameter_renames: bool = True
    """Offer renames for parameters of public functions, with a caution where callers may pass them by name."""
    reload_seconds: float = 2.0
    """How often to look for a newly promoted model."""


def _snake(key: str) -> str:
    return re.sub(r"(?<!^)(?=[A-Z])", "_", key).lower()


def parse_settings(raw, previous: ServerSettings | None = None) -> tuple[ServerSettings, list[str]]:
    """Settings from the editor's camelCase object; each bad value is reported and its default kept."""
    settings = ServerSettings()
    if previous is not None:
        settings = ServerSettings(**{f.name: getattr(previous, f.name) for f in fields(ServerSettings)})
    problems: list[str] = []
    if raw is None or raw == []:
        return settings, problems  # no settings (some clients encode an empty object as an empty list)
    if not isinstance(raw, dict):
        return settings, [f"cognomen settings must be an object, not {type(raw).__name__}"]
    if isinstance(raw.get("cognomen"), dict):
        raw = raw["cognomen"]
    defaults = ServerSettings()
    known = {f.name for f in fields(ServerSettings)}
    for key, value in raw.items():
        name = _snake(key)
        if name not in known:
            problems.append(f"unknown setting {key!r} ignored")
            continue
        try:
            setattr(settings, name, _check(name, value))
        except ValueError as error:
            problems.append(f"setting {key}: {error}; using the default {getattr(defaults, name)!r}")
            setattr(settings, name, getattr(defaults, name))
    return settings, problems


def _check(name: str, value):
    if name == "model_dir":
        if value is not None and not isinstance(value, str):
            raise ValueError("must be a path")
        return value
    if name == "severity":
        if value not in SEVERITIES:
            raise ValueError(f"must be one of {', '.join(SEVERITIES)}")
        return value
    if name == "minimum_level":
        if value not in LEVELS:
            raise ValueError(f"must be one of {', '.join(LEVELS)}")
        return value
    if name == "threshold":
        if value is not None and (isinstance(value, bool) or not isinstance(value, (int, float))):
            raise ValueError("must be a number or null")
        return None if value is None else float(value)
    if name == "languages":
        if not isinstance(value, list) or any(v not in LANGUAGES for v in value):
            raise ValueError(f"must be a list drawn from {', '.join(LANGUAGES)}")
        return list(value)
    if name in ("max_file_size", "debounce_ms"):
        if isinstance(value, bool) or not isinstance(value, int) or value < 0:
            raise ValueError("must be a whole number, 0 or more")
        return value
    if name == "reload_seconds":
        if isinstance(value, bool) or not isinstance(value, (int, float)) or value <= 0:
            raise ValueError("must be a positive number")
        return float(value)
    if name == "allow_public_parameter_renames":
        if not isinstance(value, bool):
            raise ValueError("must be true or false")
        return value
    return value
