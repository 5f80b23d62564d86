"""The runtime policy: how the Python process is set once, when a worker (or the CLI) starts, and never per request.

Python's cyclic collector scans every tracked object at each full pass. A worker holds the app, numpy and
matplotlib (about 80 000 objects) for its whole life, and a batch makes hundreds of thousands of small objects
without reference cycles. So, once, after the imports:

- ``gc.freeze()`` moves every object alive then out of the collector's sight: later passes scan only what the
  requests make;
- a higher first-generation threshold lets a request's objects be freed by reference counting before a pass
  comes, instead of being scanned while they are built.

The collector stays on throughout, in every thread: a request that never ends (a client that holds an upload
open) cannot stop collection for the others, as a per-request pause did.
"""

from __future__ import annotations

import gc

# objects made before a first-generation pass (Python's default 700); the older generations keep their defaults
FIRST_GENERATION_THRESHOLD = 50_000


def apply() -> None:
    """Set the policy: collect what start-up left, freeze the rest, raise the first generation's threshold."""
    gc.collect()
    gc.freeze()
    _, second, third = gc.get_threshold()
    gc.set_threshold(FIRST_GENERATION_THRESHOLD, second, third)
    gc.enable()


def describe() -> dict[str, int]:
    """What the policy set (for /metrics' neighbours, tests and the bench)."""
    first, second, third = gc.get_threshold()
    return {"frozen_objects": gc.get_freeze_count(), "threshold_0": first, "threshold_1": second, "threshold_2": third}
