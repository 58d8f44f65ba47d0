"""The command line as people and other programs use it."""

import json
import re

from .conftest import run_cli


def test_train_summary_and_check_json(patched_demo):
    result = run_cli("check", "--format", "json", "fernhill/valves.py", "fernhill/readings.py", cwd=patched_demo)
    assert result.returncode == 0, result.stderr
    findings = json.loads(result.stdout)["findings"]
    assert {"path", "line", "column", "end_line", "end_column", "name", "score", "threshold",
            "suggestions"} <= set(findings[0])
    odd = [f for f in findings if f["name"] == "zone"]
    assert odd, "the valve the prepared change calls `zone` is flagged"
    assert odd[0]["path"] == "fernhill/valves.py" and odd[0]["suggestions"][0]["name"] == "valve"
    assert (odd[0]["line"], odd[0]["column"], odd[0]["end_line"], odd[0]["end_column"]) == (123, 9, 123, 13)
    assert odd[0]["score"] > odd[0]["threshold"]
    evidence = odd[0]["suggestions"][0]["evidence"]
    assert evidence and all({"path", "line"} == set(e) for e in evidence)
    for place in evidence:  # each place is a line of the team's code that names a variable `valve`
        line = (patched_demo / place["path"]).read_text().splitlines()[place["line"] - 1]
        assert re.search(r"\bvalve\b", line), place


def test_check_text_reads_like_a_compiler_message(patched_demo):
    result = run_cli("check", "fernhill/valves.py", cwd=patched_demo)
    assert result.returncode == 0
    assert "fernhill/valves.py:123:9: `zone` does not fit how it is used here; the team would call it `valve`" \
        in result.stdout
    assert result.stdout.splitlines()[-1] == "1 oddly named variable in 1 file"


def test_check_a_folder_checks_every_source_file_under_it(patched_demo):
    one = run_cli("check", "fernhill/valves.py", cwd=patched_demo)
    folder = run_cli("check", "fernhill", cwd=patched_demo)
    assert folder.returncode == 0, folder.stderr
    python_files = sorted(str(p.relative_to(patched_demo)) for p in (patched_demo / "fernhill").rglob("*.py"))
    assert f"in {len(python_files)} files" in folder.stdout.splitlines()[-1]
    # What a file shows on its own, it shows within its folder.
    flagged = [line for line in one.stdout.splitlines() if line.startswith("fernhill/valves.py:")]
    assert flagged and all(line in folder.stdout for line in flagged)
    missing = run_cli("check", "no/such/folder", cwd=patched_demo)
    assert missing.returncode == 2 and "no such file or folder" in missing.stderr


def test_suggest_many_positions(patched_demo):
    result = run_cli("suggest", "--format", "json", "fernhill/valves.py:123:10", "fernhill/valves.py:1:1",
                     cwd=patched_demo)
    assert result.returncode == 0, result.stderr
    first, second = json.loads(result.stdout)["results"]
    assert first["name"] == "zone" and first["suggestions"][0]["name"] == "valve"
    assert second["suggestions"] == [] and "no local variable" in second["reason"]


def test_unsupported_file_gets_a_note(demo_copy):
    text = run_cli("check", "README.md", cwd=demo_copy)
    assert text.returncode == 0 and "note: README.md: not a supported language" in text.stdout
    as_json = run_cli("check", "--format", "json", "README.md", cwd=demo_copy)
    assert json.loads(as_json.stdout) == {"findings": []}


def test_missing_model(tmp_path):
    source = tmp_path / "a.py"
    source.write_text("x = 1\n")
    result = run_cli("--model-dir", str(tmp_path / "none"), "check", str(source))
    assert result.returncode == 2
    assert result.stderr.strip() == f"cognomen: no model found in {tmp_path / 'none'}; run cognomen train"


def test_nothing_to_learn(tmp_path):
    result = run_cli("train", str(tmp_path))
    assert result.returncode == 2
    assert f"nothing to learn from: 0 source files under {tmp_path}" in result.stderr
    assert "Traceback" not in result.stderr


