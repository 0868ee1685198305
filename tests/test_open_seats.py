"""Open seats: a bearing left to be chosen from a catalogue (``choose:``), the
``selection:`` section, and the model written back with the chosen bearings.

The rules tested here are the model-file format of shaftsys (common practice, no
source): what a bearing with ``choose`` may and must carry, where each mistake is
reported (file, line of the key, field path), and that a filled model reads back to the
bearing that was chosen, float for float. The model is invented; the ratings come from
the invented ``models/demo_catalogue.csv``.
"""

from __future__ import annotations

import contextlib
import csv
import dataclasses
import io
import shutil
from collections.abc import Callable
from pathlib import Path
from typing import Any

import jsonschema
import numpy as np
import pytest
import yaml

from shaftsys.cli.main import main
from shaftsys.errors import ModelError, OutputError
from shaftsys.io.catalogue import read_catalogue
from shaftsys.io.filled_model import filled_model_text, write_filled_model
from shaftsys.io.loader import load_model, load_model_text
from shaftsys.io.schema import model_schema
from shaftsys.model import AxialRole, Bearing, BearingKind
from shaftsys.model.catalogue import Catalogue
from shaftsys.model.selection import Objective, SelectionSettings

CATALOGUE = Path(__file__).resolve().parent.parent / "models" / "demo_catalogue.csv"

#: One shaft on a fixed bearing A (typed in) and an open bearing B (chosen). Invented.
MODEL = """\
shaftsys: 1
name: open seat test
materials:
  steel: {E: 210 GPa, density: 7850 kg/m^3}
shafts:
  - id: s1
    material: steel
    steps:
      - length: 100 mm
        d: 45 mm
      - length: 200 mm
        d: 60 mm
      - length: 100 mm
        d: 50 mm
    bearings:
      - id: A
        type: deep_groove_ball
        at: 50 mm
        d: 45 mm
        D: 85 mm
        C: 33 kN
        C0: 21 kN
        axial: float
      - id: B
        at: 350 mm
        axial: both
        target_life: 30000 h
        choose:
          catalogue: cat/demo_catalogue.csv
          types: [spherical_roller, deep_groove_ball]
          max_D: 110 mm
    elements:
      - {id: g, type: gear, at: 200 mm, pitch_diameter: 150 mm, mesh_angle: 0 deg}
      - {id: c, type: coupling, at: 10 mm}
cases:
  - id: run
    share: 1
    speed: 1000 rpm
    input: {element: c, power: 5 kW}
    outputs: {g: 1}
"""

Write = Callable[..., Path]


@pytest.fixture
def write(tmp_path: Path) -> Write:
    """Write the model (after ``replace`` edits of its text) next to a copy of the
    demo catalogue in ``cat/``; returns the model's path.
    """
    (tmp_path / "cat").mkdir(exist_ok=True)
    shutil.copy(CATALOGUE, tmp_path / "cat" / "demo_catalogue.csv")
    (tmp_path / "folder.csv").mkdir(exist_ok=True)

    def make(*replace: tuple[str, str], text: str = MODEL, name: str = "model.yaml"
             ) -> Path:
        for old, new in replace:
            assert old in text, old
            text = text.replace(old, new)
        path = tmp_path / name
        path.write_text(text, encoding="utf-8")
        return path

    return make


def find_line(text: str, needle: str, occurrence: int = 1) -> int:
    """1-based line of the ``occurrence``-th line of ``text`` holding ``needle``."""
    hits = [i + 1 for i, line in enumerate(text.splitlines()) if needle in line]
    assert len(hits) >= occurrence, f"{needle!r} occurs {len(hits)} times"
    return hits[occurrence - 1]


def _validate(path: Path) -> tuple[int, str, str]:
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = main(["validate", str(path)])
    return code, out.getvalue(), err.getvalue()


def _catalogue_rows(path: Path) -> list[dict[str, str]]:
    """The data rows of a catalogue CSV, read with the csv module (independent check)."""
    lines = [ln for ln in path.read_text(encoding="utf-8").splitlines()
             if ln.strip() and not ln.lstrip().startswith("#")]
    return list(csv.DictReader(lines))


