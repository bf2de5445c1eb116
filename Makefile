# heatpath-workbench — the two set-up commands are `make lab` and `make test`.
PYTHON ?= python3
VENV   := .venv
PY     := $(VENV)/bin/python
STAMP  := $(VENV)/.installed-stamp
PORT   ?= 8866
# JupyterLab refuses to start as root unless told; these machines run as root.
ROOT_OK := $(if $(filter 0,$(shell id -u)),--allow-root,)

.PHONY: lab app docs test test-latest lock bench lint clean notebooks meeting meeting-password

LOCK   := requirements/lock-py311.txt
UV_VERSION := 0.13.9

# The tested environment: every package (direct and transitive) at the exact version and hash
# in $(LOCK); the project itself goes in editable, with no dependency resolution of its own.
$(STAMP): pyproject.toml $(LOCK)
	@$(PYTHON) -c 'import sys; sys.exit(0 if sys.version_info[:2] == (3, 11) else "the lock $(LOCK) is for Python 3.11; run make with PYTHON=python3.11")'
	test -x $(PY) || $(PYTHON) -m venv $(VENV)
	$(PY) -m pip install --require-hashes --no-deps -r $(LOCK) > $(VENV)/pip.log 2>&1 || (tail -n 30 $(VENV)/pip.log; exit 1)
	$(PY) -m pip install --no-deps --no-build-isolation -e . >> $(VENV)/pip.log 2>&1 || (tail -n 30 $(VENV)/pip.log; exit 1)
	$(PY) -m pip check >> $(VENV)/pip.log 2>&1 || (tail -n 30 $(VENV)/pip.log; exit 1)
	touch $(STAMP)

## make lab: create .venv, install, open JupyterLab on the quick-start notebook
lab: $(STAMP)
	$(VENV)/bin/jupyter lab $(ROOT_OK) notebooks/quick_start.ipynb

## make app: serve the web app on 127.0.0.1 (PORT=): a first page offering the three jobs (wall, shipper, housing)
app: $(STAMP)
	$(VENV)/bin/voila notebooks/app.ipynb --no-browser --port $(PORT) --Voila.ip=127.0.0.1

## make docs: regenerate docs/scenario-keys.md (every scenario-file key of every study kind) from the declarations
docs: $(STAMP)
	$(PY) -c "from workbench.scenario import scenario_keys_text as k; open('docs/scenario-keys.md', 'w', encoding='utf-8').write(k(None, 'markdown'))"

## make meeting: the live review meeting: JupyterLab with real-time collaboration on
## notebooks/review_meeting.ipynb; 127.0.0.1 unless HOST= says otherwise, PORT= too; always a
## token (random) or the password set with `make meeting-password`; prints the link to share
meeting: $(STAMP)
	$(PY) -m workbench.meeting --host "$(HOST)" --port "$(PORT)"

## make meeting-password: set the meeting password (stored as a hash; delete the file it names to go back to tokens)
meeting-password: $(STAMP)
	$(PY) -m workbench.meeting password

# The suite: unit tests, published checks and doctests in random order (pytest-randomly), then
# the notebooks in cell order. The seed is printed first; `make test SEED=N` replays an order.
ifeq ($(origin SEED),undefined)
SEED := $(shell $(PYTHON) -c 'import random; print(random.randrange(1, 2**31))')
endif
PYTEST_ARGS := tests workbench notebooks --nbval --nbval-current-env --nbval-cell-timeout=300 \
	--nbval-sanitize-with notebooks/nbval_sanitize.cfg -q -p randomly --randomly-seed=$(SEED)

## make test: create the locked environment and run the whole suite
test: $(STAMP)
	@echo "test order: random, seed $(SEED) (replay with: make test SEED=$(SEED))"
	$(PY) -m pytest $(PYTEST_ARGS)

## make test-latest: the suite against the newest versions pyproject.toml allows (not run by CI)
test-latest:
	test -x .venv-latest/bin/python || $(PYTHON) -m venv .venv-latest
	.venv-latest/bin/python -m pip install --upgrade --upgrade-strategy eager -e '.[lab,test]' > .venv-latest.log 2>&1 || (tail -n 30 .venv-latest.log; exit 1)
	.venv-latest/bin/python -m pip freeze --exclude-editable > artifacts-latest-versions.txt
	@echo "newest versions tried: artifacts-latest-versions.txt (diff against $(LOCK) to see what drifted)"
	@echo "test order: random, seed $(SEED)"
	.venv-latest/bin/python -m pytest $(PYTEST_ARGS)

## make lock: regenerate $(LOCK) after changing a dependency or its range in pyproject.toml
lock:
	test -x .venv-tools/bin/uv || ($(PYTHON) -m venv .venv-tools && .venv-tools/bin/pip install -q uv==$(UV_VERSION))
	.venv-tools/bin/uv pip compile pyproject.toml --extra lab --extra test --python-version 3.11 \
		--generate-hashes --custom-compile-command "make lock" -o $(LOCK)

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
	rm -rf $(VENV) .venv-latest .venv-tools build dist .pytest_cache artifacts
