"""A first model from the editor: offer to train one, then run `cognomen train` in the background.

The training runs as its own process (the real command line), so the server keeps answering;
its progress lines become work-done progress, and the server's hot reload loads the model once
it is promoted.
"""

from __future__ import annotations

import asyncio
import logging
import sys
import time
from pathlib import Path
from typing import TYPE_CHECKING

from lsprotocol import types

if TYPE_CHECKING:
    from .lsp import NameServer

log = logging.getLogger("cognomen.server.first_model")
TRAIN_NOW = "Train now"
NOT_NOW = "Not now"


def can_offer(ls: NameServer) -> bool:
    """Whether the client answers window/showMessageRequest (it declares window.showMessage)."""
    capabilities = ls.client_capabilities
    window = capabilities.window if capabilities else None
    return bool(window and window.show_message is not None)


def no_model_text(store: Path | str) -> str:
    return f"cognomen: no model found in {store}; run `cognomen train` in the repository to get name hints"


async def offer_training(ls: NameServer, store: Path, root: Path) -> None:
    """Ask whether to train now; train in the background when the person says so."""
    try:
        answer = await ls.window_show_message_request_async(types.ShowMessageRequestParams(
            type=types.MessageType.Info,
            message=f"cognomen: no naming model for {root.name} yet. Train one now? It learns from the "
                    f"repository's code in the background (`cognomen train`; a minute or more on a large "
                    f"repository) and name hints appear when it is done.",
            actions=[types.MessageActionItem(title=TRAIN_NOW), types.MessageActionItem(title=NOT_NOW)]))
    except Exception:  # the client may refuse the request; then it is only a message it did not show
        log.exception("could not ask whether to train")
        return
    if answer is not None and answer.title == TRAIN_NOW:
        await train_in_background(ls, store, root)


async def train_in_background(ls: NameServer, store: Path, root: Path) -> None:
    """Run `cognomen train` on the workspace root with work-done progress; say how it ended."""
    token = f"cognomen-train-{time.monotonic_ns()}"
    progress = await _begin(ls, token)
    process = await asyncio.create_subprocess_exec(
        sys.executable, "-m", "cognomen", "--model-dir", str(store), "train", str(root),
        stdin=asyncio.subprocess.DEVNULL, stdout=asyncio.subprocess.PIPE, stderr=asyncio.subprocess.PIPE)
    ls.training = process
    last_line = ""

    async def follow_progress() -> None:
        nonlocal last_line
        async for raw in process.stderr:
            last_line = raw.decode("utf-8", "replace").strip() or last_line
            if progress and last_line:
                ls.work_done_progress.report(token, types.WorkDoneProgressReport(message=last_line))

    try:
        _, summary = await asyncio.gather(follow_progress(), process.stdout.read())
        status = await process.wait()
    finally:
        ls.training = None
    if status == 0:
        log.info("trained a first model: %s", (summary.decode("utf-8", "replace").splitlines() or ["?"])[0])
        ending = "done; loading the model"
    else:
        ending = f"training stopped: {last_line or f'exit status {status}'}"
        ls.window_show_message(types.ShowMessageParams(type=types.MessageType.Warning, message=f"cognomen: {ending}"))
    if progress:
        ls.work_done_progress.end(token, types.WorkDoneProgressEnd(message=ending))


async def _begin(ls: NameServer, token: str) -> bool:
    if not ls.supports_progress():
        return False
    try:
        await ls.work_done_progress.create_async(token)
        ls.work_done_progress.begin(token, types.WorkDoneProgressBegin(
            title="cognomen", message="training the naming model", cancellable=False))
    except Exception:
        return False
    return True


def stop_training(ls: NameServer) -> None:
    """End a training still running when the server shuts down (the store keeps its old state)."""
    if ls.training is not None and ls.training.returncode is None:
        ls.training.kill()
