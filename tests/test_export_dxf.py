"""DXF of flat parts in both flavours: layers, exact geometry, audit, same bytes, and
the outline as two independent readers see it.

The DXF writer works from the numeric profile and needs no CAD kernel. Geometry read
back is measured against the exact profile: the flanks against the involute's polar
equation, whole loops against the profile's own exact polylines (within 1e-5 mm).
"""

from __future__ import annotations

import math
from pathlib import Path

import ezdxf
import numpy as np
import pytest
from _dxf_readback import (
    STEP,
    distance_to_loops,
    exact_loops,
    freecad_available,
    loop_length,
    read_with_ezdxf,
    read_with_freecad,
)
from click.testing import CliRunner
from ezdxf.math import fit_points_to_cad_cv

from tests._demo import DEMO
from wheelgen.cli import main
from wheelgen.export.biarcs import biarc_segments
from wheelgen.export.build import BuildOptions, build_design
from wheelgen.export.dxf import write_dxf
from wheelgen.export.formats import DXF_CURVES
from wheelgen.layout.part_kinds import PinBoss, SlotCut, WheelPart
from wheelgen.layout.wheel_profile import plate_profile
from wheelgen.parts import plan_parts
from wheelgen.solids.spline_fit import SPLINE_FIT_TOLERANCE, fit_segments
from wheelgen.teeth.forms import outline_for
from wheelgen.teeth.involute_tooth import generate_tooth
from wheelgen.teeth.spec import ToothSpec

TOL = 0.01  # mm, the default mesh tolerance: the arcs' budget


def _profile(z=24, module=1.0, **kw):
    part = WheelPart("wheel_a", ToothSpec(z, module), 3.0, 4.0, **kw)
    return part, plate_profile(part, outline_for(part.tooth))


def _by_layer(doc) -> dict[str, list]:
    out: dict[str, list] = {}
    for e in doc.modelspace():
        out.setdefault(e.dxf.layer, []).append(e)
    return out


def _involute_normal_error(gen, pts: np.ndarray) -> np.ndarray:
    """Distance (mm) of points from the nearest flank's involute, along its normal.

    derived: polar equation theta(R) = +-(psi + inv a - inv(acos(rb / R))) of the two
    flanks of tooth k about its centre line; the circumferential error times rb / R
    is the normal one (the normal meets the circle at the pressure angle a_R).
    """
    z = gen.teeth
    r = np.hypot(pts[:, 0], pts[:, 1])
    phi = np.arctan2(pts[:, 1], pts[:, 0])
    phi -= np.round(phi / (2 * math.pi / z)) * (2 * math.pi / z)
    t = np.sqrt(np.maximum((r / gen.base_radius) ** 2 - 1, 0))
    half = gen.half_angle_ref_rad + math.tan(gen.alpha_rad) - gen.alpha_rad
    psi = half - (t - np.arctan(t))
    return np.abs(np.abs(phi) - psi) * r * gen.base_radius / r


@pytest.fixture(scope="module")
def docs(tmp_path_factory):
    """Both flavours of a spoked wheel with a pin and a hub boss, and their docs."""
    out = tmp_path_factory.mktemp("dxf")
    part, prof = _profile(spokes=4, rim=2.0, round_radius=0.5)
    result = {}
    for curves in DXF_CURVES:
        path = write_dxf(
            prof,
            out / f"w_{curves}.dxf",
            part.name,
            curves=curves,
            tolerance=TOL,
            pins=[(8.0, 3.0, 1.5)],
            hub_diameter=7.0,
        )
        result[curves] = (path, ezdxf.readfile(path))
    return prof, result


