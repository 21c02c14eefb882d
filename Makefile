# propscope: developer and CI entry points. `make help` lists them.
SHELL := /bin/bash
GO ?= go

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

go-test: ## Go unit tests, examples and fuzz seed corpora
	$(GO) vet ./...
	$(GO) test -count=1 ./...

# Executing notebooks needs no gopls (only editing help does), so the tests
# skip its build. `go mod tidy` keeps e2e/go.sum in step with the library's
# dependencies (e2e replaces the library with ../).
notebook-test: ## execute every notebook and check it in headless Chromium (screenshots in e2e/out/)
	PROPSCOPE_SKIP_GOPLS=1 scripts/setup-notebooks.sh
	cd e2e && $(GO) mod tidy && $(GO) vet ./... && $(GO) test -count=1 -timeout 40m ./...

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
