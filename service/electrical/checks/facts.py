"""What the checks of the rules beyond the calculations share: reading stated facts, and the clause texts of
the rules that apply to each circuit under its edition (:mod:`service.electrical.rules.requirements`)."""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from service.electrical.checks.base import CheckColumns
from service.electrical.rules import requirements


def stated(values: np.ndarray, value: object) -> np.ndarray:
    """Where a fact (an object column of True, False, words or None) was stated as ``value``; a fact not stated
    (None) is never equal to a stated one."""
    return np.array([v is value or (v is not None and v == value) for v in values.tolist()], dtype=bool)


def unknown(values: np.ndarray) -> np.ndarray:
    """Where a fact was not stated."""
    return np.array([v is None for v in values.tolist()], dtype=bool)


def among(values: np.ndarray, words: Sequence[str]) -> np.ndarray:
    chosen = frozenset(words)
    return np.array([v in chosen for v in values.tolist()], dtype=bool)


def bases(editions: np.ndarray, masks: Sequence[np.ndarray], rules: Sequence[str], default: str) -> np.ndarray:
    """Per row, the clauses of the rules whose mask holds there (``default`` where none does), under the row's
    edition: 'BS 7671:2018+A4:2026 411.3.3, 701.411.3.3 (carried forward ...)'. Each distinct text is made once."""
    flags = list(zip(*(np.asarray(m, bool).tolist() for m in masks), strict=True)) if masks else None
    spelled: dict[tuple, str] = {}
    out = []
    for i, edition in enumerate(editions.tolist()):
        key = (edition, flags[i] if flags is not None else ())
        text = spelled.get(key)
        if text is None:
            names = [rule for rule, on in zip(rules, key[1], strict=True) if on] or [default]
            text = spelled[key] = requirements.basis(edition, names)
        out.append(text)
    return np.array(out, dtype=object)


def joined(masks: Sequence[np.ndarray], texts: Sequence[str], head: str, tail: str) -> np.ndarray:
    """Per row, ``head`` and the texts whose masks hold there joined by '; ', then ``tail`` (None where none
    holds): a note that names every fact missing at once."""
    out = []
    for flags in zip(*(np.asarray(m, bool).tolist() for m in masks), strict=True):
        said = [t for t, on in zip(texts, flags, strict=True) if on]
        out.append(head + "; ".join(said) + tail if said else None)
    return np.array(out, dtype=object)


def spread(check: CheckColumns, inverse: np.ndarray) -> CheckColumns:
    """A check computed once per distinct combination of facts, given to each circuit (``inverse``: its row)."""
    check.verdict, check.value, check.limit = check.verdict[inverse], check.value[inverse], check.limit[inverse]
    check.basis, check.note, check.margin_percent = (
        check.basis[inverse],
        check.note[inverse],
        check.margin_percent[inverse],
    )
    if check.applies is not None:
        check.applies = np.asarray(check.applies)[inverse]
    check.cautions = [(np.asarray(mask)[inverse], text) for mask, text in check.cautions]
    return check