@pytest.mark.parametrize("curves", DXF_CURVES)
def test_every_feature_on_its_own_layer(docs, curves):
    prof, result = docs
    _, doc = result[curves]
    assert doc.header["$INSUNITS"] == 4  # millimetres
    layers = _by_layer(doc)
    assert set(layers) == {
        "OUTLINE",
        "BORE",
        "WINDOWS",
        "PIN_MARK",
        "HUB_MARK",
        "CENTRE",
    }
    (bore,) = layers["BORE"]
    assert bore.dxftype() == "CIRCLE" and bore.dxf.radius == pytest.approx(2.0)
    assert len(layers["WINDOWS"]) == 4 * len(prof.holes[1].segments)
    assert [e.dxftype() for e in layers["CENTRE"]] == ["LINE", "LINE"]
    # the pin standing on the face: its circle and a cross through its centre
    circle = next(e for e in layers["PIN_MARK"] if e.dxftype() == "CIRCLE")
    assert tuple(circle.dxf.center)[:2] == pytest.approx((8.0, 3.0))
    assert circle.dxf.radius == pytest.approx(0.75)
    assert sorted(e.dxftype() for e in layers["PIN_MARK"]) == ["CIRCLE", "LINE", "LINE"]
    (hub,) = layers["HUB_MARK"]
    assert hub.dxf.radius == pytest.approx(3.5)
    # every layer the file uses is declared in its layer table
    assert set(layers) <= {layer.dxf.name for layer in doc.layers}


def test_slots_and_pin_holes_have_their_layers(tmp_path):
    part, prof = _profile(
        z=40, slot=SlotCut(6.0, 12.0, 2.0), pin=PinBoss(15.0, 1.5, 4.0, hole_only=True)
    )
    doc = ezdxf.readfile(write_dxf(prof, tmp_path / "s.dxf", part.name))
    layers = _by_layer(doc)
    assert [e.dxftype() for e in layers["PIN_HOLES"]] == ["CIRCLE"]
    assert layers["PIN_HOLES"][0].dxf.radius == pytest.approx(0.75)
    assert sorted(e.dxftype() for e in layers["SLOTS"]) == [
        "ARC",
        "ARC",
        "LINE",
        "LINE",
    ]


@pytest.mark.parametrize("curves", DXF_CURVES)
def test_audit_finds_nothing_to_fix(docs, curves):
    _, result = docs
    auditor = result[curves][1].audit()
    assert not auditor.has_errors and not auditor.has_fixes, (
        auditor.errors + auditor.fixes
    )


def test_splines_carry_control_points_and_the_exact_fit_points(docs):
    prof, result = docs
    splines = result["splines"][1].modelspace().query("SPLINE")
    exact = [s.points for s in prof.outline.segments() if s.kind == "spline"]
    assert len(splines) == len(exact)
    gen = generate_tooth(ToothSpec(24, 1.0))
    worst = 0.0
    for sp, pts in zip(splines, exact):
        fit = np.array([tuple(p)[:2] for p in sp.fit_points])
        assert np.abs(fit - pts).max() < 1e-12
        assert sp.dxf.degree == 3 and 4 <= len(sp.control_points) < len(pts)
        # the control-point curve, evaluated by ezdxf from the file alone
        curve = np.array([tuple(v)[:2] for v in sp.construction_tool().points(
            np.linspace(0.0, sp.construction_tool().max_t, 401))])  # fmt: skip
        r = np.hypot(curve[:, 0], curve[:, 1])
        if r.min() >= gen.form_radius - 1e-9:  # a flank (not a root fillet)
            worst = max(worst, float(_involute_normal_error(gen, curve).max()))
            # a reader that rebuilds the curve from the fit points and the end
            # tangents instead (ezdxf's rebuild follows the common CAD method)
            again = fit_points_to_cad_cv(
                [tuple(p) for p in sp.fit_points],
                tangents=[sp.dxf.start_tangent, sp.dxf.end_tangent],
            )
            rebuilt = np.array(
                [tuple(v)[:2] for v in again.points(np.linspace(0, again.max_t, 401))]
            )
            worst = max(worst, float(_involute_normal_error(gen, rebuilt).max()))
    assert 0 < worst <= SPLINE_FIT_TOLERANCE + 1e-9


