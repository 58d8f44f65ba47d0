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


@functools.lru_cache(maxsize=256)
def language_for_path(path: str) -> str | None:
    """Language id from a file name alone (never from its content), or None when unsupported."""
    from pygments.lexers import get_lexer_for_filename
    from pygments.util import ClassNotFound

    try:
        lexer = get_lexer_for_filename(path)
    except ClassNotFound:
        return None
    return _BY_LEXER.get(lexer.name)


def lex(text: str, language: str, keep_comments: bool = False, raw: bool = False) -> list[Token]:
    """Lex source text into normalised tokens: literals abstracted, comments dropped (see tokens.py)."""
    return LANGUAGES[language].lex(text, keep_comments, raw)
