"""One self-contained HTML report of a solved model (inline CSS and SVG, no scripts).

The page holds: provenance (model file, its SHA-256, tool version, date); the inputs
that decide the verdicts; a machine summary; per shaft a to-scale drawing; per case
the applied loads and the internal-force diagrams; the support verdicts with a
"reserve gauge" per support; per bearing the load-life chart and calculation sheet;
warnings; assumptions and cautions. Every piece of user text passes through
``html.escape``. No network resource is referenced, so the file can be archived with
the model and opened offline; ``@media print`` lays it out for A4.

Units as everywhere in shaftsys (N, mm, N*mm, rpm, h, mm^2/s, degC), stated in each
column head.
"""

from __future__ import annotations

import datetime as _dt
import html
import math
import os
import re
from collections.abc import Callable, Collection, Iterable, Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

from shaftsys import __version__
from shaftsys.analysis.life import worst_case
from shaftsys.analysis.results import BearingResult, Result
from shaftsys.model import Case, CaseKind
from shaftsys.report import figures
from shaftsys.report.calcsheet import explain_bearing_html, format_value

if TYPE_CHECKING:
    import pandas as pd

    from shaftsys.study.sweep import Study

__all__ = ["SECTION_TITLES", "render_report", "report_steps"]

#: Section headings of the report, in order (tests and readers look for them).
SECTION_TITLES = (
    "Provenance",
    "Inputs that decide the verdicts",
    "Machine summary",
    "Shafts to scale",
    "Operating cases",
    "Support verdicts",
    "Bearing details",
    "Warnings",
    "Assumptions and cautions",
)

#: Title of the section shown only when the model had open supports (bearings chosen).
SELECTION_TITLE = "Bearing choice"

#: Range of the reserve gauge: log10(Lnm/target) from -1 to +2 (0.1x to 100x target).
_GAUGE_LOG_MIN = -1.0
_GAUGE_LOG_MAX = 2.0

_CSS = """
:root { --ink:#1d2630; --muted:#5b6b7a; --line:#cfd6dd; --paper:#fbfaf7; --ok:#2f7d5b;
        --bad:#b23a1e; --accent:#c2571a; --band:#eef1f4; }
* { box-sizing: border-box; }
body { margin: 0; background: var(--paper); color: var(--ink);
       font: 14px/1.45 "Segoe UI", "Helvetica Neue", Arial, sans-serif; }
main { max-width: 1040px; margin: 0 auto; padding: 24px 28px 60px; }
header.top { border-left: 8px solid var(--accent); padding: 6px 0 6px 16px; margin-bottom: 18px; }
header.top h1 { margin: 0; font-size: 24px; letter-spacing: .01em; }
header.top .sub { color: var(--muted); font-size: 13px; }
.stamp { display: inline-block; padding: 2px 10px; border-radius: 3px; font-weight: 700;
         letter-spacing: .08em; color: #fff; }
.stamp.ok { background: var(--ok); } .stamp.bad { background: var(--bad); }
section { margin-top: 28px; }
h2 { font-size: 17px; border-bottom: 2px solid var(--ink); padding-bottom: 3px;
     margin: 0 0 10px; text-transform: uppercase; letter-spacing: .06em; }
h3 { font-size: 15px; margin: 18px 0 6px; }
dl.kv { display: grid; grid-template-columns: max-content 1fr; gap: 2px 16px; margin: 0; }
dl.kv dt { color: var(--muted); } dl.kv dd { margin: 0; font-family: ui-monospace, Consolas,
     monospace; word-break: break-all; }
table { border-collapse: collapse; width: 100%; margin: 6px 0 10px; font-size: 12.5px; }
th, td { padding: 3px 7px; border-bottom: 1px solid var(--line); text-align: right;
         vertical-align: top; }
th { background: var(--band); font-weight: 600; white-space: nowrap; }
th:first-child, td:first-child, td.t, th.t { text-align: left; }
td.num { font-variant-numeric: tabular-nums; white-space: nowrap; }
figure { margin: 8px 0 14px; break-inside: avoid; page-break-inside: avoid; }
figure .fig { border: 1px solid var(--line); background: #fff; }
figure svg { width: 100%; height: auto; display: block; }
figcaption { color: var(--muted); font-size: 12px; }
.gauge { position: relative; height: 14px; min-width: 180px; background:
         linear-gradient(90deg, #f3dcd3 0 33.33%, #e3efe7 33.33% 100%); border-radius: 2px; }
.gauge .fill { position: absolute; left: 0; top: 3px; height: 8px; }
.gauge .fill.ok { background: var(--ok); } .gauge .fill.bad { background: var(--bad); }
.gauge .tgt { position: absolute; left: 33.33%; top: -2px; width: 2px; height: 18px;
              background: var(--ink); }
.verdict { font-weight: 700; letter-spacing: .06em; }
.verdict.ok { color: var(--ok); } .verdict.bad { color: var(--bad); }
pre.calcsheet { background: #fff; border: 1px solid var(--line); padding: 10px 12px;
                font: 11.5px/1.4 ui-monospace, Consolas, "DejaVu Sans Mono", monospace;
                white-space: pre-wrap; overflow-wrap: anywhere; }
.bearing { border-top: 1px dashed var(--line); padding-top: 6px; }
h2 + .bearing { border-top: none; padding-top: 0; }
ul.warn li { margin: 2px 0; }
.note { color: var(--muted); font-size: 12.5px; }
@page { size: A4; margin: 14mm 12mm; }
@media print {
  body { background: #fff; font-size: 10.5pt; }
  main { max-width: none; padding: 0; }
  section { break-before: auto; }
  h2, h3 { break-after: avoid; page-break-after: avoid; }
  table, figure, pre.calcsheet { break-inside: avoid; }
  .bearing { break-before: page; }
  .gauge, .stamp, th { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
}
"""

