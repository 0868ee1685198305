"""Reading a user's bearing catalogue (CSV and YAML) into column arrays.

Every catalogue here is invented for the tests (designations ``TST-...``, ratings made
up). Unit factors are those of the SI definitions (BIPM SI Brochure, 9th ed., 2019: the
prefixes k = 10^3, M = 10^6, c = 10^-2) and NIST Special Publication 811 (2008 ed.),
Appendix B (1 in = 25.4 mm exactly), unless a test says otherwise. Expected lines are
found by searching the written text for the offending row (``line_of``), not computed by
shaftsys; expected fields and wording are typed in literally.
"""

from __future__ import annotations

import json
import logging
import math
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path

import jsonschema
import numpy as np
import pytest
import yaml

import shaftsys
import shaftsys.io.catalogue as catalogue_module
from shaftsys.errors import EXIT_BAD_INPUT, ModelError
from shaftsys.io.catalogue import (
    _COMMON_FACTORS,
    COLUMNS,
    catalogue_columns_markdown,
    catalogue_schema,
    read_catalogue,
    resolve_column,
)
from shaftsys.io.quantities import to_internal
from shaftsys.io.yamlsource import MAX_FILE_BYTES
from shaftsys.model import AxialRole, BearingKind, SetArrangement
from shaftsys.model.catalogue import KIND_CODE, NUMERIC_FIELDS, Catalogue

SHIPPED_SCHEMA = Path(shaftsys.__file__).resolve().parent / "catalogue.schema.json"

BASE_CSV = """\
# invented test catalogue: every value is made up
designation,type,d_mm,D_mm,B_mm,C_kN,C0_kN,Cu_kN,limiting_speed_rpm,mass_kg,contact_angle_deg,price_EUR,seal
TST-DG-40,deep_groove_ball,40,80,18,30.0,19.0,0.80,12000,0.37,,10.50,open

TST-AC-45,angular_contact_ball,45,85,19,38.0,27.0,1.10,10000,0.42,40,21.00,
# a comment between rows
TST-TR-50,tapered_roller,50,90,21.75,82.0,95.0,10.5,7000,0.55,14,18.25,shield
"""

BASE_YAML = """\
name: invented test catalogue
price_unit: EUR
bearings:
  - designation: TST-DG-40
    type: deep_groove_ball
    d: 40 mm
    D: 80 mm
    B: 18 mm
    C: 30 kN
    C0: 19 kN
    Cu: 0.8 kN
    limiting_speed: 12000 rpm
    mass: 0.37 kg
    price: 10.50
    seal: open
  - designation: TST-AC-45
    type: angular_contact_ball
    d: 45 mm
    D: 85 mm
    B: 19 mm
    C: 38 kN
    C0: 27 kN
    Cu: 1.1 kN
    limiting_speed: 10000 rpm
    mass: 0.42 kg
    contact_angle: 40 deg
    price: 21.00 EUR
  - designation: TST-TR-50
    type: tapered_roller
    d: 50 mm
    D: 90 mm
    B: 21.75 mm
    C: 82 kN
    C0: 95 kN
    Cu: 10.5 kN
    limiting_speed: 7000 rpm
    mass: 0.55 kg
    contact_angle: 14 deg
    price: 18.25
    seal: shield
"""


def line_of(text: str, needle: str, occurrence: int = 1) -> int:
    """1-based line of the ``occurrence``-th line of ``text`` containing ``needle``."""
    hits = [i for i, line in enumerate(text.splitlines(), start=1) if needle in line]
    assert len(hits) >= occurrence, f"{needle!r} not in the test text"
    return hits[occurrence - 1]


def _write(tmp_path: Path, text: str | bytes, name: str = "cat.csv") -> Path:
    path = tmp_path / name
    if isinstance(text, bytes):
        path.write_bytes(text)
    else:
        path.write_text(text, encoding="utf-8")
    return path


def _edit_row(designation: str, column: str, value: str) -> Callable[[str], str]:
    """Replace one cell of a CSV row of BASE_CSV (found by designation and header)."""
    def edit(text: str) -> str:
        lines = text.split("\n")
        header = next(line for line in lines if line.startswith("designation,"))
        j = header.split(",").index(column)
        for k, line in enumerate(lines):
            if line.startswith(designation + ","):
                cells = line.split(",")
                cells[j] = value
                lines[k] = ",".join(cells)
        return "\n".join(lines)
    return edit


# ---------------------------------------------------------------------------------------
# bad CSV input


