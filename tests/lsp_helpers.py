"""A real LSP client (pytest-lsp) driving `cognomen serve` over stdio, as an editor would."""

from __future__ import annotations

import asyncio
import contextlib
import sys
from pathlib import Path

from lsprotocol import types
from pygls.protocol import default_converter
from pytest_lsp import ClientServerConfig, LanguageClient, client_capabilities
from pytest_lsp.client import DEFAULT_CLIENT_FEATURES, register_lsp_features


def _published(client: LanguageClient, params: types.PublishDiagnosticsParams):
    client.diagnostics[params.uri] = params.diagnostics
    client.diagnostic_versions[params.uri] = params.version
    client.publish_counts[params.uri] = client.publish_counts.get(params.uri, 0) + 1


def _message_request(client: LanguageClient, params: types.ShowMessageRequestParams):
    """Answer as a person would: pick the action titled `client.answer`, or dismiss the message."""
    client.message_requests.append(params)
    return next((action for action in params.actions or [] if action.title == client.answer), None)


def make_client() -> LanguageClient:
    """pytest-lsp's test client, also remembering which document version each diagnostics were for,
    and answering window/showMessageRequest."""
    client = LanguageClient(converter_factory=default_converter)
    client.diagnostic_versions = {}
    client.publish_counts = {}
    client.message_requests = []
    client.answer = None
    register_lsp_features(client, dict(DEFAULT_CLIENT_FEATURES, **{
        types.TEXT_DOCUMENT_PUBLISH_DIAGNOSTICS: _published, types.WINDOW_SHOW_MESSAGE_REQUEST: _message_request}))
    return client


@contextlib.asynccontextmanager
async def lsp_client(root: Path, options: dict | list | None = None, model_dir: Path | None = None,
                     editor: str = "neovim@v0.10.0", capabilities: types.ClientCapabilities | None = None,
                     answer: str | None = None):
    """A session with `cognomen serve`; the client declares the capabilities pytest-lsp recorded from
    `editor` (or `capabilities`, when given) and answers a message request with the action `answer`."""
    command = [sys.executable, "-m", "cognomen"]
    if model_dir is not None:
        command += ["--model-dir", str(model_dir)]
    command.append("serve")
    client = await ClientServerConfig(server_command=command, client_factory=make_client).start()
    client.answer = answer
    await client.initialize_session(types.InitializeParams(
        capabilities=capabilities or client_capabilities(editor),
        root_uri=root.as_uri(),
        workspace_folders=[types.WorkspaceFolder(uri=root.as_uri(), name=root.name)],
        initialization_options=options,
    ))
    try:
        yield client
    finally:
        await client.shutdown_session()
        await client.stop()


def open_document(client, path: Path, text: str | None = None, language: str = "python", version: int = 1) -> str:
    uri = path.as_uri()
    client.text_document_did_open(types.DidOpenTextDocumentParams(text_document=types.TextDocumentItem(
        uri=uri, language_id=language, version=version, text=path.read_text() if text is None else text)))
    return uri


async def diagnostics_for(client, uri: str, version: int | None = None, after: int = 0, timeout: float = 30.0):
    """The diagnostics of a document once published more than `after` times (for a version, when asked)."""
    async def wait():
        while True:
            if client.publish_counts.get(uri, 0) > after and (
                    version is None or client.diagnostic_versions.get(uri) == version):
                return client.diagnostics[uri]
            await asyncio.sleep(0.01)
    return await asyncio.wait_for(wait(), timeout)


def published(client, uri: str) -> int:
    """How many times diagnostics were published for a document so far."""
    return client.publish_counts.get(uri, 0)


async def code_actions_at(client, uri: str, position: types.Position):
    """The code actions offered with the cursor at a position and no diagnostics passed."""
    return await client.text_document_code_action_async(types.CodeActionParams(
        text_document=types.TextDocumentIdentifier(uri=uri), range=types.Range(start=position, end=position),
        context=types.CodeActionContext(diagnostics=[])))
