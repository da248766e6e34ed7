#!/usr/bin/env bash
# Headless-browser check of an HTML report: renders REPORT.html in Debian's Chromium, writes a full-page
# screenshot to OUTDIR/report.png, and fails (exit 1) on any console error, uncaught exception, blocked load, or a
# figure listed in <meta name="switchfit-figures"> that is missing, empty or not laid out.
#
# Usage: .ci/render-report.sh REPORT.html OUTDIR      (OUTDIR should be under target/)
#        .ci/render-report.sh --self-test OUTDIR      (checks that the check itself fails on broken pages)
#
# Driver: Node.js (render-report.mjs, DevTools protocol over a pipe, no npm packages) when `node` is present;
# otherwise Chromium's --dump-dom plus --enable-logging=stderr, where any console line at all counts as an error
# (our reports run no scripts, so a console line means a blocked load or a parse problem).
# Exit codes: 0 pass, 1 check failed, 2 could not run.
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"

if [ $# -ne 2 ]; then
  echo "usage: $0 REPORT.html OUTDIR | --self-test OUTDIR" >&2
  exit 2
fi

chromium_bin="$(command -v chromium || true)"
if [ -z "$chromium_bin" ]; then
  echo "render-report: installing Debian's chromium" >&2
  (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium) >&2 || {
    echo "render-report: could not install chromium" >&2; exit 2; }
  chromium_bin="$(command -v chromium)"
fi

flags=(--headless --no-sandbox --disable-gpu --disable-quic --no-first-run --disable-background-networking
  --disable-component-update --disable-sync --hide-scrollbars)

check_with_dump_dom() { # REPORT OUTDIR
  local report="$1" out="$2" profile url rc=0 id
  profile="$(mktemp -d)"
  url="file://$(cd "$(dirname "$report")" && pwd)/$(basename "$report")"
  timeout 120 "$chromium_bin" "${flags[@]}" --user-data-dir="$profile" --enable-logging=stderr --v=0 \
    --dump-dom "$url" >"$out/dom.html" 2>"$out/browser.log" || { rm -rf "$profile"; return 2; }
  rm -rf "$profile"
  if grep -E ':CONSOLE[:(]|Uncaught' "$out/browser.log" >"$out/console.txt"; then
    sed 's/^/render-report: FAIL: console: /' "$out/console.txt" >&2
    rc=1
  fi
  local ids
  ids="$(sed -n 's/.*<meta name="switchfit-figures" content="\([^"]*\)".*/\1/p' "$out/dom.html" | head -n 1)"
  if ! grep -q '<meta name="switchfit-figures"' "$out/dom.html"; then
    echo "render-report: FAIL: no <meta name=\"switchfit-figures\"> in the page" >&2
    rc=1
  fi
  for id in $ids; do
    # The svg element must be present and contain at least one drawing element before it closes.
    if ! tr '\n' ' ' <"$out/dom.html" | grep -Eq "<svg[^>]*data-figure=\"$id\"[^>]*>([^<]|<[^/]|</[^s]|</s[^v])*<(path|line|circle|rect|text)[ >]"; then
      echo "render-report: FAIL: figure '$id' is missing or empty" >&2
      rc=1
    fi
  done
  profile="$(mktemp -d)"
  timeout 120 "$chromium_bin" "${flags[@]}" --user-data-dir="$profile" --window-size=1200,6000 \
    --screenshot="$out/report.png" "$url" >/dev/null 2>&1 || rc=2
  rm -rf "$profile"
  [ $rc -eq 0 ] && echo "render-report: OK (dump-dom): figures [$ids] present; screenshot $out/report.png"
  return $rc
}

check() { # REPORT OUTDIR
  mkdir -p "$2"
  if [ ! -f "$1" ]; then
    echo "render-report: no such report: $1" >&2
    return 2
  fi
  if command -v node >/dev/null && [ "${RENDER_REPORT_DRIVER:-node}" = node ]; then
    node "$here/render-report.mjs" "$chromium_bin" "$1" "$2"
  else
    check_with_dump_dom "$1" "$2"
  fi
}

if [ "$1" != "--self-test" ]; then
  set +e
  check "$1" "$2"
  exit $?
fi

# Self-test: one good page must pass; each broken page must fail with exit 1.
out="$2"
mkdir -p "$out"
svg='<svg xmlns="http://www.w3.org/2000/svg" data-figure="a" width="200" height="100" viewBox="0 0 200 100"><rect width="100" height="50" fill="#0072B2"/></svg>'
csp='<meta http-equiv="Content-Security-Policy" content="default-src '"'none'"'; style-src '"'unsafe-inline'"'; img-src data:"/>'
page() { printf '<!DOCTYPE html><html><head>%s<meta name="switchfit-figures" content="%s"/></head><body>%s</body></html>\n' "$csp" "$1" "$2"; }
page "a" "$svg" >"$out/good.html"
page "a" "$svg<img src=\"https://example.invalid/x.png\"/>" >"$out/blocked-load.html"
page "a" "$svg<script>console.error('x')</script>" >"$out/script.html"
page "a b" "$svg" >"$out/missing-figure.html"
page "a" "${svg/<rect width=\"100\" height=\"50\" fill=\"#0072B2\"\/>/}" >"$out/empty-figure.html"
fails=0
set +e
for driver in node dump-dom; do
  if [ $driver = node ] && ! command -v node >/dev/null; then continue; fi
  export RENDER_REPORT_DRIVER=$driver
  check "$out/good.html" "$out/$driver-good" >/dev/null 2>&1
  rc=$?
  if [ $rc -ne 0 ]; then echo "self-test ($driver): good page failed (exit $rc)" >&2; fails=$((fails + 1)); fi
  for bad in blocked-load script missing-figure empty-figure; do
    check "$out/$bad.html" "$out/$driver-$bad" >/dev/null 2>&1
    rc=$?
    if [ $rc -ne 1 ]; then echo "self-test ($driver): $bad was not caught (exit $rc)" >&2; fails=$((fails + 1)); fi
  done
done
if [ $fails -ne 0 ]; then
  echo "render-report self-test: $fails problems" >&2
  exit 1
fi
echo "render-report self-test: OK (good page passes; blocked load, script, missing and empty figure caught)"