# ------------------------------------------------------------------ a model that loads
def test_open_seat_loads_with_catalogue_bore_and_types(write: Write) -> None:
    path = write()
    model = load_model(path)
    assert len(model.open_seats) == 1
    seat = model.open_seats[0]
    assert (seat.bearing_id, seat.shaft_id) == ("B", "s1")
    assert Path(seat.catalogue.source) == path.parent / "cat" / "demo_catalogue.csv"
    rows = _catalogue_rows(CATALOGUE)
    assert len(seat.catalogue) == len(rows)
    assert seat.catalogue.designation == tuple(r["designation"] for r in rows)
    assert seat.bore_mm == 50.0          # the third step (300..400 mm) holds x = 350 mm
    assert seat.kinds == (BearingKind.SPHERICAL_ROLLER, BearingKind.DEEP_GROOVE_BALL)
    assert seat.max_D_mm == 110.0 and seat.max_B_mm is None
    assert seat.housing_bores_mm == () and seat.bore_tolerance_mm == 0.01
    assert seat.line == find_line(path.read_text(), "- id: B")
    assert model.selection == SelectionSettings()


def test_placeholder_bearing_keeps_the_designers_role(write: Write) -> None:
    model = load_model(write())
    b = model.shafts[0].bearings[1]
    assert b.id == "B" and b.kind is BearingKind.DEEP_GROOVE_BALL
    assert (b.d_mm, b.D_mm, b.B_mm, b.C_N, b.C0_N) == (50.0, 1.5 * 50.0, None, 1.0, 1.0)
    assert b.x_mm == 350.0 and b.pressure_centre_offset_mm == 0.0
    assert b.axial is AxialRole.BOTH and b.target_life_h == 30000.0
    assert model.shafts[0].bearings[0].C_N == 33000.0   # the typed bearing is as before


def test_every_option_of_choose_and_selection_is_read(write: Write) -> None:
    path = write(("          max_D: 110 mm\n",
                  "          max_D: 110 mm\n          bore: 50.02 mm\n"
                  "          max_B: 30 mm\n          housing_bores: [90 mm, 0.1 m]\n"
                  "          bore_tolerance: 5 um\n"),
                 ("cases:\n", "selection: {objective: cheapest, max_passes: 3, "
                  "runners_up: 0}\ncases:\n"))
    model = load_model(path)
    seat = model.open_seats[0]
    assert seat.bore_mm == 50.02 and seat.max_B_mm == 30.0
    assert seat.housing_bores_mm == (90.0, 100.0)
    assert seat.bore_tolerance_mm == pytest.approx(0.005, rel=1e-12)
    assert model.selection == SelectionSettings(Objective.CHEAPEST, 3, 0)
    assert model.shafts[0].bearings[1].d_mm == 50.02


def test_default_types_is_every_type_of_the_catalogue(write: Write) -> None:
    seat = load_model(write(("          types: [spherical_roller, deep_groove_ball]\n",
                             ""))).open_seats[0]
    assert seat.kinds == ()


def test_bore_follows_the_step_at_the_station(write: Write) -> None:
    seat = load_model(write(("at: 350 mm", "at: 150 mm"))).open_seats[0]
    assert seat.bore_mm == 60.0


def test_station_on_a_step_edge_with_a_given_bore_loads(write: Write) -> None:
    path = write(("at: 350 mm", "at: 300 mm"),
                 ("          max_D: 110 mm\n", "          bore: 50 mm\n"))
    assert load_model(path).open_seats[0].bore_mm == 50.0


def test_one_catalogue_file_is_read_once(write: Write) -> None:
    """Two seats name the same file in two spellings: one Catalogue object."""
    text = MODEL.replace("""        d: 45 mm
        D: 85 mm
        C: 33 kN
        C0: 21 kN
        axial: float
""", """        choose: {catalogue: ./cat/../cat/demo_catalogue.csv}
""").replace("        type: deep_groove_ball\n        at: 50 mm", "        at: 50 mm")
    model = load_model(write(text=text))
    first, second = model.open_seats
    assert (first.bearing_id, second.bearing_id) == ("A", "B")
    assert first.catalogue is second.catalogue
    assert first.bore_mm == 45.0


