# Two commands on a fresh machine: `make run` and `make test`.
PY      ?= python3
VENV    := .venv
BIN     := $(VENV)/bin
STAMP   := $(VENV)/.installed
PORT    ?= 8501

.PHONY: run test test-fast bench setup clean

setup: $(STAMP)

$(STAMP): requirements.txt
	test -x $(BIN)/python || $(PY) -m venv $(VENV)
	$(BIN)/python -m pip install --quiet --upgrade pip
	$(BIN)/python -m pip install --quiet -r requirements.txt
	touch $(STAMP)

run: $(STAMP)
	@echo "liftcore dashboard: http://localhost:$(PORT)  (Ctrl+C to stop)"
	$(BIN)/python -m streamlit run app.py --server.port $(PORT) --server.headless true \
		--browser.gatherUsageStats false

test: $(STAMP)
	$(BIN)/python -m pytest -q

test-fast: $(STAMP)
	$(BIN)/python -m pytest -q -m "not browser"

bench: $(STAMP)
	$(BIN)/python -m benchmarks

clean:
	rm -rf $(VENV) .pytest_cache .hypothesis
