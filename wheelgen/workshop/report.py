"""The build report: one self-contained HTML page that opens offline.

Everything is inside the file: drawings are inline SVG, plots are SVG data URIs, the
stylesheet is our own and short; there is no script, no web font and no link out, so
the page opens from a USB stick in a classroom and prints on plain paper. Sections:
title and job, layout drawing, sectional elevation, train diagram with every arbor's
period, findings, target verdicts, uneven motion plots, each mesh's transmission error
over one tooth pitch, the animated preview, parts (a drawing each and the bill), the
cutting sheet, the drilling chart, the assembly steps, and the build's files with their
sizes. The page is written from the numbers (the same functions that write
``cutting.csv`` and ``parts.csv``), never by reading those files back; of the other
files only their sizes are read.
"""

from __future__ import annotations

import base64
from pathlib import Path
from typing import Any, Sequence

from ..design.model import Design
from ..design.names import xml_text
from ..design.periods import format_period
from ..design.units import MM, Lengths, lengths_of
from ..findings import Finding, has_errors, sort_findings
from ..frame.plan import plan_frame
from ..kinematics.rates import TrainSolution, solve_rates
from ..kinematics.targets import (
    TargetResult,
    arbor_period,
    arbor_sense,
    evaluate_targets,
)
from ..layout.part_kinds import Part
from ..layout.placement import arbor_positions
from ..version import __version__
from .assembly import ASSEMBLY_FILE, assembly_steps
from .bed_drawing import bed_svg
from .cutter_drawing import cutter_svg
from .cutting import (
    CuttingRow,
    cutter_drawing_file,
    cutting_rows,
    indexing_text,
    pitch_text,
)
from .dial_preview import dials_svg
from .drilling import chart_holes, drilling_svg
from .elevation import elevation_svg
from .file_sizes import file_format, list_files, part_file, size_summary, size_text
from .fit_coupon import fit_test_plan
from .layout_drawing import layout_svg
from .motion_plot import motion_plot_svg
from .part_drawing import part_svg
from .parts_bill import BillRow, bill_rows, volume_text
from .preview import PreviewPlan, preview_plan, preview_svg
from .print_plan import (
    FIT_TEST_FILE,
    LONG_ROD_RATIO,
    ORIENTATIONS,
    PART_SPACING,
    PrintLayout,
    bed_file,
    print_layout,
)
from .te_plot import TeCurve, mesh_te_curves, te_comparison_svg, te_plot_svg
from .train_diagram import train_diagram_svg

__all__ = ["REPORT_FILE", "report_html", "report_writer", "STYLESHEET"]

#: File name of the report inside the build output.
REPORT_FILE = "report.html"

#: Our own plain stylesheet: readable on screen, black on white when printed.
STYLESHEET = """
body { font-family: sans-serif; color: #222; background: #fff; margin: 2em auto;
       max-width: 62em; padding: 0 1em; line-height: 1.4; }
h1 { font-size: 1.6em; margin-bottom: 0.2em; }
h2 { font-size: 1.25em; border-bottom: 2px solid #1f5f8b; padding-bottom: 0.1em;
     margin-top: 2em; }
h3 { font-size: 1.05em; margin-bottom: 0.3em; }
table { border-collapse: collapse; margin: 0.6em 0; font-size: 0.88em; }
th, td { border: 1px solid #bbb; padding: 0.2em 0.45em; text-align: left;
         vertical-align: top; }
th { background: #eef2f6; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
.job td:first-child { font-weight: bold; }
.banner { padding: 0.5em 0.8em; border: 2px solid; margin: 1em 0; }
.banner.ok { border-color: #3d7d3a; background: #eef6ed; }
.banner.bad { border-color: #a3261b; background: #fbecea; font-weight: bold; }
.error { color: #a3261b; font-weight: bold; }
.warning { color: #8a5a00; font-weight: bold; }
.note { color: #1f5f8b; }
.met { color: #3d7d3a; font-weight: bold; }
.unmet { color: #a3261b; font-weight: bold; }
figure { margin: 1em 0; page-break-inside: avoid; break-inside: avoid; }
figcaption { font-size: 0.88em; color: #444; }
svg.drawing { width: 100%; height: auto; max-height: 75vh; border: 1px solid #ccc; }
.parts { display: flex; flex-wrap: wrap; gap: 0.8em; }
.parts figure { width: 11em; margin: 0; }
.parts svg { width: 100%; height: 9em; border: 1px solid #ddd; background: #fcfbf7; }
img.plot { width: 100%; max-width: 40em; }
.chart svg { width: 100%; height: auto; max-height: 75vh; border: 1px solid #ccc; }
.wide { overflow-x: auto; }
ol.steps { padding-left: 0; list-style: none; display: flex; flex-wrap: wrap;
           gap: 0.6em; }
ol.steps li { width: 19em; page-break-inside: avoid; break-inside: avoid; }
ol.steps svg { width: 100%; height: auto; border: 1px solid #ddd; }
ol.steps .n { font-weight: bold; color: #1f5f8b; }
svg.train { width: auto; max-width: 100%; max-height: none; }
nav ol { columns: 2; font-size: 0.92em; }
@media print {
  body { margin: 0; max-width: none; }
  nav { display: none; }
  h2 { page-break-after: avoid; break-after: avoid; }
  svg.drawing { max-height: none; }
  .chart svg { max-height: none; }
}
"""

