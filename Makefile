# Every target sets itself up: a fresh machine needs only python3 and make.
PY ?= python3
VENV := .venv
BIN := $(VENV)/bin
STAMP := $(VENV)/.installed

.PHONY: demo test lint bench soak clean

$(STAMP): pyproject.toml
	$(PY) -m venv $(VENV)
	$(BIN)/python -m pip install --quiet --upgrade pip
	$(BIN)/python -m pip install --quiet -e ".[test,lint]"
	touch $(STAMP)

demo: $(STAMP)
	$(BIN)/python -m plotwise.demo build/demo
	$(BIN)/python tools/export_tour.py demo_notebooks/tour.ipynb build/demo/tour.html

test: $(STAMP)
	$(BIN)/python -m pytest -q

soak: $(STAMP)
	$(BIN)/python -m pytest -q -s -m soak tests/test_soak.py

lint: $(STAMP)
	$(BIN)/ruff check plotwise tests tools

bench: $(STAMP)
	MPLBACKEND=Agg $(BIN)/python benchmarks/run.py

clean:
	rm -rf $(VENV) build
