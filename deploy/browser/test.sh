#!/usr/bin/env bash
# End-to-end test of the report page in a real browser: Debian's headless Chromium renders the
# demo report at 1280 px and 400 px and in print (deploy/browser/browser_test.go).
#
#   bash deploy/browser/test.sh      # install Chromium (if needed), run the test
#
# Set UNFOLD_BROWSER_SHOTS=DIR to keep the screenshots and the printed PDF.
# Exit status: 0 when the test passed, or when Chromium could not be installed here (then it
# prints "SKIP: ..." and why); non-zero when Chromium was there and the test failed.
set -uo pipefail
cd "$(dirname "$0")/../.."

skip() { echo "SKIP: report page browser test: $*"; exit 0; }

find_chromium() {
  for b in chromium chromium-browser; do
    command -v "$b" 2>/dev/null && return 0
  done
  return 1
}
exe=$(find_chromium)
if [ -z "$exe" ]; then
  [ "$(id -u)" = 0 ] || skip "Chromium is not installed and installing it needs root (uid $(id -u))"
  command -v apt-get >/dev/null 2>&1 || skip "Chromium is not installed and there is no apt-get"
  log=$(mktemp)
  inst() {
    DEBIAN_FRONTEND=noninteractive timeout 600 apt-get install -y -q --no-install-recommends \
      -o Dpkg::Use-Pty=0 -o DPkg::Lock::Timeout=60 chromium fonts-dejavu-core >>"$log" 2>&1
  }
  if ! inst; then
    echo "apt-get install failed; running apt-get update and trying once more" >&2
    DEBIAN_FRONTEND=noninteractive timeout 300 apt-get update -q >>"$log" 2>&1 && inst
  fi
  exe=$(find_chromium)
  if [ -z "$exe" ]; then
    tail -n 15 "$log" | sed 's/^/  apt: /'
    rm -f "$log"
    skip "could not install Debian's chromium (apt output above)"
  fi
  rm -f "$log"
  echo "installed $("$exe" --version 2>/dev/null)"
fi
command -v go >/dev/null 2>&1 || skip "go is not on PATH"
UNFOLD_BROWSER_TEST=1 UNFOLD_CHROMIUM="$exe" go test -count=1 -timeout 8m -v -run 'Browser' ./deploy/browser/ 2>&1
