"""A pair of devices' time-current curves on log-log axes, as a small SVG of our own: polylines over whole decades.

The report draws each distinct pair once, and a printed page holds two. matplotlib (service/picture.py) stays
for the single pictures of the API; here a few hundred bytes of SVG do, in well under a millisecond a picture.
Both curves are maximum operating times: published parts solid, estimated parts dashed, the 'at most' end dotted.
"""

from __future__ import annotations

import math
from html import escape

from service.electrical.devices.base import Device
from service.picture import STYLE, ranges

WIDTH, HEIGHT = 500, 320
LEFT, RIGHT, TOP, BOTTOM = 46, 18, 24, 34


class Axes:
    """Whole decades of current (x) and time (y) onto the picture's box."""

    def __init__(self, x_range: tuple[float, float], y_range: tuple[float, float]):
        self.x0, self.x1 = (math.log10(v) for v in x_range)
        self.y0, self.y1 = (math.log10(v) for v in y_range)

    def x(self, current_a: float) -> float:
        return LEFT + (math.log10(current_a) - self.x0) / (self.x1 - self.x0) * (WIDTH - LEFT - RIGHT)

    def y(self, time_s: float) -> float:
        return HEIGHT - BOTTOM - (math.log10(time_s) - self.y0) / (self.y1 - self.y0) * (HEIGHT - TOP - BOTTOM)

    def points(self, currents: list[float], times: list[float]) -> str:
        return " ".join(f"{self.x(c):.1f},{self.y(t):.1f}" for c, t in zip(currents, times, strict=True))


def _label(value: float) -> str:
    return f"{value:g}" if value >= 0.001 else f"{value:.0e}"


def _grid(ax: Axes) -> list[str]:
    """Decade lines and their labels."""
    out = [f'<rect x="{LEFT}" y="{TOP}" width="{WIDTH - LEFT - RIGHT}" height="{HEIGHT - TOP - BOTTOM}" '
           f'fill="{STYLE["face"]}" stroke="#888"/>']  # fmt: skip
    for d in range(round(ax.x0), round(ax.x1) + 1):
        x = ax.x(10.0**d)
        out.append(f'<path d="M{x:.1f} {TOP}V{HEIGHT - BOTTOM}" stroke="{STYLE["grid"]}"/>')
        out.append(f'<text x="{x:.1f}" y="{HEIGHT - BOTTOM + 12}" text-anchor="middle">{_label(10.0**d)}</text>')
    for d in range(round(ax.y0), round(ax.y1) + 1):
        y = ax.y(10.0**d)
        out.append(f'<path d="M{LEFT} {y:.1f}H{WIDTH - RIGHT}" stroke="{STYLE["grid"]}"/>')
        out.append(f'<text x="{LEFT - 3}" y="{y + 3:.1f}" text-anchor="end">{_label(10.0**d)}</text>')
    out.append(f'<text x="{(LEFT + WIDTH) / 2:.0f}" y="{HEIGHT - 4}" text-anchor="middle">current (A)</text>')
    out.append(f'<text x="{LEFT + 4}" y="{HEIGHT - BOTTOM - 4}">time (s)</text>')
    return out


def _curve(ax: Axes, device: Device, colour: str, x_end: float) -> list[str]:
    """The device's maximum operating times: runs of published (solid) and estimated (dashed) segments, then the
    'at most' end (dotted) out to the edge of the picture."""
    ch = device.characteristic
    currents, times = [float(c) for c in ch.current_a], [float(t) for t in ch.time_s]
    flags = [bool(ch.estimated[k] or ch.estimated[k + 1]) for k in range(len(currents) - 1)]
    out, start = [], 0
    for k in range(1, len(flags) + 1):
        if k == len(flags) or flags[k] != flags[start]:
            dash = ' stroke-dasharray="6 3"' if flags[start] else ""
            points = ax.points(currents[start : k + 1], times[start : k + 1])
            out.append(f'<polyline points="{points}" stroke="{colour}" stroke-width="2" fill="none"{dash}/>')
            start = k
    tail = ax.points([currents[-1], x_end], [times[-1], times[-1]])
    out.append(f'<polyline points="{tail}" stroke="{colour}" stroke-width="1.5" fill="none" stroke-dasharray="2 3"/>')
    return out


def pair_svg(downstream: Device, upstream: Device, limit_a: float | None, title: str) -> str:
    """The circuit's device under the device feeding its board, and the current up to which only it operates."""
    x_range, y_range = ranges([downstream, upstream], [limit_a], [1])
    ax = Axes(x_range, y_range)
    parts = [
        f'<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 {WIDTH} {HEIGHT}" font-family="DejaVu Sans, Arial" '
        f'font-size="10" role="img" aria-label="{escape(title)}">',
        *_grid(ax),
        *_curve(ax, upstream, STYLE["upstream"], x_range[1]),
        *_curve(ax, downstream, STYLE["curve"], x_range[1]),
    ]
    legend = [(STYLE["curve"], downstream.label), (STYLE["upstream"], upstream.label)]
    if limit_a is not None and math.isfinite(limit_a) and x_range[0] < limit_a < x_range[1]:
        x = ax.x(limit_a)
        parts.append(f'<path d="M{x:.1f} {TOP}V{HEIGHT - BOTTOM}" stroke="{STYLE["limit"]}" stroke-width="1.5"/>')
        legend.append((STYLE["limit"], f"selective up to {limit_a:,.0f} A"))
    box = f'<rect x="{WIDTH - 206}" y="{TOP + 2}" width="{206 - RIGHT - 2}" height="{13 * len(legend) + 4}" '
    parts.append(box + 'fill="white" fill-opacity="0.85" stroke="#bbb"/>')
    for k, (colour, text) in enumerate(legend):
        y = TOP + 12 + 13 * k
        parts.append(f'<path d="M{WIDTH - 200} {y - 3}h14" stroke="{colour}" stroke-width="2"/>')
        parts.append(f'<text x="{WIDTH - 182}" y="{y}">{escape(text)}</text>')
    parts.append(f'<text x="{LEFT}" y="15" font-size="11" font-weight="600">{escape(title)}</text></svg>')
    return "".join(parts)
