"""The language server end to end: a real client over stdio, the demo repository, a trained model."""

import asyncio
import contextlib
import re
import shutil

import pytest
from lsprotocol import types
from pygls.exceptions import JsonRpcException
from pytest_lsp import client_capabilities

from .conftest import DEMO, STDLIB, renamed_by_ast, run_cli, variable_places
from .lsp_helpers import code_actions_at, diagnostics_for, lsp_client, open_document, published

pytestmark = pytest.mark.asyncio(loop_scope="function")


def position_of(text: str, needle: str, nth: int = 0) -> types.Position:
    index = -1
    for _ in range(nth + 1):
        index = text.index(needle, index + 1)
    line = text.count("\n", 0, index)
    return types.Position(line=line, character=index - (text.rfind("\n", 0, index) + 1))


async def test_diagnostic_for_an_odd_name(patched_workspace):
    workspace = patched_workspace
    async with lsp_client(workspace) as client:
        uri = open_document(client, workspace / "fernhill" / "valves.py")
        diagnostics = await diagnostics_for(client, uri)
        assert len(diagnostics) == 1
        diagnostic = diagnostics[0]
        assert diagnostic.source == "cognomen" and diagnostic.code == "name-does-not-fit"
        assert diagnostic.severity == types.DiagnosticSeverity.Information
        assert diagnostic.range.start == types.Position(line=122, character=8)
        assert diagnostic.range.end == types.Position(line=122, character=12)
        assert "`zone` does not fit" in diagnostic.message and "`valve`" in diagnostic.message
        assert diagnostic.related_information
        assert all(info.location.uri.startswith((workspace / "fernhill").as_uri())
                   for info in diagnostic.related_information)


async def test_quick_fix_renames_every_occurrence(patched_workspace):
    workspace = patched_workspace
    path = workspace / "fernhill" / "valves.py"
    text = path.read_text()
    async with lsp_client(workspace) as client:
        uri = open_document(client, path)
        diagnostics = await diagnostics_for(client, uri)
        actions = await client.text_document_code_action_async(types.CodeActionParams(
            text_document=types.TextDocumentIdentifier(uri=uri), range=diagnostics[0].range,
            context=types.CodeActionContext(diagnostics=list(diagnostics))))
        # The preferred fix (what an editor applies on its own) is the rename to the first suggestion; beside the
        # renames, a quick fix keeps the name with a keep-name comment.
        [rename] = [action for action in actions if action.is_preferred]
        assert rename.title == "Rename `zone` to `valve`" and rename.kind == types.CodeActionKind.QuickFix
        renames = [action.title for action in actions if action.title.startswith("Rename")]
        assert renames[0] == rename.title
        [keep] = [action for action in actions if action.title.startswith("Keep the name")]
        assert keep.kind == types.CodeActionKind.QuickFix
        [keep_edit] = keep.edit.changes[uri]
        binding_line = text.split("\n")[122]
        assert keep_edit.range.start == keep_edit.range.end == types.Position(line=122, character=len(binding_line))
        assert "cognomen: keep-name" in keep_edit.new_text
        kept = text.replace(binding_line, binding_line + keep_edit.new_text)
        compile(kept, "valves.py", "exec")
        path.write_text(kept)  # as saved by the editor: `check` honours the comment
        checked = await asyncio.to_thread(run_cli, "check", "fernhill/valves.py", cwd=workspace)
        assert checked.stdout.splitlines()[-1] == "0 oddly named variables in 1 file; 1 name kept on purpose"
        path.write_text(text)
        edits = rename.edit.changes[uri]
        # Every place Python's ast finds the variable: the loop's binding and its uses in busiest_valve.
        places = variable_places(text, "zone", "busiest_valve")
        assert len(places) == 3
        assert sorted((e.range.start.line + 1, e.range.start.character + 1) for e in edits) == places
        lines = text.split("\n")
        for edit in sorted(edits, key=lambda e: (e.range.start.line, e.range.start.character), reverse=True):
            line = lines[edit.range.start.line]
            assert line[edit.range.start.character:edit.range.end.character] == "zone"
            lines[edit.range.start.line] = line[:edit.range.start.character] + edit.new_text + \
                line[edit.range.end.character:]
        renamed = "\n".join(lines)
        assert renamed == renamed_by_ast(text, "zone", "valve", "busiest_valve")
        assert "for valve in bank.open_valves():" in renamed and "busiest = valve" in renamed
        compile(renamed, "valves.py", "exec")


