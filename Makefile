# Two entry points for a fresh machine that has only python3:
#   make demo   set up .venv and build the bundled demo design into output/
#   make test   set up .venv (with the test extra) and run the whole test suite
PYTHON ?= python3
VENV := .venv
PY := $(VENV)/bin/python
DEMO := wheelgen/designs/harbour_tide_clock.toml

.PHONY: demo test bench lint clean

$(VENV)/.installed: pyproject.toml
	test -x $(PY) || $(PYTHON) -m venv $(VENV)
	$(PY) -m pip install --quiet --upgrade pip
	$(PY) -m pip install --quiet -e '.[test]'
	touch $@

demo: $(VENV)/.installed
	$(VENV)/bin/wheelgen check $(DEMO)
	$(VENV)/bin/wheelgen build $(DEMO)

test: $(VENV)/.installed
	$(PY) -m pytest -q

lint: $(VENV)/.installed
	$(PY) -m pip install --quiet -e '.[dev]'
	$(VENV)/bin/ruff format --check wheelgen tests benchmarks
	$(VENV)/bin/ruff check wheelgen tests benchmarks
	$(VENV)/bin/mypy

bench: $(VENV)/.installed
	for f in benchmarks/bench_*.py; do echo "== $$f"; $(PY) $$f || exit 1; done

clean:
	rm -rf output/*/ output/.wheelgen-cache
