"""The shape of the code the project holds itself to: short functions and files, a test file per core module."""

import ast
from pathlib import Path

import pytest

from tests.paths import ROOT

SERVICE = ROOT / "service"
MAX_FUNCTION_LINES = 60
MAX_FILE_LINES = 400
SOURCES = sorted(SERVICE.rglob("*.py"))


@pytest.mark.parametrize("path", SOURCES, ids=lambda p: str(p.relative_to(ROOT)))
def test_files_and_functions_stay_short(path):
    text = path.read_text(encoding="utf-8")
    assert len(text.splitlines()) <= MAX_FILE_LINES, f"{path.name} is longer than {MAX_FILE_LINES} lines"
    for node in ast.walk(ast.parse(text)):
        if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef)):
            length = node.end_lineno - node.lineno + 1
            assert length <= MAX_FUNCTION_LINES, f"{path.name}:{node.lineno} {node.name} has {length} lines"


def test_every_core_module_has_its_test_file():
    core = SERVICE / "electrical"
    missing = []
    for module in core.rglob("*.py"):
        if module.name == "__init__.py":
            continue
        relative = module.relative_to(core)
        expected = ROOT / "tests" / "electrical" / relative.parent / f"test_{relative.name}"
        if not expected.exists():
            missing.append(str(expected.relative_to(ROOT)))
    assert not missing, f"core modules without a test file: {missing}"


def test_verdict_words_are_written_once():
    # the words live in the Verdict enum; everything else uses it
    offenders = []
    for path in SOURCES:
        for number, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
            if any(f'"{word}"' in line for word in ("pass", "fail", "not-verified")) and path.name != "verdicts.py":
                offenders.append(f"{path.relative_to(ROOT)}:{number}")
    assert not offenders, offenders


def test_no_reference_test_reads_outside_the_repository():
    here = Path(__file__).resolve()
    for path in (ROOT / "tests").rglob("*.py"):
        if path.resolve() != here:
            text = path.read_text(encoding="utf-8")
            assert "../shared" not in text and '"shared"' not in text, path