_SECTIONS = (
    ("layout", "Layout"),
    ("elevation", "Sectional elevation"),
    ("train", "Train"),
    ("findings", "Findings"),
    ("targets", "Targets"),
    ("motion", "Uneven motion"),
    ("transmission", "Transmission error"),
    ("preview", "Animated preview"),
    ("parts", "Parts"),
    ("cutting", "Cutting sheet"),
    ("drilling", "Drilling chart"),
    ("assembly", "Assembly"),
    ("files", "Files and sizes"),
)


def _at_scale(svg: str, px_per_mm: float) -> str:
    """An SVG document drawn in millimetres, inline at ``px_per_mm`` (wider than the
    page it scrolls, so that its small print stays readable)."""
    head, rest = svg.split(">", 1)
    for key in ("width", "height"):
        start = head.index(f'{key}="') + len(key) + 2
        end = head.index('"', start)
        mm = float(head[start:end].removesuffix("mm"))
        head = f"{head[:start]}{mm * px_per_mm:.0f}{head[end:]}"
    return head + ">" + rest


def _e(text: object) -> str:
    return xml_text(text)


def _num(value: float | None, digits: int = 3) -> str:
    return "" if value is None else f"{value:.{digits}f}"


def _table(
    head: Sequence[str], rows: Sequence[Sequence[str]], numeric: set[int]
) -> str:
    """An HTML table; cells are already escaped HTML; ``numeric`` columns align right."""
    out = ["<table><thead><tr>"]
    out += [f"<th>{h}</th>" for h in head]
    out.append("</tr></thead><tbody>")
    for row in rows:
        out.append("<tr>")
        for i, cell in enumerate(row):
            cls = ' class="num"' if i in numeric else ""
            out.append(f"<td{cls}>{cell}</td>")
        out.append("</tr>")
    out.append("</tbody></table>")
    return "".join(out)


def _job(design: Design, parts: Sequence[Part], findings: Sequence[Finding]) -> str:
    rows = [
        ("Design file", Path(design.source).name if design.source else design.name),
        ("SHA-256 of the file", design.sha256 or "not recorded"),
        ("Made by", design.process.kind),
        (
            "Drive",
            f"arbor {design.drive.arbor}, one turn in "
            f"{format_period(design.drive.period_s)}, {design.drive.sense}",
        ),
        ("Parts", str(len(parts))),
        ("Written by", f"wheelgen {__version__}"),
    ]
    body = "".join(f"<tr><td>{_e(k)}</td><td>{_e(v)}</td></tr>" for k, v in rows)
    if has_errors(findings):
        banner = (
            '<p class="banner bad">UNCHECKED: this build was forced past error-level '
            "findings (see Findings). Do not cut metal from it before they are "
            "resolved.</p>"
        )
    else:
        banner = '<p class="banner ok">Checked: no error-level findings.</p>'
    return f'<table class="job">{body}</table>{banner}'


def _arbor_table(design: Design, solution: TrainSolution) -> str:
    rows = []
    for a in design.arbors:
        rate = solution.rate(a.name)
        period = arbor_period(design, rate)
        where = (
            f"around {a.around}"
            if a.around
            else f"carried on {a.carrier}"
            if a.carrier
            else "on the plates"
        )
        rows.append(
            [
                _e(a.name),
                _e(where + (", fixed" if a.fixed else "")),
                _e("" if rate is None else rate),
                _e("" if period is None else format_period(period)),
                _e(arbor_sense(design, rate)),
            ]
        )
    head = ["arbor", "mounting", "turns per drive turn (exact)", "one turn in", "sense"]
    return _table(head, rows, {2})