@dataclass(frozen=True)
class Bad:
    """One bad catalogue: how to make it and what the error must say."""

    name: str
    edit: Callable[[str], str]
    needle: str            # text of the offending line after the edit
    field: str | None
    message: str           # substring of the message
    expected: str          # substring of what would have been valid
    occurrence: int = 1


def _drop_column(name: str) -> Callable[[str], str]:
    def edit(text: str) -> str:
        lines = text.split("\n")
        header = next(line for line in lines if line.startswith("designation,"))
        j = header.split(",").index(name)
        out = []
        for line in lines:
            if line and not line.startswith("#"):
                cells = line.split(",")
                del cells[j]
                out.append(",".join(cells))
            else:
                out.append(line)
        return "\n".join(out)
    return edit


def _rename_column(old: str, new: str) -> Callable[[str], str]:
    return lambda t: t.replace(f",{old},", f",{new},", 1)


def _header_only(text: str) -> str:
    return "\n".join(line for line in text.split("\n") if not line.startswith("TST-"))


BAD_CSV = [
    Bad("missing rating", _edit_row("TST-AC-45", "C_kN", ""), "TST-AC-45,", "C_kN",
        "bearing 'TST-AC-45': 'C_kN' is missing", "a value in column 'C_kN'"),
    Bad("non-numeric rating", _edit_row("TST-AC-45", "C0_kN", "lots"), "TST-AC-45,",
        "C0_kN", "cannot read 'lots' as a number", "a quantity such as '52 kN'"),
    Bad("zero rating C", _edit_row("TST-TR-50", "C_kN", "0"), "TST-TR-50,", "C_kN",
        "must be positive, got 0 N", "a value > 0"),
    Bad("negative rating C0", _edit_row("TST-DG-40", "C0_kN", "-19"), "TST-DG-40,",
        "C0_kN", "must be positive, got -19000 N", "a value > 0"),
    Bad("negative dimension", _edit_row("TST-AC-45", "B_mm", "-19"), "TST-AC-45,", "B_mm",
        "bearing 'TST-AC-45': must be positive, got -19 mm", "a value > 0"),
    Bad("zero bore", _edit_row("TST-TR-50", "d_mm", "0"), "TST-TR-50,", "d_mm",
        "must be positive, got 0 mm", "a value > 0"),
    Bad("duplicate designation", lambda t: t.replace("TST-TR-50,", "TST-DG-40,"),
        "TST-DG-40,", "designation", "designation 'TST-DG-40' appears on lines 3 and 7",
        "each designation once", occurrence=2),
    Bad("bore not below outside diameter", _edit_row("TST-AC-45", "d_mm", "85"),
        "TST-AC-45,", "D_mm", "outside diameter 85 mm is not larger than the bore 85 mm",
        "D > d"),
    Bad("unknown type with suggestion", _edit_row("TST-TR-50", "type", "taperd_roller"),
        "TST-TR-50,", "type", "'taperd_roller' is not a bearing type; did you mean "
        "'tapered_roller'?", "one of: deep_groove_ball"),
    Bad("unreadable unit in the header", _rename_column("C_kN", "C_kqq"), "designation,",
        "C_kqq", "cannot read the unit 'kqq'", "a unit of force such as 'N'"),
    Bad("length unit on a rating column", _rename_column("C_kN", "C_mm"), "designation,",
        "C_mm", "the unit 'mm' is not a unit of force", "a unit of force"),
    Bad("missing required column", _drop_column("C0_kN"), "designation,", "C0",
        "the header has no column 'C0'", "a column 'C0_kN'"),
    Bad("row with too few cells", lambda t: t.replace("40,21.00,\n", "40,21.00\n"),
        "TST-AC-45,", None, "the row has 12 cells, the header names 13 columns",
        "13 comma-separated cells"),
    Bad("row with too many cells", lambda t: t.replace(",shield", ",shield,x"),
        "TST-TR-50,", None, "the row has 14 cells", "13 comma-separated cells"),
    Bad("empty catalogue", _header_only, "designation,", None,
        "the catalogue has no bearing", "one row per bearing"),
    Bad("fatigue limit not below C0", _edit_row("TST-DG-40", "Cu_kN", "19"), "TST-DG-40,",
        "Cu_kN", "fatigue load limit 19000 N is not below the static rating C0 19000 N",
        "Cu < C0"),
    Bad("contact angle above 90", _edit_row("TST-TR-50", "contact_angle_deg", "95"),
        "TST-TR-50,", "contact_angle_deg", "95 deg is above the largest allowed 90 deg",
        "a value <= 90 deg"),
    Bad("negative contact angle", _edit_row("TST-AC-45", "contact_angle_deg", "-5"),
        "TST-AC-45,", "contact_angle_deg", "-5 deg is below the smallest allowed 0 deg",
        "a value >= 0 deg"),
    Bad("angular contact without angle", _edit_row("TST-AC-45", "contact_angle_deg", ""),
        "TST-AC-45,", "contact_angle_deg", "the contact angle is missing (needed for "
        "angular_contact_ball)", "a contact angle"),
    Bad("cell unit of the wrong dimension", _edit_row("TST-AC-45", "C_kN", "38 mm"),
        "TST-AC-45,", "C_kN", "the unit 'mm' is not a unit of force", "a unit of force"),
    Bad("NaN written in a cell", _edit_row("TST-TR-50", "mass_kg", "nan"), "TST-TR-50,",
        "mass_kg", "'nan' is not a finite number", "a quantity such as '0.5 kg'"),
    Bad("infinite rating", _edit_row("TST-TR-50", "C_kN", "inf"), "TST-TR-50,", "C_kN",
        "'inf' is not a finite number", "52 kN"),
    Bad("rating beyond floating point range", _edit_row("TST-DG-40", "C_kN", "1e300"),
        "TST-DG-40,", "C_kN", "is outside the range shaftsys computes with",
        "0 or a magnitude from 1e-15 to 1e+15 N"),
    Bad("mixed currencies", _edit_row("TST-AC-45", "price_EUR", "21 USD"), "TST-AC-45,",
        "price_EUR", "a price in USD among prices in EUR", "every price in EUR"),
    Bad("column given twice", _rename_column("B_mm", "bore"), "designation,", "bore",
        "column 'd' appears twice in the header ('d_mm' and 'bore')", "each column once"),
    Bad("missing designation", lambda t: t.replace("TST-TR-50,", ",", 1),
        "tapered_roller", "designation", "the designation is missing",
        "the catalogue's name"),
    Bad("unit row with an unreadable unit", lambda t: t.replace(
        "price_EUR,seal\n", "price_EUR,seal\nunits,,,,,,,,,zz,,,\n"), "units,", "mass_kg",
        "cannot read the unit 'zz'", "a unit of mass"),
    Bad("unit row disagreeing with the name", lambda t: t.replace(
        "price_EUR,seal\n", "price_EUR,seal\nunits,,,,,N,,,,,,,\n"), "units,", "C_kN",
        "the unit row gives 'N' for a column whose name says 'kN'", "one unit per column"),
    Bad("control character", _edit_row("TST-AC-45", "seal", "a\x01b"), "TST-AC-45,", None,
        "character #x0001 is not allowed", "printable text"),
    Bad("unterminated quote", _edit_row("TST-TR-50", "seal", '"shield'), "TST-TR-50,",
        None, "cannot read the CSV row", "quotes closed"),
]


