"""The house holds (tests/structure.json): every import of service/ and deploy/ walked, file by file.

It fails on an import between two parts that is a ``never``, on one that no arrow allows (an import that runs
back up), on a file that belongs to no part, and on a circle of imports among the files. Run it alone with
``python -m pytest tests/test_structure.py``.
"""

import ast
import json
from pathlib import Path

from tests.paths import ROOT

STRUCTURE = json.loads((ROOT / "tests" / "structure.json").read_text(encoding="utf-8"))
FILES = sorted([*(ROOT / "service").rglob("*.py"), *(ROOT / "deploy").rglob("*.py")])


def part_of(path: Path) -> str | None:
    """The part whose ``is`` holds the file (the longest prefix wins)."""
    relative = path.relative_to(ROOT).as_posix()
    best = None
    for name, part in STRUCTURE["parts"].items():
        for prefix in part["is"]:
            if (relative == prefix or (prefix.endswith("/") and relative.startswith(prefix))) and (
                best is None or len(prefix) > len(best[1])
            ):
                best = (name, prefix)
    return best and best[0]


def module_file(module: str) -> Path | None:
    """The file of a ``service...`` module, None for anything else."""
    if module != "service" and not module.startswith("service."):
        return None
    base = ROOT.joinpath(*module.split("."))
    for candidate in (base.with_suffix(".py"), base / "__init__.py"):
        if candidate.exists():
            return candidate
    return None


def imports_of(path: Path) -> set[Path]:
    """The project's files that ``path`` imports, anywhere in it (inside functions too)."""
    found: set[Path] = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        names: list[str] = []
        if isinstance(node, ast.Import):
            names = [alias.name for alias in node.names]
        elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
            names = [node.module] + [f"{node.module}.{alias.name}" for alias in node.names]
        for name in names:
            target = module_file(name)
            if target is not None and target != path:
                found.add(target)
    return found


GRAPH = {path: imports_of(path) for path in FILES}


def test_every_file_is_in_a_part():
    assert [str(p.relative_to(ROOT)) for p in FILES if part_of(p) is None] == []


def test_no_never_is_broken_and_every_import_follows_an_arrow():
    nevers = {(a, b): why for a, b, why in STRUCTURE["never"]}
    arrows = {tuple(pair) for pair in STRUCTURE["arrows"]}
    broken, unexpected = [], []
    for path, targets in GRAPH.items():
        for target in targets:
            pair = (part_of(path), part_of(target))
            if pair[0] == pair[1]:
                continue
            where = f"{path.relative_to(ROOT)} -> {target.relative_to(ROOT)}"
            if pair in nevers:
                broken.append(f"{where}: never {pair[0]} -> {pair[1]} ({nevers[pair]})")
            elif pair not in arrows:
                unexpected.append(f"{where}: no arrow {pair[0]} -> {pair[1]}")
    assert broken == [] and unexpected == []


def test_no_circle_of_imports():
    """Tarjan's strongly connected components over the files; a component of more than one file is a circle
    (a package's ``__init__`` importing its own modules is not one: those edges are left out)."""
    index: dict[Path, int] = {}
    low: dict[Path, int] = {}
    stack: list[Path] = []
    circles: list[list[str]] = []

    def edges(path: Path) -> list[Path]:
        return [t for t in GRAPH.get(path, ()) if not (t.name == "__init__.py" and path.is_relative_to(t.parent))]

    def visit(path: Path) -> None:
        index[path] = low[path] = len(index)
        stack.append(path)
        for target in edges(path):
            if target not in index:
                visit(target)
                low[path] = min(low[path], low[target])
            elif target in stack:
                low[path] = min(low[path], index[target])
        if low[path] == index[path]:
            component = []
            while True:
                member = stack.pop()
                component.append(str(member.relative_to(ROOT)))
                if member == path:
                    break
            if len(component) > 1:
                circles.append(sorted(component))

    for path in FILES:
        if path not in index:
            visit(path)
    assert circles == []


def test_the_walk_sees_what_it_should():
    # a check that could not fail would prove nothing: the walk finds the arrows that are known to exist
    core = ROOT / "service" / "electrical" / "pipeline.py"
    assert any(core in targets for path, targets in GRAPH.items() if part_of(path) == "HTTP")
    assert part_of(ROOT / "service" / "contract" / "problems.py") == "Contract"