def test_a_malformed_settings_file_is_one_line_for_every_command_that_reads_it(tmp_path):
    (tmp_path / "a.py").write_text("def f(value):\n    return value\n")
    (tmp_path / "cognomen.toml").write_text("include = [\n")
    for command in ("train", "eval", "vocab"):
        result = run_cli(command, str(tmp_path), cwd=tmp_path)
        assert result.returncode == 2 and "Traceback" not in result.stderr, command
        assert "cognomen.toml: not valid TOML" in result.stderr, command


def test_bad_input_never_tracebacks(demo_copy, tmp_path):
    cases = [
        ("check", "no/such/file.py"),
        ("suggest", "fernhill/alerts.py:x:1"),
        ("suggest", "fernhill/alerts.py"),
        ("train", "no/such/dir"),
        ("models", "promote", "nope"),
        ("models", "use", "nope"),
        ("models", "frobnicate"),
        ("frobnicate",),
    ]
    for args in cases:
        result = run_cli(*args, cwd=demo_copy)
        assert result.returncode == 2, args
        assert "Traceback" not in result.stderr, args
    binary = tmp_path / "b.py"
    binary.write_bytes(b"\0\1\2")
    result = run_cli("check", str(binary), cwd=demo_copy)
    assert result.returncode == 2 and "binary" in result.stderr


def test_models_lists_the_current_model(demo_copy):
    result = run_cli("models", "--format", "json", cwd=demo_copy)
    listing = json.loads(result.stdout)
    assert listing["current"] == listing["models"][0]["model_id"]


def test_model_dir_before_or_after_any_subcommand(patched_demo, tmp_path):
    from cognomen.server.cli import build_parser

    parser = build_parser()
    subcommands = parser._subparsers._group_actions[0].choices
    minimal = {"suggest": ["a.py:1:1"], "check": ["a.py"]}
    for name in subcommands:
        words = [name, *minimal.get(name, [])]
        assert parser.parse_args([*words, "--model-dir", "after"]).model_dir == "after", name
        assert parser.parse_args(["--model-dir", "before", *words]).model_dir == "before", name
        assert parser.parse_args(words).model_dir is None, name
    store = patched_demo / ".cognomen"
    valves = patched_demo / "fernhill/valves.py"
    checked = run_cli("check", str(valves), "--model-dir", str(store), cwd=tmp_path)
    assert checked.returncode == 0 and checked.stdout.endswith(" in 1 file\n"), checked.stderr
    # The model in that store, not just any: it names the prepared change's `zone` a `valve`.
    suggested = run_cli("suggest", "--format", "json", f"{valves}:123:9", "--model-dir", str(store), cwd=tmp_path)
    assert suggested.returncode == 0, suggested.stderr
    [result] = json.loads(suggested.stdout)["results"]
    assert result["name"] == "zone" and result["suggestions"][0]["name"] == "valve"
    listed = run_cli("models", "--model-dir", str(store), "--format", "json", cwd=tmp_path)
    assert listed.returncode == 0, listed.stderr
    assert json.loads(listed.stdout)["current"]
    missing = run_cli("models", "--model-dir", str(tmp_path / "none"), cwd=tmp_path)
    assert missing.returncode == 2 and "no model found" in missing.stderr


def test_models_promote_and_its_former_name_kept_out_of_help(demo_copy):
    current = json.loads(run_cli("models", "--format", "json", cwd=demo_copy, check=True).stdout)["current"]
    for action in ("promote", "use"):
        result = run_cli("models", action, current, cwd=demo_copy)
        assert result.returncode == 0 and result.stdout.strip() == f"current model is now {current}", action
    shown = run_cli("--help").stdout + run_cli("models", "--help").stdout + run_cli("train", "--help").stdout
    assert "models promote ID" in shown and "promotion check" in shown
    assert not re.search(r"\buse\b", shown) and "gate" not in shown


OLD_SPELLINGS = re.compile(r"recovery|recall|@|kloc|\bthr\b|calibration_lines", re.IGNORECASE)


