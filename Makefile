# Set-up and everyday tasks. Only python3 and make are needed on a fresh machine.
PYTHON ?= python3
VENV := .venv
BIN := $(VENV)/bin
STAMP_RUN := $(VENV)/.installed-run
STAMP_TEST := $(VENV)/.installed-test

.PHONY: demo test install install-test bench clean

$(BIN)/python:
	$(PYTHON) -m venv $(VENV)
	$(BIN)/python -m pip install --quiet --upgrade pip

$(STAMP_RUN): pyproject.toml | $(BIN)/python
	$(BIN)/python -m pip install --quiet -e .
	touch $@

$(STAMP_TEST): pyproject.toml | $(BIN)/python
	$(BIN)/python -m pip install --quiet -e ".[test]"
	touch $@ $(STAMP_RUN)

install: $(STAMP_RUN)
install-test: $(STAMP_TEST)

demo: $(STAMP_RUN)
	$(BIN)/fitkin demo --out demo-output --force

test: $(STAMP_TEST)
	$(BIN)/python -m pytest

bench: $(STAMP_RUN)
	@for f in benchmarks/bench_*.py; do echo "== $$f"; $(BIN)/python $$f || exit 1; done

clean:
	rm -rf $(VENV) demo-output build *.egg-info
