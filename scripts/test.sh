#!/usr/bin/env sh
# Run the whole test suite. On a fresh machine it first makes a virtual environment and installs
# the project with its test extra, pinned by constraints.txt. Extra arguments go to pytest.
set -eu
cd "$(dirname "$0")/.."
VENV="${FAULTPATH_VENV:-.venv}"
if [ ! -x "$VENV/bin/python" ]; then
  python3 -m venv "$VENV"
fi
"$VENV/bin/python" -m pip install --quiet --disable-pip-version-check -c constraints.txt -e ".[test]"
"$VENV/bin/python" -m pip check
exec "$VENV/bin/python" -m pytest "$@"
