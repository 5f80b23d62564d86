#!/usr/bin/env sh
# The reliability report (bench/reliability.py): corpus, soaks, faults, lost items, schemathesis.
# Sets up what it needs. Usage: sh scripts/reliability.sh [--quick]
set -eu
cd "$(dirname "$0")/.."
. scripts/env.sh
. scripts/debian-tools.sh
exec "$VENV/bin/python" bench/reliability.py "$@"
