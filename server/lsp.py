"""`cognomen serve`: name hints, rename quick fixes, hover and completion over the Language Server Protocol."""

from __future__ import annotations

import asyncio
import functools
import gc
import logging
import math
import re
import time
from concurrent.futures import ThreadPoolExecutor
from dataclasses import dataclass
from pathlib import Path
from urllib.parse import unquote, urlparse

from lsprotocol import types
from pygls.exceptions import JsonRpcException, JsonRpcInternalError, JsonRpcInvalidParams
from pygls.lsp.server import LanguageServer
from pygls.workspace.position_codec import ServerTextPosition

from cognomen import __version__
from cognomen.model import bundle
from cognomen.model.bundle import ModelError
from cognomen.model.chunks import PieceCache
from cognomen.model.corpus import SourceFile, read_settings
from cognomen.model.findings import (Finding, JudgementCache, analyse_text, check_source, complete_binding,
                                     suggest_at)
from cognomen.model.persistence import load_scorer
from cognomen.model.suppression import keep_comment
from cognomen.model.scoring import Scorer
from cognomen.model.languages import get_language, language_for_path

from . import first_model
from .review import calibrated_threshold, level_of
from .settings import LEVELS, ServerSettings, parse_settings

log = logging.getLogger("cognomen.server")
DIAGNOSTIC_CODE = "name-does-not-fit"
SEVERITY = {"error": types.DiagnosticSeverity.Error, "warning": types.DiagnosticSeverity.Warning,
            "information": types.DiagnosticSeverity.Information, "hint": types.DiagnosticSeverity.Hint}


@dataclass
class Analysis:
    """The last checked state of an open document."""

    version: int | None
    source: SourceFile
    findings: list[Finding]


class ClientLogHandler(logging.Handler):
    """Forwards cognomen's own log records to the editor's log (never other libraries')."""

    def __init__(self, server: "NameServer"):
        super().__init__(logging.INFO)
        self.server = server

    def emit(self, record: logging.LogRecord) -> None:
        kind = types.MessageType.Error if record.levelno >= logging.ERROR else \
            types.MessageType.Warning if record.levelno >= logging.WARNING else types.MessageType.Info
        try:
            self.server.window_log_message(types.LogMessageParams(type=kind, message=self.format(record)))
        except Exception:  # the client may be gone; logging must never fail a request
            pass


