"""Random edits and random positions against an open document: the server never falls over,
keeps answering, and its last diagnostics match the final text."""

import asyncio
import shutil

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from lsprotocol import types
from pygls.exceptions import JsonRpcException

from cognomen.model.findings import analyse_text, check_source
from cognomen.model.persistence import load_scorer

from .lsp_helpers import code_actions_at, diagnostics_for, lsp_client, open_document

SNIPPETS = ["x", "zone", " = ", "(", ")", ":", "\n", "\n    ", "reading.moisture", "for valve in zones:\n        ",
            "'é'", "\"🌱\"", "def f(a, b):\n    return a\n", "#", "[", "]", "banana = 3\n", "    ", "valve", "import os\n"]


def utf16_offset(text: str, line: int, character: int) -> int:
    """Index into text of an LSP position counted in UTF-16 code units."""
    lines = text.split("\n")
    line = min(line, len(lines) - 1)
    offset = sum(len(l) + 1 for l in lines[:line])
    units = 0
    for index, char in enumerate(lines[line]):
        if units >= character:
            return offset + index
        units += 2 if ord(char) > 0xFFFF else 1
    return offset + len(lines[line])


def position_at(text: str, fraction: float) -> types.Position:
    index = int(fraction * len(text))
    before = text[:index]
    line = before.count("\n")
    column_text = before[before.rfind("\n") + 1:]
    return types.Position(line=line, character=sum(2 if ord(c) > 0xFFFF else 1 for c in column_text))


operation = st.one_of(
    st.tuples(st.just("edit"), st.floats(0, 1), st.integers(0, 12), st.sampled_from(SNIPPETS)),
    st.tuples(st.just("ask"), st.sampled_from(["hover", "action", "complete"]), st.floats(0, 1.2), st.integers(0, 3)),
)


@settings(max_examples=6, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(operations=st.lists(operation, min_size=5, max_size=40))
def test_random_edits_and_positions(patched_demo, tmp_path_factory, operations):
    workspace = tmp_path_factory.mktemp("fuzz") / "fernhill"
    shutil.copytree(patched_demo, workspace, symlinks=True)
    asyncio.run(exercise(workspace, operations))


async def exercise(workspace, operations):
    path = workspace / "fernhill" / "valves.py"
    text = path.read_text()
    async with lsp_client(workspace, options={"debounceMs": 5}) as client:
        uri = open_document(client, path, text)
        version = 1
        for op in operations:
            if op[0] == "edit":
                _, where, length, snippet = op
                start = position_at(text, where)
                begin = utf16_offset(text, start.line, start.character)
                end_index = min(len(text), begin + length)
                before_end = text[:end_index]
                end = types.Position(line=before_end.count("\n"), character=sum(
                    2 if ord(c) > 0xFFFF else 1 for c in before_end[before_end.rfind("\n") + 1:]))
                text = text[:begin] + snippet + text[end_index:]
                version += 1
                client.text_document_did_change(types.DidChangeTextDocumentParams(
                    text_document=types.VersionedTextDocumentIdentifier(uri=uri, version=version),
                    content_changes=[types.TextDocumentContentChangePartial(
                        range=types.Range(start=start, end=end), text=snippet)]))
            else:
                _, kind, where, shift = op
                position = position_at(text, min(where, 1.0))
                if where > 1.0:  # deliberately outside the document
                    position = types.Position(line=position.line + 50 * shift + 1, character=3)
                document = types.TextDocumentIdentifier(uri=uri)
                try:
                    if kind == "hover":
                        await client.text_document_hover_async(types.HoverParams(text_document=document,
                                                                                 position=position))
                    elif kind == "action":
                        await code_actions_at(client, uri, position)
                    else:
                        await client.text_document_completion_async(types.CompletionParams(
                            text_document=document, position=position))
                except JsonRpcException:
                    assert where > 1.0, "only positions outside the document may get an error"
        final = await diagnostics_for(client, uri, version=version, timeout=60)
        # Still answering after everything above.
        await client.text_document_hover_async(types.HoverParams(
            text_document=types.TextDocumentIdentifier(uri=uri), position=types.Position(line=0, character=0)))
    scorer, _ = load_scorer(workspace / ".cognomen")
    source = analyse_text(text, "fernhill/valves.py", "python")
    expected = sorted((f.line - 1, f.name) for f in check_source(scorer, source))
    assert sorted((d.range.start.line, d.data["name"]) for d in final) == expected
