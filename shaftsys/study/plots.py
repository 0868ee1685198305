"""Study figures (matplotlib; each function draws on a given ``ax``).

Units: lives in h (log axis), quantities in their internal units, margins [-].
"""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING, Any

import numpy as np

from shaftsys.errors import ModelError

if TYPE_CHECKING:
    import pandas as pd
    from matplotlib.axes import Axes

    from shaftsys.study.sweep import Study


def _runs(mask: np.ndarray) -> list[tuple[int, int]]:
    """Index ranges [i, j] of consecutive True values."""
    out = []
    i = None
    for k, v in enumerate(mask):
        if v and i is None:
            i = k
        if not v and i is not None:
            out.append((i, k - 1))
            i = None
    if i is not None:
        out.append((i, len(mask) - 1))
    return out


def plot_life(ax: Axes, df: pd.DataFrame, study: Study, quantity: str | None = None) -> Axes:
    """Life Lnm_h [h] of every support against one swept quantity.

    The target life is drawn as a horizontal line (per bearing where a bearing has its
    own target) and the ranges of the quantity where the variant passes (``ok``) are
    shaded. With several swept quantities pass the rows of one line of the grid.
    """
    q = quantity or study.quantities[0].path
    if q not in df.columns:
        raise ModelError(f"'{q}' is not a swept quantity", field="--plot",
                         expected=f"one of {[x.path for x in study.quantities]}")
    d = df.sort_values(q)
    x = d[q].to_numpy(float)
    for s in study.model.shafts:
        for b in s.bearings:
            ax.plot(x, d[f"{b.id}.Lnm_h"].to_numpy(float), marker="o", ms=3,
                    label=f"{b.id} ({b.kind.value.replace('_', ' ')})")
            if b.target_life_h is not None:
                ax.axhline(b.target_life_h, ls=":", lw=1, color="0.4")
    target = study.model.life.target_life_h
    ax.axhline(target, color="k", ls="--", lw=1.2, label=f"target {target:,.0f} h")
    ok = d["ok"].to_numpy(bool)
    for k, (i, j) in enumerate(_runs(ok)):
        lo = x[i] - (0.5 * (x[i] - x[i - 1]) if i > 0 else 0.0)
        hi = x[j] + (0.5 * (x[j + 1] - x[j]) if j + 1 < len(x) else 0.0)
        ax.axvspan(lo, hi, color="tab:green", alpha=0.12, lw=0,
                   label="feasible" if k == 0 else None)
    unit = next(x_.unit for x_ in study.quantities if x_.path == q)
    ax.set_yscale("log")
    ax.set_xlabel(f"{q} [{unit}]")
    ax.set_ylabel("life Lnm [h]")
    ax.grid(True, which="both", alpha=0.3)
    ax.legend(fontsize="small")
    return ax


def plot_contour(ax: Axes, df: pd.DataFrame, study: Study, x: str | None = None,
                 y: str | None = None, column: str = "worst_margin") -> Axes:
    """Contour map of ``column`` over two swept quantities (grid studies).

    The level 1 of a margin is drawn bold (the target); variants that fail (``ok``
    false) are hatched; invalid variants are left blank.
    """
    paths = [q.path for q in study.quantities]
    x = x or paths[0]
    y = y or (paths[1] if len(paths) > 1 else None)
    if y is None or x not in paths or y not in paths:
        raise ModelError("a contour map needs two swept quantities", field="--plot",
                         expected="a study with two quantities")
    piv = df.pivot_table(index=y, columns=x, values=column, aggfunc="min", dropna=False)
    okp = df.pivot_table(index=y, columns=x, values="ok", aggfunc="min", dropna=False)
    X, Y = np.meshgrid(piv.columns.to_numpy(float), piv.index.to_numpy(float))
    Z = piv.to_numpy(float)
    cs = ax.contourf(X, Y, Z, levels=12, cmap="viridis")
    ax.figure.colorbar(cs, ax=ax, label=column)
    if np.nanmin(Z) < 1.0 < np.nanmax(Z):
        ax.contour(X, Y, Z, levels=[1.0], colors="k", linewidths=1.8)
    bad = np.where(np.asarray(okp.to_numpy(float)) < 0.5, 1.0, np.nan)
    ax.contourf(X, Y, bad, levels=[0.5, 1.5], colors="none", hatches=["//"])
    units = {q.path: q.unit for q in study.quantities}
    ax.set_xlabel(f"{x} [{units[x]}]")
    ax.set_ylabel(f"{y} [{units[y]}]")
    ax.set_title(f"{column} (hatched: fails)")
    return ax


def save_study_plot(df: pd.DataFrame, study: Study, path: str | Path) -> Path:
    """Write the study's figure (life plot for one quantity, contour for two).

    The format follows the suffix (.png or .svg); the file is written atomically.
    """
    from shaftsys.io.output import write_figure

    def draw(fig: Any) -> None:
        ax = fig.add_subplot()
        if len(study.quantities) == 1:
            plot_life(ax, df, study)
        elif len(study.quantities) == 2 and study.mode == "grid":
            plot_contour(ax, df, study)
        else:
            raise ModelError("a study figure needs one quantity (life plot) or two in a grid "
                             "(contour map)", field="--plot", expected="one or two --vary")

    return write_figure(path, draw, (7.5, 4.8))
