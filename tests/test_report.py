"""Report pieces: figures, calculation sheet and the self-contained HTML report.

The demo model ``models/fan_drive.yaml`` is solved once per module. Reference checks
use closed-form formulas of the published sources (named beside each), evaluated here
on the numbers the sheet prints or the JSON results hold, never on report internals.
"""

from __future__ import annotations

import dataclasses
import hashlib
import importlib.util
import math
import re
from html.parser import HTMLParser
from pathlib import Path
from typing import Any

import numpy as np
import pytest

import shaftsys
from shaftsys.io.results_json import result_to_dict
from shaftsys.report import calcsheet, figures
from shaftsys.report.html import render_report

ROOT = Path(__file__).resolve().parent.parent
MODEL = ROOT / "models" / "fan_drive.yaml"
EXAMPLE = ROOT / "examples" / "plot_fan_shaft_diagrams.py"

#: Section headings the report must carry (typed literally: the brief's sections).
HEADINGS = (
    "Provenance",
    "Inputs that decide the verdicts",
    "Machine summary",
    "Shafts to scale",
    "Operating cases",
    "Support verdicts",
    "Bearing details",
    "Warnings",
    "Assumptions and cautions",
)


@pytest.fixture(scope="module")
def result() -> Any:
    return shaftsys.analyse(shaftsys.load_model(str(MODEL)))


@pytest.fixture(scope="module")
def report(result: Any) -> str:
    return render_report(result, date="2024-01-02")


class _Collector(HTMLParser):
    def __init__(self) -> None:
        super().__init__()
        self.tags: list[str] = []
        self.h2: list[str] = []
        self._in_h2 = False
        self.attrs: list[tuple[str, str | None]] = []

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        self.tags.append(tag)
        self.attrs.extend(attrs)
        if tag == "h2":
            self._in_h2 = True
            self.h2.append("")

    def handle_endtag(self, tag: str) -> None:
        if tag == "h2":
            self._in_h2 = False

    def handle_data(self, data: str) -> None:
        if self._in_h2:
            self.h2[-1] += data


# ----------------------------------------------------------------------------- HTML
def test_report_parses_with_every_section_and_figure(result: Any, report: str) -> None:
    p = _Collector()
    p.feed(report)
    p.close()
    for heading in HEADINGS:
        assert heading in [h.strip() for h in p.h2], heading
    n_shafts = len(result.shafts)
    n_cases = len(result.model.cases)
    n_life = sum(1 for b in result.bearings if b.life is not None)
    assert n_shafts >= 1 and n_cases >= 2 and n_life >= 2
    assert p.tags.count("svg") >= n_shafts + n_cases * n_shafts + n_life


def test_report_is_self_contained(report: str) -> None:
    p = _Collector()
    p.feed(report)
    assert "script" not in p.tags
    assert "link" not in p.tags and "img" not in p.tags and "iframe" not in p.tags
    for name, value in p.attrs:
        if name in ("src", "href") and value is not None:
            assert value.startswith("#"), (name, value)
    assert "@media print" in report and "size: A4" in report


def test_report_header_names_file_hash_version_date(result: Any, report: str) -> None:
    # The SHA-256 is checked against hashlib on the file bytes (Python stdlib hashlib).
    digest = hashlib.sha256(MODEL.read_bytes()).hexdigest()
    assert digest in report
    assert "fan_drive.yaml" in report
    assert shaftsys.__version__ in report
    assert "2024-01-02" in report


def test_report_escapes_user_text(result: Any) -> None:
    evil = '<script>alert("x")</script> & co'
    model = dataclasses.replace(result.model, name=evil)
    text = render_report(dataclasses.replace(result, model=model), date="d")
    assert "<script>" not in text
    assert "&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; co" in text


def test_report_verdicts_match_results(result: Any, report: str) -> None:
    data = result_to_dict(result)
    for b in data["bearings"]:
        assert f'id="bearing-{b["id"]}"' in report
    stamp = ("ALL CHECKS PASS" if data["ok"] else "LIMIT OR TARGET MISSED"
             if data["failed_checks"] else "NOT EVALUATED")
    assert stamp in report


def _verdict_section(html: str) -> str:
    start = html.index('<section id="verdicts">')
    return html[start: html.index("</section>", start)]


