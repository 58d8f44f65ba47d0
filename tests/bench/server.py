"""Benchmark: the language server over stdio, driven by a real LSP client.

Measures start to ready with a ~50,000-token model, resident memory, diagnostics latency
after an edit on a 2,000-line file (debounce included), and code action, hover and
completion latency. Prints p50/p95 and writes bench-results/server.json.
Targets: diagnostics p95 <= 200 ms (analysis <= 100 ms); requests p95 <= 30 ms;
ready <= 1.5 s; memory <= 200 MB.
"""

from __future__ import annotations

import asyncio
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
    text = (STDLIB / "argparse.py").read_text(encoding="utf-8").split("\n")[:2000]
    path = workspace / "big_module.py"
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
        latencies = []
        lines = text.split("\n")
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
        figures["diagnostics_ms"] = {"p50": round(statistics.median(latencies), 1),
                                     "p95": round(percentile(latencies, 0.95), 1)}
        document = types.TextDocumentIdentifier(uri=uri)
        requests = {"code action": [], "hover": [], "completion": []}
        positions = [types.Position(line=l, character=c) for l, c in ((120, 12), (300, 16), (700, 20), (1500, 12))]
        for round_ in range(15):
            for position in positions:
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
                    text_document=document, position=types.Position(line=position.line, character=8)))
                requests["completion"].append((time.monotonic() - began) * 1000)
        figures["requests_ms"] = {name: {"p50": round(statistics.median(v), 1), "p95": round(percentile(v, 0.95), 1)}
                                  for name, v in requests.items()}
        figures["resident_mb"] = round(resident_mb(pid), 1)
    return figures


def analysis_ms(store: Path, path: Path) -> dict:
    """The analysis alone (lex, scopes, scoring) on the same 2,000-line file, in process: from
    scratch, and after a one-line edit with the server's cache of unchanged scopes."""
    from cognomen.model.findings import JudgementCache, analyse_text, check_source
    from cognomen.model.persistence import load_scorer

    scorer, _ = load_scorer(store)
    text = path.read_text()
    fresh, edited = [], []
    cache = JudgementCache()
    check_source(scorer, analyse_text(text, "big_module.py", "python"), cache=cache)
    lines = text.split("\n")
    for round_ in range(20):
        began = time.monotonic()
        check_source(scorer, analyse_text(text, "big_module.py", "python"))
        fresh.append((time.monotonic() - began) * 1000)
        lines[100 + 80 * round_] += " "
        changed = "\n".join(lines)
        began = time.monotonic()
        check_source(scorer, analyse_text(changed, "big_module.py", "python"), cache=cache)
        edited.append((time.monotonic() - began) * 1000)
    return {"p50": round(statistics.median(fresh), 1), "p95": round(percentile(fresh, 0.95), 1),
            "after_edit_p50": round(statistics.median(edited), 1),
            "after_edit_p95": round(percentile(edited, 0.95), 1)}


def main() -> int:
    with tempfile.TemporaryDirectory(prefix="cognomen-bench-") as scratch:
        workspace = copy_stdlib(Path(scratch) / "stdlib")
        # More code than the standard library alone, for a vocabulary of about 50,000 tokens.
        from quality import fetch_debian, fetch_pypi
        for name, extra in (("networkx", fetch_pypi("networkx", "3.4.2")),
                            ("xnet", fetch_debian("golang-golang-x-net-dev"))):
            shutil.copytree(extra, workspace / "extra" / name)
        store = Path(scratch) / "store"
        subprocess.run([sys.executable, "-m", "cognomen", "--model-dir", str(store), "train", "--quiet",
                        "--min-count", "1", str(workspace)], check=True)
        import json
        manifest = json.loads(next((store / "models").glob("*/manifest.json")).read_text())
        figures = asyncio.run(measure(workspace, store))
        figures["model_tokens"] = manifest["counts"]["vocabulary"]
        figures["analysis_ms"] = analysis_ms(store, workspace / "big_module.py")
    print(f"model: {figures['model_tokens']:,} tokens")
    print(f"start to ready: {figures['ready_seconds']} s (initialize answered after {figures['initialize_seconds']} s)")
    print(f"resident memory: {figures['resident_mb']} MB")
    print(f"diagnostics after an edit (2,000 lines, debounce included): p50 {figures['diagnostics_ms']['p50']} ms, "
          f"p95 {figures['diagnostics_ms']['p95']} ms")
    analysis = figures["analysis_ms"]
    print(f"analysis alone, from scratch: p50 {analysis['p50']} ms, p95 {analysis['p95']} ms; after a one-line "
          f"edit: p50 {analysis['after_edit_p50']} ms, p95 {analysis['after_edit_p95']} ms")
    for name, values in figures["requests_ms"].items():
        print(f"{name}: p50 {values['p50']} ms, p95 {values['p95']} ms")
    save("server", figures)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
