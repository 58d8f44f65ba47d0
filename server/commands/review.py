"""`cognomen review`: flag the odd names a change introduced or touched, as text, JSON or SARIF."""

from __future__ import annotations

import json
from pathlib import Path

from ..review import ReviewError, fails, repository_top, review, to_json
from ..sarif import sarif_log
from .check import finding_text
from .exits import FLAGGED, OK, UsageError
from .store import load_or_explain, store_for


def register(commands) -> None:
    review_parser = commands.add_parser("review", help="flag odd names that a change introduced or touched")
    review_parser.add_argument("--base", default="HEAD", help="compare against this revision (default HEAD)")
    review_parser.add_argument("--head", help="the change's last revision (default: the working tree)")
    review_parser.add_argument("--format", choices=("text", "json", "sarif"), default="text")
    review_parser.add_argument("--fail-on", choices=("warning", "error", "never"), default="warning",
                               help="exit 1 when a finding at or above this level is reported (default warning)")
    review_parser.add_argument("--threshold", type=float,
                               help="flag above this oddness instead of the calibrated one")
    review_parser.set_defaults(handler=run)


def run(args) -> int:
    try:
        root = repository_top(Path.cwd())
    except ReviewError as error:
        raise UsageError(str(error)) from None
    scorer, _ = load_or_explain(store_for(args, root))
    try:
        result = review(scorer, root, args.base, args.head, args.threshold)
    except ReviewError as error:
        raise UsageError(str(error)) from None
    if args.format == "json":
        print(to_json(result))
    elif args.format == "sarif":
        print(json.dumps(sarif_log([(f, result.level(f)) for f in result.findings], root), indent=2))
    else:
        for finding in result.findings:
            print(finding_text(finding))
        extra = f", {result.suppressed} kept on purpose" if result.suppressed else ""
        print(f"{len(result.findings)} oddly named variable{'s' if len(result.findings) != 1 else ''} "
              f"in {result.files} changed file{'s' if result.files != 1 else ''}{extra}")
    return FLAGGED if fails(result, args.fail_on) else OK
