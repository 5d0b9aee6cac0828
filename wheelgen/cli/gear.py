"""``wheelgen gear``: the data sheet of one wheel (and of its mesh with a mate).

Each form has its own sheet: involute wheels the ISO 21771 quantities (base circle,
span, over pins, working pressure angle, contact ratio); triangular wheels the angles
and widths of straight flanks, the cutter, and for a pair the play and transmission
error that the mesh simulator measures over one pitch.
"""

from __future__ import annotations

import math
from pathlib import Path
from typing import Any

import click

from ..checks.mesh_checks import check_mesh, check_wheel
from ..design.diametral_pitch import inch_rack, module_of_dp, pitch_words
from ..design.model import Process
from ..design.tooth_defaults import tooth_defaults
from ..design.units import MM, UNITS, Lengths
from ..findings import Finding
from ..teeth.drawing import outline_svg
from ..teeth.forms import outline_for
from ..teeth.gear_data import GearData, gear_data
from ..teeth.mesh_data import MeshData, mesh_data
from ..teeth.spec import ToothSpec, thinning_for
from ..teeth.triangular_cut import triangular_cut
from ..teeth.triangular_data import TriangularData, triangular_data
from ._common import EXIT_OK, echo_json, fail
from ._options import Bounded, Length

__all__ = ["gear_command"]


def _sizes(lengths: Lengths) -> Any:
    """The writer of one size on a sheet: ``"31.7500 mm"``, or in inches
    ``"1.2500 in (31.7500 mm)"``; ``"-"`` for none."""

    def size(value: float | None) -> str:
        return "-" if value is None else lengths.both(value)

    return size


