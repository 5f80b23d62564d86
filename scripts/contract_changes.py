"""What changed between two OpenAPI documents, descriptions apart: `python scripts/contract_changes.py OLD NEW`.

Prints whether the two are the same byte for byte once every description is left out (keys in their written
order), and which descriptions were added, changed or removed. Exit 1 when anything but descriptions changed.
"""

import json
import sys


def without_descriptions(node):
    if isinstance(node, dict):
        return {k: without_descriptions(v) for k, v in node.items() if not (k == "description" and isinstance(v, str))}
    if isinstance(node, list):
        return [without_descriptions(v) for v in node]
    return node


def descriptions(node, path=""):
    found = {}
    if isinstance(node, dict):
        for key, value in node.items():
            if key == "description" and isinstance(value, str):
                found[path] = value
            else:
                found.update(descriptions(value, f"{path}/{key}"))
    elif isinstance(node, list):
        for k, value in enumerate(node):
            found.update(descriptions(value, f"{path}/{k}"))
    return found


def main(old_path: str, new_path: str) -> int:
    old, new = (json.load(open(p, encoding="utf-8")) for p in (old_path, new_path))
    same = json.dumps(without_descriptions(old), indent=2) == json.dumps(without_descriptions(new), indent=2)
    before, after = descriptions(old), descriptions(new)
    added = [p for p in after if p not in before or before[p] == ""]
    changed = [p for p in after if p in before and before[p] not in ("", after[p])]
    removed = [p for p in before if p not in after]
    print(f"identical apart from descriptions: {same}")
    print(f"descriptions added: {len(added)}, changed: {len(changed)}, removed: {len(removed)}")
    for p in changed + removed:
        print(f"  {p}: {before.get(p)!r} -> {after.get(p)!r}")
    return 0 if same else 1


if __name__ == "__main__":
    raise SystemExit(main(*sys.argv[1:3]))
