# One-command set-up: every target creates .venv when missing and installs what it needs.
PYTHON ?= python3
VENV   := .venv
BIN    := $(VENV)/bin
STAMP  := $(VENV)/.installed
TSTAMP := $(VENV)/.installed-test

LAB    ?= lab
# JupyterLab refuses to run as root unless told; containers often run as root
ROOTOK := $(shell [ "$$(id -u)" = 0 ] && echo --allow-root)

.PHONY: demo test lab lab-reset bench clean

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

lab: $(STAMP)  ## JupyterLab on a working copy of the notebooks in ./lab (the committed ones stay clean)
	@mkdir -p $(LAB)
	@for f in notebooks/*.ipynb; do \
	  if [ -e "$(LAB)/$${f##*/}" ]; then echo "keeping your working copy $(LAB)/$${f##*/} (make lab-reset to start over)"; \
	  else cp "$$f" "$(LAB)/"; fi; done
	$(BIN)/jupyter lab $(ROOTOK) --notebook-dir=$(LAB)

lab-reset:  ## drop the working copies of the notebooks (./lab); the next `make lab` copies them afresh
	rm -rf $(LAB)

bench: $(STAMP)  ## benchmarks (figures printed, nothing asserted)
	$(BIN)/python benchmarks/run_all.py

clean:
	rm -rf $(VENV) reports build *.egg-info .pytest_cache .hypothesis
