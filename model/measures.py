"""One plain name per quality measure, the same in manifests, JSON, every command's text and the README.

Training and evaluation compute figures under working keys; whatever a person or another program
reads goes through `public` (JSON keys: the name's words joined by underscores) and `label` (text).
"""

from __future__ import annotations

import re

# working key -> the measure's one name
NAMES = {
    "recovery_at_1": "found first",
    "recovery_at_5": "found in top 5",
    "true_name_reachable": "true name ranked at all",
    "detection_auc": "detection AUC",
    "recall_at_threshold": "misnames flagged",
    "recall_at_1_per_kloc": "misnames flagged at 1 false alarm per 1,000 lines",
    "false_alarms_per_kloc": "false alarms per 1,000 lines",
    "seeded": "seeded misnames",
    "calibration_lines": "lines scored as if unseen",
    "kept_names": "names kept on purpose",
}


def key_of(name: str) -> str:
    """A name's JSON key: 'false alarms per 1,000 lines' -> 'false_alarms_per_1000_lines'."""
    return re.sub(r"[^a-z0-9]+", "_", name.lower().replace(",", "")).strip("_")


PUBLIC_KEYS = {working: key_of(name) for working, name in NAMES.items()}
_NAME_BY_KEY = {key_of(name): name for name in NAMES.values()}


def public(figures: dict) -> dict:
    """Figures under their public keys; keys that name no measure pass through unchanged."""
    return {PUBLIC_KEYS.get(key, key): value for key, value in figures.items()}


def label(key: str) -> str:
    """The name to print for a public (or working) key."""
    return _NAME_BY_KEY.get(key) or NAMES.get(key) or key.replace("_", " ")


def figure(value) -> str:
    """A measure's value as printed: three decimals, counts with thousands separators, "-" for none."""
    if value is None or (isinstance(value, float) and value != value):
        return "-"
    if isinstance(value, float):
        return f"{value:.3f}"
    return f"{value:,}" if isinstance(value, int) else str(value)


def public_evaluation(result: dict) -> dict:
    """An evaluation's result (see `evaluation.evaluate_corpus`) with every measure under its public key."""
    return dict(public(result), calibration=public(result.get("calibration", {})),
                scorers={scorer: public(figures) for scorer, figures in result.get("scorers", {}).items()})