@pytest.mark.parametrize("bad", BAD_CSV, ids=lambda b: b.name)
def test_bad_csv_names_file_line_and_column(tmp_path: Path, bad: Bad) -> None:
    """Common practice, no source: a user mistake is one located ModelError (exit 2)."""
    text = bad.edit(BASE_CSV)
    assert text != BASE_CSV
    path = _write(tmp_path, text)
    with pytest.raises(ModelError) as info:
        read_catalogue(path)
    err = info.value
    assert err.exit_code == EXIT_BAD_INPUT
    assert err.file == str(path)
    assert err.line == line_of(text, bad.needle, bad.occurrence)
    assert err.field == bad.field
    assert bad.message in err.message
    assert err.expected is not None and bad.expected in err.expected
    assert str(err).startswith(f"{path}:{err.line}: ")


def test_first_problem_in_file_order_is_reported(tmp_path: Path) -> None:
    """Two bad rows: the message names the earlier line, whatever column comes first."""
    text = _edit_row("TST-TR-50", "d_mm", "-1")(_edit_row("TST-AC-45", "mass_kg", "x")(BASE_CSV))
    with pytest.raises(ModelError) as info:
        read_catalogue(_write(tmp_path, text))
    assert info.value.line == line_of(text, "TST-AC-45,")
    assert info.value.field == "mass_kg"


def test_file_too_large(tmp_path: Path) -> None:
    text = BASE_CSV + "#" * (MAX_FILE_BYTES + 1) + "\n"
    with pytest.raises(ModelError) as info:
        read_catalogue(_write(tmp_path, text))
    assert "larger than" in info.value.message
    assert (info.value.line, info.value.field) == (1, None)


def test_non_utf8_bytes_name_their_line(tmp_path: Path) -> None:
    data = BASE_CSV.replace("shield", "sh\xefeld").encode("latin-1")
    with pytest.raises(ModelError) as info:
        read_catalogue(_write(tmp_path, data))
    assert info.value.message == "the file is not UTF-8 text"
    assert info.value.line == line_of(BASE_CSV, "TST-TR-50,")


