# `make demo` and `make test` work on a fresh clone: they create .venv when it is missing.
PYTHON ?= python3
VENV ?= .venv
PY := $(VENV)/bin/python

.PHONY: demo test bench install clean

$(VENV)/.installed: pyproject.toml
	test -x $(PY) || $(PYTHON) -m venv $(VENV)
	$(PY) -m pip install --quiet --disable-pip-version-check -e '.[test]'
	touch $@

install: $(VENV)/.installed

demo: $(VENV)/.installed
	$(PY) demo_workspace/run_demo.py

test: $(VENV)/.installed
	$(PY) -m pytest -q

bench: $(VENV)/.installed
	$(PY) tests/bench/train.py
	$(PY) tests/bench/quality.py
	$(PY) tests/bench/server.py
	$(PY) tests/bench/review.py

clean:
	rm -rf $(VENV) .pytest_cache demo_workspace/.cognomen
