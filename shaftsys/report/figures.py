"""Figures of a solved model: shaft drawing, internal-force diagrams, load-life chart.

matplotlib is imported lazily (inside the functions) so that importing shaftsys never
needs it. A function given an ``ax`` draws into the caller's axes and returns them;
without one it builds a stand-alone :class:`matplotlib.figure.Figure` on the ``Agg``
canvas (no pyplot state, no window) and returns the Figure. Nothing is shown or saved
here; :func:`to_svg` turns a Figure into inline SVG text.

Units on the axes: positions in mm (internal unit), forces in N, moments and torque in
N*m (internal N*mm divided by 1000 for readability), deflection in micrometres
(internal mm times 1000). Every axis label states its unit.
"""

from __future__ import annotations

import io
import itertools
import math
import re
import sys
from collections.abc import Sequence
from typing import TYPE_CHECKING, Any, overload

import numpy as np

from shaftsys.analysis.results import BearingResult, CaseSolution, ShaftResult
from shaftsys.model import Shaft
from shaftsys.units import MEGA_REVOLUTIONS

if TYPE_CHECKING:
    from matplotlib.axes import Axes
    from matplotlib.figure import Figure

__all__ = ["deflection_lines", "diagrams", "load_life_chart", "mode_shapes", "shaft_drawing",
           "to_svg"]

#: Colours of the report's own palette (ink, steel, accent, muted, warm, cool).
INK = "#1d2630"
STEEL = "#8a97a6"
ACCENT = "#c2571a"
MUTED = "#5b6b7a"
COOL = "#2a6f97"
WARM = "#a23b72"

_SVG_COUNTER = itertools.count(1)
_METADATA = re.compile(r"<metadata>.*?</metadata>\s*", re.DOTALL)