_CAUTIONS = (
    "Adjusted pairs of angular-contact or tapered bearings are computed with zero "
    "operating clearance and no preload; real clearance or preload changes the load "
    "sharing and the lives.",
    "Defaults without a published source (for example the required static safety "
    "s0_min per bearing type, the induced-force factor of tapered bearings, minimum-load "
    "warnings) are common practice; they are named as such where used.",
    "Gyroscopic effects, shaft whirl and dynamic amplification are not modelled; "
    "loads are quasi-static per case.",
    "Bearing ratings and factors (C, C0, Cu, e, X, Y, Y0) come from the bearing "
    "maker's current data for the bearing actually bought; values estimated here "
    "(Cu, f0) are flagged as estimates.",
    "Bearing friction and operating temperatures from the heat balance are estimates "
    "(Palmgren's friction model, one lumped housing temperature): they do not replace a "
    "measured temperature or the bearing supplier's friction data.",
    "These results support but do not replace engineering judgement. The maker's "
    "recommendations, local codes and standards, and licensed engineering practice "
    "govern; check every result that matters against an independent calculation.",
)


def _e(text: object) -> str:
    return html.escape(str(text), quote=True)


def _n(value: float | None, digits: int = 4) -> str:
    return _e(format_value(value, digits))


def _table(headers: Sequence[str], rows: Iterable[Sequence[str]],
           text_cols: int | Collection[int] = 1) -> str:
    """An HTML table; ``headers`` are escaped, cells must already be HTML.

    ``text_cols``: the first that many columns, or the given column indices, hold text
    (left-aligned); the others hold numbers (right-aligned, tabular figures).
    """
    text = set(range(text_cols)) if isinstance(text_cols, int) else set(text_cols)
    head = "".join(f'<th{" class=t" if i in text else ""}>{_e(h)}</th>'
                   for i, h in enumerate(headers))
    body = "".join(
        "<tr>" + "".join(f'<td class="{"t" if i in text else "num"}">{c}</td>'
                         for i, c in enumerate(r)) + "</tr>"
        for r in rows)
    return f"<table><thead><tr>{head}</tr></thead><tbody>{body}</tbody></table>"


#: Figure width [pt] that fills the text column; narrower figures keep their share, so
#: that text in every figure prints at one size.
_FULL_FIGURE_PT = 648.0
_SVG_WIDTH = re.compile(r'<svg[^>]*?\swidth="([0-9.]+)pt"')


def _figure(fig: object, caption: str, ctx: _Render) -> str:
    svg = figures.to_svg(fig, salt=ctx.next_salt())  # type: ignore[arg-type]
    m = _SVG_WIDTH.match(svg)
    share = 100.0 if m is None else min(100.0, 100.0 * float(m.group(1)) / _FULL_FIGURE_PT)
    return (f'<figure><div class="fig" style="width:{share:.1f}%">{svg}</div>'
            f"<figcaption>{_e(caption)}</figcaption></figure>")


#: Entries of a table smaller than this fraction of the table's largest magnitude are
#: round-off of the solve and are shown as 0.
_ROUND_OFF = 1e-9


def _snap(value: float, scale: float) -> float:
    """``value``, or 0.0 when it is round-off next to ``scale`` (same unit)."""
    return 0.0 if abs(value) <= _ROUND_OFF * scale else value


def _gauge(ratio: float, ok: bool) -> str:
    """A bar whose length is log10(ratio) on [-1, 2]; the dark tick is the target."""
    if not math.isfinite(ratio) or ratio <= 0:
        frac = 1.0 if (math.isinf(ratio) and ratio > 0) else 0.0
    else:
        lg = math.log10(ratio)
        frac = (min(max(lg, _GAUGE_LOG_MIN), _GAUGE_LOG_MAX) - _GAUGE_LOG_MIN) / (
            _GAUGE_LOG_MAX - _GAUGE_LOG_MIN)
    cls = "ok" if ok else "bad"
    return (f'<div class="gauge" title="Lnm/target = {_n(ratio)}">'
            f'<div class="fill {cls}" style="width:{100 * frac:.1f}%"></div>'
            f'<div class="tgt"></div></div>')


def _verdict(ok: bool) -> str:
    return f'<span class="verdict {"ok" if ok else "bad"}">{"PASS" if ok else "FAIL"}</span>'


def _provenance(result: Result, date: str) -> str:
    m = result.model
    fname = os.path.basename(m.source) if m.source else "(built in Python, no file)"
    items = [("model", m.name), ("model file", fname),
             ("model file SHA-256", m.sha256 or "(none)"),
             ("shaftsys version", __version__), ("report date", date)]
    dl = "".join(f"<dt>{_e(k)}</dt><dd>{_e(v)}</dd>" for k, v in items)
    return (f'<section id="provenance"><h2>{SECTION_TITLES[0]}</h2>'
            f'<dl class="kv">{dl}</dl></section>')


