from datetime import date, datetime

import pytest

from fernhill.controller import Decision
from fernhill.fertiliser import (Dose, DosingError, StockTank, days_of_stock, doses_for_decisions, draw, draw_all,
                                 ec_problems, format_dose, millilitres_by_zone, needs_refill, recipe_on,
                                 recipes_by_zone)
from fernhill.zones import Zone, ZoneRegistry

NOW = datetime(2026, 5, 1, 6, 0)
PLANTED_ON = date(2026, 4, 20)


def make_registry():
    registry = ZoneRegistry()
    registry.add(Zone("n1", "north 1", "north", "tomato", 40.0))
    registry.add(Zone("s1", "south 1", "south", "basil", 30.0))
    return registry


def make_dose(zone_id="n1", millilitres=500.0, day=1):
    return Dose(zone_id, 250.0, millilitres, datetime(2026, 5, day, 6, 0))


def test_recipe_follows_the_crop_stage():
    zone = Zone("n1", "north 1", "north", "tomato", 40.0)
    assert recipe_on(zone, PLANTED_ON, date(2026, 4, 25)).stage == "seedling"
    assert recipe_on(zone, PLANTED_ON, date(2026, 5, 20)).stage == "vegetative"


def test_no_recipe_for_unplanned_crops():
    zone = Zone("e1", "east 1", "east", "pepper", 35.0)
    assert recipe_on(zone, PLANTED_ON, NOW.date()) is None


def test_doses_follow_decisions():
    registry = make_registry()
    decisions = [Decision("n1", 100.0, "deficit 8.0"), Decision("s1", 0.0, "moist enough")]
    doses = doses_for_decisions(registry, decisions, {"n1": PLANTED_ON, "s1": PLANTED_ON}, NOW)
    assert [dose.zone_id for dose in doses] == ["n1"]
    assert doses[0].millilitres == pytest.approx(80.0)


def test_draw_lowers_the_tank():
    tank = StockTank("t1", capacity=10.0, level=2.0)
    level = draw(tank, make_dose(millilitres=500.0))
    assert level == pytest.approx(1.5)
    assert len(tank.doses) == 1


def test_draw_refuses_more_than_the_tank_holds():
    tank = StockTank("t1", capacity=10.0, level=0.1)
    with pytest.raises(DosingError):
        draw(tank, make_dose(millilitres=500.0))


def test_draw_all_skips_what_does_not_fit():
    tank = StockTank("t1", capacity=10.0, level=1.0)
    skipped = draw_all(tank, [make_dose(millilitres=600.0), make_dose(millilitres=600.0)])
    assert len(skipped) == 1
    assert needs_refill(tank)


def test_days_of_stock():
    tank = StockTank("t1", capacity=10.0, level=6.0)
    draw_all(tank, [make_dose(day=1), make_dose(day=1), make_dose(day=2)])
    assert days_of_stock(tank) == pytest.approx(6.0)


def test_millilitres_by_zone():
    doses = [make_dose("n1", 100.0), make_dose("s1", 50.0), make_dose("n1", 25.0)]
    assert millilitres_by_zone(doses) == {"n1": 125.0, "s1": 50.0}


def test_ec_problems():
    registry = make_registry()
    plantings = {"n1": PLANTED_ON, "s1": PLANTED_ON}
    problems = ec_problems(registry, {"n1": 2.4, "s1": 1.1}, plantings, NOW.date())
    assert len(problems) == 1
    assert problems[0].startswith("zone n1")


def test_format_dose():
    dose = make_dose("s1", 125.0)
    assert format_dose(dose) == "s1 125 ml in 250.0 l at 2026-05-01 06:00"


def test_recipes_by_zone_skips_unplanted_zones():
    registry = make_registry()
    recipes = recipes_by_zone(registry, {"s1": PLANTED_ON}, NOW.date())
    assert list(recipes) == ["s1"]
    assert recipes["s1"].ml_per_litre == 0.5
