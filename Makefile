# Quick start: `make demo` checks the bundled example; `make test` runs the whole test suite.
# Both set everything up first (Debian libraries for openseespy, a virtual environment, the package).
VENV ?= .venv
PYTHON ?= python3
PY := $(VENV)/bin/python
DEMO_PROJECT ?= examples/sway_frame/project.toml
DEMO_OUT ?= out/demo

.PHONY: setup demo test bench clean

setup: $(VENV)/.installed

$(VENV)/.installed: pyproject.toml scripts/system-deps.sh
	bash scripts/system-deps.sh
	$(PYTHON) -m venv $(VENV)
	$(PY) -m pip install --quiet --upgrade pip
	$(PY) -m pip install --quiet -e '.[test]'
	touch $@

# Exit codes 1 (members over 1.0) and 3 (checks not evaluated) are results, not set-up failures.
demo: setup
	@rc=0; $(VENV)/bin/framesweep run $(DEMO_PROJECT) --out $(DEMO_OUT) || rc=$$?; \
	if [ $$rc -eq 2 ] || [ $$rc -gt 3 ]; then exit $$rc; fi; \
	echo "framesweep finished with exit code $$rc (0 all pass, 1 some fail, 3 some not evaluated); outputs in $(DEMO_OUT)/"

# Lint and type check first: a style or type error stops the run before the longer test suite.
test: setup
	$(VENV)/bin/ruff check .
	$(VENV)/bin/mypy
	$(PY) -m pytest -q

bench: setup
	$(PY) -m postproc.bench_run
	$(PY) -m postproc.benchmark

clean:
	rm -rf $(VENV) out .pytest_cache