def test_each_measure_has_one_name_in_every_output(demo_copy, tmp_path):
    from cognomen.model.measures import NAMES, PUBLIC_KEYS

    store = tmp_path / "store"
    trained = run_cli("--model-dir", str(store), "train", "--quiet", str(demo_copy), check=True)
    held_out = next(line for line in trained.stdout.splitlines() if line.strip().startswith("held out"))
    assert "found in top 5" in held_out and "found first" in held_out
    listed = run_cli("--model-dir", str(store), "models", check=True).stdout
    assert "found in top 5" in listed and "misnames flagged" in listed
    manifest = json.loads(run_cli("--model-dir", str(store), "models", "--format", "json", check=True).stdout)
    quality_keys = set(manifest["models"][0]["quality"])
    assert quality_keys and quality_keys <= set(PUBLIC_KEYS.values())
    evaluated = run_cli("--model-dir", str(store), "eval", str(demo_copy), check=True).stdout
    assert all(name in evaluated for name in ("found first", "found in top 5", "detection AUC", "misnames flagged"))
    figures = json.loads(run_cli("--model-dir", str(store), "eval", "--format", "json", str(demo_copy),
                                 check=True).stdout)
    assert set(figures["scorers"]["model"]) <= set(PUBLIC_KEYS.values())
    for text in (trained.stdout, listed, evaluated, json.dumps(manifest), json.dumps(figures)):
        assert not OLD_SPELLINGS.search(text), OLD_SPELLINGS.search(text).group(0)
    assert len(set(NAMES.values())) == len(NAMES), "no two measures share a name"


def test_check_a_folder_skips_what_training_skips_and_counts_it(patched_workspace):
    workspace = patched_workspace
    before = run_cli("check", "--format", "json", "fernhill", cwd=workspace)
    assert before.returncode == 0, before.stderr
    (workspace / "fernhill" / "blob.py").write_bytes(b"\0\1\2binary")
    (workspace / "fernhill" / "packed.py").write_text("DATA = [" + "1, " * 11_000 + "]\n")  # one 33 KB line
    (workspace / "fernhill" / "widget_pb2.py").write_text("def f(value):\n    return value\n")
    result = run_cli("check", "fernhill", cwd=workspace)
    assert result.returncode == 0, result.stderr
    assert "note: skipped 3 files: 1 binary, 1 generated, 1 minified or generated" in result.stdout
    as_json = run_cli("check", "--format", "json", "fernhill", cwd=workspace)
    report = json.loads(as_json.stdout)
    assert report["skipped"] == {"binary": 1, "generated": 1, "minified or generated": 1}
    # The skipped files change nothing else: the folder's findings are those it had before they came.
    assert report["findings"] == json.loads(before.stdout)["findings"]
    for finding in report["findings"]:
        assert f"{finding['path']}:{finding['line']}:{finding['column']}: `{finding['name']}`" in result.stdout
    (workspace / "stray.py").write_bytes(b"\x89PNG\r\n\x1a\n\0\0")
    everything = run_cli("check", ".", cwd=workspace)
    assert everything.returncode == 0 and "2 binary" in everything.stdout, everything.stderr
    named = run_cli("check", "fernhill/blob.py", cwd=workspace)
    assert named.returncode == 2 and "fernhill/blob.py: cannot read (binary)" in named.stderr


def test_check_applies_the_training_size_limit_and_shows_progress(workspace):
    from cognomen.model.corpus import MAX_FILE_BYTES

    huge = workspace / "fernhill" / "huge.py"
    body = "".join(f"def step_{i}(value):\n    total = value + {i}\n    return total\n\n" for i in range(20_000))
    huge.write_text(body)
    assert huge.stat().st_size > MAX_FILE_BYTES
    folder = run_cli("check", "fernhill", cwd=workspace)
    assert folder.returncode == 0 and "note: skipped 1 file: 1 over 1 MiB" in folder.stdout
    named = run_cli("check", "fernhill/huge.py", cwd=workspace)
    assert named.returncode == 0
    assert "fernhill/huge.py: over 1 MiB; skipped (--max-file-size raises the limit)" in named.stdout
    assert named.stdout.splitlines()[-1] == "0 oddly named variables in 0 files"
    raised = run_cli("check", "--format", "json", "--max-file-size", "2M", "fernhill/huge.py", cwd=workspace)
    assert raised.returncode == 0, raised.stderr
    assert "findings" in json.loads(raised.stdout), "stdout holds only the JSON"
    assert "checking 1/1: fernhill/huge.py (1," in raised.stderr
    quiet = run_cli("check", "--quiet", "--max-file-size", "2M", "fernhill/huge.py", cwd=workspace)
    assert quiet.returncode == 0 and quiet.stderr == ""
    bad = run_cli("check", "--max-file-size", "lots", "fernhill/huge.py", cwd=workspace)
    assert bad.returncode == 2 and "'lots' is not a size" in bad.stderr