def _inputs(result: Result) -> str:
    m = result.model
    life = m.life
    basis = sorted({b.life.life_basis for b in result.bearings if b.life is not None})
    settings = [
        ("default target life [h]", format_value(life.target_life_h)),
        ("target reliability [-]", format_value(life.target_reliability)),
        ("reliability method", life.reliability_method),
        ("application factor af [-]", format_value(life.application_factor)),
        ("minimum speed for fatigue [rpm]", format_value(life.min_speed_rpm)),
        ("required s0 (model-wide)", format_value(life.s0_min) if life.s0_min is not None
         else "per type, common practice"),
        ("use modified life", "yes" if life.use_modified_life else "no"),
        ("life basis of the verdicts", ", ".join(basis) or "-"),
    ]
    ck = m.checks
    overrides = [f"{bid}: " + ", ".join(f"{k} {v}" for k, v in (
        ("slope", o.slope_rad), ("speed", o.speed), ("min load", o.min_load))
        if v is not None) for bid, o in ck.bearings.items()]
    overrides += [f"{gid}: " + ", ".join(f"{k} {v}" for k, v in (
        ("slope", g.slope_rad), ("deflection mm", g.deflection_mm),
        ("deflection / module", g.deflection_per_module)) if v is not None)
        for gid, g in ck.gears.items()]
    targets = [f"machine {format_value(ck.system_life_target_h)} h"] \
        if ck.system_life_target_h is not None else []
    if ck.shaft_system_life_target_h is not None:
        targets.append(f"every shaft {format_value(ck.shaft_system_life_target_h)} h")
    targets += [f"shaft {sid} {format_value(v)} h" for sid, v in ck.shaft_targets_h.items()]
    settings += [
        ("limiting-speed check", ck.speed),
        ("minimum-load check (0.01 C ball, 0.02 C roller)", ck.min_load),
        ("fatigue criterion", ck.fatigue_criterion),
        ("required fatigue / yield safety [-]",
         f"{format_value(ck.fatigue_safety)} / {format_value(ck.yield_safety)}"),
        ("bearing slope limits by type [rad]", ", ".join(
            f"{k} {format_value(v)}" for k, v in ck.bearing_slope_by_type.items())
         or "typical range of each type"),
        ("gear limits", "; ".join(x for x in (
            f"slope {format_value(ck.gear_slope_rad)} rad"
            if ck.gear_slope_rad is not None else "",
            f"deflection {format_value(ck.gear_deflection_mm)} mm"
            if ck.gear_deflection_mm is not None else "",
            f"deflection {format_value(ck.gear_deflection_per_module)} x module"
            if ck.gear_deflection_per_module is not None else "") if x)
         or "default (Shigley Table 7-2)"),
        ("system-life targets", ", ".join(targets) or "none (system life is information)"),
        ("system life stated at", "90 %" if ck.system_reliability == "90_percent"
         else "the target reliability"),
        ("Weibull slopes of the system life (ball / roller)",
         f"{format_value(ck.weibull_slope_ball, 4)} / {format_value(ck.weibull_slope_roller, 4)}"),
        ("per-item check settings", "; ".join(overrides) or "none"),
    ]
    lub = m.lubrication
    if lub is None:
        settings.append(("lubrication", "not given (verdict on a1*L10)"))
    else:
        settings += [
            ("lubricant viscosity [mm^2/s]",
             f"{format_value(lub.nu1_at_t1_mm2_s)} at {format_value(lub.t1_C)} degC, "
             f"{format_value(lub.nu2_at_t2_mm2_s)} at {format_value(lub.t2_C)} degC"),
            ("lubrication method", lub.method),
            ("contamination ec", format_value(lub.ec) if lub.ec is not None
             else f"from cleanliness {lub.cleanliness or '-'}"),
            ("EP additives", "yes" if lub.ep_additives else "no"),
        ]
    dl = "".join(f"<dt>{_e(k)}</dt><dd>{_e(v)}</dd>" for k, v in settings)
    rows = []
    for b in result.bearings:
        br = b.bearing
        cu = ("-" if b.life is None or b.life.Cu_N is None else
              format_value(b.life.Cu_N, 4) + (" (estimate)" if b.life.Cu_estimated else ""))
        factors = ", ".join(f"{k}={format_value(getattr(br, k))}"
                            for k in ("e", "X", "Y", "Y1", "Y2", "Y0", "contact_angle_deg",
                                      "f0") if getattr(br, k) is not None) or "standard"
        target = b.life.target_h if b.life is not None else br.target_life_h
        rows.append([_e(br.id), _e(b.shaft_id), _e(br.kind.value.replace("_", " ")),
                     _e(br.axial.value + (f", pair {br.pair}" if br.pair else "")),
                     _n(br.x_mm), _n(br.d_mm), _n(br.D_mm), _n(br.C_N, 6), _n(br.C0_N, 6),
                     _e(cu), _e(factors), _n(target, 6),
                     _n(b.life.reliability if b.life is not None else None),
                     _n(b.life.s0_min if b.life is not None else br.s0_min)])
    table = _table(["bearing", "shaft", "type", "axial", "x mm", "d mm", "D mm", "C N",
                    "C0 N", "Cu N", "factors", "target h", "R", "s0 min"], rows,
                   (0, 1, 2, 3, 10))
    return (f'<section id="inputs"><h2>{SECTION_TITLES[1]}</h2><dl class="kv">{dl}</dl>'
            f"<h3>Bearing ratings and targets (maker's data as entered)</h3>{table}</section>")


def _case_drive_text(result: Result, case: Case) -> str:
    """Speed [rpm] of every shaft in ``case`` and where power enters (torque in N*m).

    Speeds come from the solution: machine models derive those of linked shafts.
    """
    parts = []
    for s in result.shafts:
        text = f"{s.shaft.id}: {format_value(s.case(case.id).speed_rpm)} rpm"
        d = case.drives.get(s.shaft.id)
        if d is not None and d.input_element:
            text += (f", in at {d.input_element} T = "
                     f"{format_value(d.input_torque_Nmm / 1e3, 5)} N*m")
        parts.append(text)
    return "; ".join(parts) or "-"


def _summary(result: Result) -> str:
    m = result.model
    srows = []
    for s in result.shafts:
        sh = s.shaft
        srows.append([_e(sh.id), _n(sh.length_mm, 6), _e(sh.material.name),
                      _e(len(sh.steps)), _e(", ".join(b.id for b in sh.bearings)),
                      _e(", ".join(e.id for e in sh.elements)), _n(s.system_life_h, 5),
                      _e(s.limiting_bearing or "-")])
    shares = m.shares()
    crows = []
    for c in m.cases:
        crows.append([_e(c.id), _e(c.kind.value), _n(shares[c.id]), _n(c.duration),
                      _n(c.temperature_C), _e(_case_drive_text(result, c))])
    unit = "h" if m.duration_in_hours else "share"
    sys_line = (f"System life of the machine: {format_value(result.system_life_h, 3)} h at "
                f"the target reliability, limited by {result.limiting_bearing or '-'}.")
    judged = [(label, sl) for label, sl in result.system_lives() if sl.verdict is not None]
    if judged:
        sys_line += " System-life targets set in the model (checks.system_life): " + "; ".join(
            f"{label} {format_value(sl.life_h, 3)} h at reliability {sl.reliability:g} "
            f"against {format_value(sl.target_h, 3)} h: {sl.verdict.upper()}"
            for label, sl in judged if sl.verdict is not None) + "."
    elif result.system_life_h is not None and result.system_life_h < m.life.target_life_h:
        sys_line += (f" It is below the {format_value(m.life.target_life_h, 3)} h target: "
                     "information, not a criterion of the verdict, which checks each "
                     "support's own life against its own target (a system-life target "
                     "in checks.system_life makes it one).")
    return (f'<section id="summary"><h2>{SECTION_TITLES[2]}</h2>'
            + _table(["shaft", "length mm", "material", "steps", "bearings", "elements",
                      "system life h", "limiting"], srows, (0, 2, 4, 5, 7))
            + _table(["case", "kind", "time share", f"duration ({unit})", "T degC",
                      "speed and input per shaft"], crows, (0, 1, 5))
            + f'<p class="note">{_e(sys_line)}</p></section>')


