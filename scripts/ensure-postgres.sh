#!/usr/bin/env bash
# Installs the PostgreSQL server binaries (Debian package `postgresql`) unless
# initdb is already on PATH or under /usr/lib/postgresql/*/bin.
set -euo pipefail

if command -v initdb >/dev/null 2>&1 || compgen -G '/usr/lib/postgresql/*/bin/initdb' >/dev/null; then
	exit 0
fi
echo "== installing PostgreSQL (Debian package postgresql)"
SUDO=""
if [ "$(id -u)" -ne 0 ]; then
	SUDO="sudo"
fi
$SUDO apt-get update
DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y postgresql
