"""Turn two wheel outlines against each other and measure how the driven wheel follows.

Method (our own, in the driven wheel's frame, no polygon booleans):

- The reference wheel's tooth is reduced to a table: for each radius on a fine grid,
  the angular extent of the tooth at that radius on its upper (``+``) and lower (``-``)
  side, found by exact segment-circle intersection of its polyline. The free gap at
  radius r is then an angle interval, and a point at (r, angle) constrains the wheel's
  turn to an interval: an interpolation, not a search.
- For each driver angle, the boundary points of the driver's teeth near the mesh are
  expressed in polar co-ordinates about the driven centre. Each point bounds the driven
  wheel's offset from its ideal angle from above (the drive flank) and from below (the
  coast flank); the minimum and maximum over points give first contact on either side.
- The same is done with roles swapped (the driven wheel's points against the driver's
  table), because a sharp corner of one wheel can slip between the sampled points of the
  other; the two sets of bounds are intersected. With polygons, first contact is always
  a vertex of one outline on an edge of the other, so using both outlines' vertices as
  samples finds every contact.
- The swapped bounds come at driven angles of their own and are interpolated onto the
  driver's steps; where the contact passes from one corner to another the bound has a
  kink that the interpolation would cut short. So the swapped sweep is turned again to
  just where the contact was found at each step (twice), which brings the error there
  from about 0.01 to below 5e-4 degrees at 60 steps a pitch.

Angles are degrees in public (``_deg``), radians inside. The driver turns
counter-clockwise (``sense="ccw"``) about the origin, the driven wheel sits at
``(centre_distance, 0)`` and turns clockwise; ``sense="cw"`` reports the other flank.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..design.model import Sense
from ..teeth.outline import WheelOutline

__all__ = [
    "CHECK_STEPS",
    "JAM_TOLERANCE_DEG",
    "MeshSimulation",
    "ToothTable",
    "tooth_table",
    "simulate_mesh",
]

#: Play below this (degrees, at the driven wheel) counts as overlap: the pair binds.
JAM_TOLERANCE_DEG = 1e-4
#: Steps per pitch when the checks run the simulator (enough for a verdict; the
#: benchmark and tests use finer steps). Every search for a running value uses the
#: same, so a value it finds clears the check's verdict.
CHECK_STEPS = 60
#: Extra turns of the swapped sweep to where the contact was found (see simulate_mesh).
REFINE_PASSES = 2
#: A swapped bound that interpolation or a pass of refining moves by less than this
#: (radians, 1e-5 degrees, ten times finer than the simulator resolves) is settled.
_SETTLED_RAD = math.radians(1e-5)


@dataclass(frozen=True, slots=True, eq=False)
class MeshSimulation:
    """Result of :func:`simulate_mesh`; arrays have one entry per driver step.

    Attributes
    ----------
    driver_deg
        Driver angles in degrees, from 0 over the swept pitches.
    drive_deg, coast_deg
        Driven angle (degrees, absolute, clockwise negative) at first contact of the
        driving flank and of the coast flank; ``nan`` where no tooth touches.
    te_deg
        Transmission error in degrees: driven angle at drive contact minus the ideal
        ``drive_deg[0] - driver_deg * z1 / z2``.
    play_deg
        Angular free play of the driven wheel, degrees (negative: the outlines overlap).
    te_peak_to_peak_deg
        Peak-to-peak of ``te_deg``; ``inf`` if contact is lost somewhere.
    backlash_deg, backlash_max_deg
        Smallest and largest free play over the sweep (degrees at the driven wheel; the
        smallest is clipped at 0).
    backlash_mm
        ``backlash_deg`` as arc length (mm) on the driven wheel's pitch circle.
    min_play_deg
        Smallest play, not clipped: below ``-JAM_TOLERANCE_DEG`` the pair jams.
    jams
        True if at some step the driven wheel has no position free of overlap.
    contact_lost
        True if at some step no driver tooth touches the driven wheel on the drive side
        (contact ratio below 1, or teeth that never reach each other).
    resolution_deg
        Estimated numerical resolution of the angles, degrees (from the outline chord
        tolerance and point spacing).
    """

    driver_deg: np.ndarray
    drive_deg: np.ndarray
    coast_deg: np.ndarray
    te_deg: np.ndarray
    play_deg: np.ndarray
    te_peak_to_peak_deg: float
    backlash_deg: float
    backlash_max_deg: float
    backlash_mm: float
    min_play_deg: float
    jams: bool
    contact_lost: bool
    centre_distance: float
    ratio: float
    resolution_deg: float

    def summary(self) -> dict[str, float | bool]:
        """The summary numbers as a plain dict (for ``--json``)."""
        return {
            "te_peak_to_peak_deg": self.te_peak_to_peak_deg,
            "backlash_deg": self.backlash_deg,
            "backlash_max_deg": self.backlash_max_deg,
            "backlash_mm": self.backlash_mm,
            "min_play_deg": self.min_play_deg,
            "jams": self.jams,
            "contact_lost": self.contact_lost,
            "centre_distance": self.centre_distance,
            "resolution_deg": self.resolution_deg,
        }


@dataclass(frozen=True, slots=True, eq=False)
class ToothTable:
    """Angular half-extent of one tooth against radius (mm -> radians, inside only).

    ``upper_rad[i]`` is the largest polar angle of tooth material at ``radius[i]``,
    ``lower_rad[i]`` minus the smallest; ``nan`` where the tooth does not reach.
    """

    radius: np.ndarray
    upper_rad: np.ndarray
    lower_rad: np.ndarray
    r_min: float
    r_max: float
    pitch_rad: float


def tooth_table(
    outline: WheelOutline, chord_tol: float, grid: int = 4096
) -> ToothTable:
    """Tabulate the tooth of ``outline`` against radius.

    Parameters
    ----------
    outline
        The wheel; its tooth is centred on +X.
    chord_tol
        Chord tolerance in mm for turning the outline into a polyline.
    grid
        Number of radii between the smallest and largest radius of the tooth.
    """
    if grid < 16:
        raise ValueError(f"'grid' must be at least 16, got {grid}")
    pts = outline.tooth_polyline(chord_tol)
    # close the tooth chain with the first point of the next tooth
    pitch = 2 * math.pi / outline.teeth
    c, s = math.cos(pitch), math.sin(pitch)
    nxt = pts[0] @ np.array([[c, s], [-s, c]])
    a = pts
    b = np.vstack((pts[1:], nxt))
    d = b - a
    ra = np.hypot(a[:, 0], a[:, 1])
    rb = np.hypot(b[:, 0], b[:, 1])
    dd = np.einsum("ij,ij->i", d, d)
    ad = np.einsum("ij,ij->i", a, d)
    t_foot = np.clip(np.where(dd > 0, -ad / np.where(dd > 0, dd, 1.0), 0.0), 0.0, 1.0)
    foot = a + t_foot[:, None] * d
    seg_rmin = np.hypot(foot[:, 0], foot[:, 1])
    seg_rmax = np.maximum(ra, rb)
    r_min, r_max = float(seg_rmin.min()), float(seg_rmax.max())
    radius = np.linspace(r_min, r_max, grid)
    dr = (r_max - r_min) / (grid - 1)
    lo = np.ceil((seg_rmin - r_min) / dr - 1e-9).astype(np.int64)
    hi = np.floor((seg_rmax - r_min) / dr + 1e-9).astype(np.int64)
    lo = np.clip(lo, 0, grid - 1)
    hi = np.clip(hi, 0, grid - 1)
    count = np.where(dd > 0, np.maximum(hi - lo + 1, 0), 0)
    seg = np.repeat(np.arange(len(a)), count)
    start = np.repeat(np.cumsum(count) - count, count)
    gi = np.repeat(lo, count) + (np.arange(len(seg)) - start)
    r = radius[gi]
    # |a + t d|^2 = r^2, both roots in [0, 1] are crossings
    qa, qb, qc = dd[seg], ad[seg], ra[seg] ** 2 - r**2
    disc = np.sqrt(np.maximum(qb * qb - qa * qc, 0.0))
    upper = np.full(grid, -np.inf)
    lower = np.full(grid, -np.inf)
    for sign in (-1.0, 1.0):
        t = (-qb + sign * disc) / qa
        ok = (t >= -1e-9) & (t <= 1 + 1e-9)
        t = np.clip(t[ok], 0.0, 1.0)
        sg = seg[ok]
        p = a[sg] + t[:, None] * d[sg]
        ang = np.arctan2(p[:, 1], p[:, 0])
        np.maximum.at(upper, gi[ok], ang)
        np.maximum.at(lower, gi[ok], -ang)
    upper[~np.isfinite(upper)] = np.nan
    lower[~np.isfinite(lower)] = np.nan
    return ToothTable(radius, upper, lower, r_min, r_max, pitch)


def _offset_bounds(
    mover: WheelOutline,
    mover_centre: tuple[float, float],
    mover_rad: np.ndarray,
    table: ToothTable,
    ref_centre: tuple[float, float],
    ref_ideal_rad: np.ndarray,
    spacing: float,
    chord_tol: float,
) -> tuple[np.ndarray, np.ndarray]:
    """Bounds on the reference wheel's turn away from its ideal angle, per mover angle.

    Returns ``(low, high)`` in radians: for each mover angle, the reference wheel is
    free of the mover's sampled points for offsets in ``[low, high]`` (``high < low``:
    overlap; ``+inf``/``-inf``: no point reaches that side).
    """
    cx, cy = ref_centre[0] - mover_centre[0], ref_centre[1] - mover_centre[1]
    dist = math.hypot(cx, cy)
    tooth = _densify(mover.tooth_polyline(chord_tol), spacing)
    rho = np.hypot(tooth[:, 0], tooth[:, 1])
    # only points that can come inside the reference wheel's tip circle matter
    tooth = tooth[rho > dist - table.r_max - spacing]
    if len(tooth) == 0:
        n = len(mover_rad)
        return np.full(n, -np.inf), np.full(n, np.inf)
    r_out = float(np.hypot(tooth[:, 0], tooth[:, 1]).max())
    # half-angle, seen from the mover centre, of the lens where the tip circles overlap
    cos_w = (dist**2 + r_out**2 - table.r_max**2) / (2 * dist * r_out)
    half = math.acos(max(-1.0, min(1.0, cos_w)))
    p_m = 2 * math.pi / mover.teeth
    bearing = math.atan2(cy, cx)
    # teeth whose centre can come within the lens during the sweep
    span = float(mover_rad.max() - mover_rad.min())
    k_lo = math.floor((bearing - half - p_m - float(mover_rad.max())) / p_m)
    k_hi = math.ceil((bearing + half + p_m - float(mover_rad.min())) / p_m)
    if k_hi - k_lo + 1 > mover.teeth + 2 + span / p_m:
        k_lo, k_hi = 0, mover.teeth - 1
    ks = np.arange(k_lo, k_hi + 1) * p_m
    # points of all chosen teeth in the mover's frame at angle 0: (K*P, 2)
    cos_k, sin_k = np.cos(ks)[:, None], np.sin(ks)[:, None]
    px = (cos_k * tooth[:, 0] - sin_k * tooth[:, 1]).ravel()
    py = (sin_k * tooth[:, 0] + cos_k * tooth[:, 1]).ravel()
    low = np.empty(len(mover_rad))
    high = np.empty(len(mover_rad))
    p_r = table.pitch_rad
    symmetric = bool(
        np.allclose(table.upper_rad, table.lower_rad, atol=1e-12, equal_nan=True)
    )
    # a few steps at a time keeps the work arrays small (cache) without Python overhead
    chunk = max(1, 100_000 // max(1, len(px)))
    for i0 in range(0, len(mover_rad), chunk):
        th = mover_rad[i0 : i0 + chunk][:, None]
        ct, st = np.cos(th), np.sin(th)
        x = ct * px - st * py - cx
        y = st * px + ct * py - cy
        r = np.hypot(x, y)
        # only points inside the reference tip circle bound anything
        row, col = np.nonzero(r < table.r_max)
        xi, yi, ri = x[row, col], y[row, col], r[row, col]
        phi = np.arctan2(yi, xi)
        up = np.interp(ri, table.radius, table.upper_rad)
        dn = up if symmetric else np.interp(ri, table.radius, table.lower_rad)
        # below the smallest tabulated radius there is solid wheel: no gap at all
        solid = ri < table.r_min
        up = np.where(solid, p_r, np.where(np.isnan(up), -p_r, up))
        dn = np.where(solid, p_r, np.where(np.isnan(dn), -p_r, dn))
        # the point's angle from the nearest gap centre of the ideally placed wheel
        g = phi - ref_ideal_rad[i0 : i0 + chunk][row] - p_r / 2
        g = (g + p_r / 2) % p_r - p_r / 2
        hi_b = np.full(r.shape, np.inf)
        lo_b = np.full(r.shape, -np.inf)
        hi_b[row, col] = g - up + p_r / 2
        lo_b[row, col] = g - p_r / 2 + dn
        high[i0 : i0 + chunk] = hi_b.min(axis=1)
        low[i0 : i0 + chunk] = lo_b.max(axis=1)
    return low, high


def _densify(points: np.ndarray, spacing: float) -> np.ndarray:
    """Insert points on the chords of an open polyline, no gap over ``spacing`` mm."""
    seg = np.diff(points, axis=0)
    n = np.maximum(1, np.ceil(np.hypot(seg[:, 0], seg[:, 1]) / spacing).astype(int))
    t = np.concatenate([np.arange(k) / k for k in n])
    idx = np.repeat(np.arange(len(seg)), n)
    out = points[idx] + t[:, None] * seg[idx]
    return np.vstack((out, points[-1:]))


def simulate_mesh(
    driver: WheelOutline,
    driven: WheelOutline,
    centre_distance: float,
    *,
    steps: int = 240,
    pitches: float = 1.0,
    chord_tol: float | None = None,
    sense: Sense = "ccw",
) -> MeshSimulation:
    """Turn ``driver`` through ``pitches`` tooth pitches and follow ``driven``.

    Parameters
    ----------
    driver, driven
        Outlines in their own frames (mm), teeth centred on +X.
    centre_distance
        Distance between the two axes, mm.
    steps
        Number of driver positions over the sweep (at least 4).
    pitches
        Driver sweep in tooth pitches of the driver (the motion repeats every pitch).
    chord_tol
        Chord tolerance in mm for the outline polylines; default 2e-6 times the larger
        tip radius, which keeps the angular error near 1e-4 degrees.
    sense
        Sense in which the driver turns; ``"cw"`` makes the other flank the drive
        flank.

    Returns
    -------
    MeshSimulation
    """
    if steps < 4:
        raise ValueError(f"'steps' must be at least 4, got {steps}")
    if pitches <= 0:
        raise ValueError(f"'pitches' must be > 0, got {pitches}")
    if centre_distance <= 0:
        raise ValueError(f"'centre_distance' must be > 0 mm, got {centre_distance}")
    if sense not in ("ccw", "cw"):
        raise ValueError(f"'sense' must be one of 'ccw', 'cw', got {sense!r}")
    z1, z2 = driver.teeth, driven.teeth
    k = z1 / z2
    tol = chord_tol
    if tol is None:
        size = max(_outer_radius(driver), _outer_radius(driven))
        tol = 2e-6 * size
    if tol <= 0:
        raise ValueError(f"'chord_tol' must be > 0 mm, got {tol}")
    t1 = tooth_table(driver, tol)
    t2 = tooth_table(driven, tol)
    # spacing of sampled points: fine against the tooth depth
    spacing = max(tol * 20, min(t1.r_max - t1.r_min, t2.r_max - t2.r_min) / 150)
    p1, p2 = t1.pitch_rad, t2.pitch_rad
    theta1 = np.linspace(0.0, pitches * p1, steps)
    # driven gap centre (own angle p2/2) facing the driver at the start
    theta2_0 = math.pi - p2 / 2
    ideal2 = theta2_0 - k * theta1
    lo_a, hi_a = _offset_bounds(
        driver, (0.0, 0.0), theta1, t2, (centre_distance, 0.0), ideal2, spacing, tol
    )
    # The same with roles swapped, over one driven pitch: the motion repeats every
    # tooth, so the swapped bounds are periodic in the driver angle with period p1.
    n_b = max(16, int(steps / pitches) + 8)
    theta2 = theta2_0 - np.linspace(0.0, p2, n_b, endpoint=False)
    ideal1 = (theta2_0 - theta2) / k
    lo_b, hi_b = _offset_bounds(
        driven, (centre_distance, 0.0), theta2, t1, (0.0, 0.0), ideal1, spacing, tol
    )
    # driver offset e at driven angle t2 is the point (theta1 = ideal1 + e, delta = k e)
    far = 4 * p2
    hi = np.minimum(_limit(hi_a, far), _regrid(ideal1, hi_b, k, theta1, p1, far))
    lo = np.maximum(_limit(lo_a, far), _regrid(ideal1, lo_b, k, theta1, p1, far))
    # Between those evenly spread driven angles the swapped bound is interpolated, and
    # where the contact passes from one corner to another it has a kink that a chord
    # cuts short (by up to 0.01 degrees at 60 steps). So turn the driven wheel again,
    # to just where the estimate puts it at each driver step: there the swapped bound
    # lands (almost) on that step, and interpolation has nothing to cut. Twice: the
    # second lands within a hair of the step even beside a kink.
    xs_hi, ys_hi, xs_lo, ys_lo = [ideal1], [hi_b], [ideal1], [lo_b]
    direct_hi, direct_lo = _limit(hi_a, far), _limit(lo_a, far)
    # a bound needs it only where the interpolation has not settled: where the
    # swapped samples and every other one of them disagree (a kink nearby)
    rough_hi = _unsettled(ideal1, hi_b, k, theta1, p1, far)
    rough_lo = _unsettled(ideal1, lo_b, k, theta1, p1, far)
    for _ in range(REFINE_PASSES):
        # only where the swapped bound is the one that holds
        ok_hi = rough_hi & (np.abs(hi) < p2) & (hi < direct_hi - 1e-12)
        ok_lo = rough_lo & (np.abs(lo) < p2) & (lo > direct_lo + 1e-12)
        m_hi = int(ok_hi.sum())
        t2_r = np.concatenate((ideal2[ok_hi] + hi[ok_hi], ideal2[ok_lo] + lo[ok_lo]))
        if not len(t2_r):
            break
        ideal1_r = (theta2_0 - t2_r) / k
        lo_r, hi_r = _offset_bounds(
            driven, (centre_distance, 0.0), t2_r, t1, (0.0, 0.0), ideal1_r, spacing, tol
        )
        xs_hi.append(ideal1_r[:m_hi])
        ys_hi.append(hi_r[:m_hi])
        xs_lo.append(ideal1_r[m_hi:])
        ys_lo.append(lo_r[m_hi:])
        new_hi = np.minimum(
            direct_hi,
            _regrid(np.concatenate(xs_hi), np.concatenate(ys_hi), k, theta1, p1, far),
        )
        new_lo = np.maximum(
            direct_lo,
            _regrid(np.concatenate(xs_lo), np.concatenate(ys_lo), k, theta1, p1, far),
        )
        # the next pass only where this one still moved the bound
        rough_hi &= np.abs(new_hi - hi) > _SETTLED_RAD
        rough_lo &= np.abs(new_lo - lo) > _SETTLED_RAD
        hi, lo = new_hi, new_lo
    # no finite bound can exceed one pitch: beyond it no tooth touches on that side
    hi = np.where(hi > p2, np.inf, hi)
    lo = np.where(lo < -p2, -np.inf, lo)
    drive_off, coast_off = (hi, lo) if sense == "ccw" else (lo, hi)
    lost = ~np.isfinite(drive_off)
    play = hi - lo
    deg = math.degrees
    drive = np.where(np.isfinite(hi), np.degrees(ideal2 + hi), np.nan)
    coast = np.where(np.isfinite(lo), np.degrees(ideal2 + lo), np.nan)
    if sense == "cw":
        drive, coast = coast, drive
    start = drive_off[0] if np.isfinite(drive_off[0]) else 0.0
    te = np.full(len(theta1), np.nan)
    te[~lost] = np.degrees(drive_off[~lost] - start)
    finite_play = play[np.isfinite(play)]
    min_play = float(np.degrees(finite_play.min())) if len(finite_play) else math.inf
    max_play = float(np.degrees(finite_play.max())) if len(finite_play) else math.inf
    r_pitch2 = driven.radii.get("pitch", centre_distance * z2 / (z1 + z2))
    backlash = max(min_play, 0.0)
    resolution = deg(
        2 * tol / min(t1.r_min, t2.r_min) + spacing**2 / min(t1.r_min, t2.r_min)
    )
    te_pp = math.inf if lost.any() else float(np.ptp(te))
    result_arrays = [np.degrees(theta1), drive, coast, te, np.degrees(play)]
    for arr in result_arrays:
        arr.setflags(write=False)
    return MeshSimulation(
        driver_deg=result_arrays[0],
        drive_deg=result_arrays[1],
        coast_deg=result_arrays[2],
        te_deg=result_arrays[3],
        play_deg=result_arrays[4],
        te_peak_to_peak_deg=te_pp,
        backlash_deg=backlash,
        backlash_max_deg=max_play,
        backlash_mm=math.radians(backlash) * r_pitch2,
        min_play_deg=min_play,
        jams=bool(min_play < -JAM_TOLERANCE_DEG),
        contact_lost=bool(lost.any()),
        centre_distance=float(centre_distance),
        ratio=k,
        resolution_deg=resolution,
    )


def _outer_radius(outline: WheelOutline) -> float:
    if "tip" in outline.radii:
        return float(outline.radii["tip"])
    pts = outline.tooth_polyline(0.01)
    return float(np.hypot(pts[:, 0], pts[:, 1]).max())


def _unsettled(
    ideal: np.ndarray,
    off: np.ndarray,
    k: float,
    at: np.ndarray,
    period: float,
    far: float,
) -> np.ndarray:
    """Where interpolating the swapped bound from all samples and from every other one
    differ by more than ``_SETTLED_RAD``: a kink lies near (a smooth stretch differs by
    a quarter of the curvature's chord error only)."""
    full = _regrid(ideal, off, k, at, period, far)
    half = _regrid(ideal[::2], off[::2], k, at, period, far)
    return np.asarray(np.abs(full - half) > _SETTLED_RAD)


def _limit(values: np.ndarray, far: float) -> np.ndarray:
    return np.asarray(np.clip(values, -far, far), dtype=float)


def _regrid(
    ideal: np.ndarray,
    off: np.ndarray,
    k: float,
    at: np.ndarray,
    period: float,
    far: float,
) -> np.ndarray:
    """Bounds of the swapped sweep as driven offsets at the driver angles ``at`` (rad).

    At driven angle t2 the driver may sit at ``ideal + off``; there the driven offset
    from its ideal angle is ``k * off``. Infinite offsets (no contact) become ``+-far``,
    so that they never win a ``min``/``max`` against a real bound and are recognised
    afterwards.
    """
    x = ideal + np.where(np.isfinite(off), off, 0.0)
    y = np.clip(k * off, -far, far)
    return np.asarray(np.interp(at, x, y, period=period), dtype=float)
