"""Which files of a repository to learn from, and their lexed, cached token streams."""

from __future__ import annotations

import contextlib
import fnmatch
import gc
import hashlib
import json
import os
import subprocess
import tomllib
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass, field
from itertools import repeat
from pathlib import Path

from .chunks import PieceCache, read_python
from .forked import ignore_interrupts, interrupts_deferred
from .languages import GENERATED_SUFFIXES, get_language, language_for_path, lex
from .languages.python_scopes import python_variables
from .scopes import Variable
from .suppression import kept_lines
from .tokens import Token

MAX_FILE_BYTES = 1 << 20
MAX_LINE_CHARS = 1000  # a longer line marks a minified or generated file
# 11: "value_of" cues of Go map values; 10: Go named results are returned values; 9: keys of Go `for k := range` and JavaScript `for (k in o)`;
# 8: "checked" cues, no value cues from `**kwargs`; 7: name-flow cues and file facts; 6: token-based scope fixes
CACHE_FORMAT = 11

DEFAULT_EXCLUDES = (
    "node_modules", "vendor", "third_party", "third-party", "build", "dist", "out", "target",
    ".git", ".hg", ".svn", ".venv", "venv", "env", "__pycache__", ".tox", ".mypy_cache",
    ".cognomen", "site-packages", "bower_components", ".next", "coverage", "generated",
)


@dataclass
class Selection:
    """Files chosen for learning, with what was skipped and why."""

    root: Path
    files: list[str] = field(default_factory=list)  # paths relative to root, "/" separated
    skipped: dict[str, int] = field(default_factory=dict)

    def skip(self, reason: str) -> None:
        self.skipped[reason] = self.skipped.get(reason, 0) + 1


@dataclass
class Settings:
    """Include and exclude globs from [tool.cognomen] in pyproject.toml or cognomen.toml."""

    include: list[str] = field(default_factory=list)
    exclude: list[str] = field(default_factory=list)
    accepted_names: dict[str, list[str]] = field(default_factory=dict)


def read_settings(root: Path) -> Settings:
    """The repository's own settings; a malformed file raises ValueError with a plain message."""
    for name, table_path in (("cognomen.toml", ()), ("pyproject.toml", ("tool", "cognomen"))):
        path = root / name
        if not path.is_file():
            continue
        try:
            data = tomllib.loads(path.read_text(encoding="utf-8"))
        except (tomllib.TOMLDecodeError, UnicodeDecodeError) as error:
            raise ValueError(f"{path}: not valid TOML ({error})") from None
        for key in table_path:
            data = data.get(key, {})
        if not data and table_path:
            continue
        settings = Settings(
            include=_string_list(data.get("include", []), path, "include"),
            exclude=_string_list(data.get("exclude", []), path, "exclude"),
        )
        accepted = data.get("accepted-names", {})
        if not isinstance(accepted, dict):
            raise ValueError(f"{path}: accepted-names must be a table of glob = [names]")
        settings.accepted_names = {glob: _string_list(names, path, f"accepted-names.{glob}")
                                   for glob, names in accepted.items()}
        return settings
    return Settings()


def _string_list(value, path: Path, key: str) -> list[str]:
    if isinstance(value, str):
        value = [value]
    if not isinstance(value, list) or not all(isinstance(v, str) for v in value):
        raise ValueError(f"{path}: {key} must be a list of strings")
    return value


def repository_root(path: Path) -> Path | None:
    """The top of the git work tree holding path, or None outside git."""
    try:
        result = subprocess.run(["git", "rev-parse", "--show-toplevel"], cwd=path, capture_output=True,
                                text=True, timeout=30)
    except (OSError, subprocess.TimeoutExpired):
        return None
    if result.returncode != 0:
        return None
    return Path(result.stdout.strip())


def size_limit_reason(max_bytes: int) -> str:
    """Why a file over the size limit was skipped, in the summary's words ("over 1 MiB")."""
    for unit, size in (("MiB", 1 << 20), ("KiB", 1 << 10)):
        if max_bytes >= size and max_bytes % size == 0:
            return f"over {max_bytes // size:,} {unit}"
    return f"over {max_bytes:,} bytes"


