#!/bin/sh
# Renders a dragdeck HTML page to PNG with headless Chromium, for a look.
# Opt-in (CI installs no browser): needs Debian's chromium package
# (apt-get install chromium). Usage:
#   testdata/checks/render_html.sh page.html [page.png] [width] [height]
# The page is opened from the file system; the closed-network flags keep
# Chromium from reaching out (the page needs nothing from outside).
set -eu
page=$1
out=${2:-${page%.html}.png}
w=${3:-1200}
h=${4:-4000}
profile=$(mktemp -d)
trap 'rm -rf "$profile"' EXIT
chromium --headless --no-sandbox --disable-gpu --disable-quic --no-first-run \
  --disable-background-networking --disable-component-update --disable-sync \
  --user-data-dir="$profile" --hide-scrollbars --window-size="$w,$h" \
  --screenshot="$out" "file://$(realpath "$page")" 2>/dev/null
echo "$out"