def test_unknown_suffix_and_missing_file(tmp_path: Path) -> None:
    with pytest.raises(ModelError, match="cannot tell the form"):
        read_catalogue(_write(tmp_path, BASE_CSV, "cat.txt"))
    with pytest.raises(ModelError, match="cannot read the catalogue file"):
        read_catalogue(tmp_path / "missing.csv")


def test_comment_only_file_is_empty(tmp_path: Path) -> None:
    with pytest.raises(ModelError, match="the catalogue is empty") as info:
        read_catalogue(_write(tmp_path, "# nothing here\n\n"))
    assert info.value.line == 1


# ---------------------------------------------------------------------------------------
# the good file, and the three ways of giving units


def test_base_csv_values_in_internal_units(tmp_path: Path) -> None:
    """kN -> N by the SI prefix k = 10^3; every other column already in mm, rpm, kg, deg."""
    cat = read_catalogue(_write(tmp_path, BASE_CSV))
    assert len(cat) == 3
    assert cat.designation == ("TST-DG-40", "TST-AC-45", "TST-TR-50")
    assert cat.kind == (BearingKind.DEEP_GROOVE_BALL, BearingKind.ANGULAR_CONTACT_BALL,
                        BearingKind.TAPERED_ROLLER)
    assert cat.line == (line_of(BASE_CSV, "TST-DG-40"), line_of(BASE_CSV, "TST-AC-45"),
                        line_of(BASE_CSV, "TST-TR-50"))
    np.testing.assert_array_equal(cat.C_N, [30.0e3, 38.0e3, 82.0e3])
    np.testing.assert_array_equal(cat.C0_N, [19.0e3, 27.0e3, 95.0e3])
    np.testing.assert_array_equal(cat.Cu_N, [0.80e3, 1.10e3, 10.5e3])
    np.testing.assert_array_equal(cat.B_mm, [18.0, 19.0, 21.75])
    np.testing.assert_array_equal(cat.contact_angle_deg, [np.nan, 40.0, 14.0])
    np.testing.assert_array_equal(cat.price, [10.50, 21.00, 18.25])
    assert cat.price_unit == "EUR"
    assert np.isnan(cat.Y).all() and np.isnan(cat.reference_speed_rpm).all()
    assert cat.extra == {"seal": ("open", "", "shield")}
    assert cat.source == str(tmp_path / "cat.csv")
    np.testing.assert_array_equal(cat.kind_code, [KIND_CODE[k] for k in cat.kind])


UNIT_ROW_CSV = """\
designation,type,d,D,B,C,C0,Cu,limiting_speed,mass,contact_angle,price,seal
units,,mm,m,cm,kN,N,kN,rpm,g,deg,EUR,
TST-DG-40,deep_groove_ball,40,0.080,1.8,30.0,19000,0.80,12000,370,,10.50,open
TST-AC-45,angular_contact_ball,45,0.085,1.9,38.0,27000,1.10,10000,420,40,21.00,
TST-TR-50,tapered_roller,50,0.090,2.175,82.0,95000,10.5,7000,550,14,18.25,shield
"""

CELL_UNIT_CSV = (
    "Designation,Type,Bore,Outer,Width,C,C0,Cu,Limiting_Speed,Mass,Contact_Angle,Price,seal\n"
    "TST-DG-40,Deep Groove Ball,40 mm,80 mm,18mm,30 kN,19 kN,800 N,12000 rpm,370 g,,"
    "10.50 EUR,open\n"
    'TST-AC-45,angular-contact-ball,4.5 cm,85 mm,19 mm,"38,000 N",27 kN,1.1 kN,10000 rpm,'
    "0.42 kg,40 deg,21 EUR,\n"
    "TST-TR-50,tapered_roller,50 mm,90 mm,21.75 mm,82 kN,95 kN,10.5 kN,7000 rpm,0.55 kg,"
    "14 deg,18.25 EUR,shield\n")

BRACKET_CSV = (
    "designation,type,d [mm],D (in),B [mm],C [kN],C0 [kN],Cu [kN],limiting_speed [1/min],"
    "mass [kg],contact_angle [deg],price [EUR],seal\n"
    "TST-DG-40,deep_groove_ball,40,3.1496062992125986,18,30.0,19.0,0.80,12000,0.37,,10.50,"
    "open\n"
    "TST-AC-45,angular_contact_ball,45,3.3464566929133857,19,38.0,27.0,1.10,10000,0.42,40,"
    "21.00,\n"
    "TST-TR-50,tapered_roller,50,3.5433070866141736,21.75,82.0,95.0,10.5,7000,0.55,14,18.25,"
    "shield\n")


