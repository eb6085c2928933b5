#!/usr/bin/env bash
# Browser check of the HTML report (issue #5): renders a report in headless Chromium
# (Debian's chromium package, installed here if missing), fails on any console message
# (the report has no scripts, so there should be none), checks the screenshot is not blank,
# and runs the browser-tagged Go tests. Called from .ci/run.
#
# Output: the screenshots and the report are left in $BROWSER_CHECK_OUT (default: a fresh
# temporary directory, printed at the end) so a person can look at them.
set -euo pipefail
cd "$(dirname "$0")/.."

if ! command -v chromium >/dev/null 2>&1; then
	echo "browser-check: installing chromium"
	export DEBIAN_FRONTEND=noninteractive
	apt-get update
	apt-get install -y chromium
fi
CHROMIUM="$(command -v chromium)"
export CHROMIUM

out="${BROWSER_CHECK_OUT:-$(mktemp -d)}"
mkdir -p "$out"
bin="$out/cyclopair"
go build -o "$bin" ./cmd/cyclopair

# The report: the demo screen when the screen command can write HTML, else the fixture
# report the htmlreport tests build (same writer, three pairs, bundled check set).
report="$out/report.html"
if "$bin" screen presets/demo.yaml --format html >"$report" 2>"$out/screen.stderr"; then
	echo "browser-check: report from 'cyclopair screen presets/demo.yaml --format html'"
else
	echo "browser-check: screen --format html unavailable ($(head -n1 "$out/screen.stderr")); using the test fixture"
	CYCLOPAIR_DRAW_DIR="$out" go test -count=1 -run TestWellFormedAndEscaped ./cmd/cyclopair/internal/htmlreport >/dev/null
fi
"$bin" draw --diene C1=CC=CC1 --dienophile 'O=C1OC(=O)C=C1' --svg "$out/pair.svg" 2>/dev/null
"$bin" draw c1ccccc1 --orbital homo --svg "$out/benzene-homo.svg" 2>/dev/null
files="$report $out/pair.svg $out/benzene-homo.svg"
if "$bin" pair --diene 'COC=CC=C' --dienophile 'C=CC(=O)OC' --activate none,lewis --format html >"$out/pair.html" 2>"$out/pair.stderr"; then
	files="$files $out/pair.html"
else
	echo "browser-check: pair --format html unavailable ($(head -n1 "$out/pair.stderr"))"
fi

shot() { # shot FILE PNG WIDTH HEIGHT: screenshot, console lines to PNG.console
	local profile
	profile="$(mktemp -d)"
	"$CHROMIUM" --headless --no-sandbox --disable-gpu --disable-quic --no-first-run \
		--disable-background-networking --disable-component-update --disable-sync \
		--user-data-dir="$profile" --window-size="$3,$4" --screenshot="$2" \
		--enable-logging=stderr --v=0 "file://$1" >"$2.log" 2>&1 || {
		echo "browser-check: chromium failed on $1"; cat "$2.log"; rm -rf "$profile"; return 1; }
	rm -rf "$profile"
	grep ':CONSOLE' "$2.log" >"$2.console" || true
	if [ -s "$2.console" ]; then
		echo "browser-check: console messages while loading $1:"
		cat "$2.console"
		return 1
	fi
	[ -s "$2" ] || { echo "browser-check: no screenshot for $1"; return 1; }
}

shot "$report" "$out/report.png" 1280 2400
shot "$out/pair.svg" "$out/pair.png" 900 600
shot "$out/benzene-homo.svg" "$out/benzene-homo.png" 700 400

# Not blank: the Go test below decodes its own screenshot; here the PNG size is a cheap
# first check (a blank 1280×2400 page compresses to a few kB).
size=$(wc -c <"$out/report.png")
if [ "$size" -lt 30000 ]; then
	echo "browser-check: report screenshot is only $size bytes: page looks blank"
	exit 1
fi

CYCLOPAIR_BROWSER_FILES="$files" CYCLOPAIR_SCREENSHOT="$out/report-test.png" \
	go test -count=1 -tags browser -run Browser -v ./cmd/cyclopair/internal/htmlreport | grep -E '^(---|ok|FAIL|PASS)|non-white' 
echo "browser-check: passed; report, SVGs and screenshots in $out"

# The web page of 'cyclopair serve' (issue 12), driven in the same chromium over the DevTools
# protocol: pair form, bad SMILES, screen upload, oversize upload, no console messages.
go test -count=1 -tags browser -run BrowserServe -v ./cmd/cyclopair | grep -E '^(---|ok|FAIL|PASS)|expected:|console'
echo "browser-check: cyclopair serve passed in chromium"