def _findings(findings: Sequence[Finding]) -> str:
    rows = [
        [
            f'<span class="{_e(f.level)}">{_e(f.level)}</span>',
            _e(f.check),
            _e(f.subject),
            _e(f.message),
            _e(f.measured),
            _e(f.limit),
            _e(f.advice),
        ]
        for f in sort_findings(findings)
    ]
    if not rows:
        return "<p>No findings: every check passed.</p>"
    counts = {
        lvl: sum(1 for f in findings if f.level == lvl)
        for lvl in ("error", "warning", "note")
    }
    summary = (
        f"<p>{counts['error']} error(s), {counts['warning']} warning(s), "
        f"{counts['note']} note(s).</p>"
    )
    head = ["level", "check", "subject", "finding", "measured", "limit", "change"]
    return summary + _table(head, rows, set())


def _targets(targets: Sequence[TargetResult]) -> str:
    if not targets:
        return "<p>The design sets no targets.</p>"
    rows = []
    for r in targets:
        t = r.target
        if t.tolerance_s is not None:
            tol = format_period(t.tolerance_s)
        else:
            tol = f"{t.tolerance_ppm if t.tolerance_ppm is not None else 1.0:g} ppm"
        verdict = (
            '<span class="met">met</span>'
            if r.met
            else '<span class="unmet">NOT met</span>'
        )
        rows.append(
            [
                _e(t.arbor),
                _e("" if r.wanted_s is None else format_period(r.wanted_s, 9)),
                _e("" if r.got_s is None else format_period(r.got_s, 9)),
                _e("" if r.error_ppm is None else f"{r.error_ppm:+.3f}"),
                _e(tol),
                _e(
                    ""
                    if r.drift_deg_per_year is None
                    else f"{r.drift_deg_per_year:+.3f}"
                ),
                _e(f"{t.sense}, {'ok' if r.sense_ok else 'wrong'}"),
                verdict,
            ]
        )
    head = [
        "arbor",
        "wanted period",
        "period of the train",
        "error (ppm)",
        "tolerance",
        "drift (deg per year)",
        "sense wanted",
        "verdict",
    ]
    return _table(head, rows, {3, 5})


def _motion(design: Design, plan: PreviewPlan | None) -> str:
    if plan is None or not plan.uneven:
        return "<p>Every arbor turns evenly: there is no pin-and-slot coupling in the train.</p>"
    out = []
    for name in plan.uneven:
        period = 360.0 / abs(plan.mean_rates_deg_s[name])
        svg = motion_plot_svg(design, name, period)
        data = base64.b64encode(svg.encode("utf-8")).decode("ascii")
        out.append(
            f'<figure><img class="plot" alt="uneven motion of arbor {_e(name)}" '
            f'src="data:image/svg+xml;base64,{data}"><figcaption>Arbor {_e(name)} over '
            f"one turn ({_e(format_period(period))}): how far it runs ahead of even "
            "turning at its mean rate, and its speed relative to the mean.</figcaption>"
            "</figure>"
        )
    return "".join(out)


def _dials(design: Design, plan: PreviewPlan | None) -> str:
    """The front view with the dials and hands turning, when there is a display."""
    from ..display.plan import display_plan

    try:
        display = display_plan(design)
    except ValueError:  # no layout: the layout check says why
        return ""
    if plan is None or not display.dials:
        return ""
    hands = ", ".join(
        f"{_e(h.part.arbor)} (one turn in {_e(format_period(360 / abs(r)))})"
        for h in display.hands
        if (r := _deg_per_s(design, h.rate))
    )
    return (
        f"<figure>{dials_svg(design, display, plan)}<figcaption><b>The dials, seen from"
        " the front</b>, in the same time-lapse: each hand turns at its arbor's exact"
        f" rate from its reading at rest: {hands}. A hand behind a pin-and-slot coupling"
        " turns unevenly, as its arbor does.</figcaption></figure>"
    )


def _deg_per_s(design: Design, rate: Any) -> float:
    if rate is None or rate == 0:
        return 0.0
    return float(rate) * 360.0 / float(design.drive.period_s)


def _img(svg: str, alt: str) -> str:
    data = base64.b64encode(svg.encode("utf-8")).decode("ascii")
    return f'<img class="plot" alt="{_e(alt)}" src="data:image/svg+xml;base64,{data}">'


def _pp(curve: TeCurve) -> str:
    if curve.jams:
        return "the teeth jam"
    if curve.peak_to_peak_deg == float("inf"):
        return "contact is lost"
    return f"{curve.peak_to_peak_deg:.4f} degrees from peak to peak"


