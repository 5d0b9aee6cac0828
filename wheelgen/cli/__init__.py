"""Command line: ``wheelgen <command>``. Only this package catches our errors.

Exit codes: 0 all well; 1 the design loads but a check found an error (or a search
found nothing within tolerance); 2 the input cannot be used (bad file, bad option).
Each command lives in its own module and is imported here; commands that need the CAD
kernel import it inside the command body, so ``wheelgen check`` starts fast.
"""

from __future__ import annotations

import click

from ..version import __version__

__all__ = ["main"]


@click.group(
    context_settings={"help_option_names": ["-h", "--help"], "max_content_width": 100}
)
@click.version_option(__version__, prog_name="wheelgen")
def main() -> None:
    """wheelgen: from a gear-train definition to checked parts and workshop sheets.

    Write the train as a TOML file (see docs/format.md), then:

    \b
      wheelgen ratio TARGET     tooth counts that realise a period or ratio
      wheelgen check DESIGN     exact rates, targets and every check
      wheelgen motion DESIGN    uneven motion from pin-and-slot couplings
      wheelgen build DESIGN     parts as STEP, STL, 3MF, DXF and 1:1 SVG, and sheets
      wheelgen gear -z Z -m M   data sheet of one wheel or a pair (or --dp P: inch pitch)
      wheelgen index TEETH      dividing-head indexing for a tooth count

    Without DESIGN, the bundled demo (harbour_tide_clock.toml, installed with the
    package) is used. A build writes the part files, the workshop sheets (cutting or
    print sheet, drilling charts, bill of parts, turned-part drawings, elevation,
    assembly order) and report.html into output/<design name>/.
    """


from .check import check_command  # noqa: E402  (commands register after the group exists)

main.add_command(check_command)
from .index import index_command  # noqa: E402

main.add_command(index_command)
from .ratio import ratio_command  # noqa: E402

main.add_command(ratio_command)
from .motion import motion_command  # noqa: E402

main.add_command(motion_command)
from .gear import gear_command  # noqa: E402

main.add_command(gear_command)
from .build import build_command  # noqa: E402

main.add_command(build_command)
