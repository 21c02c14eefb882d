# propscope: developer and CI entry points. `make help` lists them.
SHELL := /bin/bash
GO ?= go

.PHONY: help test go-test bench
help:
	@grep -E '^[a-z-]+:.*## ' $(MAKEFILE_LIST) | sed 's/:.*## /\t/'

test: go-test ## every test (the README's test command; .ci/run calls it)

go-test: ## Go unit tests, examples and fuzz seed corpora
	$(GO) vet ./...
	$(GO) test -count=1 ./...

bench: ## benchmarks of the numerical core
	$(GO) test -run '^$$' -bench . -benchmem ./proportions/...
