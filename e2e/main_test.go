// Package e2e drives the real Lagwright server through Debian's chromium with
// chromedp: every flow starts the app in-process on a fresh, migrated and seeded
// PostgreSQL database (store/storetest), serves it on loopback with httptest, and
// clicks through it in a headless browser of its own.
//
// A full-page screenshot of every flow (passed or failed) is kept in
// e2e/artifacts/<TestName>.png (gitignored). A missing browser fails the run; it
// never skips (scripts/ensure-chromium.sh installs it).
package e2e

import (
	"fmt"
	"os"
	"os/exec"
	"testing"

	"lagwright/store/storetest"
)

// chromiumPath is the browser the flows drive, found by TestMain.
var chromiumPath string

// browserCandidates are looked up in order: Debian's chromium first.
var browserCandidates = []string{
	"/usr/bin/chromium",
	"chromium",
	"chromium-browser",
	"google-chrome",
	"google-chrome-stable",
}

func TestMain(m *testing.M) {
	p, err := findChromium()
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
	chromiumPath = p
	storetest.Main(m)
}

// findChromium returns the first browser of browserCandidates, or an error that
// names the Debian package to install. It fails in CI and on a workstation alike:
// the end-to-end tests never skip silently.
func findChromium() (string, error) {
	for _, c := range browserCandidates {
		if p, err := exec.LookPath(c); err == nil {
			return p, nil
		}
	}
	msg := "e2e: no chromium found (looked for /usr/bin/chromium, chromium-browser, google-chrome).\n"
	if os.Getenv("CI") != "" {
		return "", fmt.Errorf("%se2e: CI must install the Debian package: apt-get install -y chromium fonts-dejavu-core", msg)
	}
	return "", fmt.Errorf("%se2e: install it with scripts/ensure-chromium.sh (apt-get install -y chromium fonts-dejavu-core), or run `make test`", msg)
}
