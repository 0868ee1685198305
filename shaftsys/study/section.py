"""The ``study:`` section of a model file: format and validation.

Format (every key optional except ``vary``; values in internal units or with a unit)::

    study:
      vary:                                  # the swept quantities, in order
        - {path: bearing.B.at, values: "211:249:20", seat: true}   # start:stop:count
        - {path: step.spindle.2.d, values: [60 mm, 65 mm, 70 mm]}  # a list
      combine: grid                          # grid (cartesian product) or zip
      limits:                                # deflection [mm] / slope [rad] limits
        - {kind: deflection, at: [gears], max: 0.05 mm}
        - {kind: slope, at: [bearings, A], max: 0.001}

``path`` is a quantity path (:mod:`shaftsys.study.paths`); ``seat: true`` moves the
bearing's seat step with it; ``at`` lists bearing or element ids or the groups
``gears``, ``bearings``, ``elements``. Every error names the file, line and field.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from shaftsys.errors import ModelError
from shaftsys.model import Model
from shaftsys.study.sweep import LIMIT_KINDS, Limit, Study, make_study

STUDY_KEYS = ("vary", "combine", "limits", "optimise")
OPTIMISE_KEYS = ("objective", "bounds", "limits", "min_life_margin", "grid", "maxiter")
BOUND_KEYS = ("path", "lower", "upper")
#: Paths the optimiser may move (stations and spacings: a written model can hold them).
OPTIMISE_PATH_HEADS = ("bearing", "element", "gear", "spacing")
VARY_KEYS = ("path", "values", "seat")
LIMIT_KEYS = ("kind", "at", "max")


def read_study_section(path: str | Path) -> tuple[Any, str]:
    """The raw (located) ``study:`` mapping of a model file, or ``None``; and the file name."""
    from shaftsys.io.yamlsource import parse_yaml

    name = str(path)
    try:
        text = Path(path).read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as exc:
        raise ModelError(f"cannot read the model file: {exc}", file=name) from None
    raw = parse_yaml(text, name)
    return (raw.get("study") if isinstance(raw, dict) else None), name


def _line(container: Any, key: Any) -> int | None:
    lines = getattr(container, "lines", None)
    if isinstance(lines, dict):
        return lines.get(key, getattr(container, "line", None))
    if isinstance(lines, list) and isinstance(key, int) and key < len(lines):
        return int(lines[key])
    return getattr(container, "line", None)


def _unknown(item: dict[str, Any], allowed: Sequence[str], file: str, where: str) -> None:
    for key in item:
        if key not in allowed:
            raise ModelError(f"unknown key '{key}'", file=file, line=_line(item, key),
                             field=f"{where}.{key}", expected=f"one of {list(allowed)}")


def study_from_section(model: Model, section: Any, file: str | None = None, *,
                       vary: Sequence[tuple[str, str]] = (), seat: Sequence[str] = (),
                       combine: str | None = None, limits: Sequence[Limit] = ()) -> Study:
    """Build a :class:`Study` from a ``study:`` section and command-line overrides.

    ``vary`` given on the command line replaces the section's ``vary``; ``limits`` are
    added to the section's.

    Raises
    ------
    ModelError: naming file, line and field (``study.vary[1].values``...).
    """
    f = file or "model"
    items: list[tuple[str, Any]] = list(vary)
    seat_paths = list(seat)
    mode = combine
    all_limits = list(limits)
    if section is not None:
        if not isinstance(section, dict):
            raise ModelError("the study section is a mapping", file=f,
                             line=getattr(section, "line", None), field="study",
                             expected="study: {vary: [...], combine: grid, limits: [...]}")
        _unknown(section, STUDY_KEYS, f, "study")
        if mode is None and section.get("combine") is not None:
            mode = str(section["combine"])
            if mode not in ("grid", "zip"):
                raise ModelError(f"combine '{mode}'", file=f, line=_line(section, "combine"),
                                 field="study.combine", expected="grid or zip")
        raw_vary = section.get("vary")
        if not vary and raw_vary is not None:
            if not isinstance(raw_vary, list):
                raise ModelError("vary is a list", file=f, line=_line(section, "vary"),
                                 field="study.vary",
                                 expected="- {path: bearing.B.at, values: '400:600:11'}")
            for i, it in enumerate(raw_vary):
                here = f"study.vary[{i}]"
                if not isinstance(it, dict) or "path" not in it or "values" not in it:
                    raise ModelError("each entry needs a path and values", file=f,
                                     line=_line(raw_vary, i), field=here,
                                     expected="{path: PATH, values: LIST or 'a:b:n'}")
                _unknown(it, VARY_KEYS, f, here)
                items.append((str(it["path"]), it["values"]))
                if it.get("seat") is True:
                    seat_paths.append(str(it["path"]))
                elif it.get("seat") not in (None, False):
                    raise ModelError("seat is true or false", file=f, line=_line(it, "seat"),
                                     field=f"{here}.seat", expected="true or false")
        raw_limits = section.get("limits")
        if raw_limits is not None:
            if not isinstance(raw_limits, list):
                raise ModelError("limits is a list", file=f, line=_line(section, "limits"),
                                 field="study.limits",
                                 expected="- {kind: deflection, at: [gears], max: 0.05 mm}")
            for i, it in enumerate(raw_limits):
                all_limits.append(_limit(it, f, raw_limits, i))
    if not items:
        raise ModelError("nothing to vary", file=f, field="study.vary",
                         expected="--vary PATH=VALUES or a 'study: vary:' list in the model")
    try:
        return make_study(model, items, mode=mode or "grid", seat=seat_paths,
                          limits=all_limits)
    except ModelError as exc:
        if exc.file is None and section is not None:
            raise ModelError(exc.message, file=f, line=getattr(section, "line", None),
                             field=exc.field, expected=exc.expected) from None
        raise


def _limit(it: Any, f: str, container: Any, i: int) -> Limit:
    from shaftsys.io.quantities import QuantityProblem, to_internal

    here = f"study.limits[{i}]"
    if not isinstance(it, dict):
        raise ModelError("a limit is a mapping", file=f, line=_line(container, i), field=here,
                         expected="{kind: deflection, at: [gears], max: 0.05 mm}")
    _unknown(it, LIMIT_KEYS, f, here)
    kind = it.get("kind")
    if kind not in LIMIT_KINDS:
        raise ModelError(f"kind '{kind}'", file=f, line=_line(it, "kind"), field=f"{here}.kind",
                         expected=f"one of {list(LIMIT_KINDS)}")
    at = it.get("at", ["gears"] if kind == "deflection" else ["bearings"])
    at = [at] if isinstance(at, str) else at
    if not isinstance(at, list) or not all(isinstance(a, str) for a in at):
        raise ModelError("at is a list of ids", file=f, line=_line(it, "at"), field=f"{here}.at",
                         expected="[gears], [bearings] or bearing/element ids")
    try:
        value = to_internal(it.get("max"), "length" if kind == "deflection" else "dimensionless")
    except QuantityProblem as exc:
        raise ModelError(exc.message, file=f, line=_line(it, "max"), field=f"{here}.max",
                         expected=exc.expected) from None
    try:
        return Limit(str(kind), tuple(at), value)
    except ModelError as exc:
        raise ModelError(exc.message, file=f, line=_line(it, "max"), field=f"{here}.max",
                         expected=exc.expected) from None


def parse_limit_option(text: str) -> Limit:
    """A ``--limit KIND@AT[,AT...]=MAX`` option, e.g. ``deflection@gears=0.05``."""
    from shaftsys.io.quantities import QuantityProblem, to_internal

    expected = "KIND@AT=MAX, e.g. deflection@gears=0.05 or slope@A,B=0.001"
    if "=" not in text or "@" not in text.split("=", 1)[0]:
        raise ModelError(f"--limit '{text}'", field="--limit", expected=expected)
    head, value = text.split("=", 1)
    kind, at = head.split("@", 1)
    if kind not in LIMIT_KINDS:
        raise ModelError(f"--limit kind '{kind}'", field="--limit", expected=expected)
    try:
        v = to_internal(value, "length" if kind == "deflection" else "dimensionless")
    except QuantityProblem as exc:
        raise ModelError(f"--limit {text}: {exc.message}", field="--limit",
                         expected=exc.expected) from None
    return Limit(kind, tuple(a for a in at.split(",") if a), v)


@dataclass(frozen=True)
class OptimiseSpec:
    """The ``study: optimise:`` sub-section, read and checked (internal units).

    bounds: path -> (lower, upper) [mm]. limits: deflection [mm] / slope [rad]
    constraints. min_life_margin: every bearing's C/C_req at least this [-].
    grid, maxiter: start-grid points per quantity, optimiser iterations.
    lines: path -> model-file line of its bound (for messages).
    """

    bounds: dict[str, tuple[float, float]]
    limits: tuple[Limit, ...]
    min_life_margin: float = 1.0
    grid: int = 9
    maxiter: int = 200
    objective: str = "worst_life_margin"
    lines: dict[str, int | None] = field(default_factory=dict)


def optimise_from_section(model: Model, section: Any, file: str | None = None
                          ) -> OptimiseSpec:
    """Read ``study: optimise:`` (bounds on stations/spacings, limits, life margin).

    The limits default to the study's own ``limits``. Every path is parsed against the
    model (an unknown bearing or element is refused at its line).

    Raises
    ------
    ModelError: naming file, line and field (``study.optimise.bounds[0].upper``...).
    """
    from shaftsys.io.quantities import QuantityProblem, to_internal
    from shaftsys.study.paths import parse_quantity

    f = file or "model"
    if not isinstance(section, dict) or section.get("optimise") is None:
        raise ModelError("the model has no optimiser section", file=f,
                         line=getattr(section, "line", None), field="study.optimise",
                         expected="study: {optimise: {bounds: [{path: bearing.B.at, "
                         "lower: 200 mm, upper: 260 mm}]}}")
    opt = section["optimise"]
    where = "study.optimise"
    if not isinstance(opt, dict):
        raise ModelError("optimise is a mapping", file=f, line=_line(section, "optimise"),
                         field=where, expected="{bounds: [...], limits: [...]}")
    _unknown(opt, OPTIMISE_KEYS, f, where)
    objective = str(opt.get("objective", "worst_life_margin"))
    if objective != "worst_life_margin":
        raise ModelError(f"objective '{objective}'", file=f, line=_line(opt, "objective"),
                         field=f"{where}.objective", expected="worst_life_margin")
    raw = opt.get("bounds")
    if not isinstance(raw, list) or not raw:
        raise ModelError("bounds is a non-empty list", file=f,
                         line=_line(opt, "bounds") if "bounds" in opt else _line(
                             section, "optimise"), field=f"{where}.bounds",
                         expected="- {path: bearing.B.at, lower: 200 mm, upper: 260 mm}")
    bounds: dict[str, tuple[float, float]] = {}
    lines: dict[str, int | None] = {}
    for i, it in enumerate(raw):
        here = f"{where}.bounds[{i}]"
        if not isinstance(it, dict) or any(k not in it for k in BOUND_KEYS):
            raise ModelError("each bound needs a path, lower and upper", file=f,
                             line=_line(raw, i), field=here,
                             expected="{path: bearing.B.at, lower: 200 mm, upper: 260 mm}")
        _unknown(it, BOUND_KEYS, f, here)
        path = str(it["path"])
        parts = path.split(".")
        if parts[0] not in OPTIMISE_PATH_HEADS or (
                parts[-1] != "at" and parts[0] != "spacing"):
            raise ModelError(f"path '{path}' is not a station or a spacing", file=f,
                             line=_line(it, "path"), field=f"{here}.path",
                             expected="bearing.<id>.at, element.<id>.at, gear.<id>.at or "
                             "spacing.<a>.<b>")
        try:
            parse_quantity(model, path)
        except ModelError as exc:
            raise ModelError(exc.message, file=f, line=_line(it, "path"),
                             field=f"{here}.path", expected=exc.expected) from None
        if path in bounds:
            raise ModelError(f"path '{path}' is bounded twice", file=f,
                             line=_line(it, "path"), field=f"{here}.path",
                             expected="each path once")
        vals = []
        for key in ("lower", "upper"):
            try:
                vals.append(to_internal(it[key], "length"))
            except QuantityProblem as exc:
                raise ModelError(exc.message, file=f, line=_line(it, key),
                                 field=f"{here}.{key}", expected=exc.expected) from None
        lo, hi = vals
        if not hi > lo:
            raise ModelError(f"upper {hi:g} mm is not above lower {lo:g} mm", file=f,
                             line=_line(it, "upper"), field=f"{here}.upper",
                             expected="lower < upper")
        bounds[path] = (lo, hi)
        lines[path] = _line(raw, i)
    limits: list[Limit] = []
    raw_limits = opt.get("limits", section.get("limits"))
    key_of = "limits" if "limits" in opt else None
    if raw_limits is not None:
        if not isinstance(raw_limits, list):
            raise ModelError("limits is a list", file=f,
                             line=_line(opt if key_of else section, "limits"),
                             field=f"{where}.limits" if key_of else "study.limits",
                             expected="- {kind: deflection, at: [gears], max: 0.05 mm}")
        for i, it in enumerate(raw_limits):
            lim = _limit(it, f, raw_limits, i)
            limits.append(lim)
    margin = opt.get("min_life_margin", 1.0)
    if isinstance(margin, bool) or not isinstance(margin, int | float) or not margin > 0:
        raise ModelError(f"min_life_margin {margin!r}", file=f,
                         line=_line(opt, "min_life_margin"),
                         field=f"{where}.min_life_margin", expected="a number above 0")
    ints = {}
    for key, default, lo_i, hi_i in (("grid", 9, 2, 101), ("maxiter", 200, 1, 10_000)):
        v = opt.get(key, default)
        if isinstance(v, bool) or not isinstance(v, int) or not lo_i <= v <= hi_i:
            raise ModelError(f"{key} {v!r}", file=f, line=_line(opt, key),
                             field=f"{where}.{key}",
                             expected=f"a whole number {lo_i}..{hi_i}")
        ints[key] = v
    return OptimiseSpec(bounds=bounds, limits=tuple(limits), min_life_margin=float(margin),
                        grid=ints["grid"], maxiter=ints["maxiter"], objective=objective,
                        lines=lines)
