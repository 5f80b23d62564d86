#!/usr/bin/env sh
# The schemathesis suite at a large number of examples per operation (default 1000).
# Usage: sh scripts/schemathesis.sh [EXAMPLES]
set -eu
cd "$(dirname "$0")/.."
export FAULTPATH_SCHEMATHESIS_EXAMPLES="${1:-1000}"
exec sh scripts/test.sh tests/api/test_schemathesis.py -q