class NameServer(LanguageServer):
    """The language server: holds settings, the loaded model and the last analysis of each document."""

    def __init__(self, model_dir: str | None = None):
        super().__init__("cognomen", __version__)
        self.command_line_model_dir = model_dir
        self.settings = ServerSettings()
        self.scorer: Scorer | None = None
        self.model_id: str | None = None
        self.store: Path | None = None
        self.analyses: dict[str, Analysis] = {}
        self.judgement_caches: dict[str, JudgementCache] = {}
        self.piece_caches: dict[str, PieceCache] = {}  # each document's lexed and scoped statements
        self.pending: dict[str, asyncio.Task] = {}
        self.analysis_pool = ThreadPoolExecutor(max_workers=1, thread_name_prefix="cognomen-analysis")
        self.told_no_model = False
        self.watcher: asyncio.Task | None = None
        self.model_ready = asyncio.Event()  # set once the first attempt to load a model has ended
        self.refused_model_id: str | None = None  # a model that failed verification, not retried
        self._accepted: dict[str, list[str]] | None = None  # the workspace's accepted names
        self.training: asyncio.subprocess.Process | None = None  # `cognomen train` run for a first model
        self.offer: asyncio.Task | None = None

    # --- model ----------------------------------------------------------------------------

    def resolve_store(self) -> Path | None:
        chosen = self.settings.model_dir or self.command_line_model_dir
        if chosen:
            return Path(chosen).expanduser()
        root = self.workspace.root_path if self.workspace else None
        return Path(root) / ".cognomen" if root else None

    async def load_model(self, announce: bool = True) -> None:
        """Load the current model off the event loop, with work-done progress; keep the old one on failure."""
        try:
            await self._load_model(announce)
        finally:
            self.model_ready.set()

    async def _load_model(self, announce: bool) -> None:
        store = self.resolve_store()
        self.store = store
        if store is None or bundle.current_model_id(store) is None:
            self.scorer, self.model_id = None, None
            if not self.told_no_model:
                self.told_no_model = True
                root = self.workspace.root_path if self.workspace else None
                if store is not None and root and self.training is None and first_model.can_offer(self):
                    self.offer = asyncio.ensure_future(first_model.offer_training(self, store, Path(root)))
                else:
                    self.window_show_message(types.ShowMessageParams(
                        type=types.MessageType.Info, message=first_model.no_model_text(store or "the workspace")))
            return
        token = f"cognomen-load-{time.monotonic_ns()}"
        progress = announce and self.supports_progress()
        if progress:
            try:
                await self.work_done_progress.create_async(token)
                self.work_done_progress.begin(token, types.WorkDoneProgressBegin(
                    title="cognomen", message="loading the naming model"))
            except Exception:
                progress = False
        try:
            loop = asyncio.get_running_loop()
            scorer, loaded = await loop.run_in_executor(self.analysis_pool, load_scorer, store)
        except ModelError as error:
            self.refused_model_id = bundle.current_model_id(store)
            log.warning("model refused: %s", error)
            self.window_show_message(types.ShowMessageParams(
                type=types.MessageType.Warning, message=f"cognomen: {error}"
                + ("; keeping the model already loaded" if self.scorer else "")))
            return
        finally:
            if progress:
                self.work_done_progress.end(token, types.WorkDoneProgressEnd(message="done"))
        self.scorer, self.model_id = scorer, loaded.model_id
        self.told_no_model = False
        # The model's many small objects live as long as it does: keep them out of every
        # garbage collection, which otherwise walks them all while a document is re-read.
        gc.collect()
        gc.freeze()
        log.info("loaded model %s from %s", loaded.model_id, store)
        for uri in list(self.analyses):
            self.schedule(uri, delay=0.0)

    def supports_progress(self) -> bool:
        capabilities = self.client_capabilities
        window = capabilities.window if capabilities else None
        return bool(window and window.work_done_progress)

    async def watch_model(self) -> None:
        """Swap in a newly promoted model without a restart."""
        while True:
            await asyncio.sleep(self.settings.reload_seconds)
            store = self.resolve_store()
            if store is None:
                continue
            current = bundle.current_model_id(store)
            if current and current != self.model_id and current != self.refused_model_id:
                log.info("a new model %s was promoted; loading it", current)
                await self.load_model()

    # --- diagnostics ----------------------------------------------------------------------

    def schedule(self, uri: str, delay: float | None = None) -> None:
        """Check a document after a quiet time; a newer edit cancels the older check."""
        previous = self.pending.pop(uri, None)
        if previous is not None:
            previous.cancel()
        wait = self.settings.debounce_ms / 1000 if delay is None else delay
        self.pending[uri] = asyncio.ensure_future(self._check_later(uri, wait))

    async def _check_later(self, uri: str, wait: float) -> None:
        try:
            await asyncio.sleep(wait)
            await self.model_ready.wait()
            document = self.workspace.text_documents.get(uri)
            if document is None:
                return
            version, text = document.version, document.source
            loop = asyncio.get_running_loop()
            analysis = await loop.run_in_executor(self.analysis_pool, self.analyse, uri, text, version)
            document = self.workspace.text_documents.get(uri)
            if document is None or document.version != version:
                return  # closed or edited meanwhile: a newer check is on its way
            if analysis is None:
                self.analyses.pop(uri, None)
                self.text_document_publish_diagnostics(types.PublishDiagnosticsParams(uri=uri, diagnostics=[]))
                return
            self.analyses[uri] = analysis
            self.text_document_publish_diagnostics(types.PublishDiagnosticsParams(
                uri=uri, version=version, diagnostics=self.diagnostics(uri, analysis)))
        except asyncio.CancelledError:
            pass
        except Exception:
            log.exception("checking %s failed", uri)
        finally:
            if self.pending.get(uri) is asyncio.current_task():
                self.pending.pop(uri, None)

    def analyse(self, uri: str, text: str, version: int | None) -> Analysis | None:
        """Lex, scope and judge a document (runs off the event loop)."""
        path = path_of(uri)
        language = language_for_path(path.rsplit("/", 1)[-1])
        if language is None or language not in self.settings.languages:
            return None
        if len(text) > self.settings.max_file_size:
            log.info("%s has %d characters, over the %d limit; no hints for it", path, len(text),
                     self.settings.max_file_size)
            return None
        source = analyse_text(text, self.relative(path), language, pieces=self.pieces(uri))
        if source is None:
            return None
        cache = self.judgement_caches.setdefault(uri, JudgementCache())
        scorer = self.scorer  # the same model throughout, even if a new one is swapped in meanwhile
        findings = check_source(scorer, source, self.settings.threshold, cache=cache,
                                accepted=self.accepted_names()) if scorer else []
        minimum = LEVELS.index(self.settings.minimum_level)
        findings = [f for f in findings if LEVELS.index(level_of(f, calibrated_threshold(scorer, f))) >= minimum]
        return Analysis(version, source, findings)

    def accepted_names(self) -> dict[str, list[str]]:
        """The workspace's `[accepted-names]`, read once (a malformed settings file is logged, not fatal)."""
        if self._accepted is None:
            root = self.workspace.root_path if self.workspace else None
            self._accepted = {}
            if root:
                try:
                    self._accepted = read_settings(Path(root)).accepted_names
                except ValueError as error:
                    log.warning("%s", error)
        return self._accepted

    def pieces(self, uri: str) -> PieceCache:
        return self.piece_caches.setdefault(uri, PieceCache())

    def relative(self, path: str) -> str:
        root = self.workspace.root_path if self.workspace else None
        if root:
            try:
                return str(Path(path).relative_to(root))
            except ValueError:
                pass
        return path

    def diagnostics(self, uri: str, analysis: Analysis) -> list[types.Diagnostic]:
        document = self.workspace.get_text_document(uri)
        found = []
        for finding in analysis.findings:
            names = ", ".join(f"`{s.name}`" for s in finding.suggestions[:3])
            related = [types.DiagnosticRelatedInformation(
                location=types.Location(uri=self.uri_for(path), range=line_range(line)),
                message=f"`{suggestion.name}` used in a similar context")
                for suggestion in finding.suggestions[:3] for path, line in suggestion.evidence[:2]]
            found.append(types.Diagnostic(
                range=client_range(document, finding.line, finding.column, len(finding.name)),
                message=f"`{finding.name}` does not fit how it is used here; the team would call it {names}",
                severity=SEVERITY[self.settings.severity],
                code=DIAGNOSTIC_CODE,
                source="cognomen",
                related_information=related or None,
                data={"name": finding.name, "line": finding.line, "column": finding.column},
            ))
        return found

    def uri_for(self, path: str) -> str:
        root = self.workspace.root_path if self.workspace else None
        full = Path(path) if Path(path).is_absolute() or not root else Path(root) / path
        return full.as_uri()

    # --- requests -------------------------------------------------------------------------

    def fresh_source(self, uri: str) -> SourceFile | None:
        """The document as it is now: the last analysis when current, else analysed afresh."""
        document = self.workspace.text_documents.get(uri)
        if document is None:
            return None
        analysis = self.analyses.get(uri)
        if analysis is not None and analysis.version == document.version:
            return analysis.source
        fresh = self.analyse(uri, document.source, document.version)
        return fresh.source if fresh else None

    def server_position(self, uri: str, position: types.Position) -> tuple[int, int]:
        """A client position as a 1-based line and 1-based character column; invalid params if outside.

        A character past the end of its line means the end of the line, as the LSP specification
        says of every position.
        """
        document = self.workspace.get_text_document(uri)
        lines = document.lines
        if position.line < 0 or position.character < 0 or position.line > len(lines) or (
                position.line == len(lines) and position.character > 0):
            raise JsonRpcInvalidParams(f"position {position.line}:{position.character} is outside the document")
        length = self.line_length(uri, position.line)
        if position.character > length:
            position = types.Position(line=position.line, character=length)
        converted = document.position_from_client_units(position)
        return converted.line + 1, converted.character + 1

    def line_length(self, uri: str, line: int) -> int:
        """A line's length in the client's units (0 for the empty place after a final newline)."""
        document = self.workspace.get_text_document(uri)
        if line >= len(document.lines):
            return 0
        return document.position_codec.client_num_units(document.lines[line].rstrip("\r\n"))

    def accepts_markdown(self) -> bool:
        """Whether the client renders Markdown in hovers (it says so in textDocument.hover.contentFormat)."""
        capabilities = self.client_capabilities
        hover = capabilities.text_document.hover if capabilities and capabilities.text_document else None
        formats = hover.content_format if hover else None
        return formats is None or types.MarkupKind.Markdown in formats