def test_text_without_a_file_reads_the_catalogue_from_the_current_folder(
        write: Write, tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.chdir(tmp_path)
    model = load_model_text(MODEL)
    assert Path(model.open_seats[0].catalogue.source).resolve() == (
        tmp_path / "cat" / "demo_catalogue.csv").resolve()


def test_type_rules_are_not_applied_to_an_open_seat(write: Write) -> None:
    """An adjusted pair needs angular-contact or tapered bearings; an open partner is
    not refused for its deep groove placeholder (the choice offers suitable types).
    """
    path = write(("        type: deep_groove_ball\n", "        type: angular_contact_ball\n"
                  "        contact_angle: 25 deg\n"),
                 ("        axial: float\n", "        axial: +x\n        pair: B\n"),
                 ("        axial: both\n", "        axial: -x\n        pair: A\n"),
                 ("types: [spherical_roller, deep_groove_ball]",
                  "types: [angular_contact_ball, tapered_roller]"))
    model = load_model(path)
    assert model.shafts[0].bearings[1].pair == "A"
    assert model.open_seats[0].kinds == (BearingKind.ANGULAR_CONTACT_BALL,
                                         BearingKind.TAPERED_ROLLER)


def test_validate_passes_and_counts_the_open_seat(write: Write) -> None:
    code, out, err = _validate(write())
    assert code == 0, err
    assert "2 bearing(s), 1 of them to choose from a catalogue" in out


def test_schema_takes_choose_and_refuses_it_with_ratings(write: Write) -> None:
    """The JSON Schema states the two forms of a bearing (if/then/else)."""
    validator = jsonschema.Draft202012Validator(model_schema())
    data = yaml.safe_load(MODEL)
    assert list(validator.iter_errors(data)) == []
    data["shafts"][0]["bearings"][1]["C"] = "50 kN"
    assert list(validator.iter_errors(data))
    del data["shafts"][0]["bearings"][1]["choose"]
    assert list(validator.iter_errors(data))      # no choose: type, d, D, C0 missing


# ------------------------------------------------------------------------ bad inputs
@dataclasses.dataclass(frozen=True)
class Bad:
    name: str
    replace: tuple[tuple[str, str], ...]
    needle: str                  # text of the line the error must point at
    field: str
    message: str
    occurrence: int = 1


_B = "shafts[s1].bearings[B]"
BAD = [
    *[Bad(f"{key} with choose", (("        axial: both\n",
                                  f"        axial: both\n        {key}: {value}\n"),),
          f"        {key}: {value}", f"{_B}.{key}", f"remove '{key}' or 'choose'")
      for key, value in [("C", "50 kN"), ("C0", "40 kN"), ("type", "spherical_roller"),
                         ("d", "52 mm"), ("D", "90 mm"), ("B", "20 mm"), ("Cu", "1 kN"),
                         ("e", "0.3"), ("Y", "1.5"), ("Y0", "1"), ("Y1", "2"), ("Y2", "3"),
                         ("X", "0.4"), ("contact_angle", "15 deg"), ("f0", "14"),
                         ("limiting_speed", "5000 rpm"), ("ratings", "per_row"),
                         ("pressure_centre_offset", "3 mm"), ("designation", "X-1")]],
    Bad("missing C without choose", (("        C: 33 kN\n", ""),), "      - id: A",
        "shafts[s1].bearings[0].C", "give C and C0, or choose: {catalogue: ...}"),
    Bad("missing C0 without choose", (("        C0: 21 kN\n", ""),), "      - id: A",
        "shafts[s1].bearings[0].C0", "give C and C0, or choose: {catalogue: ...}"),
    Bad("missing type without choose", (("        type: deep_groove_ball\n", ""),),
        "      - id: A", "shafts[s1].bearings[0].type", "'type' is missing (bearing type)"),
    Bad("missing catalogue file", (("cat/demo_catalogue.csv", "cat/nothing.csv"),),
        "catalogue: cat/nothing.csv", f"{_B}.choose.catalogue", "nothing.csv does not exist"),
    Bad("catalogue is a folder", (("cat/demo_catalogue.csv", "folder.csv"),),
        "catalogue: folder.csv", f"{_B}.choose.catalogue", "is a folder"),
    Bad("catalogue of unknown form", (("cat/demo_catalogue.csv", "cat/demo.txt"),),
        "catalogue: cat/demo.txt", f"{_B}.choose.catalogue", "cannot tell the form"),
    Bad("catalogue missing under choose", (("          catalogue: cat/demo_catalogue.csv\n",
                                            ""),),
        "          types: [spherical_roller", f"{_B}.choose.catalogue",
        "'catalogue' is missing"),
    Bad("unknown key under choose", (("max_D: 110 mm", "max_d: 110 mm"),),
        "max_d: 110 mm", f"{_B}.choose.max_d", "did you mean 'max_D'?"),
    Bad("unknown type", (("types: [spherical_roller,", "types: [spherical_rollers,"),),
        "types: [spherical_rollers,", f"{_B}.choose.types[0]",
        "did you mean 'spherical_roller'?"),
    Bad("type listed twice", (("deep_groove_ball]", "spherical_roller]"),),
        "types: [spherical_roller, spherical_roller]", f"{_B}.choose.types[1]",
        "listed twice"),
    Bad("empty type list", (("types: [spherical_roller, deep_groove_ball]", "types: []"),),
        "types: []", f"{_B}.choose.types", "the list is empty"),
    Bad("bore in the wrong unit", (("max_D: 110 mm", "bore: 50 kg"),),
        "bore: 50 kg", f"{_B}.choose.bore", "not a length"),
    Bad("station on a step edge", (("at: 350 mm", "at: 300.0005 mm"),),
        "        choose:", f"{_B}.choose.bore", "give the seat diameter as choose.bore"),
    Bad("max_D not above the bore", (("max_D: 110 mm", "max_D: 50 mm"),),
        "max_D: 50 mm", f"{_B}.choose.max_D", "not larger than the bore"),
    Bad("housing bore not above the bore", (("max_D: 110 mm", "housing_bores: [90 mm, 45 mm]"),),
        "housing_bores: [90 mm, 45 mm]", f"{_B}.choose.housing_bores[1]",
        "housing bore 45 mm is not larger"),
    Bad("choose is not a mapping", (("        choose:\n          catalogue: "
                                     "cat/demo_catalogue.csv\n          types: "
                                     "[spherical_roller, deep_groove_ball]\n          "
                                     "max_D: 110 mm\n", "        choose: yes\n"),),
        "        choose: yes", "shafts[s1].bearings[1].choose", "expected a mapping"),
    Bad("bad objective", (("cases:\n", "selection: {objective: cheapest_first}\ncases:\n"),),
        "selection:", "selection.objective", "did you mean 'cheapest'?"),
    Bad("bad max_passes", (("cases:\n", "selection:\n  max_passes: 0\ncases:\n"),),
        "max_passes: 0", "selection.max_passes", "below the smallest allowed 1"),
]


@pytest.mark.parametrize("bad", BAD, ids=lambda b: b.name)
def test_bad_input_is_a_located_model_error(write: Write, bad: Bad) -> None:
    path = write(*bad.replace)
    text = path.read_text(encoding="utf-8")
    with pytest.raises(ModelError) as info:
        load_model(path)
    err = info.value
    assert err.file == str(path)
    assert err.line == find_line(text, bad.needle, bad.occurrence), err
    assert err.field == bad.field, err
    assert bad.message in err.message, err
    code, _, stderr = _validate(path)
    assert code == 2
    assert stderr.startswith("shaftsys: error: ") and "Traceback" not in stderr
    assert f"{path}:{err.line}: {bad.field}: " in stderr


def test_missing_catalogue_names_the_path_tried(write: Write, tmp_path: Path) -> None:
    path = write(("cat/demo_catalogue.csv", "cat/nothing.csv"))
    with pytest.raises(ModelError) as info:
        load_model(path)
    assert str((tmp_path / "cat" / "nothing.csv").absolute()) in info.value.message


def test_types_the_catalogue_does_not_hold(write: Write, tmp_path: Path) -> None:
    """An invented two-row catalogue of deep groove ball bearings only."""
    (tmp_path / "cat" / "small.csv").write_text(
        "designation,type,d_mm,D_mm,B_mm,C_kN,C0_kN\n"
        "T-1,deep_groove_ball,50,90,20,30,20\nT-2,deep_groove_ball,50,100,22,40,26\n",
        encoding="utf-8")
    path = write(("cat/demo_catalogue.csv", "cat/small.csv"),
                 ("types: [spherical_roller, deep_groove_ball]", "types: [tapered_roller]"))
    with pytest.raises(ModelError) as info:
        load_model(path)
    err = info.value
    assert err.field == f"{_B}.choose.types"
    assert err.line == find_line(path.read_text(), "types: [tapered_roller]")
    assert "has no bearing of type tapered_roller" in err.message
    assert err.expected is not None and "deep_groove_ball" in err.expected


def test_error_inside_the_catalogue_names_the_catalogue(write: Write, tmp_path: Path
                                                        ) -> None:
    broken = tmp_path / "cat" / "broken.csv"
    broken.write_text("designation,type,d_mm,D_mm,B_mm,C_kN,C0_kN\n"
                      "T-1,deep_groove_ball,50,90,20,30,20\n"
                      "T-2,deep_groove_ball,50,100,22,-40,26\n", encoding="utf-8")
    path = write(("cat/demo_catalogue.csv", "cat/broken.csv"))
    with pytest.raises(ModelError) as info:
        load_model(path)
    assert info.value.file == str(tmp_path / "cat" / "broken.csv")
    assert info.value.line == 3
    code, _, stderr = _validate(path)
    assert code == 2 and f"{broken}:3: " in stderr and "Traceback" not in stderr


# ------------------------------------------------------------- the filled model file
_RATING_FIELDS = ("kind", "d_mm", "D_mm", "B_mm", "C_N", "C0_N", "Cu_N", "limiting_speed_rpm",
                  "e", "Y", "Y0", "Y1", "Y2", "X", "contact_angle_deg", "f0",
                  "pressure_centre_offset_mm", "rows", "arrangement", "ribs", "axial",
                  "x_mm", "target_life_h")


def _row(cat: Catalogue, kind: str, d: float) -> int:
    rows = np.flatnonzero(cat.of_kind(kind) & (cat.d_mm == d))
    assert len(rows) >= 1
    return int(rows[0])


def _chosen(model_path: Path, kind: str, **extra: Any) -> tuple[Bearing, str]:
    cat = read_catalogue(model_path.parent / "cat" / "demo_catalogue.csv")
    i = _row(cat, kind, 50.0)
    bearing = cat.to_bearing(i, id="B", x_mm=350.0, axial="both", target_life_h=30000.0,
                             **extra)
    return bearing, cat.designation[i]


@pytest.mark.parametrize(("kind", "extra"), [
    ("spherical_roller", {}),
    ("deep_groove_ball", {}),
    ("angular_contact_ball", {"pressure_centre_offset_mm": 21.375}),
    ("cylindrical_roller", {"ribs": True}),
])
def test_filled_model_reads_back_to_the_chosen_bearing(write: Write, tmp_path: Path,
                                                       kind: str, extra: dict[str, Any]
                                                       ) -> None:
    path = write(("types: [spherical_roller, deep_groove_ball]", f"types: [{kind}]"))
    chosen, designation = _chosen(path, kind, **extra)
    out = tmp_path / "out" / "filled.yaml"
    out.parent.mkdir()
    write_filled_model(path, {"B": chosen}, out, note="picked by hand for the test")
    model = load_model(out)
    assert model.open_seats == ()
    loaded = model.shafts[0].bearings[1]
    for name in _RATING_FIELDS:
        assert getattr(loaded, name) == getattr(chosen, name), name
    data = yaml.safe_load(out.read_text(encoding="utf-8"))
    entry = data["shafts"][0]["bearings"][1]
    assert list(entry)[:4] == ["id", "designation", "type", "at"]
    assert entry["designation"] == designation
    assert "choose" not in entry and entry["axial"] == "both"
    assert entry["C"].endswith(" N") and entry["d"].endswith(" mm")


def test_float_digits_survive_the_round_trip(write: Write, tmp_path: Path) -> None:
    """Ratings that are not short decimals come back bit for bit (repr of the float)."""
    path = write()
    chosen, _ = _chosen(path, "deep_groove_ball")
    # the bore stays within the 0.05 mm seat tolerance of the 50 mm step (seat rule)
    odd = dataclasses.replace(chosen, C_N=chosen.C_N * (1 + 2**-40), d_mm=50.0 + 1 / 300,
                              e=0.1 + 0.2, limiting_speed_rpm=6300.000000000001)
    out = tmp_path / "odd.yaml"
    write_filled_model(path, {"B": odd}, out)
    loaded = load_model(out).shafts[0].bearings[1]
    for name in ("C_N", "d_mm", "e", "limiting_speed_rpm"):
        assert getattr(loaded, name) == getattr(odd, name), name
    entry = yaml.safe_load(out.read_text())["shafts"][0]["bearings"][1]
    assert "designation" not in entry         # no catalogue row has these values


def test_matched_set_ratings_are_written_for_the_set(write: Write, tmp_path: Path) -> None:
    """to_bearing gives the set's C = 2^0.7 C1 (ISO 281:2007 for identical bearings side
    by side); the written file holds the set's ratings and reads them back as they are.
    """
    path = write(("        axial: both\n", "        axial: both\n        rows: 2\n"
                  "        arrangement: back_to_back\n"),
                 ("types: [spherical_roller, deep_groove_ball]", "types: [angular_contact_ball]"))
    chosen, designation = _chosen(path, "angular_contact_ball", rows=2,
                                  arrangement="back_to_back")
    cat = read_catalogue(CATALOGUE)
    single_C = float(cat.C_N[_row(cat, "angular_contact_ball", 50)])
    assert abs(chosen.C_N - 2**0.7 * single_C) <= 1e-12 * chosen.C_N
    out = tmp_path / "set.yaml"
    write_filled_model(path, {"B": chosen}, out)
    loaded = load_model(out).shafts[0].bearings[1]
    assert (loaded.C_N, loaded.C0_N, loaded.rows) == (chosen.C_N, chosen.C0_N, 2)
    assert yaml.safe_load(out.read_text())["shafts"][0]["bearings"][1]["designation"] \
        == designation


def test_header_says_what_wrote_it(write: Write) -> None:
    path = write()
    chosen, designation = _chosen(path, "spherical_roller")
    text = filled_model_text(path, {"B": chosen}, "first line\nsecond\u2028third\x1bx")
    header = [ln for ln in text.splitlines() if ln.startswith("#")]
    assert text.startswith("# Model file written by shaftsys")
    assert any(str(path) in ln for ln in header)
    assert any(designation in ln and "cat/demo_catalogue.csv" in ln for ln in header)
    assert "# first line" in header and "# second" in header and "# third x" in header
    assert any("comments are not kept" in ln for ln in header)
    assert load_model_text(text, file=str(path)).open_seats == ()


def test_writing_over_the_input_is_refused(write: Write) -> None:
    path = write()
    before = path.read_bytes()
    chosen, _ = _chosen(path, "spherical_roller")
    with pytest.raises(OutputError, match="refusing to write the filled model over"):
        write_filled_model(path, {"B": chosen}, path)
    with pytest.raises(OutputError):
        write_filled_model(path, {"B": chosen}, path.parent / "." / path.name)
    assert path.read_bytes() == before
    write_filled_model(path, {"B": chosen}, path, overwrite_input=True)
    assert load_model(path).shafts[0].bearings[1].C_N == chosen.C_N


def test_unknown_bearing_id_is_refused(write: Write, tmp_path: Path) -> None:
    path = write()
    chosen, _ = _chosen(path, "spherical_roller")
    with pytest.raises(ModelError, match="no bearing 'Q'"):
        write_filled_model(path, {"Q": chosen}, tmp_path / "q.yaml")
    assert not (tmp_path / "q.yaml").exists()


def test_a_seat_left_open_keeps_its_catalogue_from_another_folder(write: Write,
                                                                  tmp_path: Path) -> None:
    """Only A is chosen; B stays open and its relative catalogue path is re-rooted."""
    text = MODEL.replace("""      - id: A
        type: deep_groove_ball
        at: 50 mm
        d: 45 mm
        D: 85 mm
        C: 33 kN
        C0: 21 kN
        axial: float
""", """      - id: A
        at: 50 mm
        axial: float
        choose: {catalogue: cat/demo_catalogue.csv}
""")
    path = write(text=text)
    cat = read_catalogue(CATALOGUE)
    chosen_a = cat.to_bearing(_row(cat, "deep_groove_ball", 45.0), id="A", x_mm=50.0,
                              axial="float")
    out = tmp_path / "deeper" / "down" / "filled.yaml"
    out.parent.mkdir(parents=True)
    write_filled_model(path, {"A": chosen_a}, out)
    model = load_model(out)
    assert [s.bearing_id for s in model.open_seats] == ["B"]
    assert Path(model.open_seats[0].catalogue.source).resolve() == (
        tmp_path / "cat" / "demo_catalogue.csv").resolve()
    assert model.shafts[0].bearings[0].C_N == chosen_a.C_N
