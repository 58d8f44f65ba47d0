"""Work shared out to forked processes that read the parent's memory, and stop when it stops.

Ctrl-C in a terminal reaches every process of the group. Workers ignore it, so that only the
parent decides: it ends its workers and passes the interrupt on, and no worker prints a
traceback of its own.
"""

from __future__ import annotations

import contextlib
import multiprocessing
import signal
import threading
import traceback
from multiprocessing.connection import wait
from typing import Callable, Sequence, TypeVar

Item = TypeVar("Item")
Result = TypeVar("Result")


def can_fork() -> bool:
    return "fork" in multiprocessing.get_all_start_methods()


def ignore_interrupts() -> None:
    """Leave Ctrl-C to the parent process (the initializer of every worker)."""
    signal.signal(signal.SIGINT, signal.SIG_IGN)


@contextlib.contextmanager
def interrupts_deferred():
    """Hold back Ctrl-C while processes are forked, and raise it once they are.

    Python runs callbacks of its own around a fork (the logging module's lock, for one), and a
    KeyboardInterrupt raised in one of them is printed and dropped: training then ran on, or
    ended by the signal (exit -2) instead of stopping cleanly."""
    if threading.current_thread() is not threading.main_thread() or \
            signal.getsignal(signal.SIGINT) is signal.SIG_IGN:  # started with Ctrl-C ignored (`nohup ... &`)
        yield
        return
    received = []
    previous = signal.signal(signal.SIGINT, lambda *_: received.append(True))
    try:
        yield
    finally:
        signal.signal(signal.SIGINT, previous)
        if received:
            raise KeyboardInterrupt


def forked_map(function: Callable[[Item], Result], items: Sequence[Item], workers: int,
               order: Sequence[int] | None = None) -> list[Result]:
    """`[function(item) for item in items]`, computed by up to `workers` forked processes.

    Each process takes the next item in `order` (positions in `items`; largest first makes
    the processes finish together) when it has finished one. A failure in a worker is raised
    here as RuntimeError with the worker's traceback; on any exception, the interrupt
    included, every worker is ended before it propagates."""
    if workers <= 1 or len(items) < 2 or not can_fork():
        return [function(item) for item in items]
    context = multiprocessing.get_context("fork")
    order = list(order) if order is not None else list(range(len(items)))
    handed_out = context.Value("q", 0)
    children, receivers = [], []
    try:
        with interrupts_deferred():
            for _ in range(min(workers, len(items))):
                receiver, sender = context.Pipe(duplex=False)
                child = context.Process(target=_work, args=(function, items, order, handed_out, sender),
                                        name="cognomen-worker", daemon=True)
                child.start()
                sender.close()
                children.append(child)
                receivers.append(receiver)
        results: dict[int, Result] = {}
        running = list(receivers)
        while running:
            for receiver in wait(running):
                try:
                    outcome, position, value = receiver.recv()
                except EOFError:
                    running.remove(receiver)
                    continue
                if outcome == "failed":
                    raise RuntimeError(f"a worker process failed:\n{value}")
                results[position] = value
        if len(results) != len(items):
            raise RuntimeError(f"worker processes ended with {len(items) - len(results)} of {len(items)} items undone")
        return [results[k] for k in range(len(items))]
    finally:
        for child in children:
            if child.is_alive():
                child.terminate()
            child.join()
        for receiver in receivers:
            receiver.close()


def _work(function, items, order, handed_out, sender) -> None:
    ignore_interrupts()
    position = -1
    try:
        while True:
            with handed_out.get_lock():
                taken = handed_out.value
                handed_out.value = taken + 1
            if taken >= len(order):
                return
            position = order[taken]
            sender.send(("done", position, function(items[position])))
    except BaseException:  # noqa: BLE001 - told to the parent, which raises it
        try:
            sender.send(("failed", position, traceback.format_exc()))
        except OSError:
            pass
    finally:
        sender.close()
