# Lagwright: `make run` starts the app with its own PostgreSQL; `make test` is CI.
.PHONY: run test build generate

run:
	scripts/ensure-postgres.sh
	go run ./cmd/lagwright serve

test:
	scripts/test.sh

build:
	go build -o bin/lagwright ./cmd/lagwright

generate:
	go tool templ generate