def test_headline_follows_the_rows(result: Any) -> None:
    """A headline says "missed" only when a row fails (the rows decide, not the stamp).

    Three variants of one result: all rows pass; one bearing's life short of a target
    raised above it; one bearing's life removed (not evaluated). Common practice, no
    source: a report signed off must not show a failure that no row carries.
    """
    assert result.ok, "the fixture must pass for the first variant"
    html = _verdict_section(render_report(result, date="d"))
    assert "ALL CHECKS PASS" in html and "MISSED" not in html
    assert 'class="stamp bad"' not in html
    b0 = result.bearings[0]
    short = dataclasses.replace(b0.life, life_ok=False, ok=False)
    failing = dataclasses.replace(result, bearings=(dataclasses.replace(b0, life=short),
                                                    *result.bearings[1:]))
    html = _verdict_section(render_report(failing, date="d"))
    assert "LIMIT OR TARGET MISSED" in html
    assert f"life of bearing &#x27;{b0.bearing.id}&#x27;" in html
    assert failing.failed_checks == (f"life of bearing '{b0.bearing.id}'",)
    missing = dataclasses.replace(result, bearings=(dataclasses.replace(b0, life=None),
                                                    *result.bearings[1:]))
    html = _verdict_section(render_report(missing, date="d"))
    assert "NOT EVALUATED (NOT A PASS)" in html and "MISSED" not in html
    assert html.count("NOT EVALUATED") >= 2     # the headline and the bearing's own row
    assert missing.failed_checks == ()


# ----------------------------------------------------------------------------- sheet
@pytest.mark.parametrize("key", ["P_eq_N", "L10_h", "Lnm_h", "C_required_N", "s0"])
def test_sheet_prints_the_json_numbers(result: Any, key: str) -> None:
    data = result_to_dict(result)
    for b in data["bearings"]:
        text = calcsheet.explain_bearing(result, b["id"])
        value = b["life"][key]
        assert value is not None
        assert calcsheet.format_value(value) in text, (b["id"], key, value)
        obj = getattr(result.bearing(b["id"]).life, key)
        assert obj == value


def test_format_value_is_six_significant_digits() -> None:
    assert calcsheet.format_value(7633.2213) == "7633.22"
    assert calcsheet.format_value(1110661.9) == "1110660"
    assert calcsheet.format_value(0.5) == "0.5"
    assert calcsheet.format_value(None) == "-"
    assert calcsheet.format_value(math.inf) == "inf"
    assert calcsheet.format_value(3.2e-7) == "3.20000e-07"


_NUM = r"(-?[0-9.]+(?:e[-+]?\d+)?)"


def test_sheet_substitutions_evaluate_to_the_printed_results(result: Any) -> None:
    """The numbers substituted on each line give the printed result when redone by hand.

    Formulas: Fr = sqrt(Fy^2 + Fz^2) (vector resultant); P = X*Fr + Y*Fa
    (ISO 281:2007, 6.2 / 7.2); s0 = C0/P0 (ISO 76:2006). Tolerance 2e-5 relative: the
    sheet prints 6 significant digits.
    """
    checked = 0
    for b in result.bearings:
        text = calcsheet.explain_bearing(result, b.bearing.id)
        for fy, fz, fr in re.findall(
                rf"Fr = sqrt\(\({_NUM}\)\^2 \+ \({_NUM}\)\^2\) = {_NUM} N", text):
            assert math.hypot(float(fy), float(fz)) == pytest.approx(float(fr), rel=2e-5)
            checked += 1
        for x, fr, y, fa, p in re.findall(
                rf"P = {_NUM}\*{_NUM} \+ {_NUM}\*{_NUM} = {_NUM} N", text):
            assert float(x) * float(fr) + float(y) * float(fa) == pytest.approx(
                float(p), rel=2e-5, abs=1e-3)
            checked += 1
        for c0, p0, s0 in re.findall(rf"s0 = {_NUM}/{_NUM} = {_NUM}", text):
            assert float(c0) / float(p0) == pytest.approx(float(s0), rel=2e-5)
            checked += 1
    assert checked >= 3 * len(result.bearings) * len(result.model.cases)


def test_sheet_spectrum_life_matches_iso281_closed_form(result: Any) -> None:
    """L10h = (C/Pm)^p * 10^6 / (60 n_m) (ISO 281:2007, 6.3 / 7.3) on the JSON numbers."""
    data = result_to_dict(result)
    for b in data["bearings"]:
        life = b["life"]
        p = 10.0 / 3.0 if b["type"].endswith("roller") else 3.0
        L10h = (b["C_N"] / life["P_eq_N"]) ** p * 1e6 / (60.0 * life["n_m_rpm"])
        assert L10h == pytest.approx(life["L10_h"], rel=1e-9)
        text = calcsheet.explain_bearing(result, b["id"])
        assert "ISO 281:2007, 9.2" in text and "ISO 76:2006" in text
        assert "ASTM D341" in text and "Shigley" in text


