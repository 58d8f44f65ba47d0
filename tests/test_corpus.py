"""File discovery, bad input, and the incremental token cache."""

import os
import subprocess

from cognomen.model.corpus import Settings, TokenCache, discover, load_corpus, read_settings


def write(path, text="", data=None):
    path.parent.mkdir(parents=True, exist_ok=True)
    if data is not None:
        path.write_bytes(data)
    else:
        path.write_text(text)


def test_walk_skips_what_is_not_hand_written_source(tmp_path):
    write(tmp_path / "app.py", "def f(value):\n    return value\n")
    write(tmp_path / "web.ts", "const total = 1;\n")
    write(tmp_path / "node_modules/lib/index.js", "var a = 1;\n")
    write(tmp_path / "build/out.py", "x = 1\n")
    write(tmp_path / "bundle.min.js", "var a=1;\n")
    write(tmp_path / "notes.md", "# notes\n")
    write(tmp_path / "big.py", "x = 1\n" * 200_000)  # over 1 MiB
    write(tmp_path / "blob.py", data=b"x = 1\0\0\0")
    write(tmp_path / "latin.py", data="nom = 'café'\n".encode("latin-1"))
    write(tmp_path / "minified.js", "var a=1;" * 300)
    os.symlink(tmp_path, tmp_path / "loop")  # a symlink loop must not hang the walk
    selection = discover(tmp_path)
    assert sorted(selection.files) == ["app.py", "blob.py", "latin.py", "minified.js", "web.ts"]
    assert selection.skipped["over 1 MiB"] == 1
    assert selection.skipped["generated"] == 1
    corpus = load_corpus(selection, TokenCache(None), workers=1)
    assert sorted(f.path for f in corpus.files) == ["app.py", "web.ts"]
    assert corpus.skipped["binary"] == 1
    assert corpus.skipped["not UTF-8"] == 1
    assert corpus.skipped["minified or generated"] == 1


def test_git_repository_lists_tracked_files_and_respects_settings(tmp_path):
    write(tmp_path / "src/keep.py", "a = 1\n")
    write(tmp_path / "src/ignored.py", "b = 1\n")
    write(tmp_path / "scripts/tool.py", "c = 1\n")
    write(tmp_path / ".gitignore", "src/ignored.py\n")
    write(tmp_path / "cognomen.toml", 'exclude = ["scripts/*"]\n')
    subprocess.run(["git", "init", "-q"], cwd=tmp_path, check=True)
    selection = discover(tmp_path, read_settings(tmp_path))
    assert selection.files == ["src/keep.py"]


def test_settings_from_pyproject(tmp_path):
    write(tmp_path / "pyproject.toml", '[tool.cognomen]\ninclude = ["lib/*"]\n')
    write(tmp_path / "lib/a.py", "a = 1\n")
    write(tmp_path / "other/b.py", "b = 1\n")
    assert discover(tmp_path, read_settings(tmp_path)).files == ["lib/a.py"]


def test_bad_settings_are_reported(tmp_path):
    write(tmp_path / "cognomen.toml", "exclude = [1, 2]\n")
    try:
        read_settings(tmp_path)
    except ValueError as error:
        assert "exclude must be a list of strings" in str(error)
    else:
        raise AssertionError("a malformed setting was accepted")


def test_cache_relexes_only_changed_files(tmp_path):
    for index in range(12):
        write(tmp_path / f"m{index}.py", f"def f{index}(value):\n    total = value + {index}\n    return total\n")
    cache = TokenCache(tmp_path / ".cache")
    first = load_corpus(discover(tmp_path, Settings()), cache)
    assert (first.lexed, first.cached) == (12, 0)
    write(tmp_path / "m3.py", "def changed(value):\n    return value\n")
    second = load_corpus(discover(tmp_path, Settings()), cache)
    assert (second.lexed, second.cached) == (1, 11)
    changed = next(f for f in second.files if f.path == "m3.py")
    assert [v.name for v in changed.variables] == ["value"]
    unchanged = next(f for f in second.files if f.path == "m5.py")
    assert [v.name for v in unchanged.variables] == ["value", "total"]