@pytest.mark.parametrize("name", ["unit row", "cell units", "brackets", "yaml"])
def test_every_way_of_giving_units_gives_the_same_arrays(tmp_path: Path, name: str) -> None:
    """SI prefixes (k, c), 1 m = 1000 mm, 1 g = 1e-3 kg, 1 in = 25.4 mm (NIST SP 811, B.8).

    ``"38,000 N"`` holds a thousands separator: it is refused below, so the cell-unit file
    writes the quoted cell only to prove quoting works; its value is replaced first.
    """
    text = {"unit row": UNIT_ROW_CSV, "cell units": CELL_UNIT_CSV.replace(
        '"38,000 N"', '"38000 N"'), "brackets": BRACKET_CSV, "yaml": BASE_YAML}[name]
    suffix = "cat.yaml" if name == "yaml" else "cat.csv"
    reference = read_catalogue(_write(tmp_path, BASE_CSV, "ref.csv"))
    cat = read_catalogue(_write(tmp_path, text, suffix))
    assert cat.designation == reference.designation
    assert cat.kind == reference.kind
    for attr in NUMERIC_FIELDS:
        # inches and metres are exact factors, but 80/25.4*25.4 may round in the last bit
        np.testing.assert_allclose(getattr(cat, attr), getattr(reference, attr), rtol=1e-15,
                                   atol=0, err_msg=attr)
    np.testing.assert_array_equal(cat.C_N, reference.C_N)
    assert cat.price_unit == "EUR"
    assert cat.extra == reference.extra


def test_thousands_separator_in_a_cell_is_refused(tmp_path: Path) -> None:
    """Common practice, no source: '38,000' is ambiguous (decimal comma), so refused."""
    with pytest.raises(ModelError) as info:
        read_catalogue(_write(tmp_path, CELL_UNIT_CSV))
    assert info.value.field == "C"
    assert info.value.line == line_of(CELL_UNIT_CSV, "TST-AC-45")


def test_bare_numbers_without_unit_warn_once(tmp_path: Path,
                                             caplog: pytest.LogCaptureFixture) -> None:
    """Common practice, no source: a catalogue read in N because no unit was given is
    almost always a mistake worth a warning; a file with units gives none.
    """
    text = BASE_CSV.replace("C_kN,C0_kN,Cu_kN", "C,C0,Cu")
    with caplog.at_level(logging.WARNING, logger="shaftsys.io.catalogue"):
        cat = read_catalogue(_write(tmp_path, text))
    np.testing.assert_array_equal(cat.C_N, [30.0, 38.0, 82.0])
    warnings = [r for r in caplog.records if r.name == "shaftsys.io.catalogue"]
    assert len(warnings) == 1
    assert "columns C (N), C0 (N), Cu (N):" in warnings[0].getMessage()
    caplog.clear()
    with caplog.at_level(logging.WARNING, logger="shaftsys.io.catalogue"):
        read_catalogue(_write(tmp_path, BASE_CSV, "units.csv"))
    assert [r for r in caplog.records if r.name == "shaftsys.io.catalogue"] == []


def test_common_unit_factors_agree_with_pint() -> None:
    """The shortcut table must give pint's factor (SI Brochure; NIST SP 811, B.8)."""
    for (dim, unit), factor in _COMMON_FACTORS.items():
        assert to_internal(f"1 {unit}", dim) == pytest.approx(factor, rel=1e-15), (dim, unit)


def test_pint_units_outside_the_table(tmp_path: Path) -> None:
    """1 lbf = 4.4482216152605 N (NIST SP 811, B.8); 1 rad = 180/pi deg; 1 Hz = 60 rpm
    (shaftsys reads a frequency as revolutions per unit time, see io/quantities.py).
    """
    text = BASE_CSV.replace("C_kN", "C_lbf").replace("limiting_speed_rpm", "limiting_speed_Hz")
    text = text.replace(",40,21.00,", f",{math.radians(40)!r} rad,21.00,")
    cat = read_catalogue(_write(tmp_path, text))
    np.testing.assert_allclose(cat.C_N, np.array([30.0, 38.0, 82.0]) * 4.4482216152605,
                               rtol=1e-14)
    np.testing.assert_allclose(cat.limiting_speed_rpm, [12000 * 60, 10000 * 60, 7000 * 60],
                               rtol=1e-15)
    assert cat.contact_angle_deg[1] == pytest.approx(40.0, rel=1e-14)