def test_sheet_html_is_escaped_pre(result: Any) -> None:
    frag = calcsheet.explain_bearing_html(result, result.bearings[0].bearing.id)
    assert frag.startswith('<pre class="calcsheet"') and frag.endswith("</pre>")
    assert "Fa/Fr = " in frag
    assert "&lt;=" in frag or "&gt;" in frag
    assert "<=" not in frag and " > e" not in frag


def test_sheet_unknown_bearing_raises(result: Any) -> None:
    with pytest.raises(KeyError):
        calcsheet.explain_bearing(result, "no-such-bearing")


# ----------------------------------------------------------------------------- figures
def test_figures_return_matplotlib_objects(result: Any) -> None:
    from matplotlib.axes import Axes
    from matplotlib.figure import Figure

    s = result.shafts[0]
    assert isinstance(figures.shaft_drawing(s), Figure)
    assert isinstance(figures.shaft_drawing(s.shaft), Figure)
    assert isinstance(figures.diagrams(s.cases[0]), Figure)
    assert isinstance(figures.load_life_chart(result.bearings[0]), Figure)
    fig = Figure()
    ax = fig.add_subplot()
    assert figures.shaft_drawing(s, ax=ax) is ax
    assert figures.load_life_chart(result.bearings[0], ax=fig.add_subplot(2, 1, 2)) \
        is not None
    axes = Figure().subplots(4, 1)
    got = figures.diagrams(s.cases[0], ax=list(axes))
    assert isinstance(got, list) and all(isinstance(a, Axes) for a in got)
    with pytest.raises(ValueError):
        figures.diagrams(s.cases[0], ax=list(axes)[:2])
    with pytest.raises(ValueError):
        figures.shaft_drawing("not a shaft")  # type: ignore[call-overload]


def test_shaft_drawing_is_to_scale(result: Any) -> None:
    """Each step rectangle has the step's length and outer diameter (model input)."""
    from matplotlib.figure import Figure

    shaft = result.shafts[0].shaft
    ax = Figure().add_subplot()
    figures.shaft_drawing(shaft, ax=ax)
    from matplotlib.patches import Rectangle

    sizes = {(round(p.get_width(), 9), round(p.get_height(), 9)) for p in ax.patches
             if isinstance(p, Rectangle)}
    for step in shaft.steps:
        assert (round(step.length_mm, 9), round(step.d_mm, 9)) in sizes
    assert ax.get_aspect() == 1.0


def test_diagrams_plot_the_solver_arrays(result: Any) -> None:
    from matplotlib.figure import Figure

    cs = result.shafts[0].cases[0]
    axes = list(Figure().subplots(4, 1))
    figures.diagrams(cs, ax=axes)
    vy = axes[0].lines[0]
    np.testing.assert_array_equal(vy.get_xdata(), cs.stations_mm)
    np.testing.assert_array_equal(vy.get_ydata(), cs.Vy_N)
    defl = axes[3].lines[0]
    np.testing.assert_array_equal(defl.get_xdata(), cs.node_x_mm)
    for a in axes:
        assert "[" in a.get_ylabel()


def test_load_life_chart_rating_line_and_target(result: Any) -> None:
    """Rating line L = (C/P)^p passes through (1, C) (ISO 281:2007, 6.3 / 7.3); the
    target line sits at target_h*60*n_m/10^6 (10^6 rev)."""
    from matplotlib.figure import Figure

    data = {b["id"]: b for b in result_to_dict(result)["bearings"]}
    for b in result.bearings:
        ax = Figure().add_subplot()
        figures.load_life_chart(b, ax=ax)
        line = ax.lines[0]
        L = np.asarray(line.get_xdata())
        P = np.asarray(line.get_ydata())
        C = data[b.bearing.id]["C_N"]
        p = 10.0 / 3.0 if data[b.bearing.id]["type"].endswith("roller") else 3.0
        np.testing.assert_allclose(P, C / L ** (1.0 / p), rtol=1e-12)
        life = data[b.bearing.id]["life"]
        target = life["target_h"] * 60.0 * life["n_m_rpm"] / 1e6
        xdata = [np.asarray(ln.get_xdata(), dtype=float) for ln in ax.lines]
        xs = [x[0] for x in xdata if x.size == 2 and x[0] == x[1]]
        assert any(x == pytest.approx(target, rel=1e-12) for x in xs)
        assert ax.get_xscale() == "log" and ax.get_yscale() == "log"


