"""Benchmark: the language server over stdio, driven by a real LSP client.

Measures start to ready with a ~50,000-token model, resident memory, diagnostics latency
after an edit on a 2,000-line file (debounce included), and code action, hover and
completion latency. Prints p50/p95 and writes bench-results/server.json.
Targets: diagnostics p95 <= 200 ms (analysis <= 100 ms); requests p95 <= 30 ms;
ready <= 1.5 s; memory <= 200 MB.
"""

from __future__ import annotations

import asyncio
import re
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
sys.path.insert(0, str(Path(__file__).resolve().parents[2]))

from common import STDLIB, copy_stdlib, save  # noqa: E402
from lsprotocol import types  # noqa: E402

from tests.lsp_helpers import diagnostics_for, lsp_client, open_document, published  # noqa: E402


def percentile(values: list[float], share: float) -> float:
    ordered = sorted(values)
    return ordered[min(len(ordered) - 1, int(round(share * (len(ordered) - 1))))]


def resident_mb(pid: int) -> float:
    for line in Path(f"/proc/{pid}/status").read_text().splitlines():
        if line.startswith("VmRSS:"):
            return int(line.split()[1]) / 1024
    return float("nan")


def two_thousand_lines(workspace: Path) -> Path:
    """doctest.py up to line 2,001, where a top-level definition begins: a real file that compiles."""
    text = (STDLIB / "doctest.py").read_text(encoding="utf-8").split("\n")[:2001]
    path = workspace / "big_module.py"
    path.write_text("\n".join(text) + "\n")
    return path


def two_thousand_broken_lines(workspace: Path) -> Path:
    """argparse.py cut at line 2,000, inside a method: a file that does not compile, as while typing."""
    text = (STDLIB / "argparse.py").read_text(encoding="utf-8").split("\n")[:2000]
    path = workspace / "broken_module.py"
    path.write_text("\n".join(text) + "\n")
    return path


async def measure(workspace: Path, store: Path) -> dict:
    figures: dict = {}
    started = time.monotonic()
    async with lsp_client(workspace, model_dir=store) as client:
        initialized = time.monotonic() - started
        while not any("loaded model" in m.message for m in client.log_messages):
            await asyncio.sleep(0.005)
        figures["ready_seconds"] = round(time.monotonic() - started, 3)
        figures["initialize_seconds"] = round(initialized, 3)
        path = two_thousand_lines(workspace)
        text = path.read_text()
        uri = open_document(client, path, text)
        await diagnostics_for(client, uri, timeout=120)
        pid = client._server.pid
        lines = text.split("\n")
        figures["diagnostics_ms"] = await edit_latencies(client, uri, lines)
        script = two_thousand_javascript_lines(workspace)
        script_uri = open_document(client, script, language="javascript")
        await diagnostics_for(client, script_uri, timeout=120)
        figures["diagnostics_ms_javascript"] = await edit_latencies(client, script_uri,
                                                                    script.read_text().split("\n"))
        document = types.TextDocumentIdentifier(uri=uri)
        requests = {"code action": [], "hover": [], "completion": []}
        text = "\n".join(lines)
        for round_ in range(15):
            for position, binding in zip(variable_positions(text), binding_positions(text)):
                began = time.monotonic()
                await client.text_document_code_action_async(types.CodeActionParams(
                    text_document=document, range=types.Range(start=position, end=position),
                    context=types.CodeActionContext(diagnostics=[])))
                requests["code action"].append((time.monotonic() - began) * 1000)
                began = time.monotonic()
                await client.text_document_hover_async(types.HoverParams(text_document=document, position=position))
                requests["hover"].append((time.monotonic() - began) * 1000)
                began = time.monotonic()
                await client.text_document_completion_async(types.CompletionParams(
                    text_document=document, position=binding))
                requests["completion"].append((time.monotonic() - began) * 1000)
        figures["requests_ms"] = {name: {"p50": round(statistics.median(v), 1), "p95": round(percentile(v, 0.95), 1)}
                                  for name, v in requests.items()}
        figures["resident_mb"] = round(resident_mb(pid), 1)
    return figures


async def edit_latencies(client, uri: str, lines: list[str]) -> dict:
    """From a one-character edit to the document's new diagnostics, 30 times across the file."""
    latencies = []
    for version in range(2, 32):
        line = 100 + 50 * (version % 30)
        seen = published(client, uri)
        began = time.monotonic()
        client.text_document_did_change(types.DidChangeTextDocumentParams(
            text_document=types.VersionedTextDocumentIdentifier(uri=uri, version=version),
            content_changes=[types.TextDocumentContentChangePartial(
                range=types.Range(start=types.Position(line=line, character=len(lines[line])),
                                  end=types.Position(line=line, character=len(lines[line]))),
                text=" ")]))
        lines[line] += " "
        await diagnostics_for(client, uri, version=version, after=seen, timeout=60)
        latencies.append((time.monotonic() - began) * 1000)
    return {"p50": round(statistics.median(latencies), 1), "p95": round(percentile(latencies, 0.95), 1)}


def two_thousand_javascript_lines(workspace: Path) -> Path:
    """moment.js (npm, 2.30.1) up to line 2,000: a real JavaScript file, read whole on every edit."""
    from tests.downloads import fetch_npm
    text = (fetch_npm("moment", "2.30.1") / "package" / "moment.js").read_text(encoding="utf-8").split("\n")[:2000]
    path = workspace / "big_script.js"
    path.write_text("\n".join(text) + "\n")
    return path


