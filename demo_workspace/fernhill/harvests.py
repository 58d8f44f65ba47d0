"""Harvest log: what each zone yielded, and how much water each kilogram took."""

from __future__ import annotations

from dataclasses import dataclass
from datetime import date, timedelta

from .plans import harvest_date, plan_for
from .zones import ZoneRegistry


@dataclass(frozen=True)
class Harvest:
    zone_id: str
    crop: str
    kilograms: float
    picked_on: date
    grade: str = "first"


def parse_harvest(row: dict) -> Harvest:
    kilograms = float(row["kilograms"])
    if kilograms < 0:
        raise ValueError(f"harvest in zone {row['zone_id']} has negative weight {kilograms}")
    return Harvest(
        zone_id=row["zone_id"],
        crop=row["crop"],
        kilograms=kilograms,
        picked_on=date.fromisoformat(row["picked_on"]),
        grade=row.get("grade", "first"),
    )


def parse_harvests(rows: list[dict]) -> list[Harvest]:
    harvests = []
    for row in rows:
        harvest = parse_harvest(row)
        harvests.append(harvest)
    return sorted(harvests, key=lambda harvest: harvest.picked_on)


def harvests_for_zone(harvests: list[Harvest], zone_id: str) -> list[Harvest]:
    return [harvest for harvest in harvests if harvest.zone_id == zone_id]


def harvests_between(harvests: list[Harvest], start: date, end: date) -> list[Harvest]:
    return [harvest for harvest in harvests if start <= harvest.picked_on <= end]


def total_kilograms(harvests: list[Harvest]) -> float:
    total = 0.0
    for harvest in harvests:
        total += harvest.kilograms
    return total


def kilograms_by_zone(harvests: list[Harvest]) -> dict[str, float]:
    totals: dict[str, float] = {}
    for harvest in harvests:
        totals[harvest.zone_id] = totals.get(harvest.zone_id, 0.0) + harvest.kilograms
    return totals


def kilograms_by_crop(harvests: list[Harvest]) -> dict[str, float]:
    totals: dict[str, float] = {}
    for harvest in harvests:
        totals[harvest.crop] = totals.get(harvest.crop, 0.0) + harvest.kilograms
    return dict(sorted(totals.items()))


def first_grade_share(harvests: list[Harvest]) -> float:
    total = total_kilograms(harvests)
    if total <= 0:
        return 0.0
    first_grade = sum(harvest.kilograms for harvest in harvests if harvest.grade == "first")
    return first_grade / total


def best_zone(harvests: list[Harvest]) -> str | None:
    best = None
    highest = 0.0
    for zone_id, kilograms in kilograms_by_zone(harvests).items():
        if kilograms > highest:
            highest = kilograms
            best = zone_id
    return best


def litres_per_kilogram(harvests: list[Harvest], litres_by_zone: dict[str, float]) -> dict[str, float]:
    ratios = {}
    for zone_id, kilograms in kilograms_by_zone(harvests).items():
        litres = litres_by_zone.get(zone_id)
        if litres is None or kilograms <= 0:
            continue
        ratios[zone_id] = round(litres / kilograms, 1)
    return ratios


def weekly_kilograms(harvests: list[Harvest]) -> dict[str, float]:
    totals: dict[str, float] = {}
    for harvest in harvests:
        year, week, _ = harvest.picked_on.isocalendar()
        key = f"{year}-W{week:02d}"
        totals[key] = totals.get(key, 0.0) + harvest.kilograms
    return dict(sorted(totals.items()))


def expected_harvests(registry: ZoneRegistry, plantings: dict[str, date]) -> dict[str, date]:
    expected = {}
    for zone in registry.all():
        planted_on = plantings.get(zone.zone_id)
        if planted_on is None:
            continue
        try:
            plan = plan_for(zone.crop)
        except KeyError:
            continue
        expected[zone.zone_id] = harvest_date(plan, planted_on)
    return expected


def late_zones(registry: ZoneRegistry, harvests: list[Harvest], plantings: dict[str, date], today: date,
               grace: timedelta = timedelta(days=7)) -> list[str]:
    late = []
    for zone_id, due_on in expected_harvests(registry, plantings).items():
        if today <= due_on + grace:
            continue
        picked = [harvest for harvest in harvests_for_zone(harvests, zone_id) if harvest.picked_on >= due_on]
        if not picked:
            late.append(zone_id)
    return sorted(late)


def format_harvest(harvest: Harvest) -> str:
    return f"{harvest.picked_on:%d %b} {harvest.zone_id} {harvest.crop}: {harvest.kilograms:.1f} kg ({harvest.grade})"


def harvest_report(registry: ZoneRegistry, harvests: list[Harvest], litres_by_zone: dict[str, float]) -> str:
    lines = ["Harvests by zone", ""]
    ratios = litres_per_kilogram(harvests, litres_by_zone)
    for zone_id, kilograms in sorted(kilograms_by_zone(harvests).items()):
        zone = registry.get(zone_id)
        ratio = ratios.get(zone_id)
        usage = f"{ratio:.1f} l/kg" if ratio is not None else "no water logged"
        lines.append(f"{zone.name:20} {kilograms:7.1f} kg  {usage}")
    lines.append("")
    lines.append(f"total {total_kilograms(harvests):.1f} kg, {first_grade_share(harvests):.0%} first grade")
    return "\n".join(lines)
