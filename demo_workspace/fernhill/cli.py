"""Command line for the growers: status, water now, reports."""

from __future__ import annotations

import argparse
import sys
from datetime import date, datetime
from pathlib import Path

from .config import load_settings, validate
from .readings import zone_summary
from .reports import daily_report
from .storage import read_json, read_readings
from .zones import load_zones


def command_status(args: argparse.Namespace) -> int:
    settings = load_settings(Path(args.config))
    readings = read_readings(settings.data_dir / "readings.csv")
    summary = zone_summary(readings)
    for zone_id, moisture in sorted(summary.items()):
        print(f"{zone_id:8} {moisture:5.1f}%")
    return 0


def command_report(args: argparse.Namespace) -> int:
    settings = load_settings(Path(args.config))
    registry = load_zones(read_json(settings.data_dir / "zones.json", {"zones": []})["zones"])
    readings = read_readings(settings.data_dir / "readings.csv")
    day = date.fromisoformat(args.day) if args.day else datetime.now().date()
    print(daily_report(registry, readings, [], day))
    return 0


def command_check(args: argparse.Namespace) -> int:
    settings = load_settings(Path(args.config))
    problems = validate(settings)
    for problem in problems:
        print(f"config: {problem}", file=sys.stderr)
    return 1 if problems else 0


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(prog="fernhill")
    parser.add_argument("--config", default="fernhill.toml")
    commands = parser.add_subparsers(dest="command", required=True)
    status = commands.add_parser("status")
    status.set_defaults(handler=command_status)
    report = commands.add_parser("report")
    report.add_argument("--day")
    report.set_defaults(handler=command_report)
    check = commands.add_parser("check")
    check.set_defaults(handler=command_check)
    args = parser.parse_args(argv)
    return args.handler(args)


if __name__ == "__main__":
    raise SystemExit(main())
