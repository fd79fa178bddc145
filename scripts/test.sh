#!/usr/bin/env bash
# The whole check, as CI runs it: PostgreSQL binaries and chromium present, generated
# templ files fresh, go vet, then every test against a real PostgreSQL (the e2e/
# tests also drive chromium).
set -euo pipefail
cd "$(dirname "$0")/.."

scripts/ensure-postgres.sh
scripts/ensure-chromium.sh

echo "== templ generate (generated files must be committed and fresh)"
go tool templ generate >/dev/null
if git rev-parse --is-inside-work-tree >/dev/null 2>&1; then
	if ! git diff --exit-code -- '*_templ.go'; then
		echo "error: *_templ.go files are stale: run 'go tool templ generate' and commit them" >&2
		exit 1
	fi
fi

echo "== go vet"
go vet ./...

echo "== go test"
go test -count=1 -timeout 30m ./...
