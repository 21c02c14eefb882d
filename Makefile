# propscope: developer and CI entry points. `make help` lists them.
SHELL := /bin/bash
GO ?= go

.PHONY: help notebook setup test go-test bench bench-coverage
help:
	@grep -E '^[a-z-]+:.*## ' $(MAKEFILE_LIST) | sed 's/:.*## /\t/'

notebook: ## install what is missing, then open the example notebooks in Jupyter on 127.0.0.1
	scripts/notebook.sh $(NOTEBOOK_ARGS)

setup: ## install Jupyter, Chromium, GoNB and its tools (.bin/) and the kernel (.jupyter/)
	scripts/setup-notebooks.sh

test: go-test ## every test (the README's test command; .ci/run calls it)

go-test: ## Go unit tests, examples and fuzz seed corpora
	$(GO) vet ./...
	$(GO) test -count=1 ./...

bench: ## benchmarks of the numerical core
	$(GO) test -run '^$$' -bench . -benchmem ./proportions/...

bench-coverage: ## exact coverage engine side by side with a NumPy enumeration (installs python3-numpy)
	scripts/bench-coverage.sh
