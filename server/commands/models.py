"""`cognomen models`: the trained models in the store, and switching the current one."""

from __future__ import annotations

import json
from pathlib import Path

from cognomen.model import bundle
from cognomen.model.bundle import ModelError
from cognomen.model.measures import figure, label

from .exits import OK, UsageError
from .store import store_for


ACTIONS = ("list", "promote")
FORMER_NAMES = {"use": "promote"}  # still accepted for one release, never shown in help


def register(commands) -> None:
    models = commands.add_parser("models", help="list trained models, or switch with: models promote ID")
    models.add_argument("action", nargs="?", default="list", metavar="ACTION",
                        help="list (the default), or promote: make model ID the current one")
    models.add_argument("model_id", nargs="?", metavar="ID")
    models.add_argument("--format", choices=("text", "json"), default="text")
    models.set_defaults(handler=run)


def run(args) -> int:
    store = store_for(args)
    action = FORMER_NAMES.get(args.action, args.action)
    if action not in ACTIONS:
        raise UsageError(f"models {args.action}: expected one of {', '.join(ACTIONS)}")
    if action == "promote":
        return promote(store, args.model_id)
    listed = listing(store)
    if not listed:
        raise UsageError(f"no model found in {store}; run cognomen train")
    current = bundle.current_model_id(store)
    if args.format == "json":
        print(json.dumps({"current": current, "models": [
            {**{k: m.get(k) for k in ("model_id", "created", "source_commit", "counts", "quality", "thresholds",
                                      "coverage", "promotion_check", "background")}, "status": status, "problem": problem}
            for m, status, problem in listed]}, indent=2))
        return OK
    print(f"{'':2}{'model':24} {'created':20} {'commit':8} {'files':>6} {'vocabulary':>10} "
          f"{label('found_in_top_5'):>14} {label('misnames_flagged'):>16} {'coverage':>8}  status")
    for m, status, _ in listed:
        counts, quality = m.get("counts", {}), m.get("quality", {})
        coverage = m.get("coverage", {}).get("occurrence_share")
        print(f"{'*' if m.get('model_id') == current else ' ':2}{m.get('model_id', '?'):24} "
              f"{m.get('created', ''):20} {(m.get('source_commit') or '-')[:8]:8} {counts.get('files', 0):>6} "
              f"{counts.get('vocabulary', 0):>10} {figure(quality.get('found_in_top_5')):>14} "
              f"{figure(quality.get('misnames_flagged')):>16} {figure(coverage):>8}  {status}")
    for m, status, problem in listed:
        if status == "damaged":
            print(f"note: {m.get('model_id')} is damaged and will not load: {problem}")
    if any(status == "refused" for _, status, _ in listed):
        print("note: refused models failed the promotion check; they never count toward --keep "
              "(cognomen models promote ID overrules the check)")
    return OK


def listing(store: Path) -> list[tuple[dict, str, str | None]]:
    """(manifest, status, problem) per model, newest first: current, ready, refused or damaged."""
    current = bundle.current_model_id(store)
    listed = []
    for folder in (bundle.PROMOTABLE, bundle.REFUSED):
        for manifest in bundle.list_models(store, folder):
            model_id = manifest.get("model_id", "")
            problem = bundle.problem_with(store / folder / model_id)
            if problem:
                status = "damaged"
            elif folder == bundle.REFUSED:
                status = "refused"
            else:
                status = "current" if model_id == current else "ready"
            listed.append((manifest, status, problem))
    listed.sort(key=lambda entry: (entry[0].get("created", ""), entry[0].get("model_id", "")), reverse=True)
    return listed


def promote(store: Path, model_id: str | None) -> int:
    """Make a model in the store the current one (to switch back, or to overrule the promotion check)."""
    if not model_id:
        raise UsageError("cognomen models promote needs a model id (see cognomen models)")
    known = any((store / folder / model_id).is_dir() for folder in (bundle.PROMOTABLE, bundle.REFUSED))
    if not known or model_id.startswith(".") or "/" in model_id:
        raise UsageError(f"no model {model_id} in {store}")
    try:
        bundle.promote(store, model_id)
    except ModelError as error:
        raise UsageError(str(error)) from None
    print(f"current model is now {model_id}")
    return OK
