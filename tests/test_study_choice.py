"""Design studies with open bearings: every variant gets its chosen set, batched.

Reference: the single run (``shaftsys.analysis.analyse``, which chooses with
:func:`shaftsys.analysis.selection.choose_bearings`) on each variant; the batched study
must pick the same catalogue rows and give the same lives to round-off. The shaft, its
loads and the catalogue are invented (models/demo_catalogue.csv).
"""

from __future__ import annotations

import shutil
from pathlib import Path

import numpy as np
import pytest
from conftest import base_model, dump_model

from shaftsys.io.loader import load_model
from shaftsys.study.sweep import evaluate_values, make_study, sweep

CATALOGUE = Path(__file__).resolve().parent.parent / "models" / "demo_catalogue.csv"


def _open_model(tmp_path: Path, objective: str, *, max_D_B: str = "90 mm",
                load_scale: float = 1.0) -> Path:
    shutil.copy(CATALOGUE, tmp_path / CATALOGUE.name)
    m = base_model()
    sh = m["shafts"][0]
    sh["bearings"] = [
        {"id": "A", "at": "50 mm", "axial": "both",
         "choose": {"catalogue": CATALOGUE.name}},
        {"id": "B", "at": "350 mm", "axial": "float",
         "choose": {"catalogue": CATALOGUE.name, "max_D": max_D_B}}]
    sh["elements"][2]["force"] = [f"{500 * load_scale} N", f"{-9000 * load_scale} N", 0]
    m["lubrication"] = {"viscosity_40C": "100 mm^2/s", "viscosity_100C": "11 mm^2/s",
                        "ec": 0.5}
    for c in m["cases"]:
        c["temperature"] = "60 degC"
    m["life"] = {"target": "40000 h", "reliability": 0.95}
    m["selection"] = {"objective": objective}
    path = tmp_path / "open.yaml"
    path.write_text(dump_model(m), encoding="utf-8")
    return path


@pytest.mark.parametrize("objective", ["smallest", "lightest", "largest_margin"])
def test_batched_choice_equals_the_single_run(tmp_path: Path, objective: str) -> None:
    model = load_model(str(_open_model(tmp_path, objective, load_scale=3.0)))
    study = make_study(model, [("bearing.B.at", "220:380:9"), ("step.1.d", [50, 60])])
    assert study.batched
    values = study.values_block(0, study.n_variants)
    batched, method = evaluate_values(study, values)
    single, _ = evaluate_values(study, values, batched=False)
    assert method == "batched"
    assert np.array_equal(batched.choice, single.choice)
    assert (batched.choice >= 0).any()
    both = np.isfinite(single.Lnm_h)
    assert np.array_equal(both, np.isfinite(batched.Lnm_h))
    np.testing.assert_allclose(batched.Lnm_h[both], single.Lnm_h[both], rtol=1e-9)
    np.testing.assert_allclose(batched.margin[both], single.margin[both], rtol=1e-9)
    np.testing.assert_allclose(batched.chosen_mass_kg, single.chosen_mass_kg, rtol=1e-12,
                               equal_nan=True)
    fin = np.isfinite(single.system_life_h)
    np.testing.assert_allclose(batched.system_life_h[fin], single.system_life_h[fin],
                               rtol=1e-9)


def test_results_table_has_the_choice_per_variant(tmp_path: Path) -> None:
    """A support left without a qualifying row in some variants: its choice column is
    empty there, the variant does not pass and its system life is not stated."""
    model = load_model(str(_open_model(tmp_path, "lightest", max_D_B="80 mm",
                                       load_scale=2.0)))
    df = sweep(make_study(model, [("bearing.B.at", "220:380:9")]))
    assert {"A.choice", "B.choice", "A.D_mm", "chosen_mass_kg", "chosen_price"} <= set(df)
    chosen = df["B.choice"] != ""
    assert chosen.any() and (~chosen).any()
    assert not df.loc[~chosen, "ok"].any()
    assert df.loc[~chosen, "system_life_h"].isna().all()
    assert df.loc[chosen, "chosen_mass_kg"].notna().all()