def _transmission(curves: Sequence[TeCurve]) -> str:
    if not curves:
        return "<p>The design has no meshes.</p>"
    out = []
    first = {c.form: c for c in reversed(curves)}
    if "involute" in first and "triangular" in first:
        inv, tri = first["involute"], first["triangular"]
        out.append(
            "<figure>"
            + _img(
                te_comparison_svg(inv, tri),
                "involute and triangular teeth side by side",
            )
            + "<figcaption><b>Why the tooth form matters</b> (both on one scale). "
            f"Left, {_e(inv.label)}, involute teeth: "
            f"{_e(_pp(inv))}. Right, {_e(tri.label)}, straight-sided (triangular) "
            f"teeth: {_e(_pp(tri))}. Involute flanks roll on each other so that the "
            "ratio stays exact at every moment; straight flanks cannot, so the driven "
            "wheel runs ahead of the ratio and falls back within every tooth."
            "</figcaption></figure>"
        )
    out.append(
        "<figure>"
        + _img(te_plot_svg(list(curves)), "transmission error of every mesh")
        + "<figcaption>Each mesh's driving wheel turned through one tooth pitch at a "
        "steady rate in the mesh simulator (240 steps, four times as fine as the "
        "checks turn it), at the working centre distance: the driven "
        "wheel's angle less the exact ratio of the tooth counts, in degrees. Involute "
        "teeth stay on the line (up to the simulator's resolution, about 0.001 "
        "degrees); triangular teeth wave, and the wave repeats with every tooth."
        "</figcaption></figure>"
    )
    return "".join(out)


def _preview(
    design: Design, positions: dict[str, tuple[float, float]], plan: PreviewPlan | None
) -> str:
    if plan is None:
        return "<p>No arbor turns: there is nothing to animate.</p>"
    svg = preview_svg(design, positions, plan)
    lapse = format_period(plan.factor, 4)
    cycle = format_period(plan.cycle_s, 6)
    what = (
        f"one turn of arbor {_e(plan.reference)}"
        if not plan.shortened
        else f"part of a turn of arbor {_e(plan.reference)} (a whole turn would spin "
        "the fastest arbor too often to see)"
    )
    uneven = ""
    if plan.uneven:
        uneven = (
            " Faint dashed pointers turn evenly at the mean rate of "
            + ", ".join(_e(n) for n in plan.uneven)
            + ": the gap between them and the solid pointer is the coupling's uneven motion."
        )
    return (
        f"<figure>{svg}<figcaption><b>Time-lapse: 1 second of the animation shows "
        f"{_e(lapse)} of the train</b> (factor {plan.factor:,.0f}). The loop lasts "
        f"{plan.duration_s:.0f} s and shows {cycle}: {what}. Every pointer turns at its "
        f"arbor's true relative rate; carried arbors ride round on their carrier."
        f"{uneven}</figcaption></figure>" + _dials(design, plan)
    )


def _parts(parts: Sequence[Part], bill: Sequence[BillRow], u: Lengths = MM) -> str:
    figs = []
    by_name = {r.part: r for r in bill}
    for part in parts:
        row = by_name.get(part.name)
        if row is None:  # a bought part: counted in the bill, not drawn
            continue
        if u.inches:
            d, t = u.text(row.diameter), u.text(row.length)
            size = (
                f"\u00d8{d}, {t} thick"
                if row.kind == "wheel"
                else f"{d} across, {t} thick"
                if row.kind in ("plate", "cock")
                else f"\u00d8{u.short(row.diameter)} x {t}"
            )
        elif row.kind == "wheel":
            size = f"\u00d8{row.diameter:.2f} mm, {row.length:g} mm thick"
        elif row.kind in ("plate", "cock"):
            size = f"{row.diameter:.1f} mm across, {row.length:g} mm thick"
        else:
            size = f"\u00d8{row.diameter:.2f} x {row.length:g} mm"
        figs.append(
            f"<figure>{part_svg(part)}<figcaption><b>{_e(row.part)}</b> ({_e(row.kind)})"
            f"<br>{_e(size)}</figcaption></figure>"
        )
    rows = [
        [
            _e(r.part),
            _e(r.kind),
            _e(r.quantity),
            _e(r.stock_words(u)),
            _e(u.num(r.diameter, 2)),
            _e(u.num(r.length, 2)),
            _e(volume_text(r.volume, u) if u.inches else f"{r.volume / 1000:.3f}"),
            _e(r.note),
        ]
        for r in bill
    ]
    total = sum(r.volume for r in bill) / 1000
    head = [
        "part",
        "kind",
        "qty",
        "stock",
        u.head("overall diameter"),
        u.head("length"),
        "volume (in\u00b3)" if u.inches else "volume (cm\u00b3)",
        "note",
    ]
    return (
        f'<div class="parts">{"".join(figs)}</div>'
        "<h3>Bill of parts</h3>"
        + _table(head, rows, {2, 4, 5, 6})
        + f"<p>Total volume {_total_volume(total, u)} (solid; for printed parts the plastic "
        "at 100 % infill, an estimate from the flat profiles).</p>"
    )