def test_suggest_a_position_outside_the_file_is_a_usage_error(demo_copy):
    lines = (demo_copy / "fernhill/alerts.py").read_text().splitlines()  # Python's own idea of lines
    past_file = run_cli("suggest", "fernhill/alerts.py:9999:1", cwd=demo_copy)
    assert past_file.returncode == 2 and past_file.stdout == ""
    assert past_file.stderr == (f"cognomen: fernhill/alerts.py:9999:1: line 9999 is past the end of the file "
                                f"({len(lines)} lines)\n")
    past_line = run_cli("suggest", "fernhill/alerts.py:27:500", cwd=demo_copy)
    assert past_line.returncode == 2
    assert past_line.stderr == (f"cognomen: fernhill/alerts.py:27:500: column 500 is past the end of line 27 "
                                f"({len(lines[26])} characters)\n")
    end_of_line = run_cli("suggest", f"fernhill/alerts.py:27:{len(lines[26]) + 1}",
                          f"fernhill/alerts.py:{len(lines)}:1", cwd=demo_copy)
    assert end_of_line.returncode == 0, end_of_line.stderr


def test_a_team_can_ask_for_flags_on_any_odd_name(workspace, tmp_path):
    """By default only names a collection's naming contradicts are flagged; `--flag-any-odd-name` flags
    by oddness alone, and the summary and the model say which."""
    store = tmp_path / "any"
    result = run_cli("--model-dir", str(store), "train", "--flag-any-odd-name", cwd=workspace)
    assert result.returncode == 0, result.stderr
    assert "python     flags names above" in result.stdout and "contradicts" not in result.stdout
    manifest = json.loads(next((store / "models").glob("*/manifest.json")).read_text())
    assert manifest["settings"]["flag_contradictions_only"] is False
    default = json.loads(next((workspace / ".cognomen" / "models").glob("*/manifest.json")).read_text())
    assert default["settings"]["flag_contradictions_only"] is True


def test_a_small_python_repository_learns_from_the_standard_library_unless_told_not_to(tmp_path):
    repo = tmp_path / "repo"
    repo.mkdir()
    (repo / "meter.py").write_text("def read_meter(port):\n    reading = port.read()\n    return reading\n")
    store = tmp_path / "store"
    result = run_cli("--model-dir", str(store), "train", "--quiet", str(repo))
    assert result.returncode == 0, result.stderr
    said = next(line for line in result.stdout.splitlines() if line.strip().startswith("background"))
    assert "the standard library" in said and "3 lines of Python" in said and "--no-background" in said
    assert json.loads(run_cli("--model-dir", str(store), "models", "--format", "json",
                              check=True).stdout)["models"][0]["background"] == ["stdlib"]
    alone = run_cli("--model-dir", str(tmp_path / "alone"), "train", "--quiet", "--no-background", str(repo))
    assert alone.returncode == 0, alone.stderr
    assert "background" not in alone.stdout
    both = run_cli("train", "--no-background", "--background", "stdlib", str(repo))
    assert both.returncode == 2 and "not allowed with" in both.stderr


def test_a_repository_without_python_gets_no_background(tmp_path):
    repo = tmp_path / "repo"
    repo.mkdir()
    (repo / "meter.ts").write_text("export function readMeter(port: Port) {\n  const reading = port.read();\n"
                                   "  return reading;\n}\n")
    store = tmp_path / "store"
    result = run_cli("--model-dir", str(store), "train", "--quiet", str(repo))
    assert result.returncode == 0, result.stderr
    assert "background" not in result.stdout
    assert json.loads(run_cli("--model-dir", str(store), "models", "--format", "json",
                              check=True).stdout)["models"][0]["background"] == []
