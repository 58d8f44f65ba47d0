"""Fertiliser dosing: how much feed each zone gets with its water, and what is left in the tanks."""

from __future__ import annotations

from dataclasses import dataclass, field
from datetime import date, datetime

from .controller import Decision
from .plans import plan_for, stage_on
from .zones import Zone, ZoneRegistry


class DosingError(Exception):
    pass


@dataclass(frozen=True)
class Recipe:
    crop: str
    stage: str
    ml_per_litre: float
    target_ec: float  # millisiemens per centimetre


@dataclass
class Dose:
    zone_id: str
    litres: float
    millilitres: float
    given_at: datetime


@dataclass
class StockTank:
    tank_id: str
    capacity: float  # litres of concentrate
    level: float
    doses: list[Dose] = field(default_factory=list)


RECIPES = {
    ("tomato", "seedling"): Recipe("tomato", "seedling", 0.8, 1.5),
    ("tomato", "vegetative"): Recipe("tomato", "vegetative", 1.5, 2.5),
    ("tomato", "fruiting"): Recipe("tomato", "fruiting", 2.0, 3.0),
    ("basil", "seedling"): Recipe("basil", "seedling", 0.5, 1.0),
    ("basil", "harvest"): Recipe("basil", "harvest", 1.0, 1.6),
    ("lettuce", "seedling"): Recipe("lettuce", "seedling", 0.5, 0.9),
    ("lettuce", "heading"): Recipe("lettuce", "heading", 0.9, 1.4),
}


def load_recipes(rows: list[dict]) -> dict[tuple[str, str], Recipe]:
    recipes = {}
    for row in rows:
        recipe = Recipe(
            crop=row["crop"],
            stage=row["stage"],
            ml_per_litre=float(row["ml_per_litre"]),
            target_ec=float(row.get("target_ec", 2.0)),
        )
        recipes[(recipe.crop, recipe.stage)] = recipe
    return recipes


def recipe_on(zone: Zone, planted_on: date, day: date,
              recipes: dict[tuple[str, str], Recipe] = RECIPES) -> Recipe | None:
    try:
        plan = plan_for(zone.crop)
    except KeyError:
        return None
    stage = stage_on(plan, planted_on, day)
    if stage is None:
        return None
    return recipes.get((zone.crop, stage.name))


def recipes_by_zone(registry: ZoneRegistry, plantings: dict[str, date], day: date) -> dict[str, Recipe]:
    recipes = {}
    for zone in registry.all():
        planted_on = plantings.get(zone.zone_id)
        if planted_on is None:
            continue
        recipe = recipe_on(zone, planted_on, day)
        if recipe is not None:
            recipes[zone.zone_id] = recipe
    return recipes


def dose_for(zone: Zone, recipe: Recipe, litres: float, now: datetime) -> Dose:
    if litres < 0:
        raise DosingError(f"zone {zone.zone_id} cannot be given {litres} litres")
    millilitres = litres * recipe.ml_per_litre
    return Dose(zone.zone_id, litres, millilitres, now)


def doses_for_decisions(registry: ZoneRegistry, decisions: list[Decision], plantings: dict[str, date],
                        now: datetime) -> list[Dose]:
    doses = []
    for decision in decisions:
        if decision.litres <= 0:
            continue
        zone = registry.get(decision.zone_id)
        planted_on = plantings.get(zone.zone_id)
        if planted_on is None:
            continue
        recipe = recipe_on(zone, planted_on, now.date())
        if recipe is None:
            continue
        doses.append(dose_for(zone, recipe, decision.litres, now))
    return doses


def draw(tank: StockTank, dose: Dose) -> float:
    litres = dose.millilitres / 1000
    if litres > tank.level:
        raise DosingError(f"tank {tank.tank_id} holds {tank.level:.2f} l, dose needs {litres:.2f} l")
    tank.level -= litres
    tank.doses.append(dose)
    return tank.level


def draw_all(tank: StockTank, doses: list[Dose]) -> list[Dose]:
    skipped = []
    for dose in doses:
        try:
            draw(tank, dose)
        except DosingError:
            skipped.append(dose)
    return skipped


def doses_for_zone(doses: list[Dose], zone_id: str) -> list[Dose]:
    return [dose for dose in doses if dose.zone_id == zone_id]


def millilitres_by_zone(doses: list[Dose]) -> dict[str, float]:
    totals: dict[str, float] = {}
    for dose in doses:
        totals[dose.zone_id] = totals.get(dose.zone_id, 0.0) + dose.millilitres
    return totals


def daily_use(tank: StockTank) -> dict[date, float]:
    totals: dict[date, float] = {}
    for dose in tank.doses:
        day = dose.given_at.date()
        totals[day] = totals.get(day, 0.0) + dose.millilitres / 1000
    return dict(sorted(totals.items()))


def days_of_stock(tank: StockTank) -> float | None:
    totals = daily_use(tank)
    if not totals:
        return None
    average = sum(totals.values()) / len(totals)
    if average <= 0:
        return None
    return tank.level / average


def needs_refill(tank: StockTank, limit: float = 0.2) -> bool:
    if tank.capacity <= 0:
        return True
    return tank.level / tank.capacity < limit


def ec_problems(registry: ZoneRegistry, measured_ec: dict[str, float], plantings: dict[str, date], day: date,
                tolerance: float = 0.3) -> list[str]:
    problems = []
    for zone in registry.all():
        ec = measured_ec.get(zone.zone_id)
        planted_on = plantings.get(zone.zone_id)
        if ec is None or planted_on is None:
            continue
        recipe = recipe_on(zone, planted_on, day)
        if recipe is None:
            continue
        if abs(ec - recipe.target_ec) > tolerance:
            problems.append(f"zone {zone.zone_id}: EC {ec:.1f}, {recipe.stage} target {recipe.target_ec:.1f}")
    return problems


def format_dose(dose: Dose) -> str:
    stamp = dose.given_at.strftime("%Y-%m-%d %H:%M")
    return f"{dose.zone_id} {dose.millilitres:.0f} ml in {dose.litres:.1f} l at {stamp}"
