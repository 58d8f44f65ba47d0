"""Findings as a SARIF 2.1.0 log, with the suggested renames as fixes."""

from __future__ import annotations

from pathlib import Path

from cognomen import __version__
from cognomen.model.findings import Finding

RULE_ID = "name-does-not-fit"
SCHEMA = "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json"


def _region(line: int, column: int, length: int) -> dict:
    return {"startLine": line, "startColumn": column, "endLine": line, "endColumn": column + length}


def _location(path: str, region: dict | None = None) -> dict:
    physical = {"artifactLocation": {"uri": path, "uriBaseId": "SRCROOT"}}
    if region:
        physical["region"] = region
    return {"physicalLocation": physical}


def _result(finding: Finding, level: str) -> dict:
    names = [s.name for s in finding.suggestions[:3]]
    message = f"`{finding.name}` does not fit how it is used here"
    if names:
        message += "; the team would call it " + " or ".join(f"`{n}`" for n in names)
    related = []
    for suggestion in finding.suggestions[:3]:
        for path, line in suggestion.evidence:
            related.append(dict(_location(path, {"startLine": line}), id=len(related),
                                message={"text": f"`{suggestion.name}` used in a similar context"}))
    fixes = []
    for suggestion in finding.suggestions[:3]:
        replacements = [{"deletedRegion": _region(line, column, len(finding.name)),
                         "insertedContent": {"text": suggestion.name}}
                        for line, column in finding.occurrences]
        fixes.append({"description": {"text": f"Rename `{finding.name}` to `{suggestion.name}`"},
                      "artifactChanges": [{"artifactLocation": {"uri": finding.path, "uriBaseId": "SRCROOT"},
                                           "replacements": replacements}]})
    result = {
        "ruleId": RULE_ID,
        "ruleIndex": 0,
        "level": level,
        "message": {"text": message},
        "locations": [_location(finding.path, _region(finding.line, finding.column, len(finding.name)))],
        "partialFingerprints": {"variableName/v1": f"{finding.path}:{finding.variable.function}:{finding.name}"},
        "properties": {"oddness": finding.score, "threshold": finding.threshold},
    }
    if related:
        result["relatedLocations"] = related
    if fixes:
        result["fixes"] = fixes
    return result


def sarif_log(findings: list[tuple[Finding, str]], root: Path) -> dict:
    """One run of cognomen as a SARIF 2.1.0 log; columns count Unicode code points."""
    return {
        "$schema": SCHEMA,
        "version": "2.1.0",
        "runs": [{
            "tool": {"driver": {
                "name": "cognomen",
                "version": __version__,
                "rules": [{
                    "id": RULE_ID,
                    "name": "NameDoesNotFit",
                    "shortDescription": {"text": "A variable's name does not fit how it is used."},
                    "fullDescription": {"text": "The team's own code uses other names for variables used "
                                                "in contexts like this one."},
                    "defaultConfiguration": {"level": "warning"},
                    "help": {"text": "Rename the variable to one of the suggested names, or keep the name with "
                                     "a `cognomen: keep-name` comment on its line."},
                }],
            }},
            "originalUriBaseIds": {"SRCROOT": {"uri": root.resolve().as_uri() + "/"}},
            "columnKind": "unicodeCodePoints",
            "results": [_result(finding, level) for finding, level in findings],
        }],
    }
