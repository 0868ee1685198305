"""The bearing interior through the whole run: the two demo models with an interior
run with `check`, their JSON carries an `internal` object per bearing whose element
loads balance the bearing's reaction (Newton residual), and a model without an
interior has no `internal` key (the rigid-support path is unchanged).

Reference: static equilibrium of the inner ring (the element load vectors add up to
the shaft's force on the bearing; Harris, *Rolling Bearing Analysis*).
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np
import pytest

from shaftsys.cli import main

MODELS = Path(__file__).resolve().parent.parent / "models"


@pytest.mark.parametrize("name", ["spindle_preload.yaml", "machine_clearance.yaml"])
def test_demo_with_interior_runs_and_balances(name: str, tmp_path: Path) -> None:
    out = tmp_path / "r.json"
    assert main(["check", str(MODELS / name), "--json", str(out), "--quiet"]) == 0
    data = json.loads(out.read_text())
    with_internal = [b for b in data["bearings"] if "internal" in b]
    assert with_internal
    for b in with_internal:
        inner = b["internal"]
        assert inner["newton_residual"] < 1e-8
        loads = {ld["case"]: ld for ld in b["loads"]}
        for c in inner["cases"]:
            ld = loads[c["case"]]
            Q = np.asarray(c["element_loads_N"])
            assert Q.min() >= 0.0
            assert c["max_element_load_N"] == pytest.approx(Q.max())
            # a radial load needs at least one element carrying more than Fr / Z
            assert Q.max() * inner["Z"] * inner["rows"] >= ld["Fr_N"] * (1 - 1e-9)
            K = np.asarray(c["stiffness_matrix"])
            assert K.shape == (5, 5)
            np.testing.assert_allclose(K, K.T, rtol=1e-6, atol=1e-6 * abs(K).max())
            assert c["life_ratio"] is None or math.isfinite(c["life_ratio"])


def test_model_without_interior_has_no_internal_key(demo_path: Path, tmp_path: Path
                                                   ) -> None:
    out = tmp_path / "r.json"
    main(["check", str(demo_path), "--json", str(out), "--quiet"])
    data = json.loads(out.read_text())
    assert all("internal" not in b for b in data["bearings"])


# ------------------------------------------------------------ the polar element-load figure
def test_polar_figure_draws_the_element_loads_on_the_load_line(
        tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    """The polar figure's bars are the element loads of the chosen case (one bar per
    element and row, heights = the JSON's loads), and the most loaded element of a
    single-row radial bearing lies on the line of the radial load (Stribeck's picture of
    the load zone, centred on the load; classic, from memory), which fixes the drawn
    angle convention: angles from +y toward +z."""
    from shaftsys import analyse
    from shaftsys.io.loader import load_model
    from shaftsys.report.interior_plot import element_load_polar, worst_case

    model = load_model(MODELS / "machine_clearance.yaml")
    result = analyse(model)
    assert result.internal is not None
    data = result.internal["CRB"]
    case = worst_case(data)
    c = next(x for x in data["cases"] if x["case"] == case)
    assert c["max_element_load_N"] == max(x["max_element_load_N"] for x in data["cases"])
    fig = element_load_polar("CRB", data)
    ax = fig.axes[0]
    heights = sorted(p.get_height() for p in ax.patches)
    assert len(heights) == data["Z"] * data["rows"]
    assert heights == pytest.approx(sorted(c["element_loads_N"]), rel=1e-12)
    ld = next(x for x in next(b for b in result.bearings if b.bearing.id == "CRB").loads
              if x.case == case)
    load_angle = math.degrees(math.atan2(ld.Fz_N, ld.Fy_N)) % 360.0
    k = int(max(range(len(c["element_loads_N"])), key=lambda j: c["element_loads_N"][j]))
    pitch = 360.0 / data["Z"]
    gap = abs((data["element_angles_deg"][k] - load_angle + 180.0) % 360.0 - 180.0)
    assert gap <= pitch / 2 + 1e-9
    out = tmp_path / "crb.png"
    assert main(["plot", str(MODELS / "machine_clearance.yaml"), "--what", "elements",
                 "--bearing", "CRB", "-o", str(out), "-q"]) in (0, 1)
    assert out.read_bytes()[:4] == b"\x89PNG"
    capsys.readouterr()
    assert main(["plot", str(MODELS / "fan_drive.yaml"), "--what", "elements",
                 "-o", str(out)]) == 2
    assert "no bearing an interior" in capsys.readouterr().err
    assert main(["plot", str(MODELS / "machine_clearance.yaml"), "--what", "elements",
                 "--case", "nope", "-o", str(out)]) == 2
    html = tmp_path / "r.html"
    assert main(["report", str(MODELS / "spindle_preload.yaml"), "-o", str(html),
                 "-q"]) in (0, 1)
    text = html.read_text()
    start = text.index('<section id="internal">')
    section = text[start:text.index("</section>", start)]
    assert section.count("<svg") == 2 and "FRONT" in section and "REAR" in section
    json.dumps(data)  # the object stays JSON-ready
