"""`cognomen serve`: the language server on stdin/stdout (or TCP)."""

from __future__ import annotations


def register(commands) -> None:
    serve = commands.add_parser("serve", help="the language server on stdin/stdout")
    serve.add_argument("--tcp", metavar="HOST:PORT", help="listen on TCP instead of stdin/stdout")
    serve.set_defaults(handler=run)


def run(args) -> int:
    from ..lsp import serve  # pygls loads only for the server

    return serve(args.model_dir, args.tcp)
