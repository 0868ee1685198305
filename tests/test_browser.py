"""The HTML report as a browser shows it: headless Chromium renders the demo's report.

Needs Debian's ``chromium`` (``.ci/run`` installs it). Under CI (``CI=true``) a missing
browser fails the test; elsewhere it is skipped with the reason. Two runs of the
browser: ``--dump-dom`` for the text a reader sees (after parsing and layout), and
``--screenshot`` for the picture, which must not be blank.
"""

from __future__ import annotations

import os
import shutil
import subprocess
import tempfile
from html.parser import HTMLParser
from pathlib import Path

import pytest

import shaftsys
from shaftsys.report.html import SECTION_TITLES, render_report

pytestmark = pytest.mark.browser

ROOT = Path(__file__).resolve().parent.parent
MODEL = ROOT / "models" / "fan_drive.yaml"

#: Flags for a headless run as root with no network side traffic (Chromium's own
#: command-line switches).
FLAGS = ("--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
         "--disable-background-networking", "--disable-component-update", "--disable-sync")

#: Generous bound for one browser run: a hung browser fails the test instead of
#: blocking the suite (not a timing assertion).
RUN_LIMIT_S = 90


def _browser() -> str:
    for candidate in ("/usr/bin/chromium", shutil.which("chromium"),
                      shutil.which("chromium-browser")):
        if candidate and os.access(candidate, os.X_OK):
            return candidate
    reason = "headless Chromium not found (Debian: apt-get install chromium)"
    if os.environ.get("CI", "").lower() == "true":
        pytest.fail(reason + "; .ci/run must install it")
    pytest.skip(reason)


def _run(browser: str, *args: str) -> subprocess.CompletedProcess[str]:
    with tempfile.TemporaryDirectory(prefix="shaftsys-chromium-") as profile:
        done = subprocess.run([browser, *FLAGS, f"--user-data-dir={profile}", *args],
                              capture_output=True, text=True, timeout=RUN_LIMIT_S,
                              check=False, stdin=subprocess.DEVNULL)
    assert done.returncode == 0, done.stderr[-2000:]
    return done


class _Text(HTMLParser):
    """Visible text of a document (style contents left out)."""

    def __init__(self) -> None:
        super().__init__()
        self.parts: list[str] = []
        self._skip = 0

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        if tag in ("style", "script"):
            self._skip += 1

    def handle_endtag(self, tag: str) -> None:
        if tag in ("style", "script"):
            self._skip -= 1

    def handle_data(self, data: str) -> None:
        if not self._skip:
            self.parts.append(data)


@pytest.fixture(scope="module")
def browser() -> str:
    return _browser()


@pytest.fixture(scope="module")
def report_file(tmp_path_factory: pytest.TempPathFactory) -> tuple[Path, object]:
    result = shaftsys.analyse(shaftsys.load_model(str(MODEL)))
    path = tmp_path_factory.mktemp("browser") / "fan report.html"   # a space in the name
    path.write_text(render_report(result, date="2024-01-02"), encoding="utf-8")
    return path, result


def test_browser_shows_sections_bearings_and_verdict(browser: str,
                                                      report_file: tuple[Path, object]
                                                      ) -> None:
    path, result = report_file
    dom = _run(browser, "--dump-dom", path.as_uri()).stdout
    assert "<svg" in dom                      # the inline figures survived parsing
    p = _Text()
    p.feed(dom)
    text = " ".join(" ".join(p.parts).split())
    for title in SECTION_TITLES:
        assert title in text, title
    for b in result.bearings:                 # type: ignore[attr-defined]
        assert f"Bearing {b.bearing.id} on {b.shaft_id}" in text
        assert f"CALCULATION SHEET - bearing {b.bearing.id}" in text
    assert "PASS" in text and "ALL CHECKS PASS" in text
    assert "fan_drive.yaml" in text and "2024-01-02" in text


def test_browser_screenshot_is_not_blank(browser: str, report_file: tuple[Path, object],
                                         tmp_path: Path) -> None:
    from PIL import Image

    path, _ = report_file
    png = tmp_path / "report.png"
    _run(browser, f"--screenshot={png}", "--window-size=1280,2000", path.as_uri())
    with Image.open(png) as im:
        assert im.size == (1280, 2000)
        rgb = im.convert("RGB")
        colours = rgb.getcolors(maxcolors=1 << 20)
        assert colours is not None
        # text, rules, the stamp and the shaft drawing: many distinct colours
        assert len(colours) > 200
        # the page background is off-white; count clearly darker (ink) pixels
        grey = rgb.convert("L")
        dark = sum(grey.histogram()[:160])
        assert dark > 0.01 * 1280 * 2000
        # the green PASS stamp of the header is on the first screen
        assert any(g > r + 40 and g > b + 20 for _, (r, g, b) in colours)