def path_of(uri: str) -> str:
    parsed = urlparse(uri)
    return unquote(parsed.path) if parsed.scheme == "file" else uri


def client_range(document, line: int, column: int, length: int) -> types.Range:
    start = document.position_to_client_units(ServerTextPosition(line - 1, column - 1))
    end = document.position_to_client_units(ServerTextPosition(line - 1, column - 1 + length))
    return types.Range(start=start, end=end)


def line_range(line: int) -> types.Range:
    return types.Range(start=types.Position(line=line - 1, character=0),
                       end=types.Position(line=line - 1, character=0))


def guarded(empty):
    """One failing feature must not take the others down: log it and answer with nothing.

    Requests that arrive while the first model is still loading wait for it.
    """
    def wrap(handler):
        @functools.wraps(handler)
        async def run(server: NameServer, params):
            await server.model_ready.wait()
            try:
                return handler(server, params)
            except JsonRpcInvalidParams:
                raise
            except Exception:
                log.exception("%s failed", handler.__name__)
                return empty
        return run
    return wrap


def build_server(model_dir: str | None = None) -> NameServer:
    server = NameServer(model_dir)

    @server.feature(types.INITIALIZE)
    def initialize(ls: NameServer, params: types.InitializeParams) -> None:
        apply_settings(ls, params.initialization_options)

    @server.feature(types.INITIALIZED)
    async def initialized(ls: NameServer, params: types.InitializedParams) -> None:
        await ls.load_model()
        ls.watcher = asyncio.ensure_future(ls.watch_model())

    @server.feature(types.WORKSPACE_DID_CHANGE_CONFIGURATION)
    async def configuration_changed(ls: NameServer, params: types.DidChangeConfigurationParams) -> None:
        store_before = ls.resolve_store()
        apply_settings(ls, params.settings)
        if ls.resolve_store() != store_before:
            ls.told_no_model = False
            await ls.load_model()
        for uri in list(ls.workspace.text_documents):
            ls.schedule(uri, delay=0.0)

    @server.feature(types.TEXT_DOCUMENT_DID_OPEN)
    def did_open(ls: NameServer, params: types.DidOpenTextDocumentParams) -> None:
        ls.schedule(params.text_document.uri, delay=0.0)

    @server.feature(types.TEXT_DOCUMENT_DID_CHANGE)
    def did_change(ls: NameServer, params: types.DidChangeTextDocumentParams) -> None:
        ls.schedule(params.text_document.uri)

    @server.feature(types.TEXT_DOCUMENT_DID_SAVE)
    def did_save(ls: NameServer, params: types.DidSaveTextDocumentParams) -> None:
        ls.schedule(params.text_document.uri, delay=0.0)

    @server.feature(types.TEXT_DOCUMENT_DID_CLOSE)
    def did_close(ls: NameServer, params: types.DidCloseTextDocumentParams) -> None:
        uri = params.text_document.uri
        pending = ls.pending.pop(uri, None)
        if pending:
            pending.cancel()
        ls.analyses.pop(uri, None)
        ls.judgement_caches.pop(uri, None)
        ls.piece_caches.pop(uri, None)
        ls.text_document_publish_diagnostics(types.PublishDiagnosticsParams(uri=uri, diagnostics=[]))

    @server.feature(types.TEXT_DOCUMENT_CODE_ACTION, types.CodeActionOptions(
        code_action_kinds=[types.CodeActionKind.QuickFix, types.CodeActionKind.RefactorRewrite]))
    @guarded([])
    def code_action(ls: NameServer, params: types.CodeActionParams) -> list[types.CodeAction]:
        return rename_actions(ls, params)

    @server.feature(types.TEXT_DOCUMENT_HOVER)
    @guarded(None)
    def hover(ls: NameServer, params: types.HoverParams) -> types.Hover | None:
        return hover_for(ls, params.text_document.uri, params.position)

    @server.feature(types.TEXT_DOCUMENT_COMPLETION, types.CompletionOptions(trigger_characters=[" "]))
    @guarded(None)
    def completion(ls: NameServer, params: types.CompletionParams) -> types.CompletionList | None:
        return completions_for(ls, params.text_document.uri, params.position)

    @server.feature(types.SHUTDOWN)
    def shutdown(ls: NameServer, params) -> None:
        if ls.watcher:
            ls.watcher.cancel()
        for task in ls.pending.values():
            task.cancel()
        first_model.stop_training(ls)
        ls.analysis_pool.shutdown(wait=False, cancel_futures=True)

    return server


