import pytest

from fernhill.valves import Valve, ValveBank, ValveError, water_zone


class FakeClock:
    def __init__(self):
        self.now = 0.0

    def __call__(self):
        return self.now


def make_bank():
    clock = FakeClock()
    bank = ValveBank(clock=clock)
    bank.add(Valve("n1-v1", "n1", flow_rate=10.0))
    bank.add(Valve("n1-v2", "n1", flow_rate=5.0))
    return bank, clock


def test_open_and_close_counts_litres():
    bank, clock = make_bank()
    bank.open("n1-v1")
    clock.now = 120.0
    litres = bank.close("n1-v1")
    assert litres == pytest.approx(20.0)


def test_closing_a_closed_valve_delivers_nothing():
    bank, _ = make_bank()
    assert bank.close("n1-v1") == 0.0


def test_unknown_valve():
    bank, _ = make_bank()
    with pytest.raises(ValveError):
        bank.open("nope")


def test_water_zone_opens_every_valve():
    bank, _ = make_bank()
    minutes = water_zone(bank, "n1", 30.0)
    assert len(bank.open_valves()) == 2
    assert minutes == pytest.approx(3.0)


def test_close_all():
    bank, clock = make_bank()
    bank.open("n1-v1")
    bank.open("n1-v2")
    clock.now = 60.0
    total = bank.close_all()
    assert total == pytest.approx(15.0)


def test_valve_lines_list_only_open_valves():
    from fernhill.reports import valve_lines

    bank, clock = make_bank()
    bank.open("n1-v1")
    clock.now = 600.0
    assert valve_lines(bank) == ["n1-v1 (zone n1): open 10 min"]
