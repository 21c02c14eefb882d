# propscope: developer and CI entry points. `make help` lists them.
SHELL := /bin/bash
GO ?= go
# When make started, for the elapsed times of scripts/step.sh's progress
# lines (each long step prints one line as it starts and one as it ends).
PROPSCOPE_T0 := $(or $(PROPSCOPE_T0),$(shell date +%s))
export PROPSCOPE_T0
STEP := scripts/step.sh

.PHONY: help notebook reports setup test go-test notebook-test bench bench-analysis bench-coverage bench-charts bench-exact
help:
	@grep -E '^[a-z-]+:.*## ' $(MAKEFILE_LIST) | sed 's/:.*## /\t/'

notebook: ## install what is missing, then open the example notebooks in Jupyter on 127.0.0.1
	scripts/notebook.sh $(NOTEBOOK_ARGS)

reports: ## execute every notebook headless; executed copies and HTML reports go to reports/
	scripts/setup-notebooks.sh
	cd e2e && $(GO) run ./cmd/reports -out ../reports

setup: ## install Jupyter, Chromium, GoNB and its tools (.bin/) and the kernel (.jupyter/)
	scripts/setup-notebooks.sh

test: go-test notebook-test ## every test (the README's test command; .ci/run calls it)
	@echo "make test [done] screenshots: $(CURDIR)/e2e/out/*.png and $(CURDIR)/e2e/out/charts/*.png; executed notebooks and their HTML reports: $(CURDIR)/e2e/out/"

go-test: ## Go unit tests, examples and fuzz seed corpora
	@$(STEP) "go vet" $(GO) vet ./...
	@$(STEP) "Go tests, one line per package (about 5 min on 2 cores)" $(GO) test -count=1 ./...

# Executing notebooks needs no gopls (only editing help does), so the tests
# skip its build. `go mod tidy` keeps e2e/go.sum in step with the library's
# dependencies (e2e replaces the library with ../).
# The browser tests run with no package argument, so that go test streams
# their progress lines (one per notebook) instead of holding them to the end.
notebook-test: ## execute every notebook and check it in headless Chromium (screenshots in e2e/out/)
	@$(STEP) "notebook tools: Jupyter and Chromium (apt, first run only), GoNB (a minute to build the first time)" scripts/setup-notebooks.sh
	@cd e2e && ../$(STEP) "e2e: go mod tidy and go vet" bash -c '$(GO) mod tidy && $(GO) vet ./...'
	@cd e2e && ../$(STEP) "e2e helper packages" $(GO) test -count=1 ./nbrun/... ./cmd/...
	@cd e2e && ../$(STEP) "browser tests: every notebook executed and read in Chromium (a few minutes)" $(GO) test -count=1 -timeout 40m

bench: ## benchmarks of the numerical core
	$(GO) test -run '^$$' -bench . -benchmem ./proportions/...

bench-analysis: ## the default analysis and one score interval beside their yardstick, in alternating rounds (min, median, ratio)
	scripts/bench-analysis.sh

bench-coverage: ## exact coverage engine side by side with a NumPy enumeration (installs python3-numpy)
	scripts/bench-coverage.sh

bench-charts: ## time building and rendering the charts (the confidence curve includes its ~450 test evaluations)
	$(GO) test -run '^$$' -bench 'Chart' -benchmem ./notebookui/

bench-exact: ## Fisher, Barnard, Boschloo and the exact interval side by side with SciPy (installs python3-scipy); exact intervals and planning beside their targets
	scripts/bench-exact.sh
