"""``wheelgen gear``: the data sheet of one wheel (and of its mesh with a mate)."""

from __future__ import annotations

import math
from pathlib import Path
from typing import Any

import click

from ..checks.mesh_checks import check_mesh, check_wheel
from ..design.loader import ROOT_RADIUS_BY_FORM
from ..teeth.drawing import outline_svg
from ..teeth.gear_data import GearData, gear_data
from ..teeth.mesh_data import MeshData, mesh_data
from ..teeth.spec import ToothSpec, outline_for, thinning_for
from ._common import EXIT_OK, echo_json, fail
from ._options import Bounded

__all__ = ["gear_command"]


def _mm(value: float | None, places: int = 4) -> str:
    return "-" if value is None else f"{value:.{places}f} mm"


def _sheet(data: GearData, name: str) -> list[str]:
    lines = [
        f"{name}: {data.teeth} teeth, module {data.module:g} mm, {data.form}"
        + (
            f", {data.pressure_angle_deg:g} deg pressure angle, shift {data.shift:+g}"
            if data.form == "involute"
            else f", {2 * data.pressure_angle_deg:g} deg tooth angle"
        ),
        f"  pitch diameter        {_mm(data.pitch_diameter)}",
    ]
    if data.base_diameter is not None:
        lines.append(f"  base diameter         {_mm(data.base_diameter)}")
    lines += [
        f"  tip diameter          {_mm(data.tip_diameter)}",
        f"  root diameter         {_mm(data.root_diameter)}",
    ]
    if data.form_diameter is not None:
        lines.append(f"  involute from         {_mm(data.form_diameter)} (diameter)")
    lines.append(f"  circular pitch        {_mm(data.circular_pitch)}")
    if data.base_pitch is not None:
        lines.append(f"  base pitch            {_mm(data.base_pitch)}")
    lines += [
        f"  tooth at pitch circle {_mm(data.pitch_thickness)} (arc)",
        f"  tooth at tip          {_mm(data.tip_thickness)}"
        + (" POINTED" if data.pointed else ""),
    ]
    if data.span_width is not None:
        lines.append(
            f"  span over {data.span_teeth} teeth     {_mm(data.span_width)} (W_k)"
        )
    if data.over_pins is not None:
        kind = "balls" if data.teeth % 2 else "pins"
        lines.append(
            f"  over two {kind:<5}        {_mm(data.over_pins)} "
            f"with {data.pin_diameter:g} mm {kind}"
        )
    if data.form == "involute":
        cutter = (
            f"No. {data.cutter_number} ({data.cutter_range}, diametral-pitch set "
            "numbering)"
            if data.cutter_number is not None
            else "none: fewer than 12 teeth, generate or shift instead"
        )
        lines += [
            f"  form cutter           {cutter}",
            f"  undercut limit        {data.undercut_limit:.2f} teeth: "
            f"{data.min_teeth_no_undercut} and more are free of undercut"
            + ("; THIS WHEEL IS UNDERCUT" if data.undercut else ""),
        ]
    lines += [
        f"  blank diameter        {_mm(data.blank_diameter)}",
        f"  full depth of cut     {_mm(data.depth_of_cut)}",
    ]
    lines += [f"  warning: {w}" for w in data.warnings]
    return lines


def _mesh_lines(mesh: MeshData) -> list[str]:
    lines = [
        "mesh:",
        (
            f"  centre distance       {_mm(mesh.centre_distance)} "
            f"(standard {mesh.standard_centre_distance:.4f} mm)"
        ),
    ]
    if mesh.working_pressure_angle_deg is not None:
        lines.append(
            f"  working pressure angle {mesh.working_pressure_angle_deg:.4f} deg"
        )
    if mesh.contact_ratio is not None:
        lines.append(f"  contact ratio         {mesh.contact_ratio:.4f}")
    lines.append(f"  tip-root clearance    {_mm(mesh.clearance)}")
    if mesh.backlash is not None:
        lines.append(
            f"  backlash              {_mm(mesh.backlash)} "
            "on the working pitch circle, "
            f"{mesh.normal_backlash:.4f} mm normal"
        )
    if mesh.tip_shortening is not None and mesh.tip_shortening > 1e-6:
        lines.append(
            f"  tip shortening        {_mm(mesh.tip_shortening)} restores the standard "
            "clearance"
        )
    if mesh.shift_sum_to_fit is not None:
        lines.append(f"  shift sum to fit      {mesh.shift_sum_to_fit:+.4f}")
    verdict = []
    for n, (u, i) in enumerate(
        ((mesh.undercut1, mesh.interference1), (mesh.undercut2, mesh.interference2)),
        start=1,
    ):
        verdict.append(
            f"wheel {n}: {'undercut' if u else 'no undercut'}, "
            f"{'TIP INTERFERENCE' if i else 'no tip interference'}"
        )
    lines += [f"  {v}" for v in verdict]
    return lines