def apply_settings(ls: NameServer, raw) -> None:
    ls.settings, problems = parse_settings(raw, ls.settings)
    for problem in problems:
        log.warning("%s", problem)
        ls.window_show_message(types.ShowMessageParams(type=types.MessageType.Warning,
                                                       message=f"cognomen: {problem}"))


def _finding_at(ls: NameServer, uri: str, position: types.Position) -> tuple[SourceFile, Finding] | None:
    if ls.scorer is None:
        return None
    line, column = ls.server_position(uri, position)
    source = ls.fresh_source(uri)
    if source is None:
        return None
    finding, _ = suggest_at(ls.scorer, source, line, column, ls.settings.threshold)
    return (source, finding) if finding is not None else None


def rename_actions(ls: NameServer, params: types.CodeActionParams) -> list[types.CodeAction]:
    uri = params.text_document.uri
    found = _finding_at(ls, uri, params.range.start)
    if found is None:
        return []
    source, finding = found
    variable = finding.variable
    # Callers that pass an argument by its parameter's name break when the parameter is renamed.
    breaks_callers = variable.kind == "parameter" and variable.public_parameter and \
        get_language(source.language).keyword_arguments
    if breaks_callers and not ls.settings.allow_public_parameter_renames:
        return []
    document = ls.workspace.get_text_document(uri)
    kind = types.CodeActionKind.QuickFix if finding.flagged else types.CodeActionKind.RefactorRewrite
    diagnostics = [d for d in params.context.diagnostics if d.code == DIAGNOSTIC_CODE
                   and d.range.start.line == finding.line - 1] if finding.flagged else None
    actions = []
    for index, suggestion in enumerate(finding.suggestions[:3]):
        edits = [types.TextEdit(range=client_range(document, line, column, length), new_text=text)
                 for line, column, length, text in finding.rename_edits(suggestion.name)]
        title = f"Rename `{finding.name}` to `{suggestion.name}`"
        if breaks_callers:
            title += " (callers passing it by keyword will break)"
        actions.append(types.CodeAction(
            title=title, kind=kind, diagnostics=diagnostics or None, is_preferred=finding.flagged and index == 0,
            edit=types.WorkspaceEdit(changes={uri: edits})))
    if finding.flagged:  # after the renames: a client taking the first action renames
        actions.append(keep_action(ls, uri, source, finding, diagnostics))
    return actions


