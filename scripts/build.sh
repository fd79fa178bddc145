#!/usr/bin/env bash
# Builds bin/lagwright and says what it is doing: the first build compiles every
# dependency (about 100 s on 2 cores) and go build is silent meanwhile.
set -euo pipefail
cd "$(dirname "$0")/.."

if ! command -v go >/dev/null 2>&1; then
	echo "Go is not installed: Lagwright needs Go 1.26 or newer (https://go.dev/dl/). See README, Prerequisites." >&2
	exit 1
fi
echo "== building bin/lagwright with $(go version | awk '{print $3}')"
echo "   (the first build compiles every dependency: about 2 minutes on 2 cores; later builds take seconds)"
start=$(date +%s)
n=0
# -v names each package as it is compiled: print every 20th as progress, and
# compiler messages as they come.
go build -v -o bin/lagwright ./cmd/lagwright 2>&1 | while IFS= read -r line; do
	case "$line" in
	*" "* | "#"*)
		echo "$line"
		;;
	*)
		n=$((n + 1))
		if [ $((n % 20)) -eq 1 ]; then
			echo "   compiling: $n packages so far ($line)"
		fi
		;;
	esac
done
echo "== bin/lagwright is ready ($(($(date +%s) - start)) s). Run it: bin/lagwright serve (or make run)"