# The library names its parameters; the user typed options.
_OPTION_OF = {
    "'teeth'": "'--teeth'",
    "'module'": "'--module'",
    "'pressure_angle_deg'": "'--pressure-angle'",
    "'tooth_angle_deg'": "'--tooth-angle'",
    "'shift'": "'--shift'",
    "'addendum'": "'--addendum'",
    "'dedendum'": "'--dedendum'",
    "'root_radius'": "'--root-radius'",
    "'tip_radius'": "'--tip-radius'",
    "'thinning'": "'--backlash' (half of it on each wheel)",
    "'pin_diameter'": "'--pin'",
    "'centre_distance'": "'--centre-distance'",
}


def _in_option_words(message: str) -> str:
    for name, option in _OPTION_OF.items():
        message = message.replace(name, option)
    return message


def _clean(values: dict[str, Any]) -> dict[str, Any]:
    out: dict[str, Any] = {}
    for key, value in values.items():
        if isinstance(value, float) and not math.isfinite(value):
            value = None
        elif isinstance(value, tuple):
            value = list(value)
        out[key] = value
    return out


@click.option(
    "--teeth", "-z", type=Bounded("teeth"), required=True, help="Number of teeth."
)
@click.option(
    "--module",
    "-m",
    "module",
    type=Bounded("module"),
    required=True,
    help="Module, mm.",
)
@click.option(
    "--pressure-angle",
    type=Bounded("pressure_angle"),
    default=20.0,
    show_default=True,
    help="Degrees.",
)
@click.option(
    "--shift",
    type=Bounded("shift"),
    default=0.0,
    show_default=True,
    help="Profile shift x.",
)
@click.option(
    "--form",
    type=click.Choice(["involute", "triangular"]),
    default="involute",
    show_default=True,
)
@click.option(
    "--tooth-angle",
    type=Bounded("tooth_angle"),
    default=60.0,
    show_default=True,
    help="Triangular teeth: included tooth angle, degrees.",
)
@click.option(
    "--addendum",
    type=Bounded("addendum"),
    default=1.0,
    show_default=True,
    help="x module.",
)
@click.option(
    "--dedendum",
    type=Bounded("dedendum"),
    default=1.25,
    show_default=True,
    help="x module.",
)
@click.option(
    "--root-radius",
    type=Bounded("root_radius"),
    default=None,
    help="Rack tip radius (involute) or root rounding (triangular), x module.  "
    "[default: 0.38 involute, 0.1 triangular]",
)
@click.option(
    "--tip-radius",
    type=Bounded("tip_radius"),
    default=0.0,
    show_default=True,
    help="Tip rounding of triangular teeth, x module.",
)
@click.option(
    "--backlash",
    type=Bounded("play"),
    default=0.0,
    show_default=True,
    help="Backlash each wheel asks of its meshes, mm (as the train file's "
    "'backlash'): half of it comes off each wheel's teeth.",
)
@click.option(
    "--pin", "pin", type=Bounded("size"), default=None, help="Pin diameter, mm."
)
@click.option(
    "--mate", type=Bounded("teeth"), default=None, help="Teeth of the mating wheel."
)
@click.option("--mate-shift", type=Bounded("shift"), default=0.0, show_default=True)
@click.option(
    "--centre-distance",
    type=Bounded("size"),
    default=None,
    help="Mesh at this distance, mm.",
)
@click.option("--json", "as_json", is_flag=True, help="Print one JSON object.")
@click.option(
    "--svg",
    "svg_path",
    type=click.Path(dir_okay=False, writable=True),
    default=None,
    help="Write a 1:1 SVG of the outline with its circles.",
)
def _gear(
    teeth: int,
    module: float,
    pressure_angle: float,
    shift: float,
    form: str,
    tooth_angle: float,
    addendum: float,
    dedendum: float,
    root_radius: float | None,
    tip_radius: float,
    backlash: float,
    pin: float | None,
    mate: int | None,
    mate_shift: float,
    centre_distance: float | None,
    as_json: bool,
    svg_path: str | None,
) -> None:
    """Data sheet of one wheel; with --mate, of the pair in mesh too.

    Sizes, tooth thickness, span W_k, measurement over pins, form-cutter number and
    undercut limit; for a pair the working centre distance and pressure angle,
    contact ratio, clearance, backlash and interference.
    """
    # as in a train file: each wheel gives half the play it asks of its meshes
    thinning = thinning_for(backlash)
    if root_radius is None:
        root_radius = ROOT_RADIUS_BY_FORM[form]
    common: dict[str, Any] = {
        "module": module,
        "form": form,
        "pressure_angle_deg": pressure_angle,
        "tooth_angle_deg": tooth_angle,
        "addendum": addendum,
        "dedendum": dedendum,
        "root_radius": root_radius,
        "tip_radius": tip_radius,
        "thinning": thinning,
    }
    try:
        spec = ToothSpec(teeth=teeth, shift=shift, **common)
        data = gear_data(spec, pin_diameter=pin)
        mate_data = mesh = None
        # the verdicts are the checks' own, so 'gear' and 'check' always agree
        verdicts = check_wheel(spec, "wheel")
        if mate is not None:
            mate_spec = ToothSpec(teeth=mate, shift=mate_shift, **common)
            mate_data = gear_data(mate_spec, pin_diameter=pin)
            mesh = mesh_data(spec, mate_spec, centre_distance)
            verdicts += check_wheel(mate_spec, "mate")
            verdicts += check_mesh(
                spec,
                mate_spec,
                "mesh",
                centre_distance=centre_distance,
                names=("wheel", "mate"),
            )
        elif centre_distance is not None:
            fail("'--centre-distance' needs '--mate'")
        svg_text = None
        if svg_path is not None:
            svg_text = outline_svg(
                outline_for(spec), title=f"{teeth} teeth, module {module:g} mm, {form}"
            )
    except ValueError as exc:
        fail(_in_option_words(str(exc)))
    if svg_path is not None and svg_text is not None:
        try:
            Path(svg_path).write_text(svg_text, encoding="utf-8")
        except OSError as exc:
            fail(f"cannot write {svg_path}: {exc.strerror}")
    if as_json:
        out = _clean(data.as_dict())
        if mesh is not None and mate_data is not None:
            mesh_values = _clean(mesh.as_dict())
            mesh_values["working_pressure_angle"] = mesh_values.pop(
                "working_pressure_angle_deg"
            )
            mesh_values["mesh_warnings"] = mesh_values.pop("warnings")
            out.update(mesh_values)
            out["mate"] = _clean(mate_data.as_dict())
        if svg_path is not None:
            out["svg"] = svg_path
        out["findings"] = [f.as_dict() for f in verdicts]
        echo_json(out)
        raise SystemExit(EXIT_OK)
    lines = _sheet(data, "wheel")
    if mesh is not None and mate_data is not None:
        lines += [""] + _sheet(mate_data, "mate") + [""] + _mesh_lines(mesh)
    # the wheels' verdicts are on their sheets; the pair's as 'check' gives them
    pair = [f for f in verdicts if f.subject == "mesh"]
    lines += [f"  {f.level}: {f.message.removeprefix('mesh: ')}" for f in pair]
    if svg_path is not None:
        lines += ["", f"1:1 drawing written to {svg_path}"]
    click.echo("\n".join(lines))


gear_command = click.command("gear")(_gear)