@pytest.mark.parametrize(("header", "name", "unit"), [
    ("C_kN", "C", "kN"), ("c0_KN", "C0", "KN"), ("d", "d", None), ("D", "D", None),
    ("d_mm", "d", "mm"), ("D_MM", "D", "MM"), ("Bore", "d", None), ("OUTER", "D", None),
    ("width", "B", None), ("limiting_speed_rpm", "limiting_speed", "rpm"),
    ("reference_speed", "reference_speed", None), ("price_EUR", "price", "EUR"),
    ("C [kN]", "C", "kN"), ("mass (g)", "mass", "g"), ("seal_type", None, None),
    ("type_code", None, None), ("notes", None, None),
])
def test_column_names(header: str, name: str | None, unit: str | None) -> None:
    """Case-insensitive names, except d (bore) and D (outside diameter)."""
    spec, got_unit = resolve_column(header)
    assert (spec.name if spec else None, got_unit) == (name, unit)


# ---------------------------------------------------------------------------------------
# YAML


@dataclass(frozen=True)
class BadYaml:
    name: str
    edit: Callable[[str], str]
    needle: str
    field: str | None
    message: str
    occurrence: int = 1


BAD_YAML = [
    BadYaml("missing rating", lambda t: t.replace("    C0: 27 kN\n", ""),
            "- designation: TST-AC-45", "bearings[TST-AC-45].C0", "'C0' is missing"),
    BadYaml("rating in kg", lambda t: t.replace("C0: 27 kN", "C0: 27 kg"), "C0: 27 kg",
            "bearings[TST-AC-45].C0", "the unit 'kg' is not a unit of force"),
    BadYaml("unknown type", lambda t: t.replace("type: tapered_roller", "type: taper"),
            "type: taper", "bearings[TST-TR-50].type", "did you mean 'tapered_roller'?"),
    BadYaml("duplicate designation", lambda t: t.replace("TST-TR-50", "TST-DG-40"),
            "designation: TST-DG-40", "bearings[TST-DG-40].designation",
            "appears on lines 4 and 28", occurrence=2),
    BadYaml("d >= D", lambda t: t.replace("d: 50 mm", "d: 95 mm"), "D: 90 mm",
            "bearings[TST-TR-50].D", "is not larger than the bore 95 mm"),
    BadYaml("unknown top-level key", lambda t: t.replace("bearings:", "bearing:"),
            "bearing:", "bearing", "did you mean 'bearings'?"),
    BadYaml("bearings not a list", lambda t: t.split("bearings:")[0] + "bearings: 3\n",
            "bearings: 3", "bearings", "'bearings' is not a list"),
    BadYaml("empty catalogue", lambda t: t.split("bearings:")[0] + "bearings: []\n",
            "bearings: []", "bearings", "the catalogue has no bearing"),
    BadYaml("entry not a mapping", lambda t: t + "  - just text\n", "- just text",
            "bearings[3]", "a catalogue entry is not a mapping"),
    BadYaml("nested value", lambda t: t.replace("seal: shield", "seal: [a, b]"),
            "seal: [a, b]", "bearings[TST-TR-50].seal", "'seal' holds a list"),
    BadYaml("same column twice", lambda t: t.replace("    B: 19 mm\n",
                                                     "    B: 19 mm\n    width: 19 mm\n"),
            "width: 19 mm", "bearings[TST-AC-45].width", "'B' and 'width' give the same"),
    BadYaml("boolean rating", lambda t: t.replace("C: 82 kN", "C: yes"), "C: yes",
            "bearings[TST-TR-50].C", "bool True is not a number"),
    BadYaml("bad price unit", lambda t: t.replace("price_unit: EUR", "price_unit: 12"),
            "price_unit: 12", "price_unit", "12 is not a currency name"),
]


@pytest.mark.parametrize("bad", BAD_YAML, ids=lambda b: b.name)
def test_bad_yaml_names_file_line_and_key(tmp_path: Path, bad: BadYaml) -> None:
    """Common practice, no source: field paths as in a model file, line of the key."""
    text = bad.edit(BASE_YAML)
    assert text != BASE_YAML
    path = _write(tmp_path, text, "cat.yaml")
    with pytest.raises(ModelError) as info:
        read_catalogue(path)
    err = info.value
    assert err.exit_code == EXIT_BAD_INPUT
    assert (err.file, err.line, err.field) == (str(path), line_of(text, bad.needle,
                                                                  bad.occurrence), bad.field)
    assert bad.message in err.message


