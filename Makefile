# One-command set-up: every target creates .venv when missing and installs what it needs.
PYTHON ?= python3
VENV   := .venv
BIN    := $(VENV)/bin
STAMP  := $(VENV)/.installed
TSTAMP := $(VENV)/.installed-test

.PHONY: demo test lab bench clean

$(BIN)/python:
	$(PYTHON) -m venv $(VENV)
	$(BIN)/python -m pip install --quiet --upgrade pip

$(STAMP): pyproject.toml | $(BIN)/python
	$(BIN)/python -m pip install --quiet -e .
	touch $@

$(TSTAMP): pyproject.toml | $(BIN)/python
	$(BIN)/python -m pip install --quiet -e '.[test]'
	touch $(STAMP) $@

demo: $(STAMP)  ## rate the demo unit and write one comparison report per exchanger
	$(BIN)/revamp demo

test: $(TSTAMP)  ## unit tests, doctests, notebooks
	$(BIN)/python -m pytest

lab: $(STAMP)  ## JupyterLab on the notebooks
	$(BIN)/jupyter lab notebooks/

bench: $(STAMP)  ## benchmarks (figures printed, nothing asserted)
	$(BIN)/python benchmarks/run_all.py

clean:
	rm -rf $(VENV) reports build *.egg-info .pytest_cache .hypothesis