def _new_figure(width_in: float, height_in: float, nrows: int = 1) -> tuple[Figure, list[Axes]]:
    """A stand-alone Figure on the Agg canvas with ``nrows`` stacked axes (no pyplot)."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    fig = Figure(figsize=(width_in, height_in), layout="constrained")
    FigureCanvasAgg(fig)
    axes = fig.subplots(nrows, 1, sharex=True, squeeze=False)[:, 0]
    return fig, list(axes)


def _shaft_of(obj: ShaftResult | Shaft) -> Shaft:
    if isinstance(obj, ShaftResult):
        return obj.shaft
    if isinstance(obj, Shaft):
        return obj
    raise ValueError(f"expected a ShaftResult or a Shaft, got {type(obj).__name__}")


def _element_size_mm(el: Any) -> float | None:
    """Outer size of an element to sketch [mm] (pitch/pulley diameter), or None."""
    for name in ("diameter_mm", "pitch_diameter_mm", "mean_pitch_diameter_mm"):
        v = getattr(el, name, None)
        if v:
            return float(v)
    return None


#: Width of the stand-alone shaft drawing and diagrams [in]; the HTML report scales
#: every figure to the page width, so equal widths give equal text sizes.
_DRAWING_WIDTH_IN = 9.0


#: Height limits of the stand-alone shaft drawing [in].
_DRAWING_MIN_HEIGHT_IN = 2.4
_DRAWING_MAX_HEIGHT_IN = 4.4


def _drawing_size_in(shaft: Shaft) -> tuple[float, float]:
    """Figure (width, height) [in] that fits the to-scale drawing without empty bands.

    The drawing spans 1.10 L by 2.7 r_max (the limits set in :func:`shaft_drawing`);
    about 1.0 in of width goes to the y label and ticks, 1.0 in of height to the title
    and x label. A slender shaft gets the full width and at least 2.4 in of height; a
    stubby one (gear shafts) at most 4.4 in of height and a narrower figure.
    """
    r_max = max(s.d_mm for s in shaft.steps) / 2.0
    r_max = max([r_max, *(b.D_mm / 2.0 for b in shaft.bearings),
                 *((_element_size_mm(el) or 0.0) / 2.0 for el in shaft.elements)])
    ratio = (2.7 * r_max) / (1.10 * shaft.length_mm)
    height = (_DRAWING_WIDTH_IN - 1.0) * ratio + 1.0
    if height <= _DRAWING_MAX_HEIGHT_IN:
        return _DRAWING_WIDTH_IN, max(height, _DRAWING_MIN_HEIGHT_IN)
    width = (_DRAWING_MAX_HEIGHT_IN - 1.0) / ratio + 1.0
    return max(width, 4.0), _DRAWING_MAX_HEIGHT_IN


@overload
def shaft_drawing(shaft_result_or_shaft: ShaftResult | Shaft, ax: None = None) -> Figure: ...
@overload
def shaft_drawing(shaft_result_or_shaft: ShaftResult | Shaft, ax: Axes) -> Axes: ...
def shaft_drawing(shaft_result_or_shaft: ShaftResult | Shaft, ax: Axes | None = None
                  ) -> Figure | Axes:
    """Draw a to-scale side view of one shaft (equal aspect, x and radius in mm).

    Steps are outlined rectangles of their outer diameter; a bore is a dashed
    rectangle. Each bearing is a box spanning its rings (d to D, width B or, when B is
    not given, 0.4*(D - d), a drawing default) with a cross inside and its id on top;
    a small triangle under the axis marks the support point (pressure centre). Each
    element is a diamond on the axis with its id; pulleys, gears and sprockets also
    show their pitch diameter as a thin dotted outline.

    Parameters
    ----------
    shaft_result_or_shaft:
        A :class:`~shaftsys.analysis.ShaftResult` or a :class:`~shaftsys.model.Shaft`.
    ax:
        Axes to draw into, or ``None`` for a new Figure.

    Returns
    -------
    The new Figure (``ax`` is None) or the given Axes.
    """
    from matplotlib.patches import Polygon, Rectangle

    shaft = _shaft_of(shaft_result_or_shaft)
    own = ax is None
    fig = None
    if ax is None:
        fig, (ax,) = _new_figure(*_drawing_size_in(shaft))
    edges = shaft.step_edges_mm
    r_max = max(s.d_mm for s in shaft.steps) / 2.0
    for step, x0 in zip(shaft.steps, edges[:-1], strict=True):
        r = step.d_mm / 2.0
        ax.add_patch(Rectangle((x0, -r), step.length_mm, 2 * r, facecolor="#e4e8ec",
                               edgecolor=INK, linewidth=1.0, zorder=2))
        if step.bore_mm > 0:
            rb = step.bore_mm / 2.0
            ax.add_patch(Rectangle((x0, -rb), step.length_mm, 2 * rb, facecolor="white",
                                   edgecolor=INK, linewidth=0.8, linestyle="--", zorder=3))
    length = shaft.length_mm
    ax.plot([-0.03 * length, 1.03 * length], [0, 0], color=MUTED, linewidth=0.6,
            linestyle=(0, (12, 3, 2, 3)), zorder=4)
    for b in shaft.bearings:
        width = b.B_mm if b.B_mm else 0.4 * (b.D_mm - b.d_mm)
        ri, ro = b.d_mm / 2.0, b.D_mm / 2.0
        r_max = max(r_max, ro)
        for sign in (1.0, -1.0):
            y0 = ri if sign > 0 else -ro
            ax.add_patch(Rectangle((b.x_mm - width / 2, y0), width, ro - ri,
                                   facecolor="#f6e3d6", edgecolor=ACCENT, linewidth=1.2,
                                   zorder=5))
            ys = (ri, ro) if sign > 0 else (-ri, -ro)
            ax.plot([b.x_mm - width / 2, b.x_mm + width / 2], ys, color=ACCENT,
                    linewidth=0.8, zorder=6)
            ax.plot([b.x_mm - width / 2, b.x_mm + width / 2], ys[::-1], color=ACCENT,
                    linewidth=0.8, zorder=6)
        xs = b.support_x_mm
        tri = 0.08 * max(b.D_mm, 20.0)
        ax.add_patch(Polygon([(xs, -ro), (xs - tri, -ro - 1.6 * tri), (xs + tri, -ro - 1.6 * tri)],
                             closed=True, facecolor=ACCENT, edgecolor=ACCENT, zorder=6))
        ax.annotate(f"{b.id}\n{b.kind.value.replace('_', ' ')}", (b.x_mm, ro),
                    xytext=(0, 4), textcoords="offset points", ha="center", va="bottom",
                    fontsize=7, color=ACCENT)
    seen: dict[float, int] = {}
    for el in shaft.elements:
        size = _element_size_mm(el)
        k = seen.get(el.x_mm, 0)
        seen[el.x_mm] = k + 1
        if size:
            half = size / 2.0
            r_max = max(r_max, half)
            width_mm = getattr(el, "width_mm", None)
            w = float(width_mm) if width_mm else 0.08 * size
            ax.add_patch(Rectangle((el.x_mm - w / 2, -half), w, size, fill=False,
                                   edgecolor=COOL, linewidth=0.8, linestyle=":", zorder=3))
        ax.plot([el.x_mm], [0.0], marker="D", markersize=6, color=COOL, zorder=7)
        ax.annotate(el.id, (el.x_mm, 0.0), xytext=(0, -14 - 9 * k), textcoords="offset points",
                    ha="center", va="top", fontsize=7, color=COOL, zorder=8,
                    bbox={"boxstyle": "round,pad=0.15", "facecolor": "white",
                          "edgecolor": "none", "alpha": 0.85})
    ax.set_xlim(-0.05 * length, 1.05 * length)
    ax.set_ylim(-1.35 * r_max, 1.35 * r_max)
    ax.set_aspect("equal", adjustable="box")
    ax.set_xlabel("x along the shaft [mm]")
    ax.set_ylabel("radius [mm]")
    ax.set_title(f"shaft {shaft.id}: {length:g} mm, {len(shaft.steps)} steps, to scale",
                 fontsize=9, loc="left")
    ax.grid(True, color="#eef0f2", linewidth=0.5, zorder=0)
    return fig if own and fig is not None else ax


@overload
def diagrams(case_solution: CaseSolution, ax: None = None) -> Figure: ...
@overload
def diagrams(case_solution: CaseSolution, ax: Axes) -> Axes: ...
@overload
def diagrams(case_solution: CaseSolution, ax: Sequence[Axes]) -> list[Axes]: ...
def diagrams(case_solution: CaseSolution, ax: Axes | Sequence[Axes] | None = None
             ) -> Figure | Axes | list[Axes]:
    """Plot shear, bending moment, torque and radial deflection of one case.

    Panels (top to bottom): shear Vy, Vz [N]; bending moments My, Mz and the resultant
    M [N*m]; torque T [N*m]; radial deflection sqrt(uy^2 + uz^2) [um]. Forces and
    moments are drawn at ``stations_mm`` (both ends of every element, so point loads
    show as jumps), deflection at ``node_x_mm``. Signs follow
    :class:`~shaftsys.analysis.CaseSolution` (action of the right part on the left).

    Parameters
    ----------
    case_solution:
        The solution of one case on one shaft.
    ax:
        ``None`` (new Figure with four panels), a sequence of four Axes (one per
        panel), or one Axes (all curves in it, each scaled to its own unit: only for
        quick looks).

    Returns
    -------
    The new Figure, or the given Axes (list or single).
    """
    cs = case_solution
    x = np.asarray(cs.stations_mm)
    fig = None
    axes: list[Axes]
    single = False
    if ax is None:
        fig, axes = _new_figure(_DRAWING_WIDTH_IN, 7.2, 4)
    elif isinstance(ax, Sequence):
        axes = list(ax)
        if len(axes) != 4:
            raise ValueError(f"diagrams needs 4 axes, got {len(axes)}")
    else:
        axes = [ax, ax, ax, ax]
        single = True
    a_v, a_m, a_t, a_d = axes
    a_v.plot(x, cs.Vy_N, color=COOL, linewidth=1.1, label="Vy")
    a_v.plot(x, cs.Vz_N, color=WARM, linewidth=1.1, label="Vz")
    a_m.plot(x, np.asarray(cs.My_Nmm) / 1e3, color=WARM, linewidth=1.0, label="My")
    a_m.plot(x, np.asarray(cs.Mz_Nmm) / 1e3, color=COOL, linewidth=1.0, label="Mz")
    a_m.plot(x, cs.M_Nmm / 1e3, color=INK, linewidth=1.6, label="M resultant")
    a_t.plot(x, np.asarray(cs.T_Nmm) / 1e3, color=ACCENT, linewidth=1.2, label="T")
    a_d.plot(cs.node_x_mm, cs.deflection_mm * 1e3, color=INK, linewidth=1.2,
             label="radial deflection")
    if single:
        a_v.set_ylabel("V [N], M and T [N*m], deflection [um]")
        a_v.legend(fontsize=7)
    else:
        for a, lab in zip(axes, ("shear [N]", "bending moment [N*m]", "torque [N*m]",
                                 "deflection [um]"), strict=True):
            a.set_ylabel(lab, fontsize=8)
            a.axhline(0.0, color=STEEL, linewidth=0.6)
            a.grid(True, color="#eef0f2", linewidth=0.5)
            a.tick_params(labelsize=7)
            a.legend(fontsize=7, loc="best", frameon=False)
        a_v.set_title(f"case {cs.case}: n = {cs.speed_rpm:g} rpm, "
                      f"|T|max = {cs.torque_Nmm / 1e3:.4g} N*m", fontsize=9, loc="left")
    a_d.set_xlabel("x along the shaft [mm]")
    if fig is not None:
        return fig
    return axes[0] if single else axes


@overload
def load_life_chart(bearing_result: BearingResult, ax: None = None) -> Figure: ...
@overload
def load_life_chart(bearing_result: BearingResult, ax: Axes) -> Axes: ...
def load_life_chart(bearing_result: BearingResult, ax: Axes | None = None) -> Figure | Axes:
    """Log-log chart of equivalent load P [N] against basic life L [10^6 rev].

    Shows the rating line L = (C/P)^p (ISO 281:2007, 6.2 / 7.2) through (1, C); one
    point per dynamic case at (L10_i, P_design_i), each case with its own marker
    named in the legend (one common marker above ten cases); the spectrum point (L10, Pm)
    (Palmgren-Miner mean load, ISO 281:2007 / Shigley ch. 11); the modified spectrum
    life Lnm at Pm when it differs; and the target life as a vertical line at
    target_h*60*n_m/10^6 [10^6 rev] (n_m = the engine's mean speed). The legend
    sits to the right of the axes.

    Parameters
    ----------
    bearing_result:
        A support with its life verdict (``life`` must not be None).
    ax:
        Axes to draw into, or ``None`` for a new Figure.

    Returns
    -------
    The new Figure or the given Axes.
    """
    life = bearing_result.life
    if life is None:
        raise ValueError(f"bearing '{bearing_result.bearing.id}' has no life result")
    fig = None
    own = ax is None
    if ax is None:
        fig, (ax,) = _new_figure(_DRAWING_WIDTH_IN, 4.2)
    C = bearing_result.bearing.C_N
    p = bearing_result.bearing.kind.life_exponent
    dyn = np.asarray(life.dynamic, dtype=bool)
    L_case = np.asarray(life.case_L10_mrev)[dyn]
    P_case = np.asarray(life.P_design_N)[dyn]
    ids = [c for c, d in zip(life.case_ids, dyn, strict=True) if d]
    target_mrev = life.target_h * 60.0 * life.n_m_rpm / MEGA_REVOLUTIONS
    lives = [1.0, *L_case.tolist()]
    if math.isfinite(life.L10_mrev):
        lives.append(life.L10_mrev)
    if math.isfinite(life.Lnm_mrev):
        lives.append(life.Lnm_mrev)
    if target_mrev > 0:
        lives.append(target_mrev)
    lo = 10 ** math.floor(math.log10(min(v for v in lives if v > 0)) - 0.5)
    hi = 10 ** math.ceil(math.log10(max(lives)) + 0.5)
    L_line = np.geomspace(lo, hi, 60)
    ax.loglog(L_line, C / L_line ** (1.0 / p), color=INK, linewidth=1.4,
              label=f"rating line L = (C/P)^{p:.3g}, C = {_short(C)} N")
    ax.plot([1.0], [C], marker="o", markersize=6, markerfacecolor="white",
            markeredgecolor=INK, linestyle="none")
    ax.annotate("(1, C)", (1.0, C), xytext=(5, 4), textcoords="offset points", fontsize=7)
    if 0 < L_case.size <= len(_CASE_MARKERS):
        # one marker shape per case, named in the legend: labels next to the points
        # overlap as soon as two cases have similar lives
        for L, P, cid, mk in zip(L_case, P_case, ids, _CASE_MARKERS, strict=False):
            ax.plot([L], [P], marker=mk, markersize=5.5, color=COOL, linestyle="none",
                    label=f"case {cid}: P = {_short(P)} N")
    elif L_case.size:
        ax.plot(L_case, P_case, marker="s", markersize=4, color=COOL, linestyle="none",
                label=f"{L_case.size} dynamic cases (L10_i, P_i)")
    if math.isfinite(life.L10_mrev) and life.P_eq_N > 0:
        ax.plot([life.L10_mrev], [life.P_eq_N], marker="*", markersize=11, color=ACCENT,
                linestyle="none", label=f"spectrum: Pm = {_short(life.P_eq_N)} N at L10")
        if math.isfinite(life.Lnm_mrev) and not math.isclose(life.Lnm_mrev, life.L10_mrev):
            ax.plot([life.Lnm_mrev], [life.P_eq_N], marker="*", markersize=11,
                    markerfacecolor="white", markeredgecolor=ACCENT, linestyle="none",
                    label="spectrum: Lnm at Pm")
    if target_mrev > 0:
        ax.axvline(target_mrev, color=WARM, linestyle="--", linewidth=1.2,
                   label=f"target {_short(life.target_h)} h = {_short(target_mrev)} "
                   "x 10^6 rev")
    ax.set_xlim(lo, hi)
    ax.set_xlabel("life L [10^6 rev]")
    ax.set_ylabel("equivalent dynamic load P [N]")
    ax.set_title(f"bearing {bearing_result.bearing.id} "
                 f"({bearing_result.bearing.kind.value.replace('_', ' ')})",
                 fontsize=9, loc="left")
    ax.grid(True, which="both", color="#eef0f2", linewidth=0.5)
    # legend beside the axes: it can never hide a point or the rating line
    ax.legend(fontsize=7, loc="upper left", bbox_to_anchor=(1.02, 1.0), frameon=False,
              borderaxespad=0.0)
    return fig if own and fig is not None else ax


#: Marker shapes of the duty cases in the load-life chart, in case order.
_CASE_MARKERS = ("s", "o", "^", "v", "D", "P", "X", "h", "<", ">")


def _short(value: float) -> str:
    """A number for a legend: 4 significant digits, no exponent below 1e9."""
    v = float(value)
    if not math.isfinite(v):
        return str(v)
    if v != 0.0 and not 1e-3 <= abs(v) < 1e9:
        return f"{v:.3e}"
    return f"{v:.4g}" if abs(v) < 1e4 else f"{v:.0f}"


def to_svg(fig: Figure, salt: str | None = None) -> str:
    """Inline SVG text of ``fig`` (no XML prolog); the figure is closed afterwards.

    Text stays text (``svg.fonttype = none``) and every figure gets its own id salt so
    that several SVGs can share one HTML page without clashing clip-path ids. ``salt``
    ``None`` takes the next number of a process-wide counter; give distinct salts of
    your own (e.g. ``"fig-3"``) for output that is the same on every call.
    """
    import matplotlib

    buf = io.StringIO()
    salt = f"shaftsys-fig-{next(_SVG_COUNTER)}" if salt is None else str(salt)
    with matplotlib.rc_context({"svg.fonttype": "none", "svg.hashsalt": salt}):
        fig.savefig(buf, format="svg", bbox_inches="tight", pad_inches=0.1)
    pyplot = sys.modules.get("matplotlib.pyplot")
    if pyplot is not None:
        pyplot.close(fig)
    text = _METADATA.sub("", buf.getvalue())
    start = text.find("<svg")
    if start < 0:
        raise ValueError("matplotlib produced no <svg> element")
    return text[start:]


def deflection_lines(shaft_result: ShaftResult, limits: Sequence[Any] = ()) -> Figure:
    """Deflection and slope lines of one shaft in both planes, every case.

    Four panels over x [mm]: deflection v = uy and w = uz [mm], slope dv/dx = rz and
    dw/dx = -ry [rad], one line per case (from the solved nodal displacements). Each of
    ``limits`` (the shaft's :class:`shaftsys.analysis.check_results.DeflectionCheck`
    objects: bearings and gears) is drawn at its station as a bar from -limit to
    +limit: the slope limit in the slope panels, the deflection limit (gears) in the
    deflection panels, with its id. Nothing is solved here.
    """
    fig, axes = _new_figure(8.0, 7.2, nrows=4)
    comps = ((1, 1.0, "v = uy [mm]"), (2, 1.0, "w = uz [mm]"),
             (5, 1.0, "dv/dx [rad]"), (4, -1.0, "dw/dx [rad]"))
    colours = ("#1b4965", WARM, COOL, "#e07a1f", "#3a7d44", MUTED)
    for ax, (col, sign, label) in zip(axes, comps, strict=True):
        for k, cs in enumerate(shaft_result.cases):
            ax.plot(cs.node_x_mm, sign * cs.displacement[:, col], lw=1.2,
                    color=colours[k % len(colours)], label=cs.case)
        ax.axhline(0.0, color=MUTED, lw=0.6)
        ax.set_ylabel(label)
        ax.grid(True, lw=0.3, alpha=0.5)
        slope_panel = col in (4, 5)
        for c in limits:
            lim = c.slope_limit_rad if slope_panel else c.deflection_limit_mm
            if lim is None or not math.isfinite(lim):
                continue
            ax.errorbar([c.x_mm], [0.0], yerr=[[lim], [lim]], fmt="none",
                        ecolor="#c1121f", elinewidth=1.4, capsize=4)
            ax.annotate(f"{c.id} ±{_short(lim)}", (c.x_mm, lim), fontsize=7,
                        color="#c1121f", xytext=(3, 2), textcoords="offset points")
    axes[0].legend(fontsize=7, loc="best", title="case", title_fontsize=7)
    axes[-1].set_xlabel(f"x [mm] along shaft {shaft_result.shaft.id}")
    axes[0].set_title(f"Shaft {shaft_result.shaft.id}: deflection and slope in the x-y "
                      "and x-z planes; red bars = limits at bearings and gears", fontsize=9)
    return fig


def mode_shapes(shaft_id: str, modes: Any) -> Figure:
    """The bending mode shapes of one shaft (an ``analysis.modes.ShaftModes``): one line
    per mode over x [mm], largest deflection scaled to 1, labelled with its critical
    speed [rpm]. Nothing is solved here.
    """
    fig, (ax,) = _new_figure(8.0, 3.0)
    colours = (ACCENT, COOL, WARM)
    for k, rpm in enumerate(modes.bending_rpm):
        ax.plot(modes.node_x_mm, modes.bending_shapes[k], lw=1.4,
                color=colours[k % len(colours)], label=f"mode {k + 1}: {rpm:,.0f} rpm")
    ax.axhline(0.0, color=MUTED, lw=0.6)
    ax.set_xlabel(f"x [mm] along shaft {shaft_id}")
    ax.set_ylabel("deflection (scaled)")
    ax.grid(True, lw=0.3, alpha=0.5)
    ax.legend(fontsize=7, loc="best")
    ax.set_title(f"Shaft {shaft_id}: bending mode shapes of the non-rotating shaft",
                 fontsize=9)
    return fig
