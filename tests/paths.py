"""Where the tests find the project's files."""

from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
EXAMPLES = ROOT / "schemas" / "examples"
CONTRACT = ROOT / "schemas" / "openapi.json"
