#!/bin/sh
# Starts the release app under Xvfb and writes a PNG of the screen.
# Usage: scripts/screenshot.sh OUT.png [PROJECT.rig.ron]
# Needs (installs nothing): Xvfb, xauth, Mesa GL/EGL, xkbcommon-x11, ImageMagick's `import`, xdotool
# (see the apt-get line in DEVELOPERS notes / the toolchain recipe). Build first: cargo build --release.
set -eu
out=${1:?usage: scripts/screenshot.sh OUT.png [PROJECT.rig.ron]}
project=${2:-}
root=$(cd "$(dirname "$0")/.." && pwd)
bin="${SCREENSHOT_BIN:-$root/target/release/rigwright}"
[ -x "$bin" ] || { echo "screenshot: build first: cargo build --release -p rigwright" >&2; exit 2; }
display=:${SCREENSHOT_DISPLAY:-97}
runtime=$(mktemp -d)
chmod 700 "$runtime"
# A fresh settings directory, so the shot does not depend on what was open last.
export RIGWRIGHT_DATA_DIR="${RIGWRIGHT_DATA_DIR:-}" XDG_DATA_HOME="$runtime/data" XDG_CONFIG_HOME="$runtime/config" HOME="$runtime/home"
mkdir -p "$HOME"
Xvfb "$display" -screen 0 1280x800x24 -nolisten tcp >/dev/null 2>&1 &
xpid=$!
cleanup() { kill "$apid" 2>/dev/null || true; kill "$xpid" 2>/dev/null || true; rm -rf "$runtime"; }
apid=
trap cleanup EXIT
sleep 2
if [ -n "$project" ]; then
    DISPLAY=$display XDG_RUNTIME_DIR=$runtime "$bin" "$project" &
else
    DISPLAY=$display XDG_RUNTIME_DIR=$runtime "$bin" &
fi
apid=$!
sleep "${SCREENSHOT_WAIT:-6}"
# Optional interaction before the shot, e.g. SCREENSHOT_XDOTOOL="mousemove 600 400 click 1".
if [ -n "${SCREENSHOT_XDOTOOL:-}" ]; then
    # shellcheck disable=SC2086
    DISPLAY=$display xdotool $SCREENSHOT_XDOTOOL
    sleep 2
fi
DISPLAY=$display import -window root "$out"
echo "screenshot: wrote $out"