def _total_volume(cm3: float, u: Lengths) -> str:
    if u.inches:
        return f"{volume_text(cm3 * 1000, u)} in\u00b3"
    return f"{cm3:.2f} cm\u00b3"


def _inline(svg: str) -> str:
    """A drawing file's SVG, inline in the page: no XML declaration, scaled to fit."""
    svg = svg[svg.index("<svg") :]
    return svg.replace("<svg ", '<svg class="drawing" ', 1)


def _cutting(rows: Sequence[CuttingRow], parts: Sequence[Part], u: Lengths = MM) -> str:
    specs = {p.name: p.tooth for p in parts if p.kind == "wheel"}
    if not rows:
        return "<p>No wheels to cut.</p>"
    blanks, checks = [], []
    for r in rows:
        cutter = ""
        if r.cutter_number is not None:
            dp = "" if r.diametral_pitch is None else f"{r.diametral_pitch:g} DP "
            cutter = f"{dp}No. {r.cutter_number} ({r.cutter_range})"
        elif r.cutter is not None:
            cutter = (
                f"{r.cutter.space_angle_deg:.2f}\u00b0 included, tip R "
                f"{u.num(r.cutter.tip_radius)}, shoulders R "
                f"{u.num(r.cutter.shoulder_radius)}"
            )
        span = (
            ""
            if r.span_width is None
            else f"{u.num(r.span_width, 4)} over {r.span_teeth}"
        )
        pins = (
            ""
            if r.over_pins is None
            else f"{u.num(r.over_pins, 4)} over \u00d8{u.num(r.pin_diameter)} pins"
        )
        blanks.append(
            [
                _e(r.wheel),
                _e(r.teeth),
                _e(pitch_text(r, u)),
                _e(r.form),
                _e(f"{r.angle_deg:g}"),
                _e(f"{r.shift:g}"),
                _e(u.short(r.face_width)),
                _e(u.num(r.blank_diameter)),
                _e(u.num(r.full_depth)),
                _e(cutter),
            ]
        )
        checks.append(
            [
                _e(r.wheel),
                _e(indexing_text(r.indexing)),
                _e(u.num(r.thinning, 4)),
                _e(u.num(r.infeed, 4)),
                _e(span),
                _e(pins),
            ]
        )
    head_blank = [
        "wheel",
        "teeth",
        "diametral pitch" if u.inches else "module",
        "form",
        "angle (deg)",
        "shift x",
        u.head("face"),
        u.head("blank \u00d8"),
        u.head("full depth"),
        "form cutter",
    ]
    head_check = [
        "wheel",
        "indexing",
        u.head("thinning"),
        u.head("feed in"),
        f"span W<sub>k</sub> ({u.unit}) over k teeth",
        u.head("over pins"),
    ]
    notes = [f"<li>{_e(r.wheel)}: {_e(w)}</li>" for r in rows for w in r.warnings]
    extra = f"<ul>{''.join(notes)}</ul>" if notes else ""
    drawings = [
        f"<code>{_e(cutter_drawing_file(r.wheel))}</code>" for r in rows if r.cutter
    ]
    figures = "".join(
        f"<figure>{_inline(cutter_svg(r.wheel, specs[r.wheel], r.cutter))}"
        f"<figcaption>The form cutter of {_e(r.wheel)} "
        f"(<code>{_e(cutter_drawing_file(r.wheel))}</code>, 1:1 when printed from "
        "that file).</figcaption></figure>"
        for r in rows
        if r.cutter is not None
    )
    tri = ""
    if drawings:
        tri = (
            "<p>Triangular teeth are cut with a form (fly) cutter ground to the space "
            "between two basic teeth, its included angle the tooth angle plus "
            "360\u00b0 / teeth; the 1:1 drawing of each cutter is in "
            + ", ".join(drawings)
            + ". They are checked over two pins that touch the flanks on the pitch "
            "circle.</p>" + figures
        )
    return (
        "<h3>Blanks and cutters</h3>"
        + _table(head_blank, blanks, {1, 2, 5, 6, 7, 8})
        + "<h3>Indexing, feed and checking</h3>"
        + _table(head_check, checks, {2, 3, 4, 5})
        + "<p>Feed in: how far the cutter goes in from the blank's rim. It is the full "
        "depth plus a little more, which thins each tooth by the thinning listed (half "
        "the backlash); the span and over-pins sizes are those of the thinned tooth, "
        "so feed until they are reached. Indexing: <i>t turns + h/c</i> is t whole "
        "crank turns plus h hole spaces on the c-hole circle. Form cutters use the "
        "diametral-pitch set numbering (No. 1 for the most teeth); the tooth range is "
        "given because some module sets number the other way round.</p>" + tri + extra
    )


