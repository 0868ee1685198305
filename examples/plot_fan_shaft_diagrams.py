"""Solve the bundled fan shaft and save its shaft drawing and first-case diagrams as PNG.

Run: ``python examples/plot_fan_shaft_diagrams.py [OUTPUT_FOLDER]`` (default: the
current folder). Uses the Python API and :mod:`shaftsys.report.figures` only.
"""

from __future__ import annotations

import sys
from pathlib import Path

import shaftsys
from shaftsys.report import figures

MODEL = Path(__file__).resolve().parent.parent / "models" / "fan_drive.yaml"


def main(argv: list[str] | None = None) -> list[Path]:
    """Write ``<shaft>_drawing.png`` and ``<shaft>_<case>_diagrams.png``; return the paths."""
    args = sys.argv[1:] if argv is None else argv
    out_dir = Path(args[0]) if args else Path.cwd()
    out_dir.mkdir(parents=True, exist_ok=True)
    result = shaftsys.analyse(shaftsys.load_model(str(MODEL)))
    written: list[Path] = []
    for shaft in result.shafts:
        drawing = out_dir / f"{shaft.shaft.id}_drawing.png"
        figures.shaft_drawing(shaft).savefig(drawing, dpi=110)
        first = shaft.cases[0]
        diag = out_dir / f"{shaft.shaft.id}_{first.case}_diagrams.png"
        figures.diagrams(first).savefig(diag, dpi=110)
        written += [drawing, diag]
    for path in written:
        print(path)
    return written


if __name__ == "__main__":
    main()
