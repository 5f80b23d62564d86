# Shared by the scripts: make the project's virtual environment if needed and install the project
# with its test extra, pinned by constraints.txt. Sourced, not run.
VENV="${FAULTPATH_VENV:-.venv}"
if [ ! -x "$VENV/bin/python" ]; then
  python3 -m venv "$VENV"
fi
"$VENV/bin/python" -m pip install --quiet --disable-pip-version-check -c constraints.txt -e ".[test]"