def _print_sheet(design: Design, parts: Sequence[Part], layout: PrintLayout) -> str:
    """The print sheet: the fit test first, then how each part lies and the plates.

    Sizes in the design's units; the coupon's raised labels are hundredths of a
    millimetre whatever the units, so an inch design's table gives both."""
    u = lengths_of(design)
    fit = fit_test_plan(design, parts)
    fit_rows = [
        [_e(label)]
        + ([_e(u.num(c))] if u.inches else [])
        + [_e(f"{c:.2f}"), _e(u.num(h, 2)), _e(u.num(p, 2))]
        for label, c, h, p in zip(
            fit.labels, fit.clearances, fit.hole_diameters, fit.pin_diameters
        )
    ]
    clearance = design.process.clearance
    uses = u.both(clearance, 2) if u.inches else f"{clearance:g} mm"
    inch_note = (
        " (the table gives each clearance in inches too; the labels stay in "
        "millimetres, as small clearances are printed most legibly so)"
        if u.inches
        else ""
    )
    head = (
        ["label (0.01 mm)", u.head("radial clearance")] if u.inches else ["label"]
    ) + ["radial clearance (mm)", u.head("hole \u00d8"), u.head("pin \u00d8")]
    out = [
        "<h3>First: the fit test</h3>"
        f"<p><code>{_e(FIT_TEST_FILE)}</code> is two small plates. The hole plate has "
        f"a plain \u00d8{_e(u.text(fit.nominal))} hole (label 0) and holes opened by "
        "each radial clearance below; the pin plate a plain "
        f"\u00d8{_e(u.text(fit.nominal))} pin (label 0) and pins thinned by the same "
        "clearances. Print it with the settings you will use for the parts; push the "
        "plain pin into each hole and each pin into the plain hole. The labels are the "
        f"radial clearance in hundredths of a millimetre{inch_note}; this design uses "
        f"{_e(uses)} (<code>[process] clearance</code>, label "
        f"{round(clearance * 100):d}). If that fit binds or "
        "rattles, set <code>clearance</code> to the smallest label that turns "
        "freely, divided by 100 (that is millimetres"
        + (
            '; or write the inch figure of its row as text, such as "0.0020 in"'
            if u.inches
            else ""
        )
        + "), and build again.</p>"
        + _table(head, fit_rows, set(range(1, len(head))))
    ]
    rows = [
        [
            _e(r.part),
            _e(r.kind),
            _e(ORIENTATIONS[r.orientation]),
            _e("" if r.bed is None else r.bed),
            _e(u.num(r.height, 1)),
            _e(r.note),
        ]
        for r in layout.rows
        if r.kind != "coupon"
    ]
    out.append(
        "<h3>How each part lies</h3><p>Wheels, plates, hands and dials lie flat on "
        "their larger face; tubes, pillars and short rods stand upright so that they "
        "come out round; rods longer than "
        f"{LONG_ROD_RATIO:g} diameters lie flat; an arbor the stock list has as rod "
        "is cut from the rod. The same is in <code>print.csv</code>.</p>"
        + _table(
            ["part", "kind", "orientation", "plate", u.head("height"), "note"],
            rows,
            {3, 4},
        )
    )
    bx, by = layout.bed
    plate = f"{u.short(bx)} \u00d7 {u.text(by)}"
    figs = [
        f"<figure>{bed_svg(n, layout.bed, objects)}<figcaption>Plate {n}: "
        f"<code>{_e(bed_file(n))}</code>, {len(objects)} part(s) on "
        f"{_e(plate)}.</figcaption></figure>"
        for n, objects in layout.plates
    ]
    if figs:
        out.append(
            f"<h3>Build plates</h3><p>The parts laid out on {len(figs)} plate(s) of "
            f"{_e(plate)} (<code>[process] bed</code>), "
            f"{_e(u.text(PART_SPACING))} apart and from the edges; each plate is one "
            "3MF file to open in the slicer.</p>" + "".join(figs)
        )
    return "".join(out)


