"""ISO 286 limit deviations of the running-fit zones against published tables."""

import pytest

from wheelgen.layout.fits import fit_limits, limit_deviations, parse_fit

# (size mm, zone, upper um, lower um, source). ISO 286-2:2010 limit deviations, read
# from two tool makers' tables (docs/references.md section 9):
HOLES = "ISO 286-2 holes, as printed at deepri.com tech_iso_tolerances"
SHAFTS = "ISO 286-2 shafts = JIS B 0401 (1999), as printed at docs.steelcam.org"
DEVIATIONS = [
    (3.0, "H7", 10, 0, HOLES),
    (5.0, "H7", 12, 0, HOLES),
    (8.0, "H7", 15, 0, HOLES),
    (12.0, "H7", 18, 0, HOLES),
    (3.0, "H8", 14, 0, HOLES),
    (5.0, "H8", 18, 0, HOLES),
    (8.0, "H8", 22, 0, HOLES),
    (3.0, "g6", -2, -8, SHAFTS),
    (5.0, "g6", -4, -12, SHAFTS),
    (8.0, "g6", -5, -14, SHAFTS),
    (12.0, "g6", -6, -17, SHAFTS),
    (3.0, "h6", 0, -6, SHAFTS),
    (5.0, "h6", 0, -8, SHAFTS),
    (8.0, "h6", 0, -9, SHAFTS),
    (3.0, "f7", -6, -16, SHAFTS),
    (5.0, "f7", -10, -22, SHAFTS),
    (8.0, "f7", -13, -28, SHAFTS),
    (1.5, "g6", -2, -8, SHAFTS + " (range >1-3)"),
]


@pytest.mark.parametrize(("size", "zone", "upper", "lower", "source"), DEVIATIONS)
def test_limit_deviations_match_iso_286_2(size, zone, upper, lower, source):
    assert limit_deviations(size, zone) == (upper, lower), source


# derived: clearance ranges from the table rows above (hole limits minus shaft limits):
# H7/g6 at <=3: 2..18 um, 3-6: 4..24 um, 6-10: 5..29 um.
@pytest.mark.parametrize(
    ("size", "low_um", "high_um"), [(3.0, 2, 18), (5.0, 4, 24), (8.0, 5, 29)]
)
def test_h7_g6_clearance_range(size, low_um, high_um):
    lim = fit_limits(size, "H7/g6")
    assert lim.min_clearance == pytest.approx(low_um / 1000, abs=1e-12)
    assert lim.max_clearance == pytest.approx(high_um / 1000, abs=1e-12)


def test_size_on_a_range_boundary_belongs_to_the_lower_range():
    # ISO 286: ranges run "over a up to and including b"; 6 mm is in 3-6 (H7 +12),
    # 6.001 mm in 6-10 (H7 +15) (docs/references.md section 9)
    assert limit_deviations(6.0, "H7") == (12, 0)
    assert limit_deviations(6.001, "H7") == (15, 0)


@pytest.mark.parametrize("text", ["H7-g6", "g6/H7", "H7/x6", "H7/g3", "H7", "h7/g6"])
def test_bad_fit_is_refused(text):
    with pytest.raises(ValueError, match="'(fit|zone)' must be"):
        parse_fit(text)


def test_size_out_of_table_is_refused():
    with pytest.raises(ValueError, match="'size' must be"):
        limit_deviations(0.0, "H7")