def keep_action(ls: NameServer, uri: str, source: SourceFile, finding: Finding, diagnostics) -> types.CodeAction:
    """Saying no in one keystroke: a keep-name comment on the binding's line, which check, review and
    the editor honour and the next training learns from."""
    document = ls.workspace.get_text_document(uri)
    line = finding.line - 1
    end = document.position_codec.client_num_units(document.lines[line].rstrip("\r\n"))
    comment = keep_comment(get_language(source.language).comment_prefix)
    edit = types.TextEdit(range=types.Range(start=types.Position(line=line, character=end),
                                            end=types.Position(line=line, character=end)), new_text=comment)
    return types.CodeAction(title=f"Keep the name `{finding.name}` (add a keep-name comment)",
                            kind=types.CodeActionKind.QuickFix, diagnostics=diagnostics or None,
                            edit=types.WorkspaceEdit(changes={uri: [edit]}))


def hover_for(ls: NameServer, uri: str, position: types.Position) -> types.Hover | None:
    ls.server_position(uri, position)  # invalid params outside the document
    if position.character > ls.line_length(uri, position.line):
        return None  # past the end of its line: nothing is under the pointer
    found = _finding_at(ls, uri, position)
    if found is None:
        return None
    _, finding = found
    markdown = ls.accepts_markdown()
    document = ls.workspace.get_text_document(uri)
    line, column = _occurrence_at(finding, *ls.server_position(uri, position))
    kind = types.MarkupKind.Markdown if markdown else types.MarkupKind.PlainText
    return types.Hover(contents=types.MarkupContent(kind=kind, value=hover_text(finding, markdown, ls.uri_for)),
                       range=client_range(document, line, column, len(finding.name)))


