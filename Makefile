# cablewright: every target sets up its own virtual environment on a fresh machine.
PYTHON ?= python3
VENV   ?= .venv
PY     := $(VENV)/bin/python
STAMP  := $(VENV)/.installed-stamp
OUT    ?= demo_out

.PHONY: demo test lint typecheck bench clean

$(STAMP): pyproject.toml
	$(PYTHON) -m venv $(VENV)
	$(PY) -m pip install --quiet --upgrade pip
	@# setuptools tells every editable install to mind same-named folders (an information
	@# notice, not a problem of this project); the filter hides that notice only
	PYTHONWARNINGS="ignore:Editable installation" $(PY) -m pip install --quiet -e ".[test]"
	touch $(STAMP)

## make demo: the whole job on the bundled sample drawing (DXF), on the same plant
## modelled in IFC, and the DXF sized to the NEC rule set; outputs in ./demo_out,
## ./demo_out/ifc and ./demo_out/nec
demo: $(STAMP)
	$(VENV)/bin/cablewright demo --out $(OUT)
	$(VENV)/bin/cablewright size sample_drawings/pumping_station.ifc \
		--circuits sample_drawings/pumping_station_circuits.csv --out $(OUT)/ifc || test $$? -eq 1
	$(VENV)/bin/cablewright size sample_drawings/pumping_station.dxf --circuits sample_drawings/pumping_station_circuits.csv --config sample_drawings/pumping_station_nec.toml --out $(OUT)/nec || test $$? -eq 1

## make test: the full test suite (unit, doctests, published-value checks)
test: $(STAMP)
	$(PY) -m ruff check .
	$(PY) tools/typecheck.py
	$(PY) -m pytest -q

lint: $(STAMP)
	$(PY) -m ruff check .

## make typecheck: mypy on the package as installed (tools/typecheck.py; strict on sizing/)
typecheck: $(STAMP)
	$(PY) tools/typecheck.py

## make bench: the benchmark scripts (figures in benchmarks/RESULTS.md)
bench: $(STAMP)
	$(PY) benchmarks/bench_sizing.py
	$(PY) benchmarks/bench_pipeline.py --sizes 200 2000 --work /tmp/cablewright-bench

clean:
	rm -rf $(VENV) $(OUT) .pytest_cache