def discover(root: Path, settings: Settings | None = None, max_bytes: int = MAX_FILE_BYTES) -> Selection:
    """Source files under root: git-tracked files inside a work tree, else a directory walk."""
    root = root.resolve()
    settings = settings or read_settings(root)
    selection = Selection(root)
    candidates = _git_files(root)
    if not candidates:  # outside git, or a folder the enclosing repository ignores
        candidates = _walk(root, selection)
    for relative in sorted(candidates):
        parts = relative.split("/")
        if language_for_path(parts[-1]) is None:
            continue
        if any(part in DEFAULT_EXCLUDES for part in parts[:-1]):
            selection.skip("excluded folder")
            continue
        if settings.include and not any(fnmatch.fnmatch(relative, glob) for glob in settings.include):
            continue
        if any(fnmatch.fnmatch(relative, glob) for glob in settings.exclude):
            selection.skip("excluded by settings")
            continue
        if relative.endswith(GENERATED_SUFFIXES):
            selection.skip("generated")
            continue
        full = root / relative
        if full.is_symlink():
            selection.skip("symbolic link")
            continue
        try:
            size = full.stat().st_size
        except OSError:
            selection.skip("unreadable")
            continue
        if size > max_bytes:
            selection.skip(size_limit_reason(max_bytes))
            continue
        selection.files.append(relative)
    return selection


def _git_files(root: Path) -> list[str] | None:
    top = repository_root(root)
    if top is None:
        return None
    result = subprocess.run(["git", "ls-files", "-z", "--cached", "--others", "--exclude-standard"],
                            cwd=root, capture_output=True, timeout=120)
    if result.returncode != 0:
        return None
    return [p for p in result.stdout.decode("utf-8", "surrogateescape").split("\0") if p]


def _walk(root: Path, selection: Selection) -> list[str]:
    found = []
    seen_dirs: set[tuple[int, int]] = set()
    for directory, subdirs, files in os.walk(root, followlinks=False, onerror=lambda e: selection.skip("unreadable")):
        try:
            info = os.stat(directory)
        except OSError:
            continue
        if (info.st_dev, info.st_ino) in seen_dirs:
            subdirs[:] = []
            continue
        seen_dirs.add((info.st_dev, info.st_ino))
        subdirs[:] = sorted(d for d in subdirs if d not in DEFAULT_EXCLUDES and not d.startswith("."))
        relative_dir = os.path.relpath(directory, root)
        for name in files:
            relative = name if relative_dir == "." else f"{relative_dir}/{name}".replace(os.sep, "/")
            found.append(relative)
    return found


@dataclass
class SourceFile:
    """One lexed file: tokens, variables and its count of non-blank lines."""

    path: str
    language: str
    digest: str
    lines: int
    tokens: list[Token]
    variables: list[Variable]
    facts: dict = field(default_factory=dict)  # classes, imports and the like, as the language module reads them


class SkipFile(Exception):
    """A file that is not learned from; the message is the reason."""


def read_source(path: Path) -> str:
    """A file's text; raises SkipFile for binary, non-UTF-8, minified or unreadable files."""
    try:
        data = path.read_bytes()
    except OSError:
        raise SkipFile("unreadable") from None
    return decode_source(data)


def decode_source(data: bytes) -> str:
    """Text from bytes, refusing what is not hand-written source."""
    if b"\0" in data:
        raise SkipFile("binary")
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError:
        raise SkipFile("not UTF-8") from None
    if any(len(line) > MAX_LINE_CHARS for line in text.splitlines()):
        raise SkipFile("minified or generated")
    return text


def analyse(text: str, path: str, language: str, digest: str = "", pieces: PieceCache | None = None) -> SourceFile:
    """Lex a file and find its variables.

    Python is read whole when it compiles and no `pieces` are kept; otherwise one top-level
    statement at a time (the same result, see `chunks`), reusing the pieces an editor's
    earlier readings left, and confining a syntax error to the statement that holds it.
    """
    with _no_collection():
        return _analyse(text, path, language, digest, pieces)