async def test_refactor_for_any_variable_and_public_parameters(workspace):
    path = workspace / "fernhill" / "readings.py"
    text = path.read_text()
    async with lsp_client(workspace) as client:
        uri = open_document(client, path)
        await diagnostics_for(client, uri)
        local = position_of(text, "total = 0.0")
        actions = await code_actions_at(client, uri, local)
        assert actions and all(a.kind == types.CodeActionKind.RefactorRewrite for a in actions)
        assert all("total" not in a.title.split("to")[-1] for a in actions)
        # A public function's parameter: renames are offered by default (settings.py), each with a caution.
        parameter = position_of(text, "readings: list[Reading], zone_id")
        actions = await code_actions_at(client, uri, parameter)
        assert actions and all("callers passing it by keyword will break" in a.title for a in actions)
    async with lsp_client(workspace, options={"allowPublicParameterRenames": False}) as client:
        uri = open_document(client, path)
        await diagnostics_for(client, uri)
        none = await code_actions_at(client, uri, parameter)
        assert not none, "with the setting off, a public function's parameter is not renamed"
        assert await code_actions_at(client, uri, local), "a local variable still is"


@contextlib.asynccontextmanager
async def hover_on_zone(workspace, **session):
    """The hover on a use of `zone` in the patched demo's valves.py, the file's text, and the client still
    in session."""
    path = workspace / "fernhill" / "valves.py"
    text = path.read_text()
    async with lsp_client(workspace, **session) as client:
        uri = open_document(client, path)
        await diagnostics_for(client, uri)
        hover = await client.text_document_hover_async(types.HoverParams(
            text_document=types.TextDocumentIdentifier(uri=uri), position=position_of(text, "zone.valve_id")))
        yield hover, text, client


async def test_hover_explains_the_fit(patched_workspace):
    workspace = patched_workspace
    async with hover_on_zone(workspace) as (hover, text, client):
        uri = (workspace / "fernhill" / "valves.py").as_uri()
        assert hover.contents.kind == types.MarkupKind.Markdown
        assert "`zone` does not fit how it is used here" in hover.contents.value
        assert "- `valve`" in hover.contents.value and "](file://" in hover.contents.value
        use = position_of(text, "zone.valve_id")
        assert (hover.range.start, hover.range.end) == (use, types.Position(line=use.line, character=use.character + 4))
        nothing = await client.text_document_hover_async(types.HoverParams(
            text_document=types.TextDocumentIdentifier(uri=uri), position=types.Position(line=0, character=0)))
        assert nothing is None


async def test_completion_at_a_new_binding(workspace):
    path = workspace / "fernhill" / "readings.py"
    text = path.read_text().replace("    total = 0.0\n    for reading in readings:\n        total += reading.moisture",
                                    "    to\n    for reading in readings:\n        total += reading.moisture", 1)
    async with lsp_client(workspace) as client:
        uri = open_document(client, path, text)
        where = position_of(text, "    to\n")
        result = await client.text_document_completion_async(types.CompletionParams(
            text_document=types.TextDocumentIdentifier(uri=uri),
            position=types.Position(line=where.line, character=6)))
        labels = [item.label for item in result.items]
        assert labels and all(label.startswith("to") for label in labels)
        assert "total" in labels[:3]
        not_a_binding = await client.text_document_completion_async(types.CompletionParams(
            text_document=types.TextDocumentIdentifier(uri=uri), position=position_of(text, "len(readings)")))
        assert not_a_binding is None or not not_a_binding.items


async def test_bad_settings_are_reported_and_defaults_used(patched_workspace):
    workspace = patched_workspace
    async with lsp_client(workspace, options={"severity": "loud", "debounceMs": -3}) as client:
        uri = open_document(client, workspace / "fernhill" / "valves.py")
        diagnostics = await diagnostics_for(client, uri)
        assert [d.data["name"] for d in diagnostics] == ["zone"]
        assert diagnostics[0].severity == types.DiagnosticSeverity.Information
        texts = [m.message for m in client.messages]
        assert any("setting severity" in t and "information" in t for t in texts)
        assert any("setting debounceMs" in t for t in texts)
        seen = published(client, uri)
        client.workspace_did_change_configuration(types.DidChangeConfigurationParams(
            settings={"cognomen": {"severity": "warning"}}))
        diagnostics = await diagnostics_for(client, uri, after=seen)
        assert [d.data["name"] for d in diagnostics] == ["zone"]
        assert diagnostics[0].severity == types.DiagnosticSeverity.Warning


async def test_without_a_model_the_server_says_so_once_and_answers_empty(tmp_path):
    (tmp_path / "a.py").write_text("def f(value):\n    total = value\n    return total\n")
    # Emacs 29 declares no window.showMessage: it gets the plain message, not the offer to train.
    async with lsp_client(tmp_path, editor="emacs@v29.1") as client:
        uri = open_document(client, tmp_path / "a.py")
        diagnostics = await diagnostics_for(client, uri)
        assert list(diagnostics) == []
        hover = await client.text_document_hover_async(types.HoverParams(
            text_document=types.TextDocumentIdentifier(uri=uri), position=types.Position(line=1, character=5)))
        assert hover is None
        assert len([m for m in client.messages if "no model found" in m.message]) == 1
        assert client.message_requests == [] and not (tmp_path / ".cognomen").exists()