def _drilling(design: Design, unchecked: bool) -> str:
    if design.frame is None:
        return "<p>The design has no frame plates: nothing to drill.</p>"
    u = lengths_of(design)
    frame = plan_frame(design)
    out = [
        "<p>Datum: the axis of the drive arbor; X to the right, Y up, seen from the "
        "front. The same figures drill the back plate from its inner face. Every "
        f"hole's position is held to \u00b1{u.fixed(frame.limits.position_tolerance, 3)} "
        "(half the process's centre tolerance, so that two holes keep a mesh's "
        "centre distance); diameters within the limits listed. The charts list the "
        "pivots, the pillars' holes and the cocks' mounting holes; the 1:1 charts "
        f"(with the plate's outline and a {u.bar.label} check bar) are in the "
        "<code>drilling</code> folder of the build, the plates themselves in "
        "<code>dxf</code> and <code>svg</code>.</p>"
    ]
    for plate in ("back", "front"):
        holes = chart_holes(design, plate)
        rows = [
            [
                _e(h.number),
                _e(h.member),
                _e(u.num(h.x, 4)),
                _e(u.num(h.y, 4)),
                _e(u.num(h.nominal, 3)),
                _e(h.fit),
                _e(f"{u.num(h.low, 4)} to {u.num(h.high, 4)}"),
                _e(h.role),
            ]
            for h in holes
        ]
        head = [
            "hole",
            "holds",
            u.head("X"),
            u.head("Y"),
            u.head("nominal Ø"),
            "fit",
            u.head("limits Ø"),
            "role",
        ]
        svg = drilling_svg(design, plate, unchecked)
        svg = svg[svg.index("<svg") :]  # inline: no XML declaration inside HTML
        out.append(
            f"<h3>{_e(plate.capitalize())} plate</h3>"
            + (_table(head, rows, {0, 2, 3, 4}) if rows else "<p>No holes.</p>")
            + f'<figure class="chart">{svg}</figure>'
        )
    return "".join(out)


def _assembly(design: Design, parts: Sequence[Part]) -> str:
    """Every step of assembly.csv, numbered, each with the elevation of what it is
    fitted into so far and the part it fits drawn in red."""
    items = []
    for st in assembly_steps(design, parts):
        fig = elevation_svg(parts, only=st.shown, highlight=st.group, labels=False)
        onto = f" onto <b>{_e(st.onto)}</b>" if st.onto else ""
        note = f"<br>{_e(st.note)}" if st.note else ""
        items.append(
            f'<li><figure>{fig}<figcaption><span class="n">{st.number}.</span> '
            f"<b>{_e(st.part)}</b>: {_e(st.action)}{onto}{note}</figcaption>"
            "</figure></li>"
        )
    return (
        "<p>The order in which the parts go together, worked out from their heights "
        "and sizes so that no part is ever pushed over one already in place that is "
        "larger than its bore. The back plate lies on the bench, inner face up: "
        "<i>from the front</i> is from above, <i>from the back</i> from below. An "
        "arbor is made up off the movement with what it carries and then put in; the "
        "front plate is made up with whatever it alone holds and lowered on last. "
        "Each figure is the sectional elevation of what the part is fitted into, the "
        f"part in red. The same steps are in {_e(ASSEMBLY_FILE)}.</p>"
        f'<ol class="steps">{"".join(items)}</ol>'
    )


def _files(parts: Sequence[Part], files: Sequence[tuple[str, int]] | None) -> str:
    if files is None:
        return "<p>The files are listed when <code>wheelgen build</code> writes the report.</p>"
    cells: dict[str, dict[str, int]] = {}
    others = []
    names = {p.name for p in parts}
    for path, size in files:
        owner = part_file(path)
        if owner is None or owner[0] not in names:  # the assembly, the sheets
            others.append((path, size))
        else:
            cells.setdefault(owner[0], {})[owner[1]] = size
    summary = size_summary(files)
    formats = [f for f in summary["formats"] if any(f in c for c in cells.values())]
    rows = []
    for part in parts:
        got = cells.get(part.name, {})
        rows.append(
            [_e(part.name)]
            + [_e(size_text(got[f])) if f in got else "" for f in formats]
            + [_e(size_text(sum(got.values())))]
        )
    for path, size in others:
        fmt = file_format(path)
        rows.append(
            [_e(path)]
            + [_e(size_text(size)) if f == fmt else "" for f in formats]
            + [_e(size_text(size))]
        )
    rows.append(
        ["<b>all files</b>"]
        + [f"<b>{_e(size_text(summary['formats'][f]['bytes']))}</b>" for f in formats]
        + [f"<b>{_e(size_text(summary['total_bytes']))}</b>"]
    )
    head = ["file or part"] + [f.upper() for f in formats] + ["together"]
    return (
        _table(head, rows, set(range(1, len(formats) + 2)))
        + f"<p>{len(files)} files, {_e(size_text(summary['total_bytes']))} in all "
        "(1 kB = 1000 bytes), besides this report and manifest.json. Send a workshop "
        "only the formats its machines read: DXF or STEP for cutting, STL or 3MF for "
        "printing, SVG for templates on paper.</p>"
    )