@dataclass
class _Render:
    """State of one rendering: the progress callback and the figure id counter.

    Each report numbers its figures from 1, so the same result and date give the same
    bytes on every call (the SVG clip-path ids derive from the salt).
    """

    step: Callable[[str], None]
    figures_done: int = 0

    def next_salt(self) -> str:
        self.figures_done += 1
        return f"shaftsys-fig-{self.figures_done}"


def _no_step(label: str) -> None:
    """Progress callback that does nothing."""


def _shafts(result: Result, ctx: _Render) -> str:
    parts = [f'<section id="shafts"><h2>{SECTION_TITLES[3]}</h2>']
    for s in result.shafts:
        parts.append(f"<h3>Shaft {_e(s.shaft.id)}</h3>")
        parts.append(_figure(figures.shaft_drawing(s),
                             f"Shaft {s.shaft.id}: steps, bearings (boxes, support point "
                             "triangle) and elements (diamonds), to scale, mm.", ctx))
        ctx.step(f"shaft {s.shaft.id}")
    parts.append("</section>")
    return "".join(parts)


def _cases(result: Result, ctx: _Render) -> str:
    parts = [f'<section id="cases"><h2>{SECTION_TITLES[4]}</h2>']
    for case in result.model.cases:
        parts.append(f'<h3 id="case-{_e(case.id)}">Case {_e(case.id)} '
                     f'<span class="note">({_e(case.kind.value)})</span></h3>')
        for s in result.shafts:
            cs = s.case(case.id)
            f_scale = max((abs(v) for a in cs.applied for v in a.force_N), default=0.0)
            m_scale = max((abs(v) for a in cs.applied for v in a.moment_Nmm), default=0.0)
            rows = [[_e(a.source), _n(a.x_mm, 6),
                     *(_n(_snap(v, f_scale), 5) for v in a.force_N),
                     *(_n(_snap(v, m_scale) / 1e3, 5) for v in a.moment_Nmm)]
                    for a in cs.applied]
            parts.append(f"<p class=note>Shaft {_e(s.shaft.id)}: loads applied to the shaft "
                         "axis (shaft frame; bearing reactions and shaft weight not listed)."
                         "</p>")
            parts.append(_table(["source", "x mm", "Fx N", "Fy N", "Fz N", "Mx N*m",
                                 "My N*m", "Mz N*m"], rows))
            parts.append(_figure(figures.diagrams(cs),
                                 f"Shaft {s.shaft.id}, case {case.id}: shear, bending "
                                 "moment, torque and radial deflection.", ctx))
            if cs.warnings:
                parts.append("<ul class=warn>" + "".join(f"<li>{_e(w)}</li>"
                                                         for w in cs.warnings) + "</ul>")
            ctx.step(f"case {case.id}, shaft {s.shaft.id}")
    parts.append("</section>")
    return "".join(parts)


def _selection(result: Result) -> str:
    """The bearing choice at every open support (only when the model had some)."""
    sel = result.selection
    if sel is None:
        return ""
    rows = []
    for seat in sel.seats:
        where = f"{_e(seat.shaft_id)}/{_e(seat.bearing_id)}"
        if seat.candidate is None:
            rows.append([where, '<span class="stamp bad">none qualifies</span>',
                         *["-"] * 9])
            continue
        for rank, c in enumerate((seat.candidate, *seat.runners_up)):
            rows.append([where if rank == 0 else f"runner-up {rank}",
                         ("<b>" + _e(c.designation) + "</b>") if rank == 0 else
                         _e(c.designation), _e(c.kind.replace("_", " ")),
                         _n(c.d_mm, 4) + " x " + _n(c.D_mm, 4) + " x " + _n(c.B_mm, 3),
                         _n(c.C_N, 4), _n(c.C0_N, 4), _n(c.life_h, 4), _n(c.margin, 3),
                         _n(c.s0, 3), _n(c.mass_kg, 3), _n(c.price, 4)])
    table = _table(["support", "bearing", "type", "d x D x B mm", "C N", "C0 N", "life h",
                    "C/C req", "s0", "mass kg", f"price {sel.price_unit}".strip()],
                   rows, 4)
    notes = [f"{s.bearing_id}: {s.reason_if_none}" for s in sel.seats if s.reason_if_none]
    notes += [f"{s.bearing_id}: {n}" for s in sel.seats for n in s.notes]
    state = ("settled" if sel.settled else "cycles between choices" if sel.cycle
             else "not settled")
    text = (f"Objective: {sel.objective.replace('_', ' ')}. Every catalogue row that fits "
            "the seat and envelope and suits the support's axial role was evaluated over "
            "the whole duty cycle (life at the target reliability, static safety, "
            "limiting speed in every running case, minimum load); the chosen bearings "
            f"were put in and the shafts solved again: {sel.passes} pass(es), {state}. "
            "Ratings are the user's catalogue data; confirm them with the bearing maker.")
    extra = "".join(f"<li>{_e(n)}</li>" for n in notes)
    return (f'<section id="selection"><h2>{SELECTION_TITLE}</h2><p class="note">'
            f'{_e(text)}</p>{table}{"<ul>" + extra + "</ul>" if extra else ""}</section>')