def hover_text(finding: Finding, markdown: bool, uri_for) -> str:
    """The verdict on a name and the team's names for contexts like it, in Markdown or readable plain text."""
    def code(name: str) -> str:
        return f"`{name}`" if markdown else name

    def place(path: str, line: int) -> str:
        return f"[{path}:{line}]({uri_for(path)}#L{line})" if markdown else f"{path}:{line}"

    name = code(finding.name)
    if finding.dictated:
        verdict = f"{name} is not judged: {_with_code(finding.dictated, code)}"
    elif finding.score is None:
        verdict = f"cognomen cannot judge {name} here (no model names for it)"
    elif not math.isfinite(finding.threshold):
        verdict = f"{name}: cognomen gives suggestions only for {finding.language} here (too little of it in the " \
                  f"repository to set a threshold that holds; oddness {finding.score:.2f})"
    elif finding.flagged:
        verdict = f"{name} does not fit how it is used here " \
                  f"(oddness {finding.score:.2f}, flagged above {finding.threshold:.2f})"
    elif finding.score > finding.threshold - 1.0:
        verdict = f"{name} fits, but only just (oddness {finding.score:.2f}, threshold {finding.threshold:.2f})"
    else:
        verdict = f"{name} fits how it is used here (oddness {finding.score:.2f}, threshold {finding.threshold:.2f})"
    lines = [verdict, ""]
    if finding.suggestions:
        lines.append("Names the team uses in contexts like this:")
        for suggestion in finding.suggestions[:5]:
            places = ", ".join(place(path, line) for path, line in suggestion.evidence)
            why = _with_code(suggestion.reason, code)
            lines.append(f"- {code(suggestion.name)} ({suggestion.score:.0%})" + (f": {why}" if why else "")
                         + (f" ({places})" if places and why else f": {places}" if places else ""))
    return "\n".join(lines)


def _with_code(text: str, code) -> str:
    """Model text marks names with backticks: keep them for Markdown, drop them for plain text."""
    return re.sub(r"`([^`]*)`", lambda m: code(m.group(1)), text)


def _occurrence_at(finding: Finding, line: int, column: int) -> tuple[int, int]:
    """The occurrence under a position (line, column), or the binding."""
    for place_line, place_column in finding.occurrences:
        if place_line == line and place_column <= column <= place_column + len(finding.name):
            return place_line, place_column
    return finding.line, finding.column


def completions_for(ls: NameServer, uri: str, position: types.Position) -> types.CompletionList | None:
    if ls.scorer is None:
        return None
    line, column = ls.server_position(uri, position)
    document = ls.workspace.get_text_document(uri)
    if len(document.source) > ls.settings.max_file_size:
        return None
    path = path_of(uri)
    language = language_for_path(path.rsplit("/", 1)[-1])
    if language is None or language not in ls.settings.languages:
        return None
    names = complete_binding(ls.scorer, document.source, ls.relative(path), line, column, language,
                             pieces=ls.pieces(uri))
    if not names:
        return None
    items = [types.CompletionItem(label=s.name, kind=types.CompletionItemKind.Variable,
                                  detail=f"cognomen: {s.score:.0%} fit", sort_text=f"{index:03d}",
                                  documentation=", ".join(f"{p}:{l}" for p, l in s.evidence) or None)
             for index, s in enumerate(names)]
    return types.CompletionList(is_incomplete=True, items=items)


class ClientMistakes(logging.Filter):
    """A request the client got wrong (a position outside the document) is answered with a protocol
    error; the log gets one plain line for it, not a traceback."""

    def filter(self, record: logging.LogRecord) -> bool:
        error = record.exc_info[1] if record.exc_info else None
        if isinstance(error, JsonRpcException) and not isinstance(error, JsonRpcInternalError):
            record.msg, record.args, record.exc_info = "answered a request with a protocol error: %s", (error,), None
            record.levelno, record.levelname = logging.INFO, "INFO"
        return True


def serve(model_dir: str | None = None, tcp: str | None = None) -> int:
    """Run the server over stdio (or TCP host:port); stdout carries only the protocol."""
    logging.basicConfig(level=logging.WARNING, format="cognomen %(levelname)s %(name)s: %(message)s")
    logging.getLogger("pygls.protocol.json_rpc").addFilter(ClientMistakes())
    logging.getLogger("cognomen").setLevel(logging.INFO)
    server = build_server(model_dir)
    handler = ClientLogHandler(server)
    handler.setFormatter(logging.Formatter("%(message)s"))
    logging.getLogger("cognomen").addHandler(handler)
    if tcp:
        host, _, port = tcp.rpartition(":")
        server.start_tcp(host or "127.0.0.1", int(port))
    else:
        server.start_io()
    return 0