def test_arcs_flavour_has_no_splines_and_keeps_within_the_tolerance(docs):
    prof, result = docs
    doc = result["arcs"][1]
    assert len(doc.modelspace().query("SPLINE")) == 0
    kinds = {e.dxftype() for e in doc.modelspace()}
    assert kinds <= {"LINE", "ARC", "CIRCLE"}
    read = read_with_ezdxf(result["arcs"][0])
    loops = exact_loops(prof)
    pts = np.vstack([p for _, p in read["OUTLINE"]])
    assert distance_to_loops(pts, loops["OUTLINE"]).max() <= TOL
    # and the other way: the exact flank points lie within the tolerance of the arcs
    # (read back as points 0.02 mm apart: their chords add at most 0.02^2 / 8 r)
    arcs = [p for _, p in read["OUTLINE"]]
    exact = np.vstack([s.points for s in prof.outline.segments() if s.kind == "spline"])
    assert distance_to_loops(exact, arcs).max() <= TOL + 0.02**2 / (8 * 0.3)


@pytest.mark.parametrize(("z", "m"), [(8, 1.0), (24, 1.0), (127, 1.0), (20, 10.0)])
@pytest.mark.parametrize("tol", [0.01, 0.001])
def test_biarcs_follow_the_involute_tangent_continuous(z, m, tol):
    gen = generate_tooth(ToothSpec(z, m))
    tooth = outline_for(ToothSpec(z, m)).tooth
    fits = fit_segments(tooth)
    flank, fit = tooth[2], fits[2]
    arcs = biarc_segments(fit, tol - fit.deviation)
    # one chain from the flank's first exact point to its last, joints shared
    assert np.array_equal(arcs[0].start, flank.start)
    assert np.array_equal(arcs[-1].end, flank.end)
    for a, b in zip(arcs, arcs[1:]):
        assert np.array_equal(a.end, b.start)
    # tangent continuity at each joint: derived, the tangent of an arc at an end is
    # perpendicular to the radius there, so both arcs' radii at the joint are parallel
    from wheelgen.teeth.outline import circle_through

    for a, b in zip(arcs, arcs[1:]):
        ca, _ = circle_through(*a.points)
        cb, _ = circle_through(*b.points)
        u, v = a.end - ca, b.start - cb
        assert abs(u[0] * v[1] - u[1] * v[0]) / (np.hypot(*u) * np.hypot(*v)) < 1e-6
    # dense points of every arc lie within the tolerance of the exact involute
    pts = np.vstack([s.polyline(tol / 1000) for s in arcs])
    assert _involute_normal_error(gen, pts).max() <= tol


def test_bad_flavour_names_both(tmp_path):
    _, prof = _profile()
    with pytest.raises(ValueError, match="'splines', 'arcs'"):
        write_dxf(prof, tmp_path / "x.dxf", "x", curves="polylines")
    with pytest.raises(ValueError, match="splines, arcs"):
        BuildOptions(dxf_curves="polylines")


# ---- the bundled demo: both flavours of every wheel, read back by two readers ----


@pytest.fixture(scope="module")
def demo_dxf(tmp_path_factory):
    from wheelgen.design import load_design

    design = load_design(DEMO)
    base = tmp_path_factory.mktemp("demo_dxf")
    built = {}
    for curves in DXF_CURVES:
        out = base / curves
        options = BuildOptions(formats=("dxf",), use_cache=False, dxf_curves=curves)
        build_design(design, out, options)
        built[curves] = out
    wheels = [p for p in plan_parts(design) if p.kind == "wheel"]
    profiles = {p.name: plate_profile(p, outline_for(p.tooth)) for p in wheels}
    return base, built, wheels, profiles


def _turning(loop: np.ndarray) -> float:
    """Total absolute turning (rad) of the closed polyline ``loop``."""
    d = np.diff(np.vstack((loop, loop[:2])), axis=0)
    a = np.arctan2(d[:, 1], d[:, 0])
    return float(np.abs((np.diff(a) + np.pi) % (2 * np.pi) - np.pi).sum())