def test_yaml_refuses_tags_and_bad_bytes(tmp_path: Path) -> None:
    """The model file's safe reader is used: object tags and non-UTF-8 bytes refused."""
    tagged = BASE_YAML.replace("seal: open", "seal: !!python/object:os.system x")
    with pytest.raises(ModelError, match="not allowed") as info:
        read_catalogue(_write(tmp_path, tagged, "cat.yml"))
    assert info.value.line == line_of(tagged, "seal: !!python")
    with pytest.raises(ModelError, match="not UTF-8"):
        read_catalogue(_write(tmp_path, BASE_YAML.encode() + b"  \xff\n", "bad.yaml"))


# ---------------------------------------------------------------------------------------
# the Catalogue value


def test_to_bearing_round_trip(tmp_path: Path) -> None:
    """A row becomes the model's Bearing in N and mm; what the catalogue lacks stays None
    (the engine estimates and flags it, as for a typed bearing).
    """
    cat = read_catalogue(_write(tmp_path, BASE_CSV))
    b = cat.to_bearing(1, id="A", x_mm=120.0, axial="+x", pair="B", line=7,
                       pressure_centre_offset_mm=12.5, target_life_h=30000.0)
    assert (b.id, b.kind, b.x_mm, b.axial, b.pair, b.line) == (
        "A", BearingKind.ANGULAR_CONTACT_BALL, 120.0, AxialRole.PLUS_X, "B", 7)
    assert (b.d_mm, b.D_mm, b.B_mm) == (45.0, 85.0, 19.0)
    assert (b.C_N, b.C0_N, b.Cu_N) == (38.0e3, 27.0e3, 1.10e3)
    assert (b.limiting_speed_rpm, b.contact_angle_deg) == (10000.0, 40.0)
    assert (b.e, b.Y, b.Y0, b.Y1, b.Y2, b.X, b.f0) == (None,) * 7
    assert (b.rows, b.arrangement) == (1, SetArrangement.SINGLE)
    assert b.support_x_mm == 120.0 - 12.5
    assert b.target_life_h == 30000.0 and b.s0_min is None
    plain = cat.to_bearing(0, id="C", x_mm=0.0, axial=AxialRole.FLOAT)
    assert plain.contact_angle_deg is None and plain.pressure_centre_offset_mm == 0.0


@pytest.mark.parametrize(("row", "exponent"), [(1, 0.7), (2, 7.0 / 9.0)])
def test_matched_set_ratings(tmp_path: Path, row: int, exponent: float) -> None:
    """ISO 281:2007 (i identical bearings as one unit): C = i^0.7 C ball, i^(7/9) C roller;
    ISO 76:2006: C0 = i C0 (clause numbers from memory; the loader's ``per_row`` rule).
    Cu = i Cu: common practice, no source. A double-row entry keeps its own ratings.
    """
    cat = read_catalogue(_write(tmp_path, BASE_CSV))
    pair = cat.to_bearing(row, id="P", x_mm=50.0, axial="both", rows=2,
                          arrangement="back_to_back")
    set_ratings = (pair.C_N, pair.C0_N, pair.Cu_N)
    one = (cat.C_N[row], cat.C0_N[row], cat.Cu_N[row])
    assert set_ratings == pytest.approx((2**exponent * one[0], 2 * one[1], 2 * one[2]),
                                        rel=1e-15)
    double = cat.to_bearing(row, id="Q", x_mm=50.0, axial="both", rows=2,
                            arrangement=SetArrangement.DOUBLE_ROW)
    assert (double.C_N, double.C0_N, double.rows) == (cat.C_N[row], cat.C0_N[row], 2)


def test_subset_row_and_masks(tmp_path: Path) -> None:
    cat = read_catalogue(_write(tmp_path, BASE_CSV))
    balls = cat.subset(cat.of_kind("deep_groove_ball", BearingKind.ANGULAR_CONTACT_BALL))
    assert balls.designation == ("TST-DG-40", "TST-AC-45")
    assert balls.line == cat.line[:2] and balls.extra == {"seal": ("open", "")}
    picked = cat.subset([2, 0])
    assert picked.designation == ("TST-TR-50", "TST-DG-40")
    np.testing.assert_array_equal(picked.C_N, [82.0e3, 30.0e3])
    assert len(cat.subset(cat.C_N > 1e9)) == 0
    assert cat.subset(slice(1, None)).designation == ("TST-AC-45", "TST-TR-50")
    with pytest.raises(IndexError):
        cat.subset(np.array([True, False]))
    with pytest.raises(IndexError):
        cat.subset([3])
    row = cat.row(-1)
    assert row["designation"] == "TST-TR-50" and row["type"] == "tapered_roller"
    assert (row["C_N"], row["price_EUR"], row["Y"], row["seal"]) == (82.0e3, 18.25, None,
                                                                     "shield")
    assert row["line"] == line_of(BASE_CSV, "TST-TR-50")


