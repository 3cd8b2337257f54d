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

# Two workers: the browser tests spend most of their time waiting for the page, so a second
# worker runs other tests meanwhile (each worker starts its own dashboard on a free port).
test: $(STAMP)
	$(BIN)/python -m pytest -q -n 2

test-fast: $(STAMP)
	$(BIN)/python -m pytest -q -n 2 -m "not browser"

bench: $(STAMP)
	$(BIN)/python -m benchmarks

clean:
	rm -rf $(VENV) .pytest_cache .hypothesis
