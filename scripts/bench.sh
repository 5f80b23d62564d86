#!/usr/bin/env sh
# Speed and memory figures as ratios measured in one run (bench/run.py). Sets up what it needs.
# Usage: sh scripts/bench.sh [--quick]
set -eu
cd "$(dirname "$0")/.."
. scripts/env.sh
. scripts/debian-tools.sh
exec "$VENV/bin/python" bench/run.py "$@"
