"""The report's transmission-error plots: one curve per mesh over a tooth pitch, and
an involute and a triangular mesh side by side where a design has both forms.

External truth: involute flanks are conjugate, so at the standard centre distance the
curve is flat (derived; within the simulator's 0.001 degrees); straight flanks are
not, and the curve repeats with every tooth (derived: the same teeth meet the same way
one pitch later). The plots are read back as SVG and the page rendered in headless
Chromium when it is installed.
"""

from __future__ import annotations

import re
import xml.etree.ElementTree as ET
from pathlib import Path

import numpy as np
import pytest
from _browser import screenshot

from tests._demo import DEMO
from wheelgen.checks import analyse
from wheelgen.design import load_design
from wheelgen.parts import plan_parts
from wheelgen.workshop.report import report_html
from wheelgen.workshop.te_plot import mesh_te_curves, te_comparison_svg, te_plot_svg

DATA = Path(__file__).parent / "data"
SVG = "{http://www.w3.org/2000/svg}"


@pytest.fixture(scope="module")
def two_forms():
    analysis = analyse(load_design(DATA / "two_forms.toml"))
    design = analysis.design
    return design, report_html(design, plan_parts(design), analysis.findings)


def test_one_curve_per_mesh_flat_for_involute_teeth_and_not_for_straight_ones(
    two_forms,
):
    design, _ = two_forms
    inv, tri = mesh_te_curves(design)
    assert (inv.form, tri.form) == ("involute", "triangular")
    assert (inv.label, tri.label) == tuple(m.label for m in design.meshes)
    assert inv.peak_to_peak_deg < 1e-3
    assert tri.peak_to_peak_deg > 0.05
    # one pitch later the same teeth meet the same way: the curve closes
    assert tri.te_deg[-1] == pytest.approx(tri.te_deg[0], abs=1e-3)
    assert inv.pitch_share[0] == 0.0 and inv.pitch_share[-1] == 1.0
    assert np.isfinite(tri.te_deg).all()


def _section(page: str) -> str:
    start = page.index('<section id="transmission">')
    return page[start : page.index("</section>", start)]


def _plots(section: str) -> list[ET.Element]:
    import base64

    out = []
    for data in re.findall(r'src="data:image/svg\+xml;base64,([^"]+)"', section):
        out.append(ET.fromstring(base64.b64decode(data)))
    return out


def test_report_shows_both_forms_side_by_side_and_every_mesh(two_forms):
    _, page = two_forms
    section = _section(page)
    assert "Why the tooth form matters" in section
    assert (
        "mesh inv_pinion-inv_wheel" in section
        and "mesh tri_pinion-tri_wheel" in section
    )
    plots = _plots(section)
    assert len(plots) == 2
    for svg in plots:
        assert svg.tag == f"{SVG}svg"
        # each plot holds drawn curves (matplotlib paths), two axes each here
        assert len(svg.findall(f".//{SVG}path")) > 10
        assert len(svg.findall(f".//{SVG}g[@id='axes_2']")) == 1
    assert '<a href="#transmission">' in page


def test_a_design_with_one_form_has_no_comparison():
    design = load_design(DEMO)
    page = report_html(design, plan_parts(design), analyse(design).findings)
    section = _section(page)
    assert "Why the tooth form matters" not in section
    (plot,) = _plots(section)
    text = " ".join(t.text or "" for t in plot.iter(f"{SVG}text"))
    for mesh in design.meshes:
        assert mesh.label in text


def test_plots_are_the_same_bytes_every_time(two_forms):
    design, _ = two_forms
    curves = mesh_te_curves(design)
    assert te_plot_svg(curves) == te_plot_svg(mesh_te_curves(design))
    assert te_comparison_svg(*curves) == te_comparison_svg(*curves)


def test_the_plots_render_in_headless_chromium(tmp_path: Path, two_forms) -> None:
    _, page = two_forms
    head = page[: page.index("<body>") + len("<body>")]
    only = tmp_path / "te.html"
    only.write_text(head + _section(page) + "</section></body></html>", "utf-8")
    shot = tmp_path / "te.png"
    why = screenshot(only, shot, "1000,1000")
    if why:
        pytest.skip(why)
    from PIL import Image

    img = np.asarray(Image.open(shot).convert("RGB")).astype(int)
    # the triangular curve is drawn in its own colour (#b5562d), the involute one in
    # #1f5f8b: both must show on the page
    for rgb in ((0xB5, 0x56, 0x2D), (0x1F, 0x5F, 0x8B)):
        near = (np.abs(img - np.array(rgb)).sum(axis=2) < 40).sum()
        assert near > 200, f"colour {rgb} drawn on {near} pixels only"
