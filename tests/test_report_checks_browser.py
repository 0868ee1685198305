"""The report's shaft-check sections as a browser shows them: a failing slope and a
failing fatigue section each appear with the Result's numbers and a FAIL mark.

The model is the small test shaft of ``tests/conftest.py`` with its middle step thinned
to 28 mm (fillet 0.5 mm), Su = 600 MPa, Sy = 350 MPa and 40 kW through the gear
(invented numbers): its bearing slopes exceed the deep-groove range of Shigley
Table 7-2 (0.003 rad) and its sections miss the required fatigue safety. The numbers
looked for are formatted from the Result with the report's own formatter, so the test
checks the rendering of the computed values, not a copy of them. Needs headless
Chromium (see ``tests/test_browser.py``).
"""

from __future__ import annotations

import copy
from pathlib import Path

import pytest

import shaftsys
from shaftsys.report.calcsheet import format_value
from shaftsys.report.html import SHAFT_CHECK_TITLES, render_report
from tests.conftest import BASE_MODEL, dump_model
from tests.test_browser import _browser, _run, _Text

pytestmark = pytest.mark.browser


def _failing_model(tmp_path: Path) -> Path:
    m = copy.deepcopy(BASE_MODEL)
    m["materials"]["steel"].update({"Su": "600 MPa", "Sy": "350 MPa"})
    m["shafts"][0]["steps"][1].update({"d": "28 mm", "fillet": "0.5 mm"})
    for c in m["cases"]:
        c["input"]["power"] = "40 kW"
    path = tmp_path / "failing.yaml"
    path.write_text(dump_model(m), encoding="utf-8")
    return path


def test_failing_slope_and_fatigue_shown_with_numbers(tmp_path: Path) -> None:
    browser = _browser()
    result = shaftsys.analyse(shaftsys.load_model(str(_failing_model(tmp_path))))
    checks = result.checks
    assert checks is not None
    slope = next(c for c in checks.bearings if c.verdict == "fail")
    section = next(s for s in checks.shafts[0].sections if not s.ok)
    # the premise: Shigley Table 7-2 deep groove ball range ends at 0.003 rad
    assert slope.slope_limit_rad == pytest.approx(0.003)
    assert max(k.slope_rad for k in slope.cases) > 0.003
    assert section.n_fatigue < checks.settings.required_fatigue_safety
    page = tmp_path / "report.html"
    page.write_text(render_report(result, date="2024-01-02"), encoding="utf-8")
    dom = _run(browser, "--dump-dom", page.as_uri()).stdout
    p = _Text()
    p.feed(dom)
    text = " ".join(" ".join(p.parts).split())
    for title in SHAFT_CHECK_TITLES:
        assert title in text, title
    worst = max(slope.cases, key=lambda k: k.slope_rad)
    row = (f"bearing {slope.id} {format_value(slope.x_mm, 5)} {worst.case} "
           f"{format_value(worst.slope_rad, 4)}")
    assert row in text
    at = text.index(row)
    assert "FAIL" in text[at:at + 300]
    srow = (f"{format_value(section.x_mm, 5)} {section.feature} "
            f"{format_value(section.d_mm, 4)}")
    assert srow in text
    at = text.index(srow)
    tail = text[at:at + 400]
    assert (f"{format_value(section.n_fatigue, 3)} / "
            f"{format_value(checks.settings.required_fatigue_safety, 3)}") in tail
    assert f"{format_value(section.Se_MPa, 4)}" in tail
    assert "FAIL" in tail


def test_failing_speed_check_shown_with_numbers(tmp_path: Path) -> None:
    """A case at 1500 rpm on a bearing with a limiting speed of 1000 rpm (the model of
    tests/test_checks_settings.py): the browser shows the limiting-speed row with the
    speed, the limit, the ratio 1.5 (n / limit, common practice, no source) and FAIL,
    and the headline names the check.
    """
    from tests.test_checks_settings import model_text

    browser = _browser()
    path = tmp_path / "speed.yaml"
    path.write_text(model_text(), encoding="utf-8")
    result = shaftsys.analyse(shaftsys.load_model(str(path)))
    check = result.bearing("A").operating_check("limiting_speed")
    assert check is not None and check.verdict == "fail"
    assert check.ratio == pytest.approx(1500.0 / 1000.0)
    page = tmp_path / "report.html"
    page.write_text(render_report(result, date="2024-01-02"), encoding="utf-8")
    dom = _run(browser, "--dump-dom", page.as_uri()).stdout
    p = _Text()
    p.feed(dom)
    text = " ".join(" ".join(p.parts).split())
    assert "Limiting speed and minimum load" in text
    row = (f"s/A limiting speed {check.case} {format_value(check.value, 5)} rpm "
           f"{format_value(check.limit, 5)} rpm {format_value(check.ratio, 3)} required FAIL")
    assert row in text
    assert "limiting speed of bearing 'A'" in text
