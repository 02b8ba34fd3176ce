// Package browser holds the end-to-end test of the report page in a real browser: Debian's
// headless Chromium, driven over the DevTools protocol, renders the demo report at a desktop
// width (1280 px) and a phone width (400 px) and emulates print. test.sh installs Chromium
// and runs it; under a plain `go test ./...` the test skips and says how to run it.
package browser