def test_catalogue_arrays_are_frozen_and_checked(tmp_path: Path) -> None:
    cat = read_catalogue(_write(tmp_path, BASE_CSV))
    with pytest.raises(ValueError, match="read-only"):
        cat.C_N[0] = 1.0
    with pytest.raises(ValueError, match="C0_N has shape"):
        Catalogue(designation=("a",), kind=(BearingKind.NEEDLE_ROLLER,),
                  kind_code=np.array([KIND_CODE[BearingKind.NEEDLE_ROLLER]]), line=(1,),
                  d_mm=np.array([10.0]), D_mm=np.array([14.0]), B_mm=np.array([10.0]),
                  C_N=np.array([5e3]), C0_N=np.array([5e3, 6e3]))


def test_ten_thousand_rows(tmp_path: Path) -> None:
    """A generated catalogue of 10 000 rows reads with every value where it was written.

    The expected values are the generator's own formulas evaluated by the test; the
    timing of this read is reported by the author, not asserted.
    """
    kinds = list(BearingKind)
    lines = ["# generated test catalogue", "designation,type,d_mm,D_mm,B_mm,C_kN,C0_kN,"
             "Cu_kN,contact_angle_deg,Z,price_EUR,note"]
    for i in range(10_000):
        d = 10 + i % 190
        lines.append(f"GEN-{i:05d},{kinds[i % 8].value},{d},{1.8 * d + 5:.3f},"
                     f"{0.4 * d:.3f},{0.05 * d + i * 1e-4:.4f},{0.03 * d:.4f},"
                     f"{0.001 * d:.5f},{15 + i % 20},{8 + i % 9},{d * 0.5:.2f},n{i}")
    cat = read_catalogue(_write(tmp_path, "\n".join(lines) + "\n"))
    assert len(cat) == 10_000 and len(set(cat.designation)) == 10_000
    for i in (0, 1, 4_999, 9_998, 9_999):
        d = 10 + i % 190
        assert cat.designation[i] == f"GEN-{i:05d}"
        assert cat.kind[i] is kinds[i % 8]
        assert cat.kind_code[i] == i % 8
        assert cat.line[i] == i + 3
        assert cat.d_mm[i] == d
        assert cat.D_mm[i] == float(f"{1.8 * d + 5:.3f}")
        assert cat.C_N[i] == float(f"{0.05 * d + i * 1e-4:.4f}") * 1000.0
        assert cat.Cu_N[i] == float(f"{0.001 * d:.5f}") * 1000.0
        assert cat.contact_angle_deg[i] == 15 + i % 20
        assert cat.Z[i] == 8 + i % 9
        assert cat.extra["note"][i] == f"n{i}"
    assert np.isnan(cat.mass_kg).all()
    assert int(cat.of_kind(BearingKind.THRUST_BALL).sum()) == 10_000 // 8


# ---------------------------------------------------------------------------------------
# schema and column table


def test_shipped_schema_equals_generated() -> None:
    shipped = json.loads(SHIPPED_SCHEMA.read_text(encoding="utf-8"))
    assert shipped == catalogue_schema(), (
        "shaftsys/catalogue.schema.json is stale: regenerate it with python -c 'from "
        "shaftsys.io.catalogue import write_catalogue_schema as w; "
        "w(\"shaftsys/catalogue.schema.json\")'")


def test_schema_is_valid_and_describes_the_yaml_form() -> None:
    """Checked with the reference implementation ``jsonschema`` (Draft 2020-12)."""
    schema = catalogue_schema()
    jsonschema.Draft202012Validator.check_schema(schema)
    validator = jsonschema.Draft202012Validator(schema)
    doc = yaml.safe_load(BASE_YAML)
    assert list(validator.iter_errors(doc)) == []
    bearing = schema["$defs"]["bearing"]
    assert list(bearing["properties"]) == [c.name for c in COLUMNS]
    assert set(bearing["required"]) == {c.name for c in COLUMNS if c.required}
    del doc["bearings"][1]["C0"]
    assert list(validator.iter_errors(doc))
    doc["bearings"][1]["C0"] = "27 kN"
    doc["bearings"][0]["type"] = "taper"
    assert list(validator.iter_errors(doc))


def test_column_table_is_in_the_module_docstring() -> None:
    table = catalogue_columns_markdown()
    assert catalogue_module.__doc__ is not None and table in catalogue_module.__doc__
    for spec in COLUMNS:
        assert f"| `{spec.name}` |" in table
