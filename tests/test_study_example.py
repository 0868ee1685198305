"""The design-study example runs and its headline figures hold."""

from __future__ import annotations

import importlib.util
from pathlib import Path

EXAMPLE = Path(__file__).resolve().parent.parent / "examples" / "spacing_study.py"


def test_spacing_study_example(tmp_path, capsys):
    spec = importlib.util.spec_from_file_location("spacing_study", EXAMPLE)
    assert spec is not None and spec.loader is not None
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    out = module.main(str(tmp_path))
    text = capsys.readouterr().out
    assert "300 variants" in text and "optimum" in text
    s = out["summary"]
    assert s["variants"] == 300 and 0 < s["passing"] < s["valid"] <= 300
    opt = out["optimum"]
    # the optimum is at least as good as the best passing grid point, within its bounds
    assert opt.worst_margin >= s["best_worst_margin"] - 1e-9
    assert 211.0 <= opt.values["bearing.B.at"] <= 249.0
    assert opt.active  # a limit or a bound is active
    assert (tmp_path / "results.parquet").is_file() and (tmp_path / "worst_margin.png").is_file()
