"""What cognomen knows about each language, one module per language family, and the registry.

The shared machinery (lexing, scopes, scoring, findings) asks a language object for what
differs; adding a language means one module here and one test file in tests/languages/.
"""

from __future__ import annotations

import functools

from ..tokens import Token
from .base import Language
from .c import C_LANGUAGE, CPP
from .csharp import CSHARP
from .go import GO
from .java import JAVA
from .javascript import JAVASCRIPT, TYPESCRIPT
from .python import PYTHON
from .rust import RUST

LANGUAGES: dict[str, Language] = {language.name: language for language in (
    PYTHON, JAVASCRIPT, TYPESCRIPT, GO, JAVA, RUST, C_LANGUAGE, CPP, CSHARP)}
_BY_LEXER = {lexer: language.name for language in LANGUAGES.values() for lexer in language.pygments_names}
GENERATED_SUFFIXES = tuple(suffix for language in LANGUAGES.values() for suffix in language.generated_suffixes)


def get_language(name: str) -> Language:
    """The language object for an id such as "python"; KeyError for one cognomen does not read."""
    return LANGUAGES[name]


def language_for_path(path: str) -> str | None:
    """Language id from a file name alone (never from its content), or None when unsupported.

    Pygments decides by which of its lexers' file-name patterns match; the answer is the same
    for every name that matches the same patterns, so it is worked out once per set of patterns."""
    name = path.rsplit("/", 1)[-1]
    suffixes, unusual = _filename_patterns()
    if unusual.match(name):
        return _language_for_name(name)  # Makefile, *.[1-9], bashrc...: rare, asked of pygments
    extension = "." + name.rsplit(".", 1)[-1] if "." in name else ""
    matched = tuple(suffix for suffix in suffixes.get(extension, ()) if name.endswith(suffix))
    if matched not in _BY_SUFFIXES:
        _BY_SUFFIXES[matched] = _language_for_name(name)
    return _BY_SUFFIXES[matched]


_BY_SUFFIXES: dict[tuple[str, ...], str | None] = {}


@functools.cache
def _filename_patterns():
    """Pygments' file-name patterns: `*.ext` suffixes by their last extension, and one expression
    matching any of the others."""
    import fnmatch
    import re

    from pygments.lexers import LEXERS

    suffixes: dict[str, set[str]] = {}
    unusual = []
    for _, _, _, patterns, _ in LEXERS.values():
        for pattern in patterns:
            tail = pattern[1:]
            if pattern.startswith("*") and "." in tail and not any(c in tail for c in "*?["):
                suffixes.setdefault("." + tail.rsplit(".", 1)[-1], set()).add(tail)
            else:
                unusual.append(fnmatch.translate(pattern))
    return {key: tuple(sorted(found)) for key, found in suffixes.items()}, re.compile("|".join(unusual) or "(?!)")


@functools.lru_cache(maxsize=256)
def _language_for_name(name: str) -> str | None:
    from pygments.lexers import find_lexer_class_for_filename

    lexer = find_lexer_class_for_filename(name)
    return _BY_LEXER.get(lexer.name) if lexer is not None else None


def lex(text: str, language: str, keep_comments: bool = False, raw: bool = False) -> list[Token]:
    """Lex source text into normalised tokens: literals abstracted, comments dropped (see tokens.py)."""
    return LANGUAGES[language].lex(text, keep_comments, raw)
