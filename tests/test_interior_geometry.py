"""Internal geometry of a bearing: read from the model file, estimated and flagged,
impossible geometry refused at its key (file, line, field, exit 2).

The estimation rule is common practice, no source (stated in
``shaftsys/model/interior_rules.py``); the fit rules are plain geometry: the element
must fit between the rings (d < dm - Dw, dm + Dw < D) and Z elements around the pitch
circle (the chord dm sin(pi/Z) >= Dw).
"""

from __future__ import annotations

import math
from typing import Any

import pytest

from shaftsys.cli import main
from shaftsys.errors import ModelError
from shaftsys.io.loader import load_model
from shaftsys.model import BearingKind
from shaftsys.model.catalogue import Catalogue
from shaftsys.model.interior_rules import estimate_interior, interior_problems


def _with_interior(interior: dict[str, Any], i: int = 0, **bearing: Any) -> Any:
    def edit(m: dict[str, Any]) -> None:
        m["shafts"][0]["bearings"][i]["interior"] = interior
        m["shafts"][0]["bearings"][i].update(bearing)
    return edit


def test_given_values_are_kept_and_the_rest_flagged_as_estimated(model_yaml: Any) -> None:
    path, _ = model_yaml(_with_interior({"Dw": "12 mm", "Z": 9, "clearance": "15 um"}))
    b = load_model(path).shafts[0].bearings[0]
    assert b.interior is not None
    g = b.interior
    assert (g.Dw_mm, g.Z, g.clearance_mm) == (12.0, 9, pytest.approx(0.015))
    assert g.source == "model"
    # the pitch diameter and the osculations were not given
    assert set(g.estimated) == {"dm", "fi", "fo"}
    assert g.dm_mm == pytest.approx(60.0)  # (d + D)/2 = (40 + 80)/2


def test_estimate_rule_fits_and_is_flagged() -> None:
    g = estimate_interior(BearingKind.DEEP_GROOVE_BALL, 40.0, 80.0, 18.0)
    assert g.source == "estimated"
    assert g.Dw_mm == pytest.approx(0.3 * 40.0)
    assert g.Z == math.floor(0.6 * math.pi * 60.0 / 12.0)
    assert interior_problems(BearingKind.DEEP_GROOVE_BALL, 40.0, 80.0, 18.0, g) == []
    r = estimate_interior(BearingKind.CYLINDRICAL_ROLLER, 40.0, 80.0, 18.0)
    assert r.Lwe_mm == pytest.approx(0.6 * 18.0)
    assert interior_problems(BearingKind.CYLINDRICAL_ROLLER, 40.0, 80.0, 18.0, r) == []


@pytest.mark.parametrize(("interior", "field", "words"), [
    ({"Dw": "25 mm", "Z": 8}, "interior.Dw", "do not fit between"),
    # chord of the pitch circle: 60 sin(pi/16) = 11.7 mm < Dw = 12 mm
    ({"Dw": "12 mm", "Z": 16}, "interior.Z", "overlap"),
    ({"clearance": "-0.01 mm"}, "interior.clearance", "negative"),
    ({"fi": 0.45}, "interior.fi", "0.5"),
    ({"Lwe": "10 mm"}, "interior.Lwe", "roller length"),
    ({"preload": "200 N"}, "interior.preload", "adjusted pair"),
])
def test_impossible_geometry_is_a_located_error(model_yaml: Any, line_of: Any,
                                                interior: dict[str, Any], field: str,
                                                words: str) -> None:
    path, text = model_yaml(_with_interior(interior))
    with pytest.raises(ModelError) as err:
        load_model(path)
    e = err.value
    assert e.field == f"shafts[s1].bearings[A].{field}"
    assert words in str(e)
    key = field.split(".")[-1]
    assert e.line == line_of(text, f"{key}:")
    assert main(["validate", str(path)]) == 2


def test_contact_angle_out_of_range_names_the_bearing(model_yaml: Any) -> None:
    path, _ = model_yaml(_with_interior({"Dw": "10 mm"}, type="angular_contact_ball",
                                        contact_angle="60 deg"))
    with pytest.raises(ModelError) as err:
        load_model(path)
    assert err.value.field == "shafts[s1].bearings[A].contact_angle"
    assert "out of range" in str(err.value)


def test_a_type_without_a_modelled_interior_is_refused(model_yaml: Any) -> None:
    path, _ = model_yaml(_with_interior({}, type="spherical_roller"))
    with pytest.raises(ModelError) as err:
        load_model(path)
    assert err.value.field == "shafts[s1].bearings[A].interior"


def test_catalogue_row_gives_its_interior() -> None:
    from pathlib import Path

    from shaftsys.io.catalogue import read_catalogue

    cat: Catalogue = read_catalogue(Path(__file__).parent.parent / "models"
                                    / "demo_catalogue.csv")
    i = next(k for k in range(len(cat)) if cat.kind[k] is BearingKind.DEEP_GROOVE_BALL
             and not math.isnan(cat.Dw_mm[k]))
    b = cat.to_bearing(i, id="X", x_mm=0.0, axial="both")
    assert b.interior is not None and b.interior.source == "catalogue"
    assert b.interior.Dw_mm == cat.Dw_mm[i] and b.interior.Z == int(cat.Z[i])
