#!/usr/bin/env sh
# Run the whole test suite. On a fresh machine it first makes a virtual environment and installs
# the project with its test extra, pinned by constraints.txt. Then lint (ruff, configured in
# pyproject.toml) and the tests. Extra arguments go to pytest.
set -eu
cd "$(dirname "$0")/.."
. scripts/env.sh
"$VENV/bin/python" -m pip check
"$VENV/bin/ruff" check service tests bench
"$VENV/bin/ruff" format --check --quiet service tests bench
exec "$VENV/bin/python" -m pytest "$@"