async def test_new_model_is_loaded_without_a_restart(workspace):
    async with lsp_client(workspace, options={"reloadSeconds": 0.2}) as client:
        uri = open_document(client, workspace / "fernhill" / "alerts.py")
        await diagnostics_for(client, uri)
        before = {m.message for m in client.log_messages}
        seen = published(client, uri)
        result = await asyncio.to_thread(run_cli, "train", "--quiet", "--force", "--background", "stdlib",
                                         cwd=workspace)
        assert result.returncode == 0, result.stderr
        current = (workspace / ".cognomen" / "current").read_text().strip()
        await diagnostics_for(client, uri, after=seen)  # open documents are checked again with the new model
        for _ in range(100):
            if any(current in m.message for m in client.log_messages if m.message not in before):
                break
            await asyncio.sleep(0.1)
        assert any(f"loaded model {current}" in m.message for m in client.log_messages)
        reports = [r for token, values in client.progress_reports.items() for r in values]
        assert any(isinstance(r, types.WorkDoneProgressBegin) for r in reports)
        assert any(isinstance(r, types.WorkDoneProgressEnd) for r in reports)


async def test_bad_requests_get_errors_and_the_server_keeps_going(patched_workspace, capfd):
    workspace = patched_workspace
    path = workspace / "fernhill" / "alerts.py"
    async with lsp_client(workspace, options={"maxFileSize": 50_000}) as client:
        uri = open_document(client, path)
        await diagnostics_for(client, uri)
        with pytest.raises(JsonRpcException):
            await client.text_document_hover_async(types.HoverParams(
                text_document=types.TextDocumentIdentifier(uri=uri), position=types.Position(line=5000, character=3)))
        with pytest.raises(JsonRpcException):
            await client.protocol.send_request_async("cognomen/noSuchMethod", {})
        notes = workspace / "notes.txt"
        notes.write_text("valve = 1\n")
        plain = open_document(client, notes, language="plaintext")
        assert list(await diagnostics_for(client, plain)) == []
        big = workspace / "big.py"
        big.write_text("def f(value):\n    total = value\n    return total\n" * 3000)
        big_uri = open_document(client, big)
        assert list(await diagnostics_for(client, big_uri)) == []
        assert any("no hints for it" in m.message for m in client.log_messages)
        other = workspace / "fernhill" / "valves.py"
        diagnostics = await diagnostics_for(client, open_document(client, other))
        # Still serving after the errors, and still judging: the prepared change's `zone` is flagged.
        assert [(d.range.start, d.data["name"]) for d in diagnostics] == [(types.Position(line=122, character=8),
                                                                           "zone")]
    # The server's log (its stderr, forwarded by pytest-lsp) tells of the error in one line.
    log = capfd.readouterr().err
    assert "answered a request with a protocol error" in log
    assert "Traceback" not in log


async def test_a_damaged_new_model_is_refused_and_the_old_one_stays(patched_workspace):
    workspace = patched_workspace
    store = workspace / ".cognomen"
    async with lsp_client(workspace, options={"reloadSeconds": 0.2}) as client:
        uri = open_document(client, workspace / "fernhill" / "valves.py")
        assert len(await diagnostics_for(client, uri)) == 1
        good = (store / "current").read_text().strip()
        damaged = store / "models" / "damaged-copy"
        shutil.copytree(store / "models" / good, damaged)
        vectors = damaged / "output_vectors.npy"
        vectors.write_bytes(vectors.read_bytes()[:-8] + b"\0" * 8)
        (store / "current").write_text("damaged-copy\n")
        for _ in range(200):
            if any("does not match its checksum" in m.message for m in client.messages):
                break
            await asyncio.sleep(0.05)
        assert any("keeping the model already loaded" in m.message for m in client.messages)
        await asyncio.sleep(1.0)
        refusals = [m for m in client.messages if "does not match its checksum" in m.message]
        assert len(refusals) == 1, "a refused model is reported once, not at every look"
        hover = await client.text_document_hover_async(types.HoverParams(
            text_document=types.TextDocumentIdentifier(uri=uri), position=types.Position(line=122, character=9)))
        assert hover is not None and "`zone` does not fit" in hover.contents.value


