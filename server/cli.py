"""The `cognomen` command line: the parser and the entry point; each command lives in `commands/`."""

from __future__ import annotations

import argparse
import os
import signal
import sys

from .commands import COMMANDS
from .commands.exits import INTERRUPTED, OK, USAGE, UsageError, say
from .memory import keep_freed_memory

MODEL_DIR_HELP = "model store (default: .cognomen at the repository root)"


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(prog="cognomen", description="Learns your team's naming from its own "
                                     "code and flags variable names that do not fit how they are used.")
    parser.add_argument("--model-dir", help=MODEL_DIR_HELP)
    commands = parser.add_subparsers(dest="command", metavar="COMMAND")
    for command in COMMANDS:
        command.register(commands)
    for subcommand in commands.choices.values():
        # Also after the subcommand; left out there, it keeps the value given before it.
        subcommand.add_argument("--model-dir", default=argparse.SUPPRESS, help=MODEL_DIR_HELP)
    return parser


def main(argv: list[str] | None = None) -> int:
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as exit_:
        return USAGE if exit_.code not in (0, None) else OK
    if not getattr(args, "handler", None):
        parser.print_help(sys.stderr)
        return USAGE
    if args.command != "serve":
        # One-shot commands score whole files from scratch and gain most from reusing freed
        # memory. The server re-scores only what an edit touched, so it keeps its memory low.
        keep_freed_memory()
    try:
        status = args.handler(args)
    except UsageError as error:
        say(f"cognomen: {error}")
        return USAGE
    except KeyboardInterrupt:
        say("cognomen: stopped")
        status = INTERRUPTED
    except BrokenPipeError:
        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        return OK
    if status == INTERRUPTED:
        stop_now(status)
    return status


def stop_now(status: int) -> None:
    """End an interrupted command here, its worker processes already ended. The interpreter's
    shutdown is skipped: there, the interrupted process was now and then ended by the signal
    itself (exit -2 instead of 130, in 1 of 6 to 12 runs of tests/test_bundle.py's interrupt test)."""
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    for stream in (sys.stdout, sys.stderr):
        try:
            stream.flush()
        except (OSError, ValueError):
            pass
    os._exit(status)
