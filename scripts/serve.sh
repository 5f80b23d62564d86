#!/usr/bin/env sh
# Start the service on its embedded defaults (http://127.0.0.1:8000, no API key needed on loopback).
# On a fresh machine it first makes a virtual environment and installs the project, pinned by
# constraints.txt. Every setting can be changed by environment variable (see README).
set -eu
cd "$(dirname "$0")/.."
VENV="${FAULTPATH_VENV:-.venv}"
if [ ! -x "$VENV/bin/python" ]; then
  python3 -m venv "$VENV"
fi
"$VENV/bin/python" -m pip install --quiet --disable-pip-version-check -c constraints.txt -e .
exec "$VENV/bin/python" -m service serve
