# reportgen: `make demo` and `make test` are the whole set-up on a fresh machine.
PYTHON ?= python3
VENV   := .venv
BIN    := $(VENV)/bin
STAMP  := $(VENV)/.installed
RG     := $(BIN)/reportgen
SHIP   := $(firstword $(wildcard conditions/vessels/*-hull.yaml))
CONDS  := $(sort $(wildcard conditions/*.yaml))

.PHONY: demo test bench lint system clean

# WeasyPrint needs Pango from the system (Debian: libpango-1.0-0 libpangoft2-1.0-0).
system:
	@for lib in libpango-1.0.so.0 libpangoft2-1.0.so.0; do \
	  if ! ldconfig -p 2>/dev/null | grep -q "$$lib"; then \
	    echo "reportgen needs the system library $$lib for WeasyPrint (PDF output)."; \
	    echo "On Debian or Ubuntu: sudo apt-get install libpango-1.0-0 libpangoft2-1.0-0"; \
	    exit 1; \
	  fi; \
	done

$(STAMP): pyproject.toml | system
	$(PYTHON) -m venv $(VENV)
	@echo "installing reportgen and its dependencies into $(VENV) (log: $(VENV)/install.log)"
	@{ $(BIN)/pip install --upgrade pip && $(BIN)/pip install -e '.[test]'; } \
	  > $(VENV)/install.log 2>&1 || { tail -n 30 $(VENV)/install.log; exit 1; }
	@touch $(STAMP)

demo: $(STAMP)
	@bash scripts/demo.sh

test: $(STAMP)
	$(BIN)/ruff check reportgen tests benchmarks conditions scripts
	$(BIN)/pytest -q

bench: $(STAMP)
	@missed=0; for b in benchmarks/bench_*.py; do echo "== $$b"; \
	  $(BIN)/python $$b || missed=1; done; \
	[ $$missed = 0 ] || { echo "some benchmark targets were missed (see above)"; exit 1; }

clean:
	rm -rf out/*.pdf out/*.txt out/*.yaml out/ids out/work out/limits-inputs build *.egg-info
