"""A time-current characteristic: maximum operating time against current.

Points are (current, time) pairs of *maximum* operating times. Between points the curve runs
straight on log-log axes, the way a designer reads the printed graph (conservative for fuse
curves, which are convex on those axes). A step is written as two points with the same current
(a vertical drop, e.g. a circuit-breaker's instantaneous limit) or the same time (a flat run).

Outside the data nothing is extrapolated: below the lowest current no operation is shown
(``beyond-data``); above the highest the time is 'at most' the shortest time given (``at-most``).
Segments that touch an estimated point report ``estimated``.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field
from enum import StrEnum
from typing import Any

import numpy as np

from service.electrical.column_tools import as_float, scalar_io, select
from service.electrical.errors import InvalidInput


class Bound(StrEnum):
    """How a time (or a current) read off a characteristic is bounded."""

    INTERPOLATED = "interpolated"
    ESTIMATED = "estimated"
    AT_MOST = "at-most"
    BEYOND_DATA = "beyond-data"


BOUNDS: tuple[Bound, ...] = tuple(Bound)  # on arrays a bound is its position here (an int8 code)
INTERPOLATED, ESTIMATED, AT_MOST, BEYOND_DATA = (np.int8(i) for i in range(len(BOUNDS)))
_BOUND_OBJECTS = np.array(BOUNDS, dtype=object)


def bound_names(codes: Any) -> np.ndarray:
    """The bounds (as an object array of :class:`Bound`) of an array of codes."""
    return _BOUND_OBJECTS[np.asarray(codes, dtype=np.intp)]


@dataclass(frozen=True)
class Characteristic:
    """Tabulated maximum operating times, with log-log interpolation and its inverse."""

    current_a: np.ndarray
    time_s: np.ndarray
    estimated: np.ndarray = field(default=None)  # type: ignore[assignment]

    def __post_init__(self) -> None:
        current = np.asarray(self.current_a, dtype=float)
        time = np.asarray(self.time_s, dtype=float)
        est = np.zeros(current.shape, dtype=bool) if self.estimated is None else np.asarray(self.estimated, bool)
        if current.ndim != 1 or current.shape != time.shape or est.shape != current.shape or len(current) < 1:
            raise InvalidInput("curve_points", "a characteristic needs (current, time) points")
        if (
            not (np.all(np.isfinite(current)) and np.all(np.isfinite(time)))
            or np.any(current <= 0)
            or np.any(time <= 0)
        ):
            raise InvalidInput("curve_points", "currents and times must be finite and greater than zero")
        d_current = np.diff(current)
        d_time = np.diff(time)
        if np.any(d_current < 0) or np.any(d_time > 0) or np.any((d_current == 0) & (d_time == 0)):
            raise InvalidInput("curve_points", "time must fall as current rises (no repeated point)")
        object.__setattr__(self, "current_a", current)
        object.__setattr__(self, "time_s", time)
        object.__setattr__(self, "estimated", est)
        object.__setattr__(self, "_lx", np.log(current))
        object.__setattr__(self, "_ly", np.log(time))

    @classmethod
    def from_points(
        cls, points: Sequence[tuple[float, float]], estimated: Sequence[bool] | None = None
    ) -> Characteristic:
        current, time = zip(*points, strict=True) if points else ((), ())
        return cls(
            np.asarray(current, float),
            np.asarray(time, float),
            None if estimated is None else np.asarray(estimated, bool),
        )

    @property
    def min_time_s(self) -> float:
        return float(self.time_s[-1])

    @property
    def min_current_a(self) -> float:
        return float(self.current_a[0])

    @scalar_io
    def time_at(self, current_a: Any) -> tuple[np.ndarray, np.ndarray]:
        """Maximum operating time (s) at each current (A), and how it is bounded.

        Parameters
        ----------
        current_a : float or array of float
            Prospective current, A.

        Returns
        -------
        time_s : float or array
            Maximum operating time, s; ``inf`` where the current is below the data.
        bound : Bound or array of Bound
            ``interpolated``, ``estimated``, ``at-most`` (above the data) or ``beyond-data``.

        At a vertical step the lower time applies (the device operates within it at that current).
        """
        time, codes = self.time_codes(current_a)
        return time, bound_names(codes)

    @scalar_io
    def current_for(self, time_s: Any) -> tuple[np.ndarray, np.ndarray]:
        """Smallest current (A) that operates the device within each time (s), and how it is bounded.

        Returns ``(current_a, bound)``: ``nan`` with ``beyond-data`` where the time is shorter than the
        data show; the lowest current with ``at-most`` where the time is longer than the longest time
        given (the device operates within that time at that current, perhaps lower).
        """
        current, codes = self.current_codes(time_s)
        return current, bound_names(codes)

    def time_codes(self, current_a: Any) -> tuple[np.ndarray, np.ndarray]:
        """:meth:`time_at` on arrays, with the bounds as int8 codes (the array path's form)."""
        x = np.log(np.maximum(as_float(current_a), np.finfo(float).tiny))
        lx, ly, est = self._lx, self._ly, self.estimated
        if len(lx) == 1:  # one published point: 'at most' that time at and above its current
            at = x >= lx[0]
            first = ESTIMATED if est[0] else INTERPOLATED
            code = select([x == lx[0], at], [first, ESTIMATED if est[0] else AT_MOST], BEYOND_DATA)
            return np.where(at, self.time_s[0], np.inf), code.astype(np.int8)
        last = len(lx) - 1
        i = np.searchsorted(lx, x, side="right") - 1
        below = i < 0
        above = i >= last
        lo = np.clip(i, 0, last - 1)
        hi = lo + 1
        span = lx[hi] - lx[lo]
        with np.errstate(divide="ignore", invalid="ignore"):
            frac = np.clip(np.where(span > 0, (x - lx[lo]) / np.where(span > 0, span, 1.0), 1.0), 0.0, 1.0)
        y = ly[lo] + frac * (ly[hi] - ly[lo])
        # exactly on a point: the tabulated value itself, not its round trip through logarithms
        time = select(
            [below, above, (frac >= 1) | (ly[hi] == ly[lo]), frac <= 0],
            [np.inf, self.time_s[-1], self.time_s[hi], self.time_s[lo]],
            np.exp(y),
        )
        seg_est = (est[lo] & (frac < 1)) | (est[hi] & (frac > 0))
        # an answer that rests on an estimated end point keeps saying so
        end = ESTIMATED if est[-1] else AT_MOST
        code = select([below, above], [BEYOND_DATA, end], np.where(seg_est, ESTIMATED, INTERPOLATED))
        return time, code.astype(np.int8)

    def current_codes(self, time_s: Any) -> tuple[np.ndarray, np.ndarray]:
        """:meth:`current_for` on arrays, with the bounds as int8 codes."""
        t = np.log(np.maximum(as_float(time_s), np.finfo(float).tiny))
        lx, ly, est = self._lx, self._ly, self.estimated
        if len(lx) == 1:
            ok = t >= ly[0]
            first = ESTIMATED if est[0] else INTERPOLATED
            code = select([~ok, t == ly[0]], [BEYOND_DATA, first], ESTIMATED if est[0] else AT_MOST)
            return np.where(ok, self.current_a[0], np.nan), code.astype(np.int8)
        last = len(lx) - 1
        # first index whose time is at or below the target (times fall along the curve)
        j = np.searchsorted(-ly, -t, side="left")
        too_short = t < ly[-1]
        too_long = t > ly[0]
        j_safe = np.clip(j, 1, last)
        lo, hi = j_safe - 1, j_safe
        span = ly[lo] - ly[hi]
        with np.errstate(divide="ignore", invalid="ignore"):
            frac = np.clip(np.where(span > 0, (ly[lo] - t) / np.where(span > 0, span, 1.0), 1.0), 0.0, 1.0)
        x = lx[lo] + frac * (lx[hi] - lx[lo])
        first = (j == 0) | too_long  # at or beyond the first point's time
        current = select(
            [too_short, first, (frac >= 1) | (lx[hi] == lx[lo]), frac <= 0],
            [np.nan, self.current_a[0], self.current_a[hi], self.current_a[lo]],
            np.exp(x),
        )
        seg_est = np.where(first, est[0], (est[lo] & (frac < 1)) | (est[hi] & (frac > 0)))
        code = select(
            [too_short, too_long & ~est[0]], [BEYOND_DATA, AT_MOST], np.where(seg_est, ESTIMATED, INTERPOLATED)
        )
        return current, code.astype(np.int8)

    def points(self) -> list[dict[str, Any]]:
        """The points as plain records, for an API answer or a picture."""
        return [
            {"current_a": float(c), "time_s": float(t), "estimated": bool(e)}
            for c, t, e in zip(self.current_a, self.time_s, self.estimated, strict=True)
        ]
