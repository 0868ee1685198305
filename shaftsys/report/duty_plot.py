"""Load-duration figure of a recorded duty: time and revolutions at each torque level."""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from shaftsys.analysis.duty import DutyReduction


def plot_duty(axes: Any, red: DutyReduction) -> Any:
    """Draw time [h] and revolutions per generated duty case against its torque [N*m]
    on two axes (a pair from ``plt.subplots(1, 2)``); returns the axes.
    """
    running = [c for c in red.cases if c.kind == "duty" and c.region != "standstill"]
    peaks = [c for c in red.cases if c.kind == "peak"]
    regions = sorted({c.region for c in running})
    for region in regions:
        mine = [c for c in running if c.region == region]
        T = [c.torque_Nmm / 1000.0 for c in mine]
        width = [max((c.T_hi_Nmm - c.T_lo_Nmm) / 1000.0, 1e-9) * 0.9 for c in mine]
        axes[0].bar(T, [c.time_s / 3600.0 for c in mine], width=width, label=region)
        axes[1].bar(T, [c.revs for c in mine], width=width, label=region)
    for c in peaks:
        for ax in axes:
            ax.axvline(c.torque_Nmm / 1000.0, color="k", linestyle="--", linewidth=0.8)
    axes[0].set_xlabel("input torque T_rep [N*m]")
    axes[0].set_ylabel("time at level [h]")
    axes[1].set_xlabel("input torque T_rep [N*m]")
    axes[1].set_ylabel("revolutions at level [-]")
    axes[0].set_title("load-duration (time)")
    axes[1].set_title("revolutions (damage weight)")
    if regions:
        axes[0].legend(fontsize="small")
    return axes


def duty_chart(red: DutyReduction) -> Any:
    """The load-duration figure as a stand-alone matplotlib Figure (Agg canvas, no
    pyplot state), for the report's inline SVG and ``shaftsys plot --what duty``.
    """
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    fig = Figure(figsize=(10, 4.2), layout="constrained")
    FigureCanvasAgg(fig)
    plot_duty(fig.subplots(1, 2), red)
    return fig


def save_duty_plot(red: DutyReduction, path: str | Path) -> Path:
    """Write the load-duration figure (.png or .svg, atomically)."""
    from shaftsys.io.output import write_figure

    return write_figure(path, lambda fig: plot_duty(fig.subplots(1, 2), red), (10, 4.2))


__all__ = ["duty_chart", "plot_duty", "save_duty_plot"]
