# heatpath-workbench — the two set-up commands are `make lab` and `make test`.
PYTHON ?= python3
VENV   := .venv
PY     := $(VENV)/bin/python
STAMP  := $(VENV)/.installed-stamp
PORT   ?= 8866
# JupyterLab refuses to start as root unless told; these machines run as root.
ROOT_OK := $(if $(filter 0,$(shell id -u)),--allow-root,)

.PHONY: lab app test bench lint clean notebooks

$(STAMP): pyproject.toml
	test -x $(PY) || $(PYTHON) -m venv $(VENV)
	$(PY) -m pip install --upgrade pip > $(VENV)/pip.log 2>&1 || (tail -n 30 $(VENV)/pip.log; exit 1)
	$(PY) -m pip install -e '.[lab,test]' >> $(VENV)/pip.log 2>&1 || (tail -n 30 $(VENV)/pip.log; exit 1)
	touch $(STAMP)

## make lab: create .venv, install, open JupyterLab on the quick-start notebook
lab: $(STAMP)
	$(VENV)/bin/jupyter lab $(ROOT_OK) notebooks/quick_start.ipynb

## make app: serve the wall-comparison notebook as a web app on 127.0.0.1 for a meeting
app: $(STAMP)
	$(VENV)/bin/voila notebooks/wall_comparison.ipynb --no-browser --port $(PORT) --Voila.ip=127.0.0.1

## make test: create the same environment and run the whole suite
test: $(STAMP)
	$(PY) -m pytest tests workbench notebooks \
		--nbval --nbval-current-env --nbval-cell-timeout=300 \
		--nbval-sanitize-with notebooks/nbval_sanitize.cfg -q

## make bench: run the benchmarks (ratios against baselines measured in the same run)
bench: $(STAMP)
	for b in benchmarks/*.py; do echo "== $$b"; $(PY) $$b || exit 1; done

lint: $(STAMP)
	$(VENV)/bin/ruff check workbench tests benchmarks

## make notebooks: re-execute the committed notebooks in place (outputs are compared by nbval)
notebooks: $(STAMP)
	for nb in notebooks/*.ipynb; do \
		$(VENV)/bin/jupyter nbconvert --to notebook --execute --inplace \
			--ExecutePreprocessor.store_widget_state=False $$nb || exit 1; done

clean:
	rm -rf $(VENV) build dist .pytest_cache artifacts