def _analyse(text: str, path: str, language: str, digest: str, pieces: PieceCache | None) -> SourceFile:
    tokens = variables = None
    facts: dict = {}
    if language != "python":
        tokens = lex(text, language)
        variables, facts = get_language(language).read(text, tokens)
    elif pieces is None:
        tokens = lex(text, language)
        try:
            variables, facts = python_variables(text, tokens)
        except (SyntaxError, ValueError, RecursionError, MemoryError):
            variables = None
    if variables is None:
        tokens, variables, facts = read_python(text, pieces)
    variables = sorted((v for v in variables if v.occurrences), key=lambda v: v.occurrences[0])
    kept = kept_lines(text)
    if kept:
        facts = dict(facts, kept_lines=kept)
    lines = sum(1 for line in text.splitlines() if line.strip())
    return SourceFile(path, language, digest, lines, tokens, variables, facts)


def _to_record(source: SourceFile) -> dict:
    # Variables of one scope share their bound names, and every scope shares the module's:
    # store each distinct set once, less what all of them have in common.
    sets: dict[frozenset[str], int] = {}
    for v in source.variables:
        sets.setdefault(v.bound_names, len(sets))
    common = frozenset.intersection(*sets) if sets else frozenset()
    return {
        "format": CACHE_FORMAT,
        "language": source.language,
        "lines": source.lines,
        "text": [t.text for t in source.tokens],
        "kind": "".join(_LETTER_BY_KIND[t.kind] for t in source.tokens),
        "line": [t.line for t in source.tokens],
        "column": [t.column for t in source.tokens],
        "bound_common": sorted(common),
        "bound_sets": [sorted(names - common) for names in sets],
        "variables": [[v.name, v.kind, v.occurrences, v.scope_start, v.scope_end, v.function,
                       v.public_parameter, sets[v.bound_names], v.scope_kind, v.shorthand, v.dictated, v.owner,
                       v.cues] for v in source.variables],
        "facts": source.facts,
    }


_LETTER_BY_KIND = {"keyword": "k", "operator": "o", "name": "n", "string": "s", "number": "d", "comment": "c"}
_KIND_BY_LETTER = {letter: kind for kind, letter in _LETTER_BY_KIND.items()}


def _from_record(record: dict, path: str, digest: str) -> SourceFile:
    # Built without a Python-level loop (tuple.__new__ is what Token._make calls): a million
    # tokens come through here on every training run.
    kinds = map(_KIND_BY_LETTER.__getitem__, record["kind"])
    tokens = list(map(tuple.__new__, repeat(Token), zip(record["text"], kinds, record["line"], record["column"])))
    if not (len(tokens) == len(record["kind"]) == len(record["line"]) == len(record["column"])):
        raise ValueError("token lists disagree in length")
    common = frozenset(record["bound_common"])
    sets = [common.union(names) for names in record["bound_sets"]]
    variables = [Variable(name, kind, occurrences, start, end, function, public, sets[bound], scope_kind,
                          tuple(shorthand), dictated, owner, tuple(cues))
                 for name, kind, occurrences, start, end, function, public, bound, scope_kind, shorthand, dictated,
                 owner, cues in record["variables"]]
    return SourceFile(path, record["language"], digest, record["lines"], tokens, variables, record["facts"])


class TokenCache:
    """Lexed files kept on disk by content hash, so a re-run lexes only what changed."""

    def __init__(self, directory: Path | None):
        self.directory = directory

    def _path(self, digest: str) -> Path:
        return self.directory / digest[:2] / f"{digest}.json"

    def get(self, digest: str, path: str) -> SourceFile | None:
        if self.directory is None:
            return None
        try:
            record = json.loads(self._path(digest).read_text(encoding="utf-8"))
        except (OSError, ValueError):
            return None
        if record.get("format") != CACHE_FORMAT:
            return None
        try:
            return _from_record(record, path, digest)
        except (KeyError, TypeError, ValueError):
            return None

    def put_record(self, digest: str, record: dict) -> None:
        if self.directory is None:
            return
        target = self._path(digest)
        try:
            target.parent.mkdir(parents=True, exist_ok=True)
            temporary = target.with_suffix(f".{os.getpid()}.tmp")
            temporary.write_text(json.dumps(record, separators=(",", ":")), encoding="utf-8")
            os.replace(temporary, target)
        except OSError:
            pass  # a cache that cannot be written only costs time


