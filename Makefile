# `make test` and `make demo` work on a fresh clone: they create .venv, install the pinned
# dependencies from the package registries, build the extension in release mode, then run.
# A second run reuses .venv and cargo's build cache.

VENV   := .venv
PY     := $(VENV)/bin/python
STAMP  := $(VENV)/.installed-$(shell sha1sum requirements-dev.txt | cut -c1-12)
export VIRTUAL_ENV := $(abspath $(VENV))

.PHONY: all build wheel test test-rust test-python lint fuzz demo bench clean

all: test

$(STAMP): requirements-dev.txt
	test -x $(PY) || python3 -m venv $(VENV)
	$(PY) -m pip install --quiet --upgrade pip
	$(PY) -m pip install --quiet -r requirements-dev.txt
	rm -f $(VENV)/.installed-* && touch $@

build: $(STAMP)
	$(VENV)/bin/maturin develop --release --quiet

# One abi3 wheel (CPython 3.10 and later) in dist/: pip install dist/fibrewise-*.whl
wheel: $(STAMP)
	$(VENV)/bin/maturin build --release --quiet --interpreter $(PY) --out dist

# The core's unit tests only (--lib): the benchmark programs in rust/core/examples are built by
# `make bench`, and leaving them out here spares CI a second full build of the core.
test-rust:
	cargo test --quiet -p fibrewise-core --lib

test-python: build
	$(PY) -m pytest

test: test-rust test-python

# The gates, one target each so that `make -k lint` reports every one that fails. The two
# formatting checks pass only once the tree has been formatted (`cargo fmt --all`, `ruff format`).
LINTS := lint-rustfmt lint-clippy lint-ruff lint-ruff-format lint-mypy lint-stubtest
.PHONY: $(LINTS)
lint: $(LINTS)

lint-rustfmt:
	cargo fmt --all --check

lint-clippy:
	cargo clippy --quiet --workspace --all-targets -- -D warnings

lint-ruff: $(STAMP)
	$(VENV)/bin/ruff check --quiet

lint-ruff-format: $(STAMP)
	$(VENV)/bin/ruff format --check --quiet

lint-mypy: $(STAMP)
	$(VENV)/bin/mypy

# The stub python/fibrewise/_native.pyi against the built module.
lint-stubtest: build
	$(PY) -m mypy.stubtest fibrewise._native --allowlist stubtest-allowlist.txt

# The long fuzzing run, sized by time: rounds of the fuzz tests of the normal suite with many more
# examples and every single-field tamper of twenty certificates, each round with new seeds (the
# hypothesis seed and the projections' seed are the round number), until FIBREWISE_FUZZ_SECONDS
# (default 600) have passed; the first failing round stops it. A round took about 90 s at load 8.
# Run on main (ab92095, with the merges of the evening's session) on 2026-12-05 22:04-22:15 UTC,
# beside a fresh-clone CI run: 10 rounds clean in 600 s.
FIBREWISE_FUZZ_SECONDS ?= 600
fuzz: build
	@end=$$(( $$(date +%s) + $(FIBREWISE_FUZZ_SECONDS) )); round=0; \
	while [ $$(date +%s) -lt $$end ]; do \
		round=$$((round + 1)); echo "fuzz round $$round"; \
		FIBREWISE_FUZZ=1 FIBREWISE_FUZZ_ROUND=$$round $(PY) -m pytest tests/test_fuzz.py \
			-p no:cacheprovider -q --hypothesis-seed=$$round || exit 1; \
	done; \
	echo "make fuzz: $$round rounds clean in $(FIBREWISE_FUZZ_SECONDS) s or a little more"

DEMO_OUT := $(VENV)/demo-results.jsonl

demo: build
	@for f in examples/*.txt; do \
		echo "$$ fibrewise analyze $$f"; $(VENV)/bin/fibrewise analyze "$$f" || echo "(exit status $$?)"; echo; \
	done
	@echo "$$ fibrewise basis examples/toy_cipher_gf101.txt"; $(VENV)/bin/fibrewise basis examples/toy_cipher_gf101.txt; echo
	@echo "$$ fibrewise curve examples/curve_genus2_gf16.txt --up-to 4"; $(VENV)/bin/fibrewise curve examples/curve_genus2_gf16.txt --up-to 4; echo
	@rm -f $(DEMO_OUT)
	@echo "$$ fibrewise batch examples/batch.jsonl -o $(DEMO_OUT) --timeout 30"
	@$(VENV)/bin/fibrewise batch examples/batch.jsonl -o $(DEMO_OUT) --timeout 30
	@echo; echo "$(DEMO_OUT), one line per job (cut at 160 characters):"; cut -c1-160 $(DEMO_OUT)

bench: build
	$(PY) bench/run.py

clean:
	rm -rf $(VENV) target dist
