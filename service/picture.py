"""The time-current picture as SVG, drawn from the same characteristic the calculation reads.

Log-log axes (current in A, time in s) with labelled decades; the device's maximum operating times
(published parts solid, estimated parts dashed, the 'at most' end dotted), the earth fault current as a
vertical line, the permitted time as a horizontal line, and the operating point with its figures.
Bytes are deterministic for the same input: a fixed SVG hash salt and no date in the metadata.
"""

from __future__ import annotations

import io
import math
import threading
from typing import Any

from .electrical.devices.base import Device

STYLE = {
    "curve": "#1f5f5b",
    "estimated": "#b5651d",
    "fault": "#6b3fa0",
    "limit": "#b03a2e",
    "point": "#111111",
    "grid": "#d9d9d9",
    "face": "#fbfbf8",
}
_LOCK = threading.Lock()
_READY = False


def warm() -> None:
    """Import matplotlib and set it up once (a worker calls this before it takes traffic)."""
    global _READY
    with _LOCK:
        if _READY:
            return
        import matplotlib

        matplotlib.use("Agg")
        matplotlib.rcParams.update({"svg.hashsalt": "faultpath", "svg.fonttype": "none", "font.family": "DejaVu Sans"})
        _READY = True


def _plain(value: float, _pos: Any = None) -> str:
    return f"{value:g}" if value >= 0.001 else f"{value:.0e}"


def characteristic_svg(
    device: Device,
    fault_current_a: float | None = None,
    time_s: float | None = None,
    permitted_time_s: float | None = None,
    verdict: str | None = None,
    bound: str | None = None,
) -> bytes:
    """The device's curve as SVG bytes, with the fault's operating point where given."""
    warm()
    from matplotlib.figure import Figure
    from matplotlib.ticker import FuncFormatter, LogLocator, NullFormatter

    ch = device.characteristic
    currents = [float(c) for c in ch.current_a]
    times = [float(t) for t in ch.time_s]
    x_lo = min(currents) / 2
    x_hi = max(currents) * 4
    if fault_current_a is not None and math.isfinite(fault_current_a):
        x_lo, x_hi = min(x_lo, fault_current_a / 2), max(x_hi, fault_current_a * 2)
    y_lo = min(min(times) / 3, 0.01, (permitted_time_s or 1) / 3)
    y_hi = max(max(times) * 3, 100)
    x_lo, x_hi = 10 ** math.floor(math.log10(x_lo)), 10 ** math.ceil(math.log10(x_hi))
    y_lo, y_hi = 10 ** math.floor(math.log10(y_lo)), 10 ** math.ceil(math.log10(y_hi))

    fig = Figure(figsize=(7.2, 5.4), dpi=100, facecolor="white")
    ax = fig.add_subplot(1, 1, 1)
    ax.set_gid("axes")
    ax.set_facecolor(STYLE["face"])
    ax.set_xscale("log")
    ax.set_yscale("log")
    ax.set_xlim(x_lo, x_hi)
    ax.set_ylim(y_lo, y_hi)
    for axis in (ax.xaxis, ax.yaxis):
        axis.set_major_locator(LogLocator(base=10))
        axis.set_major_formatter(FuncFormatter(_plain))
        axis.set_minor_formatter(NullFormatter())
    ax.grid(True, which="major", color=STYLE["grid"], linewidth=0.8)
    ax.grid(True, which="minor", color=STYLE["grid"], linewidth=0.3)
    ax.set_xlabel("prospective current (A)")
    ax.set_ylabel("maximum operating time (s)")

    shown = set()
    for k in range(len(currents) - 1):
        estimated = bool(ch.estimated[k] or ch.estimated[k + 1])
        label = "estimated (see device notes)" if estimated else "published limits"
        (line,) = ax.plot(currents[k:k + 2], times[k:k + 2], color=STYLE["estimated" if estimated else "curve"],
                          linestyle="--" if estimated else "-", linewidth=2.2,
                          label=None if label in shown else label)
        line.set_gid(f"curve-{k}")
        shown.add(label)
    published = [(c, t) for c, t, e in zip(currents, times, ch.estimated) if not e]
    if published:
        (marks,) = ax.plot([c for c, _ in published], [t for _, t in published], marker="s", markersize=5, linestyle="none",
                           color=STYLE["curve"], label="published point")
        marks.set_gid("published-points")
    (tail,) = ax.plot([currents[-1], x_hi], [times[-1], times[-1]], color=STYLE["curve"], linestyle=":", linewidth=1.6,
                      label=f"at most {times[-1]:g} s (end of the data)")
    tail.set_gid("curve-end")
    if permitted_time_s is not None and math.isfinite(permitted_time_s):
        line = ax.axhline(permitted_time_s, color=STYLE["limit"], linestyle="-.", linewidth=1.4,
                          label=f"permitted time {permitted_time_s:g} s")
        line.set_gid("permitted-time")
    if fault_current_a is not None and math.isfinite(fault_current_a):
        line = ax.axvline(fault_current_a, color=STYLE["fault"], linewidth=1.4, label=f"earth fault current {fault_current_a:,.0f} A")
        line.set_gid("fault-current")
        if time_s is not None and math.isfinite(time_s):
            (point,) = ax.plot([fault_current_a], [time_s], marker="o", markersize=8, color=STYLE["point"], linestyle="none")
            point.set_gid("operating-point")
            word = "at most " if bound == "at-most" else ""
            note = " (estimated)" if bound == "estimated" else ""
            right = math.log(fault_current_a / x_lo) / math.log(x_hi / x_lo) > 0.6
            ax.annotate(f"{fault_current_a:,.0f} A, {word}{time_s:.3g} s{note}", (fault_current_a, time_s),
                        xytext=(-10 if right else 10, 12), textcoords="offset points", fontsize=9,
                        ha="right" if right else "left", gid="operating-point-label")
        else:
            ax.annotate("no disconnection shown", (fault_current_a, y_hi), xytext=(6, -16), textcoords="offset points",
                        fontsize=9, gid="operating-point-label")
    title = device.label
    if verdict:
        title += f": {verdict}"
    ax.set_title(title, fontsize=12, loc="left")
    ax.legend(loc="upper right", fontsize=8, frameon=True, framealpha=0.9).set_gid("legend")
    fig.subplots_adjust(left=0.14, right=0.97, bottom=0.11, top=0.92)
    buffer = io.BytesIO()
    fig.savefig(buffer, format="svg", metadata={"Date": None, "Creator": "Faultpath"})
    return buffer.getvalue()
