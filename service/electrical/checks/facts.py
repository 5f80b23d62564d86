"""What the checks of the rules beyond the calculations share: reading stated facts, and the clause texts of
the rules that apply to each circuit under its edition (:mod:`service.electrical.requirements`)."""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from .. import requirements


def stated(values: np.ndarray, value: object) -> np.ndarray:
    """Where a fact was stated as ``value`` (True, False or a word); a fact not stated (None) is never equal."""
    return np.array([v is value or (v is not None and v == value) for v in values.tolist()], dtype=bool)


def unknown(values: np.ndarray) -> np.ndarray:
    """Where a fact was not stated."""
    return np.array([v is None for v in values.tolist()], dtype=bool)


def among(values: np.ndarray, words: Sequence[str]) -> np.ndarray:
    chosen = frozenset(words)
    return np.array([v in chosen for v in values.tolist()], dtype=bool)


def bases(editions: np.ndarray, masks: Sequence[np.ndarray], rules: Sequence[str], default: str) -> np.ndarray:
    """Per circuit, the clauses of the rules whose mask holds there (``default`` where none does), under the
    circuit's edition: 'BS 7671:2018+A4:2026 411.3.3, 701.411.3.3 (carried forward ...)'."""
    n = len(editions)
    if not masks:
        bits = np.zeros(n, dtype=np.int64)
    else:
        weights = 1 << np.arange(len(masks), dtype=np.int64)
        bits = np.vstack([np.asarray(m, bool) for m in masks]).T.astype(np.int64) @ weights
    names_of = {e: k for k, e in enumerate(dict.fromkeys(editions.tolist()))}
    edition_codes = np.array([names_of[e] for e in editions.tolist()], dtype=np.int64)
    patterns, inverse = np.unique(edition_codes << 32 | bits, return_inverse=True)
    by_code = list(names_of)
    texts = []
    for pattern in patterns.tolist():
        edition = by_code[pattern >> 32]
        names = [rule for j, rule in enumerate(rules) if pattern >> j & 1] or [default]
        clauses = ", ".join(dict.fromkeys(requirements.rule(edition, name)["clause"] for name in names))
        where = requirements.rule(edition, names[0])["basis"].split("(", 1)[1]
        texts.append(f"{edition} {clauses} ({where}")
    return np.array(texts, dtype=object)[inverse.reshape(-1)]


def joined(masks: Sequence[np.ndarray], texts: Sequence[str], head: str, tail: str) -> np.ndarray:
    """Per circuit, ``head`` and the texts whose masks hold there joined by '; ', then ``tail`` (None where none
    holds): a note that names every fact missing at once. Each distinct combination is spelled once."""
    weights = 1 << np.arange(len(masks), dtype=np.int64)
    bits = np.vstack([np.asarray(m, bool) for m in masks]).T.astype(np.int64) @ weights
    patterns, inverse = np.unique(bits, return_inverse=True)
    spelled = [
        head + "; ".join(t for j, t in enumerate(texts) if p >> j & 1) + tail if p else None for p in patterns.tolist()
    ]
    return np.array(spelled, dtype=object)[inverse.reshape(-1)]