def _verdicts(result: Result) -> str:
    rows = []
    for b in result.bearings:
        life = b.life
        if life is None:
            continue
        ratio = life.Lnm_h / life.target_h if life.target_h > 0 else math.inf
        rows.append([
            f'<a href="#bearing-{_e(b.bearing.id)}">{_e(b.shaft_id)}/{_e(b.bearing.id)}</a>',
            _e(worst_case(b) or "-"), _n(life.P_eq_N, 5), _n(life.Lnm_h, 5),
            _n(life.target_h, 6), _n(life.C_required_N, 5), _n(life.margin, 3),
            _n(life.s0, 3) + " / " + _n(life.s0_min, 3),
            _gauge(ratio, life.life_ok), _verdict(b.ok)])
    for b in result.bearings:
        if b.life is None:
            rows.append([f"{_e(b.shaft_id)}/{_e(b.bearing.id)}", *["-"] * 8,
                         '<span class="stamp bad">NOT EVALUATED</span>'])
    table = _table(["support", "worst case", "Pm N", "Lnm h", "target h", "C req N",
                    "C/C req", "s0 / min", "life reserve", "verdict"], rows, 2)
    table += _operating_table(result) + _system_life_table(result)
    legend = ("Life reserve gauge: bar length is log10(Lnm/target) from 0.1x (left edge) "
              "to 100x (right edge); the dark tick is the target (1x). Pink zone = short "
              "of the target.")
    stamp_ok = result.ok
    failed = result.failed_checks
    # the headline follows the rows: "missed" only when a check failed, "not evaluated"
    # when nothing failed but something required could not be evaluated
    stamp_text = ("ALL CHECKS PASS" if stamp_ok else "LIMIT OR TARGET MISSED" if failed
                  else "NOT EVALUATED (NOT A PASS)")
    head = (f'<p><span class="stamp {"ok" if stamp_ok else "bad"}">{stamp_text}</span></p>')
    if failed:
        head += ('<p class="note">Failed checks:</p><ul>'
                 + "".join(f"<li>{_e(f)}</li>" for f in failed) + "</ul>")
    missing = "".join(f"<li>{_e(m)}</li>" for m in result.not_evaluated)
    if missing:
        head += f'<p class="note">Not evaluated (not a pass):</p><ul>{missing}</ul>'
    if result.advisory_failed:
        head += ('<p class="note">Advisory checks that fail (shown, not deciding the '
                 f'verdict): {_e("; ".join(result.advisory_failed))}</p>')
    if result.checks is not None and result.checks.marginal:
        head += ('<p class="note">Marginal (within the limit, in its caution band): '
                 f'{_e("; ".join(result.checks.marginal))}</p>')
    return (f'<section id="verdicts"><h2>{SECTION_TITLES[5]}</h2>{head}{table}'
            f'<p class="note">{_e(legend)}</p></section>')


def _operating_table(result: Result) -> str:
    """Limiting speed and minimum load of every bearing with their numbers."""
    rows = []
    for b in result.bearings:
        for c in b.operating:
            word = c.verdict if c.reason is not None or c.mode == "required" \
                else f"{c.verdict} (advisory)"
            rows.append([_e(f"{b.shaft_id}/{b.bearing.id}"), _e(c.check.replace("_", " ")),
                         _e(c.case or "-"),
                         _n(c.value, 5) + f" {c.unit}" if c.value is not None else "-",
                         _n(c.limit, 5) + f" {c.unit}" if c.limit is not None else "-",
                         _n(c.ratio, 3), _e(c.reason or c.mode),
                         _status_word(word) if c.counts or c.verdict != "not evaluated"
                         else _e(word)])
    if not rows:
        return ""
    return ('<h3 id="operating-limits">Limiting speed and minimum load</h3>'
            + _table(["support", "check", "case", "value", "limit", "ratio", "mode",
                      "verdict"], rows, (0, 1, 2, 6))
            + '<p class="note">Speed: the largest running |n| against the limiting speed '
            "given for the bearing (passes at ratio &lt;= 1). Minimum load: the smallest "
            "running equivalent load P against 0.01 C (ball) or 0.02 C (roller) (passes "
            "at ratio &gt;= 1; common practice - the bearing maker's minimum load "
            "governs). Advisory checks are shown but do not decide the verdict.</p>")


def _system_life_table(result: Result) -> str:
    """The system lives that have a target, with their verdicts."""
    rows = [[_e(label), _n(sl.reliability, 4), _n(sl.life_h, 5), _n(sl.target_h, 5),
             _e(sl.limiting_bearing or "-"), _status_word(sl.verdict)]
            for label, sl in result.system_lives() if sl.verdict is not None]
    if not rows:
        return ""
    return ('<h3 id="system-life-targets">System life targets</h3>'
            + _table(["system", "reliability", "system life h", "target h", "limiting",
                      "verdict"], rows, (0, 4)))


def _bearing_loads_table(b: BearingResult) -> str:
    scale = max((max(abs(ld.Fr_N), abs(ld.Fa_N)) for ld in b.loads), default=0.0)
    rows = [[_e(ld.case), _n(ld.speed_rpm, 5),
             *(_n(_snap(v, scale), 5) for v in (ld.Fy_N, ld.Fz_N, ld.Fx_N, ld.Fr_N,
                                                  ld.Fa_N))] for ld in b.loads]
    return _table(["case", "n rpm", "Fy N", "Fz N", "Fx N", "Fr N", "Fa N"], rows)


def _bearings(result: Result, ctx: _Render) -> str:
    parts = [f'<section id="bearings"><h2>{SECTION_TITLES[6]}</h2>']
    for b in result.bearings:
        parts.append(f'<div class="bearing" id="bearing-{_e(b.bearing.id)}">'
                     f"<h3>Bearing {_e(b.bearing.id)} on {_e(b.shaft_id)} "
                     f"{_verdict(b.ok)}</h3>")
        parts.append(_bearing_loads_table(b))
        if b.life is not None:
            parts.append(_figure(figures.load_life_chart(b),
                                 f"Bearing {b.bearing.id}: load against basic life, rating "
                                 "line through (1, C), duty cases, Pm and the target.", ctx))
            parts.append(explain_bearing_html(result, b.bearing.id))
        parts.append("</div>")
        ctx.step(f"bearing {b.bearing.id}")
    parts.append("</section>")
    return "".join(parts)


def _warnings(result: Result) -> str:
    items = list(result.warnings)
    for b in result.bearings:
        if b.life is not None:
            items.extend(b.life.warnings)
    for s in result.shafts:
        for c in s.cases:
            items.extend(c.warnings)
    items = list(dict.fromkeys(items))
    body = ("<ul class=warn>" + "".join(f"<li>{_e(w)}</li>" for w in items) + "</ul>"
            if items else "<p>No warnings.</p>")
    return f'<section id="warnings"><h2>{SECTION_TITLES[7]}</h2>{body}</section>'


def _thermal(result: Result) -> str:
    """Friction, power loss and operating temperature per bearing and case."""
    if result.thermal is None:
        return ""
    from shaftsys.report.thermal_table import CAUTION, HEADERS, thermal_rows

    rows = [[_e(c) for c in r] for r in thermal_rows(result)]
    return ('<section id="thermal"><h2>Friction and operating temperature</h2>'
            f"{_table(HEADERS, rows, (0, 1, 7, 10))}<p class=note>{_e(CAUTION)}</p>"
            "</section>")


