"""Work in forked processes: the same results as in one process, failures told, Ctrl-C a clean stop."""

import os
import signal
import subprocess
import sys
import textwrap
import time

import pytest

from cognomen.model.forked import can_fork, forked_map, interrupts_deferred

from .conftest import ctrl_c_as_in_a_terminal

pytestmark = pytest.mark.skipif(not can_fork(), reason="no fork on this platform")


def _square_of_length(text: str) -> int:
    return len(text) ** 2


def test_the_same_results_in_the_order_of_the_items():
    items = [f"item {k}" * (k % 7) for k in range(50)]
    order = sorted(range(len(items)), key=lambda k: -len(items[k]))
    assert forked_map(_square_of_length, items, 2, order) == [len(item) ** 2 for item in items]


def _fails_on_seven(number: int) -> int:
    if number == 7:
        raise ValueError("seven is not allowed")
    return number


def test_a_failure_in_a_worker_is_raised_with_its_traceback():
    with pytest.raises(RuntimeError, match="(?s)a worker process failed.*ValueError: seven is not allowed"):
        forked_map(_fails_on_seven, list(range(20)), 2)


_INTERRUPTED = textwrap.dedent("""
    import sys, time
    from cognomen.model.forked import forked_map

    def slow(seconds):
        time.sleep(seconds)
        return seconds

    print("started", flush=True)
    try:
        forked_map(slow, {items}, 2)
    except KeyboardInterrupt:
        print("stopped", flush=True)
        sys.exit(130)
""")


@pytest.mark.parametrize("items, what", [
    ("[0.2] * 100", "both workers busy"),
    ("[30.0, 0.01]", "one worker done and gone, the other busy"),
])
def test_ctrl_c_ends_every_worker_and_reaches_the_parent(items, what):
    # A terminal sends Ctrl-C to every process of the foreground group: the same here.
    process = subprocess.Popen([sys.executable, "-c", _INTERRUPTED.format(items=items)], start_new_session=True,
                               preexec_fn=ctrl_c_as_in_a_terminal, stdout=subprocess.PIPE, stderr=subprocess.PIPE,
                               text=True)
    assert process.stdout.readline() == "started\n"
    time.sleep(1.5)
    interrupted = time.monotonic()
    os.killpg(process.pid, signal.SIGINT)
    out, err = process.communicate(timeout=20)
    assert (process.returncode, out, err) == (130, "stopped\n", ""), what
    assert time.monotonic() - interrupted < 5, what
    with pytest.raises(ProcessLookupError):  # no worker outlives the parent
        os.killpg(process.pid, 0)


def test_ctrl_c_while_forking_is_held_back_until_the_block_ends():
    # Python's own callbacks around a fork drop a KeyboardInterrupt raised inside them.
    started_with = signal.signal(signal.SIGINT, signal.default_int_handler)  # as Python sets it up in a terminal
    try:
        reached = []
        with pytest.raises(KeyboardInterrupt):
            with interrupts_deferred():
                os.kill(os.getpid(), signal.SIGINT)
                time.sleep(0.05)
                reached.append("the rest of the block")
        assert reached == ["the rest of the block"]
        assert signal.getsignal(signal.SIGINT) is signal.default_int_handler
        signal.signal(signal.SIGINT, signal.SIG_IGN)  # started with Ctrl-C ignored: it stays ignored
        with interrupts_deferred():
            os.kill(os.getpid(), signal.SIGINT)
            time.sleep(0.05)
    finally:
        signal.signal(signal.SIGINT, started_with)
