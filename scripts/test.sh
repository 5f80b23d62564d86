#!/usr/bin/env sh
# Run the whole test suite. On a fresh machine it first makes a virtual environment and installs
# the project with its test extra, pinned by constraints.txt. Extra arguments go to pytest.
set -eu
cd "$(dirname "$0")/.."
. scripts/env.sh
"$VENV/bin/python" -m pip check
exec "$VENV/bin/python" -m pytest "$@"