def _internal(result: Result, ctx: _Render) -> str:
    """Rolling-element loads of the bearings with an interior: the table and, per
    bearing, a polar figure of the element loads of its most loaded case.
    """
    if not result.internal:
        return ""
    from shaftsys.report.interior_plot import element_load_polar
    from shaftsys.report.internal_table import (
        HEADERS,
        TITLE,
        internal_rows,
        life_lines,
        nonlinear_solve_lines,
    )

    rows = [[_e(c) for c in r] for r in internal_rows(result)]
    extra = [*life_lines(result), *nonlinear_solve_lines(result).splitlines()]
    lines = "".join(f"<li>{_e(t)}</li>" for t in extra)
    figs = "".join(_figure(element_load_polar(bid, data), f"Rolling-element loads of "
                           f"{bid} in its most loaded case (outlines: the other cases)", ctx)
                   for bid, data in result.internal.items())
    note = ("Element loads from Hertzian contact with the bearing's clearance or preload and "
            "the shaft's slope at the seat as the ring tilt (housing taken as aligned); "
            "internal geometry marked estimated follows a common-practice rule, not the "
            "maker's drawing. Use the maker's data for the bearing actually bought.")
    return (f'<section id="internal"><h2>{_e(TITLE)}</h2>'
            f"{_table(HEADERS, rows, (0, 1))}" + (f"<ul>{lines}</ul>" if lines else "")
            + f"{figs}<p class=note>{_e(note)}</p></section>")


def _duty(result: Result, ctx: _Render) -> str:
    """The recording that made the duty cases: its cases, the reduction error against
    the direct integral per bearing, and the load-duration figure.
    """
    red = result.duty_reduction
    if red is None:
        return ""
    from shaftsys.report.duty_plot import duty_chart
    from shaftsys.report.duty_tables import summary_line

    cases = [[_e(c.id), _e(c.kind), _e(c.region), _n(c.torque_Nmm / 1000.0),
              _n(c.speed_rpm, 5), _n(c.time_s / 3600.0), _n(c.revs, 5), _n(c.share)]
             for c in red.cases]
    errors = [[_e(e.bearing), _n(e.exponent, 3), _n(e.P_cases_N, 5), _n(e.P_direct_N, 5),
               _e(f"{e.P_error_pct:+.3f}"), _n(e.L10_cases_h, 5), _n(e.L10_direct_h, 5),
               _e(f"{e.L10_error_pct:+.3f}")] for e in red.errors]
    note = ("Each running case is one bin of the recording: its torque is the "
            "revolution-weighted p-th power mean of the bin's samples (the bin's damage is "
            "kept), its speed the bin's revolutions over its time, its share the time "
            "share; standstill counts for time only. The error compares each bearing's "
            "equivalent load and basic life from these cases with the direct integral of "
            "P^p over the revolutions of every raw sample (loads superposed from probe "
            f"solves, affine check miss {red.affine_mismatch:.2g}). It is the error of "
            "the binning under this model only: how well the recording represents the "
            "machine's life remains the designer's judgement.")
    fig = _figure(duty_chart(red), "Load-duration of the recording: time and revolutions "
                  "at each torque level (dashed: peak cases)", ctx)
    return ('<section id="duty"><h2>Duty from the recording</h2>'
            f"<p>{_e(summary_line(red))}</p>"
            + _table(("case", "kind", "region", "torque N*m", "speed rpm", "time h",
                      "revolutions", "share"), cases, (0, 1, 2))
            + "<h3>Reduction error per bearing (basic L10)</h3>"
            + _table(("bearing", "p", "P cases N", "P direct N", "dP %", "L10 cases h",
                      "L10 direct h", "dL %"), errors, (0,))
            + f"{fig}<p class=note>{_e(note)}</p></section>")


def _cautions() -> str:
    lis = "".join(f"<li>{_e(c)}</li>" for c in _CAUTIONS)
    return f'<section id="cautions"><h2>{SECTION_TITLES[8]}</h2><ul>{lis}</ul></section>'


#: Titles of the shaft-check sections (shown when the result has shaft checks).
SHAFT_CHECK_TITLES = ("Slopes and deflections", "Critical speeds",
                      "Shaft fatigue and yield", "Static safety s0")


def _status_word(verdict: str) -> str:
    cls = "ok" if verdict in ("pass", "marginal") else "bad"
    return f'<span class="stamp {cls}">{_e(verdict.upper())}</span>'


def _deflection_section(result: Result, ctx: _Render) -> str:
    """Slope and deflection at every bearing and gear, worst case, against its limit;
    a deflection-line figure per shaft with the limits drawn at their stations.
    """
    checks = result.checks
    if checks is None:
        return ""
    parts = [f'<section id="slopes"><h2>{SHAFT_CHECK_TITLES[0]}</h2>']
    rows = []
    for c in (*checks.bearings, *checks.gears):
        ws = max(c.cases, key=lambda k: k.slope_rad, default=None)
        wd = max(c.cases, key=lambda k: k.deflection_mm, default=None)
        rows.append([
            _e(c.shaft), _e(f"{c.kind} {c.id}"), _n(c.x_mm, 5),
            _e(ws.case if ws else "-"), _n(ws.slope_rad if ws else None, 4),
            _n(c.slope_limit_low_rad, 3) + " / " + _n(c.slope_limit_rad, 3),
            _e(wd.case if wd else "-"), _n(wd.deflection_mm if wd else None, 4),
            _n(c.deflection_limit_mm, 4) if c.deflection_limit_mm is not None else "-",
            _e(c.source), _status_word(c.verdict)])
    parts.append(_table(["shaft", "at", "x mm", "worst case (slope)", "slope rad",
                         "caution / limit rad", "worst case (defl.)", "deflection mm",
                         "limit mm", "source of limits", "verdict"], rows, (0, 1, 3, 6, 9)))
    parts.append('<p class="note">Slope: resultant of both planes, largest over the cases; '
                 "a slope between the caution value and the limit is marginal. Deflection: "
                 "resultant radial deflection at the station.</p>")
    for s in result.shafts:
        lims = [c for c in (*checks.bearings, *checks.gears) if c.shaft == s.shaft.id]
        parts.append(_figure(figures.deflection_lines(s, lims),
                             f"Shaft {s.shaft.id}: deflection lines and slopes in the x-y "
                             "and x-z planes for every case; red bars: allowed slope at "
                             "bearings and gears, allowed deflection at gears.", ctx))
    parts.append("</section>")
    return "".join(parts)