def _lex_job(job: tuple[str, str, str, str | None]) -> tuple[str, dict | str]:
    with _no_collection():
        return _lex_file(job)


@contextlib.contextmanager
def _no_collection():
    """Lexing allocates millions of small acyclic objects; without this, Python's garbage
    collector walks all of them again and again (it took half the time of loading a corpus)."""
    was_enabled = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if was_enabled:
            gc.enable()


def _lex_file(job: tuple[str, str, str, str | None]) -> tuple[str, dict | str]:
    root, relative, language, cache_directory = job
    try:
        data = (Path(root) / relative).read_bytes()
    except OSError:
        return relative, "unreadable"
    digest = hashlib.sha256(data).hexdigest()
    try:
        text = decode_source(data)
    except SkipFile as skip:
        return relative, str(skip)
    source = analyse(text, relative, language, digest)
    record = _to_record(source)
    TokenCache(Path(cache_directory) if cache_directory else None).put_record(digest, record)
    return relative, record | {"digest": digest}


@dataclass
class Corpus:
    """The lexed files of a repository and the counts for the training summary."""

    files: list[SourceFile]
    skipped: dict[str, int]
    cached: int = 0
    lexed: int = 0

    @property
    def tokens(self) -> int:
        return sum(len(f.tokens) for f in self.files)

    @property
    def lines(self) -> int:
        return sum(f.lines for f in self.files)


def load_corpus(selection: Selection, cache: TokenCache, workers: int | None = None,
                progress=None) -> Corpus:
    """Lex the selected files in parallel processes, reusing the cache for unchanged content."""
    with _no_collection():
        return _load_corpus(selection, cache, workers, progress)


def _load_corpus(selection: Selection, cache: TokenCache, workers: int | None, progress) -> Corpus:
    corpus = Corpus([], dict(selection.skipped))
    pending: list[tuple[str, str, str]] = []
    by_path: dict[str, SourceFile] = {}
    for relative in selection.files:
        language = language_for_path(relative.rsplit("/", 1)[-1])
        full = selection.root / relative
        try:
            data = full.read_bytes()
        except OSError:
            corpus.skipped["unreadable"] = corpus.skipped.get("unreadable", 0) + 1
            continue
        digest = hashlib.sha256(data).hexdigest()
        cached = cache.get(digest, relative)
        if cached is not None:
            by_path[relative] = cached
            corpus.cached += 1
        else:
            pending.append((str(selection.root), relative, language,
                            str(cache.directory) if cache.directory else None))
    workers = workers or os.cpu_count() or 1
    done = 0

    def accept(relative: str, result) -> None:
        nonlocal done
        done += 1
        if isinstance(result, str):
            corpus.skipped[result] = corpus.skipped.get(result, 0) + 1
        else:
            by_path[relative] = _from_record(result, relative, result["digest"])
            corpus.lexed += 1
        if progress:
            progress(done, len(pending))

    if len(pending) > 8 and workers > 1:
        with ProcessPoolExecutor(max_workers=workers, initializer=ignore_interrupts) as pool:
            try:
                with interrupts_deferred():  # every worker process is forked here, as the jobs are handed out
                    results = pool.map(_lex_job, pending, chunksize=8)
                for relative, result in results:
                    accept(relative, result)
            except BaseException:
                pool.shutdown(cancel_futures=True)  # the files not yet begun are dropped
                raise
    else:
        for job in pending:
            accept(*_lex_file(job))
    corpus.files = [by_path[p] for p in selection.files if p in by_path]
    return corpus
