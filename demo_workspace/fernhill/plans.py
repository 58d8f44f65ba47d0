"""Crop plans: what each crop needs through its growing season."""

from __future__ import annotations

from dataclasses import dataclass
from datetime import date, timedelta


@dataclass(frozen=True)
class Stage:
    name: str
    days: int
    target_moisture: float
    litres_per_day: float


@dataclass(frozen=True)
class CropPlan:
    crop: str
    stages: tuple[Stage, ...]

    @property
    def season_days(self) -> int:
        return sum(stage.days for stage in self.stages)


PLANS = {
    "tomato": CropPlan("tomato", (Stage("seedling", 21, 45.0, 0.4), Stage("vegetative", 35, 40.0, 1.2),
                                  Stage("fruiting", 60, 38.0, 2.0))),
    "basil": CropPlan("basil", (Stage("seedling", 14, 42.0, 0.2), Stage("harvest", 70, 35.0, 0.6))),
    "lettuce": CropPlan("lettuce", (Stage("seedling", 10, 45.0, 0.2), Stage("heading", 40, 40.0, 0.5))),
}


def stage_on(plan: CropPlan, planted_on: date, day: date) -> Stage | None:
    elapsed = (day - planted_on).days
    if elapsed < 0:
        return None
    for stage in plan.stages:
        if elapsed < stage.days:
            return stage
        elapsed -= stage.days
    return None


def target_moisture_on(plan: CropPlan, planted_on: date, day: date, default: float = 35.0) -> float:
    stage = stage_on(plan, planted_on, day)
    return stage.target_moisture if stage else default


def harvest_date(plan: CropPlan, planted_on: date) -> date:
    return planted_on + timedelta(days=plan.season_days)


def season_litres(plan: CropPlan, plants: int) -> float:
    total = 0.0
    for stage in plan.stages:
        total += stage.days * stage.litres_per_day * plants
    return total


def stage_changes(plan: CropPlan, planted_on: date) -> list[tuple[date, str]]:
    changes = []
    day = planted_on
    for stage in plan.stages:
        changes.append((day, stage.name))
        day += timedelta(days=stage.days)
    changes.append((day, "harvest"))
    return changes


def plan_for(crop: str) -> CropPlan:
    plan = PLANS.get(crop)
    if plan is None:
        raise KeyError(f"no crop plan for {crop}")
    return plan


def daily_litres(crop: str, planted_on: date, day: date, plants: int) -> float:
    plan = plan_for(crop)
    stage = stage_on(plan, planted_on, day)
    if stage is None:
        return 0.0
    return stage.litres_per_day * plants