def _critical_speed_section(result: Result, ctx: _Render | None = None) -> str:
    """Bending criticals (first three) and first torsional per shaft with the classical
    estimates, margin of each case, and a figure of the bending mode shapes.
    """
    checks = result.checks
    if checks is None:
        return ""
    need = checks.settings.critical_speed_margin
    rows = []
    for s in result.shafts:
        sc = checks.shaft(s.shaft.id)
        for cs in s.cases:
            n = abs(cs.speed_rpm)
            margin = sc.first_critical_rpm / n if n > 0 else math.inf
            rows.append([_e(s.shaft.id), _e(cs.case), _n(n, 5),
                         _n(sc.first_critical_rpm, 5), _n(margin, 3),
                         _n(sc.first_torsional_rpm, 5)])
    table = _table(["shaft", "case", "speed rpm", "1st bending rpm",
                    "1st bending / speed", "1st torsional rpm"], rows, 2)
    mode_rows = []
    for sc in checks.shafts:
        m = sc.modes
        if m is None:
            continue
        crit = list(m.bending_rpm) + [math.nan] * (3 - len(m.bending_rpm))
        mode_rows.append([_e(sc.id), *(_n(v, 5) for v in crit[:3]),
                          _n(m.rayleigh_rpm, 5), _n(m.dunkerley_rpm, 5),
                          *(_n(v / sc.max_speed_rpm if sc.max_speed_rpm > 0 else math.inf, 3)
                            for v in crit[:2])])
    modes_table = "" if not mode_rows else _table(
        ["shaft", "1st bending rpm", "2nd bending rpm", "3rd bending rpm",
         "Rayleigh rpm (upper)", "Dunkerley rpm (lower)", "1st / top speed",
         "2nd / top speed"], mode_rows, 1)
    verdicts = "".join(
        f"<li>shaft {_e(sc.id)}: largest speed {_n(sc.max_speed_rpm, 5)} rpm, first "
        f"bending critical {_n(sc.first_critical_rpm, 5)} rpm - required: at least "
        f"{_n(need, 3)} x the largest speed (or below it / {_n(need, 3)}) "
        f"{_status_word(sc.critical_speed_verdict)}</li>" for sc in checks.shafts)
    figs = ""
    if ctx is not None:
        from shaftsys.report.figures import mode_shapes

        figs = "".join(_figure(mode_shapes(sc.id, sc.modes), f"Bending mode shapes of shaft "
                               f"{sc.id} (largest deflection scaled to 1)", ctx)
                       for sc in checks.shafts if sc.modes is not None and sc.modes.bending_rpm)
    return (f'<section id="critical"><h2>{SHAFT_CHECK_TITLES[1]}</h2>{table}<ul>{verdicts}'
            f"</ul>{modes_table}{figs}"
            '<p class="note">Bending criticals from the modal analysis of the beam model '
            "of the non-rotating shaft (bearings as rigid supports unless a radial "
            "stiffness is given, or on their tangent stiffness when the model solves "
            "them with nonlinear stiffness; no gyroscopic effects). Rayleigh's estimate uses the "
            "static deflection under a uniform lateral acceleration (an upper bound of the "
            "first critical), Dunkerley's the sum over all modes (a lower bound).</p>"
            "</section>")


def _fatigue_section(result: Result) -> str:
    """Every section of interest: notch factors, Se, stresses, safety vs required."""
    checks = result.checks
    if checks is None:
        return ""
    st = checks.settings
    crit = {"goodman": "DE-Goodman", "asme_elliptic": "DE-ASME elliptic",
            "gerber": "DE-Gerber"}.get(
        st.criterion, st.criterion)
    parts = [f'<section id="fatigue"><h2>{SHAFT_CHECK_TITLES[2]}</h2>']
    for sc in checks.shafts:
        parts.append(f"<h3>Shaft {_e(sc.id)} {_status_word(sc.fatigue_verdict)}</h3>")
        if sc.fatigue_not_evaluated is not None:
            parts.append(f'<p class="note">Not evaluated: {_e(sc.fatigue_not_evaluated)}</p>')
            continue
        rows = [[_n(x.x_mm, 5), _e(x.feature), _n(x.d_mm, 4),
                 _n(x.D_mm, 4) if x.D_mm is not None else "-",
                 _n(x.r_mm, 3) if x.r_mm is not None else "-",
                 _n(x.Kt, 3) + " / " + _n(x.Kts, 3), _n(x.Kf, 3) + " / " + _n(x.Kfs, 3),
                 _n(x.Se_MPa, 4), _n(x.sigma_a_MPa, 4), _n(x.sigma_m_MPa, 4),
                 _n(x.n_fatigue, 3) + " / " + _n(st.required_fatigue_safety, 3),
                 _n(x.n_yield, 3) + " / " + _n(st.required_yield_safety, 3),
                 _status_word(x.verdict)] for x in sc.sections]
        parts.append(_table(["x mm", "feature", "d mm", "D mm", "r mm", "Kt / Kts",
                             "Kf / Kfs", "Se MPa", "sigma_a' MPa", "sigma_m' MPa",
                             f"n fatigue ({crit}) / req", "n yield / req", "verdict"],
                            rows, (1,)))
        stations = sorted({x.x_mm for x in sc.sections})
        if stations:
            from shaftsys.report.calcsheet import explain_section

            sheets = "".join(f'<pre class="calcsheet">{_e(explain_section(result, sc.id, x))}'
                             "</pre>" for x in stations)
            parts.append(f"<details><summary>Calculation sheets of the sections of shaft "
                         f"{_e(sc.id)}</summary>{sheets}</details>")
    parts.append(f'<p class="note">Criterion {_e(crit)} on von Mises stresses (Shigley, '
                 "shaft design chapter); Se by the Marin factors; Kf = 1 + q (Kt - 1) "
                 "applied to alternating and mean stress; n yield is first-cycle yield "
                 "on the peak stresses.</p></section>")
    return "".join(parts)


