#!/usr/bin/env bash
# Renders a report page in headless Chromium, as a reader's browser would, offline.
#   tests/render_report.sh REPORT.html [SCREENSHOT.png]
# Checks that the DOM the browser built holds the page's figures and inline SVG, and that a
# screenshot could be taken (a non-empty PNG; default: beside the report, .png for .html).
# Exit 0 on success, 1 with a message on failure, 77 (skipped) when no Chromium is installed.
# CHROMIUM names the browser; REPORT_WINDOW the window size (default 1400,2400); REPORT_FIGURES the
# figure ids to look for, separated by spaces (default: the run report's three).
set -euo pipefail

if (($# < 1 || $# > 2)); then
  echo "usage: $0 REPORT.html [SCREENSHOT.png]" >&2
  exit 1
fi
report=$(realpath -- "$1")
screenshot=${2:-${report%.html}.png}
if [[ ! -s $report ]]; then
  echo "render_report: no report at $1" >&2
  exit 1
fi

browser=${CHROMIUM:-}
if [[ -z $browser ]]; then
  for name in chromium chromium-browser; do
    if command -v "$name" >/dev/null; then browser=$name; break; fi
  done
fi
if [[ -z $browser ]]; then
  echo "render_report: skipped: Chromium is not installed (Debian package: chromium)"
  exit 77
fi

# A profile of its own for each run, so no earlier state or lock interferes; removed afterwards.
profile=$(mktemp -d)
trap 'rm -rf -- "$profile"' EXIT
# No sandbox: tests run as root here, where Chromium refuses to start with one. The network
# switches keep the browser from reaching out: the report must render from the file alone.
flags=(--headless --no-sandbox --disable-gpu --disable-quic --no-first-run --disable-background-networking
       --disable-component-update --disable-sync --hide-scrollbars --user-data-dir="$profile")
url="file://$report"

dom=$profile/dom.html
if ! timeout 120 "$browser" "${flags[@]}" --dump-dom "$url" >"$dom" 2>"$profile/dom.log"; then
  echo "render_report: Chromium failed to load $report:" >&2
  tail -n 20 "$profile/dom.log" >&2
  exit 1
fi
read -ra figures <<<"${REPORT_FIGURES:-figure-section figure-cycles figure-peak-map}"
missing=()
for id in "${figures[@]}"; do
  grep -q "id=\"$id\"" "$dom" || missing+=("$id")
done
grep -q '<svg' "$dom" || missing+=("<svg")
if ((${#missing[@]})); then
  echo "render_report: the page Chromium built lacks: ${missing[*]}" >&2
  exit 1
fi

rm -f -- "$screenshot"
if ! timeout 120 "$browser" "${flags[@]}" --window-size="${REPORT_WINDOW:-1400,2400}" --screenshot="$screenshot" \
    "$url" >"$profile/shot.log" 2>&1; then
  echo "render_report: Chromium failed to take a screenshot of $report:" >&2
  tail -n 20 "$profile/shot.log" >&2
  exit 1
fi
if [[ ! -s $screenshot ]] || [[ $(head -c 8 "$screenshot" | od -An -tx1 | tr -d ' \n') != 89504e470d0a1a0a ]]; then
  echo "render_report: no PNG screenshot at $screenshot" >&2
  exit 1
fi
echo "render_report: $report renders: ${#figures[@]} figures found; screenshot $screenshot ($(stat -c %s "$screenshot") bytes)"
