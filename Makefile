# Every target sets itself up: a fresh machine needs only python3 and make.
PY ?= python3
VENV := .venv
BIN := $(VENV)/bin
STAMP := $(VENV)/.installed

.PHONY: demo test test-browser lint bench soak clean

$(STAMP): pyproject.toml
	$(PY) -m venv $(VENV)
	$(BIN)/python -m pip install --quiet --upgrade pip
	$(BIN)/python -m pip install --quiet -e ".[test,lint]"
	command -v java >/dev/null 2>&1 || (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq default-jre-headless)
	touch $(STAMP)

demo: $(STAMP)
	$(BIN)/python -m plotwise.demo build/demo
	$(BIN)/python tools/export_tour.py demo_notebooks/tour.ipynb build/demo/tour.html

test: $(STAMP)
	$(BIN)/python -m pytest -q -n 2 --dist worksteal

BROWSER_STAMP := $(VENV)/.browser-installed

$(BROWSER_STAMP): $(STAMP)
	$(BIN)/python -m pip install --quiet -e ".[test,lint,browser]"
	command -v chromium >/dev/null 2>&1 || (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium)
	touch $(BROWSER_STAMP)

# JupyterLab + headless Chromium: the panel used as a person would, and the exported tour offline.
test-browser: $(BROWSER_STAMP)
	test -f build/demo/tour.html || $(MAKE) demo
	$(BIN)/python -m pytest -q -p no:cacheprovider tests_browser

soak: $(STAMP)
	$(BIN)/python -m pytest -q -s -m soak tests/test_soak.py
	PLOTWISE_EXAMPLES=20000 $(BIN)/python -m pytest -q -n 2 --dist worksteal tests/engine/test_properties.py

lint: $(STAMP)
	$(BIN)/ruff check plotwise tests tests_browser tools benchmarks
	$(BIN)/mypy

bench: $(STAMP)
	MPLBACKEND=Agg $(BIN)/python benchmarks/run.py
	MPLBACKEND=Agg $(BIN)/python benchmarks/engines.py
	MPLBACKEND=Agg $(BIN)/python benchmarks/odd_inputs.py
	MPLBACKEND=Agg $(BIN)/python benchmarks/sheet.py
	MPLBACKEND=Agg $(BIN)/python benchmarks/panel.py
	MPLBACKEND=Agg $(BIN)/python benchmarks/first_call.py

clean:
	rm -rf $(VENV) build
