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

from service.electrical.devices.base import Device

STYLE = {
    "curve": "#1f5f5b",
    "estimated": "#b5651d",
    "fault": "#6b3fa0",
    "limit": "#b03a2e",
    "point": "#111111",
    "grid": "#d9d9d9",
    "upstream": "#3b4f8c",
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


def _decades(lo: float, hi: float) -> tuple[float, float]:
    return 10 ** math.floor(math.log10(lo)), 10 ** math.ceil(math.log10(hi))


def _finite(value: float | None) -> bool:
    return value is not None and math.isfinite(value)


def _axes(x_range: tuple[float, float], y_range: tuple[float, float]):
    """A figure with labelled log-log axes over whole decades."""
    from matplotlib.figure import Figure
    from matplotlib.ticker import FuncFormatter, LogLocator, NullFormatter

    fig = Figure(figsize=(7.2, 5.4), dpi=100, facecolor="white")
    ax = fig.add_subplot(1, 1, 1)
    ax.set_gid("axes")
    ax.set_facecolor(STYLE["face"])
    ax.set_xscale("log")
    ax.set_yscale("log")
    ax.set_xlim(*x_range)
    ax.set_ylim(*y_range)
    for axis in (ax.xaxis, ax.yaxis):
        axis.set_major_locator(LogLocator(base=10))
        axis.set_major_formatter(FuncFormatter(_plain))
        axis.set_minor_formatter(NullFormatter())
    ax.grid(True, which="major", color=STYLE["grid"], linewidth=0.8)
    ax.grid(True, which="minor", color=STYLE["grid"], linewidth=0.3)
    ax.set_xlabel("prospective current (A)")
    ax.set_ylabel("maximum operating time (s)")
    return fig, ax


def _curve(ax, device: Device, x_hi: float) -> None:
    """A device's maximum operating times: published parts solid, estimated dashed, the 'at most' end dotted."""
    ch = device.characteristic
    currents, times = [float(c) for c in ch.current_a], [float(t) for t in ch.time_s]
    shown: set[str] = set()
    for k in range(len(currents) - 1):
        estimated = bool(ch.estimated[k] or ch.estimated[k + 1])
        label = "estimated (see device notes)" if estimated else "published limits"
        (line,) = ax.plot(
            currents[k : k + 2],
            times[k : k + 2],
            color=STYLE["estimated"] if estimated else STYLE["curve"],
            linestyle="--" if estimated else "-",
            linewidth=2.2,
            label=None if label in shown else label,
        )
        line.set_gid(f"curve-{k}")
        shown.add(label)
    published = [(c, t) for c, t, e in zip(currents, times, ch.estimated, strict=True) if not e]
    if published:
        (marks,) = ax.plot(
            [c for c, _ in published],
            [t for _, t in published],
            marker="s",
            markersize=5,
            linestyle="none",
            color=STYLE["curve"],
            label="published point",
        )
        marks.set_gid("published-points")
    (tail,) = ax.plot(
        [currents[-1], x_hi],
        [times[-1], times[-1]],
        color=STYLE["curve"],
        linestyle=":",
        linewidth=1.6,
        label=f"at most {times[-1]:g} s (end of the data)",
    )
    tail.set_gid("curve-end")


def _operating_point(ax, current_a: float, time_s: float | None, bound: str | None, x_range, y_hi: float) -> None:
    """The earth fault current as a vertical line, and where the device operates on it."""
    line = ax.axvline(current_a, color=STYLE["fault"], linewidth=1.4, label=f"earth fault current {current_a:,.0f} A")
    line.set_gid("fault-current")
    if not _finite(time_s):
        ax.annotate(
            "no disconnection shown",
            (current_a, y_hi),
            xytext=(6, -16),
            textcoords="offset points",
            fontsize=9,
            gid="operating-point-label",
        )
        return
    (point,) = ax.plot([current_a], [time_s], marker="o", markersize=8, color=STYLE["point"], linestyle="none")
    point.set_gid("operating-point")
    word = "at most " if bound == "at-most" else ""
    note = " (estimated)" if bound == "estimated" else ""
    right = math.log(current_a / x_range[0]) / math.log(x_range[1] / x_range[0]) > 0.6
    ax.annotate(
        f"{current_a:,.0f} A, {word}{time_s:.3g} s{note}",
        (current_a, time_s),
        xytext=(-10 if right else 10, 12),
        textcoords="offset points",
        fontsize=9,
        ha="right" if right else "left",
        gid="operating-point-label",
    )


def _svg(fig, ax, title: str) -> bytes:
    ax.set_title(title, fontsize=12, loc="left")
    ax.legend(loc="upper right", fontsize=8, frameon=True, framealpha=0.9).set_gid("legend")
    fig.subplots_adjust(left=0.14, right=0.95, bottom=0.11, top=0.92)
    buffer = io.BytesIO()
    fig.savefig(buffer, format="svg", metadata={"Date": None, "Creator": "Faultpath"})
    return buffer.getvalue()


def ranges(devices: list[Device], currents: list[float | None], times: list[float | None]) -> tuple[tuple, tuple]:
    """Whole-decade axis ranges that hold every device's data and every marked current and time."""
    all_currents = [float(c) for d in devices for c in d.characteristic.current_a]
    all_times = [float(t) for d in devices for t in d.characteristic.time_s]
    x_lo, x_hi = min(all_currents) / 2, max(all_currents) * 4
    for c in currents:
        if _finite(c):
            x_lo, x_hi = min(x_lo, c / 2), max(x_hi, c * 2)
    marked = [t for t in times if _finite(t)]
    y_lo = min([min(all_times) / 3, 0.01] + [t / 3 for t in marked])
    y_hi = max(max(all_times) * 3, 100)
    return _decades(x_lo, x_hi), _decades(y_lo, y_hi)


def characteristic_svg(
    device: Device,
    fault_current_a: float | None = None,
    time_s: float | None = None,
    permitted_time_s: float | None = None,
    verdict: str | None = None,
    bound: str | None = None,
) -> bytes:
    """The device's curve as SVG bytes, with the fault's operating point and the permitted time where given."""
    warm()
    x_range, y_range = ranges([device], [fault_current_a], [permitted_time_s or 1])
    fig, ax = _axes(x_range, y_range)
    _curve(ax, device, x_range[1])
    if _finite(permitted_time_s):
        line = ax.axhline(
            permitted_time_s,
            color=STYLE["limit"],
            linestyle="-.",
            linewidth=1.4,
            label=f"permitted time {permitted_time_s:g} s",
        )
        line.set_gid("permitted-time")
    if _finite(fault_current_a):
        _operating_point(ax, fault_current_a, time_s, bound, x_range, y_range[1])
    return _svg(fig, ax, device.label + (f": {verdict}" if verdict else ""))
