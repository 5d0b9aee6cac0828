"""Plots of uneven motion: how far an arbor runs ahead of or behind even turning.

Drawn with matplotlib's Agg backend into SVG text, so the report embeds it and no
window or display is needed. The curve is the arbor's angle from
:func:`wheelgen.kinematics.angles.arbor_angles` minus the straight line of its mean
rate, over one of its turns; a second panel gives its speed relative to the mean.
"""

from __future__ import annotations

import io

import numpy as np

from ..design.model import Design
from ..design.periods import UNIT_SECONDS
from ..kinematics.angles import arbor_angles

__all__ = ["motion_plot_svg", "deviation_curve"]


def deviation_curve(
    design: Design, arbor: str, period_s: float, samples: int = 721
) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """``(times_s, deviation_deg, speed_ratio)`` over one turn of ``arbor``.

    ``deviation_deg`` is how far the arbor is ahead of even turning at its mean rate,
    in its own sense of turning (a clockwise arbor is ahead when it has turned further
    clockwise); ``speed_ratio`` the angular speed over the mean speed (1 = even), by
    central differences on the samples.
    """
    if samples < 3:
        raise ValueError(f"'samples' must be at least 3, got {samples}")
    if not period_s > 0:
        raise ValueError(f"'period_s' must be > 0 s, got {period_s}")
    t = np.linspace(0.0, period_s, samples)
    ang = np.asarray(arbor_angles(design, t)[arbor], dtype=float)
    mean = (ang[-1] - ang[0]) / period_s
    dev = (ang - ang[0] - mean * t) * (-1.0 if mean < 0 else 1.0)
    speed = np.gradient(ang, t) / mean if mean != 0 else np.ones_like(t)
    return t, dev, speed


def _time_unit(period_s: float) -> tuple[str, float]:
    for unit in ("yr", "d", "h", "min"):
        size = float(UNIT_SECONDS[unit])
        if period_s >= 2 * size:
            return unit, size
    return "s", 1.0


def motion_plot_svg(design: Design, arbor: str, period_s: float) -> str:
    """The plot as SVG text (a complete document), about 16 x 9 cm."""
    import matplotlib

    matplotlib.use("Agg")
    from matplotlib import pyplot as plt

    t, dev, speed = deviation_curve(design, arbor, period_s)
    unit, size = _time_unit(period_s)
    # fixed ids and no date: the same design gives the same bytes
    with matplotlib.rc_context({"svg.hashsalt": "wheelgen", "svg.fonttype": "none"}):
        fig, (ax1, ax2) = plt.subplots(2, 1, figsize=(6.3, 3.6), sharex=True)
        ax1.plot(t / size, dev, color="#1f5f8b", lw=1.5)
        ax1.axhline(0.0, color="#888", lw=0.8)
        ax1.set_ylabel("ahead of even\nturning (deg)")
        ax1.set_title(f"arbor {arbor}: one turn", fontsize=10)
        ax1.grid(True, lw=0.4, color="#ddd")
        ax2.plot(t / size, speed, color="#b5562d", lw=1.5)
        ax2.axhline(1.0, color="#888", lw=0.8)
        ax2.set_ylabel("speed / mean")
        ax2.set_xlabel(f"time ({unit})")
        ax2.grid(True, lw=0.4, color="#ddd")
        fig.tight_layout()
        buf = io.StringIO()
        fig.savefig(buf, format="svg", metadata={"Date": None})
        plt.close(fig)
    return buf.getvalue()