def _same_outline(read, profile, tol: float, what: str) -> None:
    """Every loop of the profile is on its layer, within ``tol`` mm, and nothing else.

    Both ways: the read-back points lie within ``tol`` of the exact loops, and the
    exact loops' points lie within ``tol`` of the read-back entities, which are
    known only at points STEP mm apart; derived: their chords stray up to
    STEP^2 / (8 r) from the entities, 2.5e-4 mm for the smallest radius of the demo's
    curves (0.2 mm, the tip rounding of its module 0.8 triangular wheel: 0.25 module,
    docs/format.md).
    """
    loops = exact_loops(profile)
    for layer in loops:
        edges = read.get(layer, [])
        assert edges, f"{what}: nothing on {layer}"
        pts = np.vstack([p for _, p in edges])
        worst = float(distance_to_loops(pts, loops[layer]).max())
        assert worst <= tol, f"{what} {layer}: {worst:.2e} mm off the profile"
        exact = np.vstack(loops[layer])
        found = [p for _, p in edges]
        missed = float(distance_to_loops(exact, found, closed=False).max())
        assert missed <= tol + STEP**2 / (8 * 0.2), f"{what} {layer}: {missed:.2e} mm"
        # as long as the exact loops. derived: a curve moved by d(s) along its normal
        # changes length by the integral of curvature x d, to first order, so by at
        # most tol x the loops' total turning
        turning = sum(_turning(loop) for loop in loops[layer])
        total = sum(length for length, _ in edges)
        exact_length = loop_length(loops[layer])
        assert abs(total - exact_length) <= tol * turning + 1e-6 * exact_length, what


@pytest.mark.slow
@pytest.mark.parametrize("curves", DXF_CURVES)
def test_demo_wheels_read_back_by_ezdxf(demo_dxf, curves):
    _, built, wheels, profiles = demo_dxf
    for part in wheels:
        path = built[curves] / "dxf" / f"{part.name}.dxf"
        doc = ezdxf.readfile(path)
        assert not doc.audit().has_errors, part.name
        _same_outline(read_with_ezdxf(path), profiles[part.name], TOL, part.name)


def test_demo_moon_wheel_marks_its_coupling_pin(demo_dxf):
    _, built, wheels, _ = demo_dxf
    (part,) = [p for p in wheels if p.name == "moon_wheel"]
    pin = part.pin
    assert pin is not None and not pin.hole_only
    for curves in DXF_CURVES:
        doc = ezdxf.readfile(built[curves] / "dxf" / "moon_wheel.dxf")
        (mark,) = doc.modelspace().query('CIRCLE[layer=="PIN_MARK"]')
        a = math.radians(pin.angle_deg)
        centre = (pin.radius * math.cos(a), pin.radius * math.sin(a))
        assert tuple(mark.dxf.center)[:2] == pytest.approx(centre, abs=1e-12)
        assert mark.dxf.radius == pytest.approx(pin.diameter / 2)


@pytest.mark.slow
@pytest.mark.skipif(not freecad_available(), reason="freecadcmd not installed")
def test_demo_wheels_read_back_by_freecad(demo_dxf):
    base, built, wheels, profiles = demo_dxf
    paths = [built[c] / "dxf" / f"{p.name}.dxf" for c in DXF_CURVES for p in wheels]
    read = read_with_freecad(paths, base)
    for curves in DXF_CURVES:
        for part in wheels:
            got = read[built[curves] / "dxf" / f"{part.name}.dxf"]
            # control points hold the flanks within 0.05 um: read back that closely
            # (plus the exact loops' own chord of 1e-5 mm); arcs within the tolerance
            tol = TOL if curves == "arcs" else SPLINE_FIT_TOLERANCE + 1e-5
            _same_outline(got, profiles[part.name], tol, f"{curves} {part.name}")
            assert {"PIN_MARK"} <= set(got) or part.name != "moon_wheel"


def test_cli_writes_arcs_only_dxf_and_refuses_an_unknown_flavour(tmp_path):
    design = Path(__file__).parent / "data" / "two_stage.toml"
    out = tmp_path / "b"
    args = ["build", str(design), "-o", str(out), "--formats", "dxf", "--no-cache"]
    result = CliRunner().invoke(main, [*args, "--dxf-curves", "arcs"])
    assert result.exit_code == 0, result.output
    for path in (out / "dxf").glob("*.dxf"):
        assert not ezdxf.readfile(path).modelspace().query("SPLINE"), path.name
    assert "Sizes:" in result.output and "DXF" in result.output
    bad = CliRunner().invoke(main, [*args, "--dxf-curves", "polylines"])
    assert bad.exit_code == 2
    assert "'splines'" in bad.output and "'arcs'" in bad.output