def report_html(
    design: Design,
    parts: Sequence[Part],
    findings: Sequence[Finding],
    solution: TrainSolution | None = None,
    targets: Sequence[TargetResult] | None = None,
    files: Sequence[tuple[str, int]] | None = None,
    layout: PrintLayout | None = None,
) -> str:
    """The whole report page as text; ``files`` are (path, bytes) of the build's files.

    A printed design gets the print sheet (``layout``, its plates laid out from the
    part files; without it the orientations alone) instead of the cutting sheet.
    """
    solution = solve_rates(design) if solution is None else solution
    targets = evaluate_targets(design, solution) if targets is None else targets
    positions = arbor_positions(design)
    try:
        plan: PreviewPlan | None = preview_plan(design, solution)
    except ValueError:
        plan = None
    cutting = cutting_rows(parts)
    bill = bill_rows(design, parts)
    u = lengths_of(design)
    printing = design.process.kind == "print"
    body = {
        "layout": (
            f"<figure>{layout_svg(design, positions)}<figcaption>Seen from the front, "
            f"{'labelled in inches' if u.inches else 'in millimetres'}: the plates' outline with the pillars (grey discs) and the "
            "cocks (tan bars), pitch circles in their arbor's colour (dashed: fixed), "
            "meshes as dashed lines between centres with a dot at the pitch point, "
            "pin-and-slot couplings in red.</figcaption></figure>"
        ),
        "elevation": (
            f'<figure><div class="wide">'
            f"{_at_scale(elevation_svg(parts, lengths=u), 4.0)}</div>"
            "<figcaption>Seen from the side and cut through the axes, heights "
            f"(z, {u.unit}) "
            "true and up the page, the back of the movement at the bottom: each "
            "axis at its true distance from the one before it, taken across the "
            "plates from left to right (a developed section). Every part is named "
            "with the heights it spans; wheels are drawn to their tip diameter, "
            "arbors and tubes with every turned length. The same drawing at 1:1 is "
            "drawings/elevation.svg.</figcaption></figure>"
        ),
        "train": (
            f'<figure><div class="wide">{train_diagram_svg(design, solution)}</div>'
            "<figcaption>Which wheel "
            "drives which: solid arrows are meshes (driver teeth \u2192 driven teeth), "
            "dashed arrows pin-and-slot couplings, dotted arrows a carrier carrying an "
            "arbor.</figcaption></figure>" + _arbor_table(design, solution)
        ),
        "findings": _findings(findings),
        "targets": _targets(targets),
        "motion": _motion(design, plan),
        "transmission": _transmission(mesh_te_curves(design)),
        "preview": _preview(design, positions, plan),
        "parts": _parts(parts, bill, u),
        "cutting": (
            _print_sheet(
                design,
                parts,
                layout if layout is not None else print_layout(design, parts, None),
            )
            if printing
            else _cutting(cutting, parts, u)
        ),
        "drilling": _drilling(design, has_errors(findings)),
        "assembly": _assembly(design, parts),
        "files": _files(parts, files),
    }
    titles = dict(_SECTIONS)
    if printing:
        titles["cutting"] = "Print sheet"
    nav = "".join(f'<li><a href="#{k}">{_e(titles[k])}</a></li>' for k, _ in _SECTIONS)
    sections = "".join(
        f'<section id="{k}"><h2>{i}. {_e(titles[k])}</h2>{body[k]}</section>'
        for i, (k, _) in enumerate(_SECTIONS, start=1)
    )
    return (
        "<!DOCTYPE html>\n"
        '<html lang="en"><head><meta charset="utf-8">'
        '<meta name="viewport" content="width=device-width, initial-scale=1">'
        f"<title>{_e(design.title)}: build report</title>"
        f"<style>{STYLESHEET}</style></head><body>"
        f"<header><h1>{_e(design.title)}</h1>{_job(design, parts, findings)}</header>"
        f"<nav><ol>{nav}</ol></nav>{sections}"
        "</body></html>\n"
    )


def report_writer(
    design: Design,
    parts: Sequence[Part],
    findings: Sequence[Finding],
    staging_dir: Path,
) -> list[Path]:
    """Sheet writer for ``wheelgen build``: writes ``report.html`` into ``staging_dir``."""
    path = Path(staging_dir) / REPORT_FILE
    files = list_files(staging_dir, skip={REPORT_FILE})
    layout = None
    if design.process.kind == "print":
        layout = print_layout(design, parts, staging_dir)
    path.write_text(
        report_html(design, parts, findings, files=files, layout=layout),
        encoding="utf-8",
    )
    return [path]
