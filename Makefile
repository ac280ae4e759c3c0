# `make test` and `make demo` work on a fresh clone: they create .venv, install the pinned
# dependencies from the package registries, build the extension in release mode, then run.
# A second run reuses .venv and cargo's build cache.

VENV   := .venv
PY     := $(VENV)/bin/python
STAMP  := $(VENV)/.installed-$(shell sha1sum requirements-dev.txt | cut -c1-12)
export VIRTUAL_ENV := $(abspath $(VENV))

.PHONY: all build test test-rust test-python demo bench clean

all: test

$(STAMP): requirements-dev.txt
	test -x $(PY) || python3 -m venv $(VENV)
	$(PY) -m pip install --quiet --upgrade pip
	$(PY) -m pip install --quiet -r requirements-dev.txt
	rm -f $(VENV)/.installed-* && touch $@

build: $(STAMP)
	$(VENV)/bin/maturin develop --release --quiet

test-rust:
	cargo test --quiet -p fibrewise-core

test-python: build
	$(PY) -m pytest

test: test-rust test-python

demo: build
	$(VENV)/bin/fibrewise basis examples/toy_cipher_gf101.txt

bench: build
	$(PY) bench/run.py

clean:
	rm -rf $(VENV) target