def test_to_svg_gives_inline_svg(result: Any) -> None:
    svg = figures.to_svg(figures.load_life_chart(result.bearings[0]))
    assert svg.startswith("<svg") and svg.rstrip().endswith("</svg>")
    assert "<?xml" not in svg and "<metadata>" not in svg


# ----------------------------------------------------------------------------- example
def test_example_script_writes_pngs(tmp_path: Path) -> None:
    spec = importlib.util.spec_from_file_location("plot_fan_shaft_diagrams", EXAMPLE)
    assert spec is not None and spec.loader is not None
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)     # import-safe: nothing runs at import
    assert not any(tmp_path.iterdir())
    written = module.main([str(tmp_path)])
    assert len(written) >= 2
    for item in written:
        path = Path(item)
        assert path.parent == tmp_path
        data = path.read_bytes()
        assert data[:8] == b"\x89PNG\r\n\x1a\n" and len(data) > 1000


# ----------------------------------------------------------------------------- progress
def test_render_report_counts_one_step_per_slow_part(result: Any, report: str) -> None:
    from shaftsys.report.html import report_steps

    labels: list[str] = []
    text = render_report(result, date="2024-01-02", progress=labels.append)
    n_shafts, n_cases = len(result.shafts), len(result.model.cases)
    assert report_steps(result) == n_shafts * (1 + n_cases) + len(result.bearings)
    assert len(labels) == report_steps(result)
    for b in result.bearings:
        assert f"bearing {b.bearing.id}" in labels
    for c in result.model.cases:
        assert any(label.startswith(f"case {c.id}") for label in labels)
    # the callback changes nothing in the page, and a second render gives the same bytes
    assert text == report


# ----------------------------------------------------------------------------- readability
def test_format_value_prints_negative_zero_as_zero() -> None:
    assert calcsheet.format_value(-0.0) == "0"
    assert calcsheet.format_value(0.0) == "0"
    assert calcsheet.format_value(-2.5) == "-2.5"


def test_report_tables_show_no_negative_zero_or_round_off(report: str) -> None:
    body = re.sub(r"<svg.*?</svg>|<pre.*?</pre>|<style>.*?</style>", "", report,
                  flags=re.DOTALL)
    cells = re.findall(r'<td class="num">([^<]*)</td>', body)
    assert cells
    assert "-0" not in cells
    assert not [c for c in cells if re.fullmatch(r"-?[0-9.]+e-1\d", c)]


def test_load_life_chart_names_every_duty_case_in_its_legend(result: Any) -> None:
    from matplotlib.figure import Figure

    for b in result.bearings:
        ax = Figure().add_subplot()
        figures.load_life_chart(b, ax=ax)
        legend = [t.get_text() for t in ax.get_legend().get_texts()]
        dynamic = [c for c, d in zip(b.life.case_ids, b.life.dynamic, strict=True) if d]
        for case in dynamic:
            assert any(f"case {case}:" in text for text in legend), (b.bearing.id, case)
        assert ax.get_legend().get_bbox_to_anchor().x0 > ax.bbox.x1 - 1  # beside the axes


def test_stubby_shaft_drawing_is_narrower_not_taller(result: Any) -> None:
    """A short, wide shaft keeps its scale in a narrower figure (page layout rule)."""
    import dataclasses as dc

    shaft = result.shafts[0].shaft
    slender = figures.shaft_drawing(shaft)
    w, h = slender.get_size_inches()
    assert w == pytest.approx(9.0) and 2.4 <= h <= 4.4
    stubby_steps = tuple(dc.replace(s, length_mm=s.length_mm / 8.0) for s in shaft.steps)
    stubby = dc.replace(shaft, steps=stubby_steps, bearings=(), elements=())
    w2, h2 = figures.shaft_drawing(stubby).get_size_inches()
    assert h2 == pytest.approx(4.4) and w2 < 9.0


def test_report_holds_the_study_plot_when_the_model_has_a_study(tmp_path):
    """A model with a 'study:' section gets a 'Design study' section with its plot."""
    from shaftsys.cli import main

    root = Path(__file__).resolve().parent.parent
    out = tmp_path / "spindle.html"
    assert main(["report", str(root / "models" / "spindle_3brg.yaml"), "-o", str(out),
                 "-q"]) in (0, 1)
    text = out.read_text()
    start = text.index('<section id="study">')
    section = text[start:text.index("</section>", start)]
    assert "<h2>Design study</h2>" in section and "<svg" in section
    assert "variants of bearing.B.at" in section
