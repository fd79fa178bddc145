# Lagwright: `make run` builds bin/lagwright and starts it with its own PostgreSQL;
# `make build` only builds it; `make test` is CI.
.PHONY: run test build generate

# The app replaces the recipe's shell (exec), so Ctrl-C and a SIGTERM sent to make
# reach it directly: it drains requests, stops its PostgreSQL and exits 0 (make then
# reports no error); nothing is left running.
run: build
	@scripts/ensure-postgres.sh
	exec bin/lagwright serve

build:
	@scripts/build.sh

test:
	scripts/test.sh

generate:
	go tool templ generate
