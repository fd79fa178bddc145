#!/bin/sh
# Times the schedule exports on a 10,000-line project against PostgreSQL's own COPY of
# the same lines, and reports peak memory. Uses DATABASE_URL when set, otherwise starts
# a private throwaway cluster (store/localpg). See scripts/exportbench/main.go.
set -eu
cd "$(dirname "$0")/.."
exec go run ./scripts/exportbench -lines "${LINES:-10000}" -runs "${RUNS:-3}" "$@"
