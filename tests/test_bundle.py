"""The model store: round trip, verification, secrets, crash safety."""

import json
import os
import signal
import subprocess
import sys
import time

import numpy as np
import pytest

from cognomen.model import bundle
from cognomen.model.bundle import ModelError
from cognomen.model.measures import PUBLIC_KEYS
from cognomen.model.corpus import TokenCache, discover, load_corpus
from cognomen.model.persistence import load_scorer, save
from cognomen.model.training import TrainSettings, train

from .conftest import DEMO, ctrl_c_as_in_a_terminal, run_cli


@pytest.fixture(scope="module")
def small_store(tmp_path_factory):
    store = tmp_path_factory.mktemp("store")
    corpus = load_corpus(discover(DEMO), TokenCache(None))
    directory = save(store, train(corpus, TrainSettings(epochs=2)), {"source_commit": None})
    bundle.promote(store, directory.name)
    return store


def test_round_trip(small_store):
    scorer, loaded = load_scorer(small_store)
    manifest = loaded.manifest
    assert manifest["format_version"] == bundle.FORMAT_VERSION
    for name, digest in manifest["files"].items():
        assert len(digest) == 64
    vectors = np.load(loaded.directory / "input_vectors.npy", allow_pickle=False)
    assert vectors.shape == (len(scorer.tables.vocabulary), manifest["arrays"]["input_vectors.npy"]["shape"][1])
    assert vectors.dtype == np.float32


def test_tampered_file_is_refused(small_store, tmp_path):
    import shutil
    copy = tmp_path / "store"
    shutil.copytree(small_store, copy)
    model = copy / "models" / bundle.current_model_id(copy)
    vectors = np.load(model / "output_vectors.npy")
    vectors[0, 0] += 1.0
    np.save(model / "output_vectors.npy", vectors)
    with pytest.raises(ModelError, match="checksum"):
        load_scorer(copy)


def test_pickled_array_is_refused(small_store, tmp_path):
    import shutil
    copy = tmp_path / "store"
    shutil.copytree(small_store, copy)
    model = copy / "models" / bundle.current_model_id(copy)
    np.save(model / "name_counts.npy", np.array([{"evil": 1}], dtype=object), allow_pickle=True)
    manifest = json.loads((model / "manifest.json").read_text())
    manifest["files"]["name_counts.npy"] = bundle._sha256(model / "name_counts.npy")
    (model / "manifest.json").write_text(json.dumps(manifest))
    with pytest.raises(ModelError, match="not a plain array"):
        load_scorer(copy)


def test_missing_model_message(tmp_path):
    with pytest.raises(ModelError, match="no model found in .*; run cognomen train"):
        load_scorer(tmp_path / "nothing")


def test_secrets_never_reach_the_bundle(tmp_path):
    secret_string = "zq-planted-literal-7f3a9c"
    secret_key = "AKIAFAKE0PLANTED0KEY0"
    # Planted secrets in key positions, where a string key may name a value: they look like
    # identifiers, but they are not made of the team's words, so they never become cues.
    key_secrets = ("zq_SECRET_7f3a9c_value", "kq81Lz0ZZy7")
    repo = tmp_path / "repo"
    repo.mkdir()
    for index in range(6):
        (repo / f"m{index}.py").write_text(
            f"import os\n\n\ndef load(path, settings):\n    token = '{secret_string}'  # key {secret_key}\n"
            f"    data = open(path).read()\n    value = settings[\"{key_secrets[0]}\"]\n"
            f"    home = os.environ.get(\"{key_secrets[1]}\")\n    max_retries = settings[\"max_retries\"]\n"
            f"    return data + token + value + home + max_retries\n")
    store = tmp_path / "store"
    run_cli("--model-dir", str(store), "train", "--quiet", str(repo), check=True)
    planted = [secret_string, secret_key, *key_secrets]
    found = [p for p in store.rglob("*") if p.is_file() and "cache" not in p.parts
             and any(secret.encode() in p.read_bytes() for secret in planted)]
    assert found == []
    flow = next(store.rglob("flow.json")).read_text()
    assert "key:max_retries" in flow, "a key made of the team's own words does become a cue"
    cached = [p for p in store.rglob("*") if p.is_file() and secret_key.encode() in p.read_bytes()]
    assert cached == [], "comments never reach the cache either"


def test_killed_training_leaves_the_previous_model(tmp_path, stdlib_corpus):
    repo = tmp_path / "repo"
    repo.mkdir()
    for index in range(5):
        (repo / f"m{index}.py").write_text(f"def f(value):\n    total = value + {index}\n    return total\n")
    store = tmp_path / "store"
    run_cli("--model-dir", str(store), "train", "--quiet", "--no-background", str(repo), check=True)
    before = bundle.current_model_id(store)
    # A long retrain (the standard library as background), killed part-way through.
    process = subprocess.Popen([sys.executable, "-m", "cognomen", "--model-dir", str(store), "train", "--quiet",
                                "--background", "stdlib", "--epochs", "20", str(repo)],
                               stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, start_new_session=True)
    time.sleep(6)
    os.killpg(process.pid, signal.SIGKILL)
    process.wait()
    assert bundle.current_model_id(store) == before
    load_scorer(store)  # still loads and verifies
    complete = [p for p in (store / "models").iterdir() if not p.name.startswith(".")]
    assert [p.name for p in complete] == [before]


def test_interrupt_is_a_clean_stop(tmp_path):
    repo = tmp_path / "repo"
    repo.mkdir()
    (repo / "a.py").write_text("def f(value):\n    return value\n")
    store = tmp_path / "store"
    process = subprocess.Popen([sys.executable, "-m", "cognomen", "--model-dir", str(store), "train",
                                "--background", "stdlib", "--epochs", "20", str(repo)], start_new_session=True,
                               preexec_fn=ctrl_c_as_in_a_terminal, stdout=subprocess.PIPE, stderr=subprocess.PIPE,
                               text=True)
    time.sleep(5)
    os.killpg(process.pid, signal.SIGINT)  # as Ctrl-C in a terminal: to every process of the group
    out, err = process.communicate(timeout=120)
    assert process.returncode == 130
    assert "Traceback" not in err
    assert "current model is unchanged" in err
    assert bundle.current_model_id(store) is None
    with pytest.raises(ProcessLookupError):  # no worker process outlives the command
        os.killpg(process.pid, 0)


def test_a_model_of_an_older_format_is_refused_with_retrain(small_store, tmp_path):
    import shutil
    copy = tmp_path / "store"
    shutil.copytree(small_store, copy)
    model = copy / "models" / bundle.current_model_id(copy)
    manifest = json.loads((model / "manifest.json").read_text())
    assert set(manifest["quality"]) <= set(PUBLIC_KEYS.values()), "this format names measures as measures.py does"
    manifest["format_version"] = 3  # format 3 kept quality under working keys such as recovery_at_5
    (model / "manifest.json").write_text(json.dumps(manifest))
    with pytest.raises(ModelError, match=f"has format 3; this cognomen reads format {bundle.FORMAT_VERSION}: retrain"):
        load_scorer(copy)
