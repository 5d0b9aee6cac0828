"""``wheelgen motion``: exit codes, the extremes, CSV table and plot files.

Truth: the demo's moon coupling (r = 8, e = 0.8) leads and lags by asin(0.1) = 5.7392
deg (firgelliauto.com, "Whitworth quick-return mechanism": alpha = asin(d / r);
docs/references.md section 13), with the slot wheel at 90 and 270 degrees from rest (the
slot at right angles to the offset line, same source); the period of the moon dial
11074/375 d is derived from the demo's tooth counts (25/113 * 15/98 turns per day).
"""

from __future__ import annotations

import csv
import json
import math
import subprocess
import sys

import pytest
from click.testing import CliRunner

from tests._demo import DEMO
from wheelgen.cli import main

ALPHA = math.degrees(math.asin(0.8 / 8.0))  # 5.7392 deg
MOON_DAYS = 11074 / 375  # derived: main 1/d, 25/113 * 15/98


def _run(*args: str):
    return CliRunner().invoke(main, ["motion", *args])


def test_text_names_the_uneven_arbor():
    result = _run(str(DEMO))
    assert result.exit_code == 0, result.output
    assert "moon_dial" in result.output
    assert f"{ALPHA:.4f} deg" in result.output
    assert "1 cycle(s) of moon_coupling" in result.output


def test_json_extremes():
    result = _run(str(DEMO), "--json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.output)
    assert data["span_s"] == pytest.approx(MOON_DAYS * 86400.0)
    (row,) = data["arbors"]
    assert row["arbor"] == "moon_dial"
    assert row["max_lead_deg"] == pytest.approx(ALPHA, abs=1e-6)
    assert row["max_lag_deg"] == pytest.approx(ALPHA, abs=1e-6)
    # the extremes come with the slot square to the offset line: 270 and 90 deg
    assert row["lead_arbor_angle_deg"] == pytest.approx(270.0, abs=0.1)
    assert row["lag_arbor_angle_deg"] == pytest.approx(90.0, abs=0.1)
    # derived: the demo turns clockwise seen from the front, the time reverse of a
    # counter-clockwise turn. Counter-clockwise the slot wheel leads at 90 deg when the
    # pin has turned 90 - alpha, and lags at 270 deg when it has turned 270 + alpha;
    # reversed in time, the lag at 270 deg (reached after 360 - (270 + alpha) degrees
    # of the pin's turn) becomes a lead in the clockwise sense, and the lead at 90 deg
    # a lag after 360 - (90 - alpha) degrees
    cycle = MOON_DAYS * 86400.0
    step = 0.06 / 360 * cycle  # the command samples every 0.05 deg of the pin's turn
    assert row["lead_at_s"] == pytest.approx((90 - ALPHA) / 360 * cycle, abs=step)
    assert row["lag_at_s"] == pytest.approx((270 + ALPHA) / 360 * cycle, abs=step)


def test_arbor_and_turns_set_the_span(tmp_path):
    out = tmp_path / "moon.csv"
    result = _run(
        str(DEMO),
        "--arbor",
        "moon_dial",
        "--turns",
        "2",
        "--samples",
        "101",
        "--csv",
        str(out),
        "--json",
    )
    assert result.exit_code == 0, result.output
    data = json.loads(result.output)
    assert data["span_s"] == pytest.approx(2 * MOON_DAYS * 86400.0)
    rows = list(csv.reader(out.open()))
    assert rows[0] == ["time_s", "moon_dial_deg", "moon_dial_dev_deg"]
    assert len(rows) == 102
    # derived: two turns from rest, exactly, clockwise (negative seen from the front)
    assert float(rows[-1][1]) == pytest.approx(-720.0, abs=1e-6)
    assert max(float(r[2]) for r in rows[1:]) == pytest.approx(ALPHA, abs=0.02)


def test_csv_all_arbors(tmp_path):
    out = tmp_path / "all.csv"
    result = _run(str(DEMO), "--samples", "11", "--csv", str(out))
    assert result.exit_code == 0, result.output
    head = next(csv.reader(out.open()))
    assert "main_deg" in head and "tide_deg" in head and "moon_dial_dev_deg" in head


@pytest.mark.parametrize("suffix", [".png", ".svg"])
def test_plot_files(tmp_path, suffix):
    out = tmp_path / f"dev{suffix}"
    result = _run(str(DEMO), "--samples", "181", "--plot", str(out))
    assert result.exit_code == 0, result.output
    data = out.read_bytes()
    if suffix == ".png":
        assert data[:8] == b"\x89PNG\r\n\x1a\n"
    else:
        assert b"<svg" in data[:2000]


def test_bad_options_exit_2(tmp_path):
    assert _run(str(DEMO), "--plot", str(tmp_path / "x.pdf")).exit_code == 2
    result = _run(str(DEMO), "--arbor", "nowhere")
    assert result.exit_code == 2
    assert "does not exist" in result.output
    assert _run(str(DEMO), "--turns", "0").exit_code == 2
    assert _run(str(tmp_path / "missing.toml")).exit_code == 2


def test_still_arbor_and_broken_coupling_exit_1(tmp_path):
    assert _run(str(DEMO), "--arbor", "stud").exit_code == 1
    bad = tmp_path / "bad.toml"
    bad.write_text(DEMO.read_text().replace("offset = 0.8", "offset = 8.0"))
    result = _run(str(bad))
    assert result.exit_code == 1
    assert "'offset' must be smaller" in result.output


def test_even_arbor_reports_even():
    result = _run(str(DEMO), "--arbor", "hours")
    assert result.exit_code == 0, result.output
    assert 'arbor "hours" moves evenly' in result.output


def test_no_plotting_library_without_plot():
    # matplotlib is imported only for --plot (fresh interpreter, nothing cached)
    code = (
        "import sys; from click.testing import CliRunner; from wheelgen.cli import main;"
        f"r = CliRunner().invoke(main, ['motion', {str(DEMO)!r}]); assert r.exit_code == 0;"
        "print('matplotlib' in sys.modules)"
    )
    out = subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, check=True
    )
    assert out.stdout.split() == ["False"]