async def test_positions_past_the_end_of_a_line(workspace):
    path = workspace / "fernhill" / "alerts.py"
    line = path.read_text().split("\n")[33]
    assert line == "    return alerts"
    document = types.TextDocumentIdentifier(uri=path.as_uri())
    async with lsp_client(workspace) as client:
        uri = open_document(client, path)
        await diagnostics_for(client, uri)
        at_the_end = await client.text_document_hover_async(types.HoverParams(
            text_document=document, position=types.Position(line=33, character=len(line))))
        assert at_the_end is not None and "alerts" in at_the_end.contents.value
        past = types.Position(line=33, character=len(line) + 40)
        assert await client.text_document_hover_async(types.HoverParams(text_document=document, position=past)) is None
        # The LSP specification: a character past the line's end defaults back to the line's end.
        actions = await code_actions_at(client, uri, past)
        assert actions and all("`alerts`" in action.title for action in actions)
        await client.text_document_completion_async(types.CompletionParams(text_document=document, position=past))


async def test_an_empty_list_of_initialization_options_is_no_settings(patched_workspace):
    # Neovim's Lua encodes an empty table `{}` as the JSON array `[]`.
    async with lsp_client(patched_workspace, options=[]) as client:
        uri = open_document(client, patched_workspace / "fernhill" / "valves.py")
        assert [d.data["name"] for d in await diagnostics_for(client, uri)] == ["zone"]
        assert not [m.message for m in client.messages if "setting" in m.message]


async def test_hover_in_plain_text_for_a_client_without_markdown(patched_workspace):
    capabilities = client_capabilities("neovim@v0.10.0")
    capabilities.text_document.hover.content_format = [types.MarkupKind.PlainText]
    async with hover_on_zone(patched_workspace, capabilities=capabilities) as (hover, _, _):
        pass
    assert hover.contents.kind == types.MarkupKind.PlainText
    value = hover.contents.value
    assert value.startswith("zone does not fit how it is used here")
    assert "\n- valve (" in value and "`" not in value and "file://" not in value and "](" not in value
    assert re.search(r"fernhill/\w+\.py:\d+", value), "evidence as plain paths"


def progress_values(client) -> list:
    """Every work-done progress value the client received, in order per token."""
    return [value for values in client.progress_reports.values() for value in values]


BUSIEST_VALVE = """from .valves import Valve, ValveBank


def busiest_valve(bank: ValveBank) -> Valve | None:
    busiest = None
    most = 0.0
    for zone in bank.open_valves():
        minutes = bank.minutes_open(zone.valve_id)
        if minutes > most:
            most = minutes
            busiest = zone
    return busiest
"""


async def test_first_run_offers_to_train_and_the_hints_follow(tmp_path):
    repo = tmp_path / "fernhill"
    shutil.copytree(DEMO, repo, ignore=shutil.ignore_patterns(".cognomen", "__pycache__", "changes"))
    # Enough Python for the model to judge names in it (the demo alone gets suggestions only), and a
    # threshold setting, since so little held-out code calibrates none.
    (repo / "lib").mkdir()
    for module in ("shutil.py", "tarfile.py", "zipfile.py", "configparser.py", "csv.py", "argparse.py"):
        shutil.copy(STDLIB / module, repo / "lib" / module)
    options = {"threshold": -100.0, "reloadSeconds": 0.2}
    # A valve called `zone` where the team names the items of `open_valves()` a `valve`: a name to flag.
    (repo / "fernhill" / "busiest.py").write_text(BUSIEST_VALVE)
    async with lsp_client(repo, options=options, answer="Train now") as client:
        uri = open_document(client, repo / "fernhill" / "busiest.py")
        assert list(await diagnostics_for(client, uri)) == [], "no model yet"
        diagnostics = []
        for _ in range(20):  # each publish after the first: until the trained model's hints arrive
            diagnostics = await diagnostics_for(client, uri, after=published(client, uri), timeout=180)
            if diagnostics:
                break
        [offer] = client.message_requests
        assert [action.title for action in offer.actions] == ["Train now", "Not now"]
        assert (repo / ".cognomen" / "current").is_file(), "the real `cognomen train` promoted a model"
        assert any(d.code == "name-does-not-fit" for d in diagnostics)
        # The model may be loaded (and hints shown) a moment before the training process has exited.
        for _ in range(300):
            if any(isinstance(r, types.WorkDoneProgressEnd) and r.message == "done; loading the model"
                   for r in progress_values(client)):
                break
            await asyncio.sleep(0.1)
        reports = progress_values(client)
        begin = next(r for r in reports if isinstance(r, types.WorkDoneProgressBegin))
        assert begin.message == "training the naming model"
        assert any(isinstance(r, types.WorkDoneProgressReport) and "found" in (r.message or "") for r in reports)
        assert any(isinstance(r, types.WorkDoneProgressEnd) and r.message == "done; loading the model"
                   for r in reports)
        assert not [m for m in client.messages if "no model found" in m.message]
