"""Plots of transmission error: how unevenly each mesh passes on the motion.

The driving wheel of a mesh is turned through one tooth pitch at a steady rate in the
mesh simulator (:func:`wheelgen.checks.mesh_sim.simulate_mesh`, at the working centre
distance, teeth as the checks make them); the curve is the driven wheel's angle less
the exact ratio. Involute teeth give a flat line; straight-sided (triangular) teeth
give a wave within every tooth. Drawn with matplotlib's Agg backend into SVG text,
like :mod:`wheelgen.workshop.motion_plot`.
"""

from __future__ import annotations

import io
import math
from dataclasses import dataclass

import numpy as np

from ..design.model import Design
from ..layout.placement import tooth_spec, working_centre_distance
from ..teeth.forms import outline_for

__all__ = ["TeCurve", "mesh_te_curves", "te_plot_svg", "te_comparison_svg"]

#: Driver positions per pitch for the plots: fine enough for a smooth curve.
PLOT_STEPS = 241
_COLOURS = {"involute": "#1f5f8b", "triangular": "#b5562d"}
#: Smallest half-height of a plot's scale, degrees: ten times the simulator's
#: resolution (about 0.001 degrees), so that its noise never fills a plot.
MIN_HALF_RANGE_DEG = 0.01


@dataclass(frozen=True, slots=True, eq=False)
class TeCurve:
    """One mesh's transmission error over one pitch of its driving wheel.

    ``pitch_share`` runs from 0 to 1 (driver turned, in its tooth pitches);
    ``te_deg`` is the driven wheel's angle less the exact ratio, degrees (``nan``
    where no tooth drives); ``peak_to_peak_deg`` its range (``inf`` if contact is
    lost); ``jams`` the outlines overlap somewhere.
    """

    label: str
    form: str
    teeth: tuple[int, int]
    pitch_share: np.ndarray
    te_deg: np.ndarray
    peak_to_peak_deg: float
    jams: bool


def mesh_te_curves(design: Design) -> list[TeCurve]:
    """One curve per ``[[mesh]]`` whose teeth can be made (others are skipped)."""
    from ..checks.mesh_sim import simulate_mesh

    out = []
    for mesh in design.meshes:
        w1, w2 = design.wheel(mesh.pair[0]), design.wheel(mesh.pair[1])
        try:
            s1, s2 = tooth_spec(w1), tooth_spec(w2)
            if s1.form != s2.form:
                continue
            a = working_centre_distance(s1, s2)
            sim = simulate_mesh(outline_for(s1), outline_for(s2), a, steps=PLOT_STEPS)
        except ValueError:
            continue  # teeth that cannot be made: the checks report them
        share = np.linspace(0.0, 1.0, len(sim.driver_deg))
        out.append(
            TeCurve(
                label=mesh.label,
                form=s1.form,
                teeth=(s1.teeth, s2.teeth),
                pitch_share=share,
                te_deg=np.asarray(sim.te_deg, dtype=float),
                peak_to_peak_deg=sim.te_peak_to_peak_deg,
                jams=sim.jams,
            )
        )
    return out


def _title(curve: TeCurve) -> str:
    z1, z2 = curve.teeth
    pp = curve.peak_to_peak_deg
    size = "contact lost" if not math.isfinite(pp) else f"{pp:.3f} deg peak to peak"
    jam = ", JAMS" if curve.jams else ""
    return f"{curve.label}\n{curve.form} {z1}/{z2}: {size}{jam}"


def _draw(ax: object, curve: TeCurve) -> None:
    ax.plot(  # type: ignore[attr-defined]
        curve.pitch_share, curve.te_deg, color=_COLOURS[curve.form], lw=1.5
    )
    ax.axhline(0.0, color="#888", lw=0.8)  # type: ignore[attr-defined]
    ax.set_title(_title(curve), fontsize=8)  # type: ignore[attr-defined]
    ax.grid(True, lw=0.4, color="#ddd")  # type: ignore[attr-defined]
    ax.set_xlim(0.0, 1.0)  # type: ignore[attr-defined]
    ax.set_ylim(*_limits([curve]))  # type: ignore[attr-defined]


def _limits(curves: list[TeCurve]) -> tuple[float, float]:
    # never zoom in below the simulator's resolution: a flat line must look flat
    values = np.concatenate([c.te_deg[np.isfinite(c.te_deg)] for c in curves])
    lo = float(values.min()) if len(values) else 0.0
    hi = float(values.max()) if len(values) else 0.0
    mid, half = (lo + hi) / 2, max((hi - lo) / 2 * 1.1, MIN_HALF_RANGE_DEG)
    return mid - half, mid + half


def _svg(fig: object) -> str:
    from matplotlib import pyplot as plt

    buf = io.StringIO()
    fig.savefig(buf, format="svg", metadata={"Date": None})  # type: ignore[attr-defined]
    plt.close(fig)  # type: ignore[arg-type]
    return buf.getvalue()


def te_plot_svg(curves: list[TeCurve]) -> str:
    """Every mesh's curve in a grid of small plots, two to a row (SVG text)."""
    import matplotlib

    matplotlib.use("Agg")
    from matplotlib import pyplot as plt

    if not curves:
        raise ValueError("'curves' must hold at least one curve")
    cols = 1 if len(curves) == 1 else 2
    rows = math.ceil(len(curves) / cols)
    # fixed ids and no date: the same design gives the same bytes
    with matplotlib.rc_context({"svg.hashsalt": "wheelgen", "svg.fonttype": "none"}):
        fig, axes = plt.subplots(
            rows, cols, figsize=(6.3 if cols == 2 else 4.2, 2.4 * rows), squeeze=False
        )
        for ax, curve in zip(axes.flat, curves):
            _draw(ax, curve)
            ax.set_xlabel("driver turned (tooth pitches)", fontsize=8)
            ax.set_ylabel("error (deg)", fontsize=8)
            ax.tick_params(labelsize=7)
        for ax in list(axes.flat)[len(curves) :]:
            ax.set_visible(False)
        fig.tight_layout()
        return _svg(fig)


def te_comparison_svg(involute: TeCurve, triangular: TeCurve) -> str:
    """An involute mesh and a triangular one side by side, on the same scale (SVG)."""
    import matplotlib

    matplotlib.use("Agg")
    from matplotlib import pyplot as plt

    with matplotlib.rc_context({"svg.hashsalt": "wheelgen", "svg.fonttype": "none"}):
        fig, (ax1, ax2) = plt.subplots(1, 2, figsize=(6.3, 2.8), sharey=True)
        for ax, curve in ((ax1, involute), (ax2, triangular)):
            _draw(ax, curve)
            ax.set_xlabel("driver turned (tooth pitches)", fontsize=8)
            ax.tick_params(labelsize=7)
        ax1.set_ylabel("driven wheel off the\nexact ratio (deg)", fontsize=8)
        ax1.set_ylim(*_limits([involute, triangular]))
        fig.tight_layout()
        return _svg(fig)