NEAR_LINES = (120, 300, 700, 1500)


def variable_positions(text: str) -> list[types.Position]:
    """A use of a local variable near each of NEAR_LINES (0-based positions)."""
    from cognomen.model.findings import analyse_text
    source = analyse_text(text, "big_module.py", "python")
    uses = sorted((source.tokens[i].line - 1, source.tokens[i].column - 1)
                  for v in source.variables for i in v.occurrences[1:])
    return [types.Position(*min(uses, key=lambda use: abs(use[0] - near))) for near in NEAR_LINES]


def binding_positions(text: str) -> list[types.Position]:
    """The start of an assignment's target near each of NEAR_LINES: where a new name is typed."""
    assignments = [(number, len(line) - len(line.lstrip())) for number, line in enumerate(text.split("\n"))
                   if re.match(r"\s+[a-z_]\w* = ", line)]
    return [types.Position(*min(assignments, key=lambda a: abs(a[0] - near))) for near in NEAR_LINES]


def analysis_ms(scorer, path: Path) -> dict:
    """The analysis alone (lex, scopes, scoring) on a 2,000-line file, in process: from scratch,
    and after a one-line edit with the server's caches of unchanged statements and scopes."""
    from cognomen.model.chunks import PieceCache
    from cognomen.model.findings import JudgementCache, analyse_text, check_source

    text = path.read_text()
    fresh, edited = [], []
    cache, pieces = JudgementCache(), PieceCache()
    check_source(scorer, analyse_text(text, path.name, "python", pieces=pieces), cache=cache)
    lines = text.split("\n")
    for round_ in range(20):
        began = time.monotonic()
        check_source(scorer, analyse_text(text, path.name, "python"))
        fresh.append((time.monotonic() - began) * 1000)
        lines[100 + 95 * round_] += " "
        changed = "\n".join(lines)
        began = time.monotonic()
        check_source(scorer, analyse_text(changed, path.name, "python", pieces=pieces), cache=cache)
        edited.append((time.monotonic() - began) * 1000)
    return {"p50": round(statistics.median(fresh), 1), "p95": round(percentile(fresh, 0.95), 1),
            "after_edit_p50": round(statistics.median(edited), 1),
            "after_edit_p95": round(percentile(edited, 0.95), 1)}


def main() -> int:
    with tempfile.TemporaryDirectory(prefix="cognomen-bench-") as scratch:
        workspace = copy_stdlib(Path(scratch) / "stdlib")
        # More code than the standard library alone, for a vocabulary of about 50,000 tokens.
        from quality import GO_NET_VERSION
        from tests.downloads import fetch_debian, fetch_npm, fetch_pypi
        for name, extra in (("networkx", fetch_pypi("networkx", "3.4.2")),
                            ("requests", fetch_pypi("requests", "2.32.3")),
                            ("click", fetch_pypi("click", "8.1.7")),
                            ("pygments", fetch_pypi("pygments", "2.18.0")),
                            ("docutils", fetch_pypi("docutils", "0.21.2")),
                            ("django", fetch_pypi("django", "5.1.4")),
                            ("moment", fetch_npm("moment", "2.30.1")),
                            ("lodash", fetch_npm("lodash", "4.17.21")),
                            ("xnet", fetch_debian("golang-golang-x-net-dev", GO_NET_VERSION))):
            shutil.copytree(extra, workspace / "extra" / name)
        store = Path(scratch) / "store"
        subprocess.run([sys.executable, "-m", "cognomen", "--model-dir", str(store), "train", "--quiet",
                        "--min-count", "1", str(workspace)], check=True)
        import json
        manifest = json.loads(next((store / "models").glob("*/manifest.json")).read_text())
        figures = asyncio.run(measure(workspace, store))
        figures["model_tokens"] = manifest["counts"]["vocabulary"]
        import gc

        from cognomen.model.persistence import load_scorer
        from cognomen.server.memory import keep_freed_memory
        keep_freed_memory()  # as the one-shot commands (check, review) do when they start
        scorer, _ = load_scorer(store)
        gc.collect()
        gc.freeze()  # as the server does after loading a model
        figures["analysis_ms"] = analysis_ms(scorer, workspace / "big_module.py")
        figures["analysis_ms_not_compiling"] = analysis_ms(scorer, two_thousand_broken_lines(workspace))
    print(f"model: {figures['model_tokens']:,} tokens")
    print(f"start to ready: {figures['ready_seconds']} s (initialize answered after {figures['initialize_seconds']} s)")
    print(f"resident memory: {figures['resident_mb']} MB")
    print(f"diagnostics after an edit (2,000 lines, debounce included): p50 {figures['diagnostics_ms']['p50']} ms, "
          f"p95 {figures['diagnostics_ms']['p95']} ms")
    script = figures["diagnostics_ms_javascript"]
    print(f"the same on 2,000 lines of JavaScript: p50 {script['p50']} ms, p95 {script['p95']} ms")
    for key, label in (("analysis_ms", "analysis alone (what `check` does once the model is loaded)"),
                       ("analysis_ms_not_compiling", "the same, file not compiling")):
        analysis = figures[key]
        print(f"{label}, from scratch: p50 {analysis['p50']} ms, p95 {analysis['p95']} ms; after a one-line "
              f"edit: p50 {analysis['after_edit_p50']} ms, p95 {analysis['after_edit_p95']} ms")
    for name, values in figures["requests_ms"].items():
        print(f"{name}: p50 {values['p50']} ms, p95 {values['p95']} ms")
    save("server", figures)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