def _sheet(data: GearData, name: str, lengths: Lengths = MM) -> list[str]:
    _mm = _sizes(lengths)
    pitch = pitch_words(data.module, data.diametral_pitch, with_module=True)
    lines = [
        f"{name}: {data.teeth} teeth, {pitch}, involute, "
        f"{data.pressure_angle_deg:g} deg pressure angle, shift {data.shift:+g}",
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
    if data.over_pins is not None and data.pin_diameter is not None:
        kind = "balls" if data.teeth % 2 else "pins"
        lines.append(
            f"  over two {kind:<5}        {_mm(data.over_pins)} "
            f"with {lengths.text(data.pin_diameter)} {kind}"
        )
    if data.form == "involute":
        set_of = (
            f" of a {data.diametral_pitch:g} DP set"
            if data.diametral_pitch is not None
            else ""
        )
        cutter = (
            f"No. {data.cutter_number}{set_of} ({data.cutter_range}, diametral-pitch "
            "set numbering)"
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


def _mesh_lines(mesh: MeshData, lengths: Lengths = MM) -> list[str]:
    _mm = _sizes(lengths)
    lines = [
        "mesh:",
        (
            f"  centre distance       {_mm(mesh.centre_distance)} "
            f"(standard {lengths.fixed(mesh.standard_centre_distance)})"
        ),
    ]
    if mesh.working_pressure_angle_deg is not None:
        lines.append(
            f"  working pressure angle {mesh.working_pressure_angle_deg:.4f} deg"
        )
    if mesh.contact_ratio is not None:
        lines.append(f"  contact ratio         {mesh.contact_ratio:.4f}")
    lines.append(f"  tip-root clearance    {_mm(mesh.clearance)}")
    if mesh.backlash is not None and mesh.normal_backlash is not None:
        lines.append(
            f"  backlash              {_mm(mesh.backlash)} "
            "on the working pitch circle, "
            f"{lengths.fixed(mesh.normal_backlash)} normal"
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
    lines += [f"  warning: {w}" for w in mesh.warnings]
    return lines


def _triangular_sheet(
    data: TriangularData,
    spec: ToothSpec,
    name: str,
    lengths: Lengths = MM,
    diametral_pitch: float | None = None,
) -> list[str]:
    _mm = _sizes(lengths)
    pitch = pitch_words(data.module, diametral_pitch, with_module=True)
    lines = [
        f"{name}: {data.teeth} teeth, {pitch}, triangular",
        f"  tooth angle           {data.tooth_angle_deg:.4f} deg (included, as cut; "
        f"{data.basic_angle_deg:g} before the backlash)",
        f"  space angle           {data.space_angle_deg:.4f} deg (included, between "
        "neighbouring flanks)",
        f"  flank angle           {data.flank_angle_deg:.4f} deg to the radius at the "
        "pitch circle",
        f"  pitch diameter        {_mm(data.pitch_diameter)}",
        f"  tip diameter          {_mm(data.tip_diameter)}",
        f"  root diameter         {_mm(data.root_diameter)}",
        f"  circular pitch        {_mm(data.circular_pitch)}",
        f"  backlash allowance    {_mm(2 * data.thinning)} (the tooth is "
        f"{_mm(data.thinning)} thinner than half the pitch)",
        f"  tooth at pitch circle {_mm(data.pitch_thickness_arc)} (arc), "
        f"{_mm(data.pitch_thickness_chord)} (chord)",
    ]
    if data.pointed:
        lines.append(
            "  tooth at tip          POINTED: the flanks meet below the tip circle"
        )
    else:
        lines.append(
            f"  tooth at tip          {_mm(data.tip_width)} across the flanks, "
            f"{_mm(data.tip_land)} flat after {_mm(data.tip_rounding)} rounding"
        )
    if data.v_root:
        lines.append(
            "  space at root         none: the flanks meet in a V above the root "
            f"circle, rounded {_mm(data.root_rounding)}"
        )
    else:
        lines.append(
            f"  space at root         {_mm(data.root_width)} across the flanks, "
            f"{_mm(data.root_land)} flat after {_mm(data.root_rounding)} rounding"
        )
    cut = triangular_cut(spec)
    lines += [
        f"  cutter                {cut.space_angle_deg:.4f} deg included (the basic "
        f"space), {_mm(cut.tip_width)} across the tip, tip radius "
        f"{_mm(cut.tip_radius)}",
        f"  feed                  {_mm(cut.infeed)} from the rim: the full depth "
        f"{_mm(cut.full_depth)} and {_mm(cut.extra_infeed)} more for the thinning",
        f"  pins                  {_mm(cut.over_pins)} across two "
        f"{'balls' if cut.teeth % 2 else 'pins'} of {_mm(cut.pin_diameter)} in "
        "opposite spaces, at that feed",
        f"  blank diameter        {_mm(data.blank_diameter)}",
    ]
    lines += [f"  warning: {w}" for w in data.warnings]
    return lines


def _triangular_pair(
    spec: ToothSpec, mate: ToothSpec, centre_distance: float | None
) -> dict[str, Any]:
    """The pair's numbers: clearance from the outlines, play and transmission error
    from the mesh simulator turned through one pitch of the wheel, as the checks do."""
    from ..checks.mesh_sim import CHECK_STEPS, simulate_mesh

    mesh = mesh_data(spec, mate, centre_distance)
    a = mesh.centre_distance
    sim = simulate_mesh(outline_for(spec), outline_for(mate), a, steps=CHECK_STEPS)
    r2 = mate.module * mate.teeth / 2
    pitch2 = 360.0 / mate.teeth
    te = sim.te_peak_to_peak_deg
    return {
        "standard_centre_distance": mesh.standard_centre_distance,
        "centre_distance": a,
        "clearance": mesh.clearance,
        "least_play": math.radians(sim.min_play_deg) * r2,
        "least_play_deg": sim.min_play_deg,
        "most_play": math.radians(sim.backlash_max_deg) * r2,
        "most_play_deg": sim.backlash_max_deg,
        "te_peak_to_peak_deg": te,
        "te_peak_to_peak": math.radians(te) * r2,
        "te_share_of_pitch": te / pitch2,
        "runs": not sim.jams and not sim.contact_lost,
        "jams": sim.jams,
        "contact_lost": sim.contact_lost,
        "te_curve": {
            "wheel_deg": [round(float(v), 6) for v in sim.driver_deg],
            "te_deg": [
                None if not math.isfinite(v) else round(float(v), 6) for v in sim.te_deg
            ],
        },
        "mesh_warnings": [w for w in mesh.warnings if "constant ratio" not in w],
    }


def _triangular_pair_lines(
    pair: dict[str, Any], mate_teeth: int, lengths: Lengths = MM
) -> list[str]:
    _mm = _sizes(lengths)
    lines = [
        "mesh:",
        f"  centre distance       {_mm(pair['centre_distance'])} "
        f"(standard {lengths.fixed(pair['standard_centre_distance'])})",
        f"  tip-root clearance    {_mm(pair['clearance'])}",
    ]
    if pair["jams"]:
        lines.append(
            f"  verdict               JAMS: the outlines overlap by "
            f"{_mm(-pair['least_play'])} on the pitch circle"
        )
        return lines
    if pair["contact_lost"]:
        lines.append(
            "  verdict               LOSES CONTACT: at some positions no tooth drives"
        )
        return lines
    lines += [
        f"  play                  {lengths.num(pair['least_play'], 4)} to "
        f"{lengths.fixed(pair['most_play'])} on the pitch circle "
        f"({pair['least_play_deg']:.4f} to "
        f"{pair['most_play_deg']:.4f} deg at the mate)",
        f"  transmission error    {pair['te_peak_to_peak_deg']:.4f} deg peak to peak "
        f"at the mate over one pitch ({_mm(pair['te_peak_to_peak'])} on its pitch "
        f"circle, {100 * pair['te_share_of_pitch']:.1f} % of its pitch)",
        "  verdict               runs",
        "  transmission error over one pitch of the wheel (deg at the mate):",
    ]
    curve = pair["te_curve"]
    n = len(curve["wheel_deg"]) - 1
    for k in range(0, 11):
        i = round(k * n / 10)
        te = curve["te_deg"][i]
        lines.append(f"    {k / 10:.1f} pitch   {'-' if te is None else f'{te:+.4f}'}")
    lines += [f"  warning: {w}" for w in pair["mesh_warnings"]]
    return lines


# The library names its parameters; the user typed options.
_OPTION_OF = {
    "'teeth'": "'--teeth'",
    "'module'": "'--module'",
    "'diametral_pitch'": "'--dp'",
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
    default=None,
    help="Module, mm (or give --dp).",
)
@click.option(
    "--dp",
    "dp",
    type=Bounded("diametral_pitch"),
    default=None,
    help="Diametral pitch, teeth per inch of pitch diameter, instead of --module: "
    "the module is 25.4/DP mm and involute teeth take the inch standard's "
    "proportions (see docs/format.md). Sizes are then printed in inches.",
)
@click.option(
    "--units",
    type=click.Choice(UNITS),
    default=None,
    help="Units of the sizes printed (the JSON stays in mm).  [default: in with "
    "--dp, else mm]",
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
    "--process",
    type=click.Choice(["print", "mill", "hand"]),
    default="mill",
    show_default=True,
    help="How the wheels are made; triangular teeth take the defaults of a design "
    "file with this process.",
)
@click.option(
    "--tooth-angle",
    type=Bounded("tooth_angle"),
    default=None,
    help="Triangular teeth: included tooth angle, degrees.  [default: 60 - 180/z, "
    "flanks at 30 deg to the radius at the pitch circle]",
)
@click.option(
    "--addendum",
    type=Bounded("addendum"),
    default=None,
    help="x module.  [default: 1.0 involute, 0.6 triangular]",
)
@click.option(
    "--dedendum",
    type=Bounded("dedendum"),
    default=None,
    help="x module.  [default: 1.25 involute (with --dp the inch standard's), "
    "0.85 triangular]",
)
@click.option(
    "--root-radius",
    type=Bounded("root_radius"),
    default=None,
    help="Rack tip radius (involute) or root rounding (triangular), x module.  "
    "[default: 0.38 involute (0.3 with --dp); 0.1 triangular, and at least the 0.5 mm radius of "
    "a 1 mm end mill with --process mill]",
)
@click.option(
    "--tip-radius",
    type=Bounded("tip_radius"),
    default=None,
    help="Tip rounding of triangular teeth, x module.  [default: 0.25 triangular]",
)
@click.option(
    "--backlash",
    type=Length("play"),
    default=None,
    help="Backlash each wheel asks of its meshes, mm or with a unit ('0.002in'; as "
    "the train file's "
    "'backlash'): half of it comes off each wheel's teeth.  [default: 0 involute; "
    "triangular 3 m/z plus the process's smallest backlash, by each wheel's teeth]",
)
@click.option(
    "--pin",
    "pin",
    type=Length("size"),
    default=None,
    help="Pin diameter, mm or with a unit ('0.054in').",
)
@click.option(
    "--mate", type=Bounded("teeth"), default=None, help="Teeth of the mating wheel."
)
@click.option("--mate-shift", type=Bounded("shift"), default=0.0, show_default=True)
@click.option(
    "--centre-distance",
    type=Length("size"),
    default=None,
    help="Mesh at this distance, mm or with a unit ('1.25in').",
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
    module: float | None,
    dp: float | None,
    units: str | None,
    pressure_angle: float,
    shift: float,
    form: str,
    process: str,
    tooth_angle: float | None,
    addendum: float | None,
    dedendum: float | None,
    root_radius: float | None,
    tip_radius: float | None,
    backlash: float | None,
    pin: float | None,
    mate: int | None,
    mate_shift: float,
    centre_distance: float | None,
    as_json: bool,
    svg_path: str | None,
) -> None:
    """Data sheet of one wheel; with --mate, of the pair in mesh too.

    Involute: sizes, tooth thickness, span W_k, measurement over pins, form-cutter
    number and undercut limit; for a pair the working centre distance and pressure
    angle, contact ratio, clearance, backlash and interference.

    Triangular: tooth, space and flank angles, thickness at the pitch circle, tip and
    root widths and the cutter that cuts one space; for a pair the clearance, the play
    and the transmission error over one pitch, turned in the mesh simulator.

    Give the tooth size as --module (mm) or --dp (diametral pitch, with the inch
    tooth proportions). Lengths on the command line are mm, or text with a unit
    ('0.054in', '1/8in').
    """
    if (module is None) == (dp is None):
        fail("give the tooth size as '--module' (mm) or as '--dp' (diametral pitch)")
    lengths = Lengths("in" if units is None and dp is not None else units or "mm")  # type: ignore[arg-type]  # checked by click.Choice
    if centre_distance is not None and mate is None:
        fail("'--centre-distance' needs '--mate'")
    given = {
        "tooth_angle_deg": tooth_angle,
        "addendum": addendum,
        "dedendum": dedendum,
        "root_radius": root_radius,
        "tip_radius": tip_radius,
    }
    make = Process(kind=process)  # type: ignore[arg-type]  # checked by click.Choice
    if dp is not None:
        module = module_of_dp(dp)
        if form == "involute":
            rack = inch_rack(dp, pressure_angle)
            for key in ("dedendum", "root_radius"):
                if given[key] is None:
                    given[key] = getattr(rack, key)
    assert module is not None
    size = module

    def spec_for(z: int, x: float) -> ToothSpec:
        values = tooth_defaults(form, z, size, make)
        values.update({k: v for k, v in given.items() if v is not None})
        # as in a train file: each wheel gives half the play it asks of its meshes
        usual = values.pop("backlash") if form == "triangular" else 0.0
        values.pop("backlash", None)
        thinning = thinning_for(usual if backlash is None else backlash)
        return ToothSpec(
            teeth=z,
            module=size,
            form=form,
            pressure_angle_deg=pressure_angle,
            shift=x,
            thinning=thinning,
            diametral_pitch=dp,
            **values,
        )

    try:
        spec = spec_for(teeth, shift)
        mate_spec = spec_for(mate, mate_shift) if mate is not None else None
        svg_text = None
        if svg_path is not None:
            svg_text = outline_svg(
                outline_for(spec),
                title=f"{teeth} teeth, {pitch_words(size, dp, with_module=True)}, {form}",
            )
        # the verdicts are the checks' own, so 'gear' and 'check' always agree
        verdicts = check_wheel(spec, "wheel")
        if mate_spec is not None:
            verdicts += check_wheel(mate_spec, "mate")
            verdicts += check_mesh(
                spec,
                mate_spec,
                "mesh",
                centre_distance=centre_distance,
                process=make,
                names=("wheel", "mate"),
            )
        if form == "triangular":
            out, lines = _triangular_output(
                spec, mate_spec, centre_distance, verdicts, lengths
            )
        else:
            out, lines = _involute_output(
                spec, mate_spec, centre_distance, pin, lengths
            )
            # the wheels' verdicts are on their sheets; the pair's as 'check' gives them
            lines += _pair_verdicts(verdicts)
    except ValueError as exc:
        fail(_in_option_words(str(exc)))
    if svg_path is not None and svg_text is not None:
        try:
            Path(svg_path).write_text(svg_text, encoding="utf-8")
        except OSError as exc:
            fail(f"cannot write {svg_path}: {exc.strerror}")
    if as_json:
        if svg_path is not None:
            out["svg"] = svg_path
        out["findings"] = [f.as_dict() for f in verdicts]
        echo_json(out)
        raise SystemExit(EXIT_OK)
    if svg_path is not None:
        lines += ["", f"1:1 drawing written to {svg_path}"]
    click.echo("\n".join(lines))


def _involute_output(
    spec: ToothSpec,
    mate_spec: ToothSpec | None,
    centre_distance: float | None,
    pin: float | None,
    lengths: Lengths = MM,
) -> tuple[dict[str, Any], list[str]]:
    data = gear_data(spec, pin_diameter=pin)
    out = _clean(data.as_dict())
    lines = _sheet(data, "wheel", lengths)
    if mate_spec is not None:
        mate_data = gear_data(mate_spec, pin_diameter=pin)
        mesh = mesh_data(spec, mate_spec, centre_distance)
        mesh_values = _clean(mesh.as_dict())
        mesh_values["working_pressure_angle"] = mesh_values.pop(
            "working_pressure_angle_deg"
        )
        mesh_values["mesh_warnings"] = mesh_values.pop("warnings")
        out.update(mesh_values)
        out["mate"] = _clean(mate_data.as_dict())
        lines += (
            [""]
            + _sheet(mate_data, "mate", lengths)
            + [""]
            + _mesh_lines(mesh, lengths)
        )
    return out, lines


def _pair_verdicts(verdicts: list[Finding], skip: tuple[str, ...] = ()) -> list[str]:
    lines = []
    for f in verdicts:
        if f.subject == "mesh" and f.check not in skip:
            lines.append(f"  {f.level}: {f.message.removeprefix('mesh: ')}")
            if f.advice:
                lines.append(f"    change: {f.advice}")
    return lines


def _triangular_output(
    spec: ToothSpec,
    mate_spec: ToothSpec | None,
    centre_distance: float | None,
    verdicts: list[Finding],
    lengths: Lengths = MM,
) -> tuple[dict[str, Any], list[str]]:
    dp = spec.diametral_pitch
    data = triangular_data(spec)
    cut = triangular_cut(spec)
    out = {
        "form": "triangular",
        **_clean(data.as_dict()),
        "diametral_pitch": dp,
        "form_cutter": _clean(
            {
                "space_angle_deg": cut.space_angle_deg,
                "full_depth": cut.full_depth,
                "extra_infeed": cut.extra_infeed,
                "infeed": cut.infeed,
                "tip_width": cut.tip_width,
                "tip_radius": cut.tip_radius,
                "shoulder_radius": cut.shoulder_radius,
                "pin_diameter": cut.pin_diameter,
                "over_pins": cut.over_pins,
            }
        ),
    }
    lines = _triangular_sheet(data, spec, "wheel", lengths, dp)
    if mate_spec is not None:
        mate_data = triangular_data(mate_spec)
        pair = _triangular_pair(spec, mate_spec, centre_distance)
        out.update(_clean(pair))
        out["mate"] = {
            "form": "triangular",
            **_clean(mate_data.as_dict()),
            "diametral_pitch": dp,
        }
        lines += (
            [""]
            + _triangular_sheet(mate_data, mate_spec, "mate", lengths, dp)
            + [""]
            + _triangular_pair_lines(pair, mate_spec.teeth, lengths)
            # the sheet shows the transmission error itself
            + _pair_verdicts(verdicts, skip=("mesh.transmission_error",))
        )
    return out, lines


gear_command = click.command("gear")(_gear)
