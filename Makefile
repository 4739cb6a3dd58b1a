# shotplan: the two set-up commands are `make run` and `make test`.
PYTHON ?= python3
VENV   := .venv
PY     := $(VENV)/bin/python
STAMP  := $(VENV)/.installed
TSTAMP := $(VENV)/.installed-test
DEMO   := assets/layouts/club-night-1-straight-in.json
# The model and the engine are held to mypy --strict.
STRICT := shotplan/errors.py shotplan/units.py shotplan/equipment shotplan/table.py \
          shotplan/stroke.py shotplan/aim.py shotplan/layout.py shotplan/racks.py shotplan/players.py \
          shotplan/tablefile.py shotplan/placement.py shotplan/games.py \
          shotplan/files shotplan/physics

.PHONY: run test bench check clean screenshots

$(PY):
	$(PYTHON) -m venv $(VENV)
	$(PY) -m pip install --quiet --upgrade pip

$(STAMP): pyproject.toml | $(PY)
	$(PY) -m pip install --quiet -e .
	touch $@

$(TSTAMP): pyproject.toml | $(PY)
	$(PY) -m pip install --quiet -e ".[test,dev]"
	touch $(STAMP) $@

# Compile the physics engine once in set-up (a second or so to load it after),
# so that no command compiles; it prints a line while it runs.
run: $(STAMP)
	$(PY) -m shotplan.cli.engine
	$(VENV)/bin/shotplan view $(DEMO)

test: $(TSTAMP)
	$(PY) -m shotplan.cli.engine
	$(PY) -m pytest

bench: $(STAMP)
	$(PY) benchmarks/run_all.py

check: $(TSTAMP)
	$(VENV)/bin/ruff check shotplan tests benchmarks tools
	$(VENV)/bin/mypy shotplan
	$(VENV)/bin/mypy --strict $(STRICT)

screenshots: $(STAMP)
	$(PY) tools/make_diagrams.py
	SDL_VIDEODRIVER=dummy $(PY) tools/make_screenshots.py

clean:
	rm -rf $(VENV) build *.egg-info