def _static_section(result: Result) -> str:
    """ISO 76 static safety s0 = C0/P0 of every bearing, worst case, against s0 min."""
    rows = []
    for b in result.bearings:
        life = b.life
        if life is None:
            continue
        rows.append([_e(f"{b.shaft_id}/{b.bearing.id}"), _e(life.s0_case or "-"),
                     _n(b.bearing.C0_N, 5), _n(life.s0, 3), _n(life.s0_min, 3),
                     _status_word("pass" if life.static_ok else "fail")])
    if not rows:
        return ""
    return (f'<section id="static"><h2>{SHAFT_CHECK_TITLES[3]}</h2>'
            + _table(["support", "worst case", "C0 N", "s0", "s0 min", "verdict"], rows, 2)
            + '<p class="note">s0 = C0 / P0 with P0 = X0 Fr + Y0 Fa (ISO 76), smallest '
            "over every case, peak and static cases included.</p></section>")


def shaft_check_sections(result: Result, ctx: _Render | None = None) -> str:
    """The HTML of the slope/deflection, critical-speed, fatigue and static-safety
    sections (empty parts when the result has no shaft checks).
    """
    c = _Render(_no_step) if ctx is None else ctx
    return "".join([_deflection_section(result, c), _critical_speed_section(result, c),
                    _fatigue_section(result), _static_section(result),
                    _gear_sheets(result), _pulley_sheets(result)])


def _gear_sheets(result: Result) -> str:
    """The calculation sheet of every spur/helical gear (mesh forces from the torque)."""
    from shaftsys.model.elements import Gear
    from shaftsys.report.calcsheet import explain_gear

    ids = [e.id for s in result.shafts for e in s.shaft.elements if isinstance(e, Gear)]
    if not ids:
        return ""
    pres = "".join(f'<pre class="calcsheet">{_e(explain_gear(result, g))}</pre>' for g in ids)
    return f'<section id="gear-forces"><h2>Gear mesh forces</h2>{pres}</section>'


def _pulley_sheets(result: Result) -> str:
    """The calculation sheet of every belt pulley (strand tensions, slip, hub force)."""
    from shaftsys.model.elements import Pulley
    from shaftsys.report.calcsheet import explain_pulley

    ids = [e.id for s in result.shafts for e in s.shaft.elements if isinstance(e, Pulley)]
    if not ids:
        return ""
    pres = "".join(f'<pre class="calcsheet">{_e(explain_pulley(result, p))}</pre>'
                   for p in ids)
    return f'<section id="belt-forces"><h2>Belt tensions and hub forces</h2>{pres}</section>'


def report_steps(result: Result) -> int:
    """Number of progress steps :func:`render_report` reports for ``result``.

    One per shaft drawing, one per case and shaft (diagrams) and one per bearing
    (load-life chart and calculation sheet): the parts that take time.
    """
    return (len(result.shafts) * (1 + len(result.model.cases)) + len(result.bearings))


def render_report(result: Result, date: str | None = None,
                  progress: Callable[[str], None] | None = None,
                  study: tuple[str, str] | None = None) -> str:
    """Render the whole report of ``result`` as one self-contained HTML document.

    Parameters
    ----------
    result:
        A solved result with life verdicts (``shaftsys.analyse(model)``).
    date:
        Date text for the header; ``None`` = today's date (UTC, ISO 8601). Pass a fixed
        value for byte-reproducible reports.
    study:
        ``(summary text, HTML fragment with the study's figure)`` when the model has a
        design study (see :func:`study_fragment`), else ``None``.
    progress:
        Called with a short label after each slow part is rendered (see
        :func:`report_steps` for how many calls to expect); ``None`` = no calls. The
        CLI passes :meth:`shaftsys.cli.progress.ProgressBar.advance`.

    Returns
    -------
    str
        The HTML text (UTF-8 when written). Forces in N, lengths in mm, moments in N*m
        in the tables, lives in h.
    """
    if date is None:
        date = _dt.datetime.now(_dt.UTC).date().isoformat()
    ctx = _Render(_no_step if progress is None else progress)
    m = result.model
    title = f"shaftsys report - {m.name}"
    stamp = "PASS" if result.ok else result.verdict.upper()
    n_duty = sum(1 for c in m.cases if c.kind is CaseKind.DUTY)
    sub = (f"{len(result.shafts)} shaft(s), {len(result.bearings)} support(s), "
           f"{len(m.cases)} case(s) ({n_duty} in the duty cycle)")
    body = "".join([
        f'<header class="top"><h1>{_e(m.name)}</h1><div class="sub">{_e(sub)} - '
        f'bearing and shaft check by shaftsys {_e(__version__)} - '
        f'<span class="stamp {"ok" if result.ok else "bad"}">{stamp}</span></div></header>',
        _provenance(result, date), _inputs(result), _summary(result),
        _shafts(result, ctx), _cases(result, ctx), _selection(result), _verdicts(result),
        _bearings(result, ctx), shaft_check_sections(result, ctx), _internal(result, ctx),
        _thermal(result), _duty(result, ctx),
        "" if study is None else (f'<section id="study"><h2>Design study</h2>'
                                  f"<p class=note>{_e(study[0])}</p>{study[1]}</section>"),
        _warnings(result), _cautions(),
    ])
    return ("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">"
            f"<title>{_e(title)}</title>"
            '<meta name="viewport" content="width=device-width, initial-scale=1">'
            f"<style>{_CSS}</style></head><body><main>{body}</main></body></html>\n")


def study_fragment(study: Study, frame: pd.DataFrame) -> tuple[str, str]:
    """Summary text and an HTML fragment (inline SVG plot) of a design study that has
    been run (its results ``frame``, :func:`shaftsys.study.sweep.sweep`).
    """
    from shaftsys.report.figures import to_svg
    from shaftsys.study.plots import plot_contour, plot_life
    from shaftsys.study.sweep import study_summary

    st, df = study, frame
    from matplotlib.figure import Figure

    fig = Figure(figsize=(7.5, 4.6))
    ax = fig.add_subplot()
    if len(st.quantities) == 1:
        plot_life(ax, df, st)
    else:
        plot_contour(ax, df, st)
    summary = study_summary(st, df)
    text = (f"{summary['variants']} variants of {', '.join(q.path for q in st.quantities)}: "
            f"{summary['valid']} valid, {summary['passing']} pass every target and limit; "
            f"best {summary['best_variant']} with {summary['best_values']}.")
    return text, f'<figure>{to_svg(fig)}</figure>'
