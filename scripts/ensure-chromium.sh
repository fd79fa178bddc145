#!/usr/bin/env bash
# Installs the browser of the end-to-end tests (Debian packages `chromium` and
# `fonts-dejavu-core`) unless chromium is already on the machine and the fonts are
# installed. The tests in e2e/ fail without a browser; they never skip.
set -euo pipefail

have_browser() {
	command -v chromium >/dev/null 2>&1 || command -v chromium-browser >/dev/null 2>&1 ||
		command -v google-chrome >/dev/null 2>&1 || [ -x /usr/bin/chromium ]
}
have_fonts() {
	[ -e /usr/share/fonts/truetype/dejavu/DejaVuSans.ttf ]
}

if have_browser && have_fonts; then
	exit 0
fi
echo "== installing chromium and fonts-dejavu-core (Debian) for the browser tests"
SUDO=""
if [ "$(id -u)" -ne 0 ]; then
	SUDO="sudo"
fi
$SUDO apt-get update
DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y chromium fonts-dejavu-core
