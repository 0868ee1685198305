"""Readable paths to model quantities, value lists, and variant geometry.

Units: every value is in the internal unit of :mod:`shaftsys.units` for its field (mm,
N, N*mm, rpm, W, h, degC, deg); :attr:`Quantity.unit` names it.

Paths (ids are those of the model file; step indices count from 0)::

    bearing.<id>.<field>        at, C, C0, Cu, d, D, B, e, X, Y, Y0, Y1, Y2, f0,
                                contact_angle, pressure_centre_offset, radial_stiffness,
                                tilt_stiffness, target_life, s0_min, ec
    spacing.<a>.<b>             x_b - x_a [mm]; setting it moves bearing b (a stays)
    step.<shaft>.<i>.<field>    d, bore, length (step.<i>.<field> on a one-shaft model)
    element.<id>.<field>        at, mass, width and the element's own numeric fields in
                                model-file names (pitch_diameter, helix_angle, pretension,
                                diameter, wrap_angle, radial_force, unbalance, ...)
    gear.<id>.<field>           the same for a gear or bevel gear (type-checked)
    case.<id>.<field>           torque, power, speed, share, hours, temperature

Rules a caller must know:

* Quantities are applied in the order given; ``spacing.A.B`` uses A's position in the
  same variant (after any change of A made earlier in the list).
* **Moving a bearing** (``bearing.<id>.at`` or ``spacing``) changes only its position;
  steps stay. With the *seat rule* (``seat=True``) the step that holds the bearing's old
  position moves with it by the same distance: the neighbour on its left grows and the
  neighbour on its right shrinks by that distance, so the overall length, the seat's
  length and diameter and the side of each shoulder are kept. The seat needs a step on
  both sides (else the variant is invalid).
* A step's ``length`` moves every later step edge (the shaft grows); bearings and
  elements keep their absolute stations.
* ``case.<id>.torque`` sets the input torque of every drive of the case;
  ``case.<id>.power`` sets the input torque of the case's first driven shaft to
  T = P/omega and scales the other drives' torques by the same ratio; ``speed`` sets the
  first shaft's speed and scales the others (ratios kept), torques unchanged (sweep
  ``power`` as well to keep the power).
"""

from __future__ import annotations

import dataclasses
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np
from numpy.typing import NDArray

from shaftsys.errors import ModelError
from shaftsys.machine.seats import HUB_KINDS, seat_fit
from shaftsys.model import BevelGear, Case, Gear, Model, Shaft

Array = NDArray[np.float64]

#: Bearing fields: model-file name -> (attribute, unit, dimension for unit text).
BEARING_FIELDS: dict[str, tuple[str, str, str]] = {
    "at": ("x_mm", "mm", "length"),
    "C": ("C_N", "N", "force"),
    "C0": ("C0_N", "N", "force"),
    "Cu": ("Cu_N", "N", "force"),
    "d": ("d_mm", "mm", "length"),
    "D": ("D_mm", "mm", "length"),
    "B": ("B_mm", "mm", "length"),
    "e": ("e", "-", "dimensionless"),
    "X": ("X", "-", "dimensionless"),
    "Y": ("Y", "-", "dimensionless"),
    "Y0": ("Y0", "-", "dimensionless"),
    "Y1": ("Y1", "-", "dimensionless"),
    "Y2": ("Y2", "-", "dimensionless"),
    "f0": ("f0", "-", "dimensionless"),
    "contact_angle": ("contact_angle_deg", "deg", "angle"),
    "pressure_centre_offset": ("pressure_centre_offset_mm", "mm", "length"),
    "radial_stiffness": ("radial_stiffness_N_mm", "N/mm", "linear_stiffness"),
    "tilt_stiffness": ("tilt_stiffness_Nmm_rad", "N*mm/rad", "angular_stiffness"),
    "target_life": ("target_life_h", "h", "time"),
    "s0_min": ("s0_min", "-", "dimensionless"),
    "ec": ("ec", "-", "dimensionless"),
}

#: Element fields: model-file name -> (candidate attributes, unit, dimension).
ELEMENT_FIELDS: dict[str, tuple[tuple[str, ...], str, str]] = {
    "at": (("x_mm",), "mm", "length"),
    "mass": (("mass_kg",), "kg", "mass"),
    "width": (("width_mm",), "mm", "length"),
    "pitch_diameter": (("pitch_diameter_mm",), "mm", "length"),
    "mean_pitch_diameter": (("mean_pitch_diameter_mm",), "mm", "length"),
    "pitch_cone_angle": (("pitch_cone_angle_deg",), "deg", "angle"),
    "pressure_angle": (("normal_pressure_angle_deg", "pressure_angle_deg"), "deg", "angle"),
    "helix_angle": (("helix_angle_deg",), "deg", "angle"),
    "mesh_angle": (("mesh_angle_deg",), "deg", "angle"),
    "belt_angle": (("mesh_angle_deg",), "deg", "angle"),
    "chain_angle": (("mesh_angle_deg",), "deg", "angle"),
    "diameter": (("diameter_mm",), "mm", "length"),
    "wrap_angle": (("wrap_angle_deg",), "deg", "angle"),
    "pretension": (("pretension_N",), "N", "force"),
    "friction": (("friction_coefficient",), "-", "dimensionless"),
    "groove_angle": (("groove_angle_deg",), "deg", "angle"),
    "radial_force": (("radial_force_N",), "N", "force"),
    "radial_angle": (("radial_angle_deg",), "deg", "angle"),
    "unbalance": (("unbalance_gmm",), "g*mm", "unbalance"),
    "phase": (("phase_deg",), "deg", "angle"),
}

STEP_FIELDS: dict[str, tuple[str, str, str]] = {
    "d": ("d_mm", "mm", "length"),
    "bore": ("bore_mm", "mm", "length"),
    "length": ("length_mm", "mm", "length"),
}

CASE_FIELDS: dict[str, tuple[str, str]] = {
    "torque": ("N*mm", "moment"),
    "power": ("W", "power"),
    "speed": ("rpm", "speed"),
    "share": ("-", "dimensionless"),
    "hours": ("h", "time"),
    "temperature": ("degC", "temperature"),
}

#: Quantities the batched evaluator handles (kind, field).
GEOMETRIC = {("bearing", "x_mm"), ("spacing", "x_mm"), ("step", "d_mm"), ("step", "bore_mm"),
             ("step", "length_mm"), ("element", "x_mm"), ("bearing", "C_N")}

#: Positions closer than this are the same station [mm] (as the mesh).
STATION_TOL_MM = 1e-9


@dataclass(frozen=True)
class Quantity:
    """One model quantity addressed by a path.

    Attributes
    ----------
    path: the path as written (``bearing.B.at``).
    kind: ``bearing``, ``spacing``, ``step``, ``element`` or ``case``.
    target: ids the path names (bearing id; (a, b) for spacing; step index as text;
        element id; case id).
    attr: dataclass attribute set (``x_mm``, ``d_mm``...; the case field name for cases).
    shaft: id of the shaft concerned (``""`` for cases).
    unit: internal unit of the values.
    dimension: dimension name for unit text (see :mod:`shaftsys.io.quantities`).
    seat: apply the seat rule when the quantity moves a bearing.
    """

    path: str
    kind: str
    target: tuple[str, ...]
    attr: str
    shaft: str
    unit: str
    dimension: str
    seat: bool = False

    @property
    def geometric(self) -> bool:
        """True when the batched evaluator handles this quantity."""
        return (self.kind, self.attr) in GEOMETRIC

    @property
    def moves_bearing(self) -> str | None:
        """Id of the bearing this quantity moves, or ``None``."""
        if self.kind == "bearing" and self.attr == "x_mm":
            return self.target[0]
        if self.kind == "spacing":
            return self.target[1]
        return None


def _err(path: str, message: str, expected: str) -> ModelError:
    return ModelError(f"'{path}': {message}", field="study.vary", expected=expected)


def _find_bearing(model: Model, bid: str, path: str) -> tuple[Shaft, int]:
    for s in model.shafts:
        for j, b in enumerate(s.bearings):
            if b.id == bid:
                return s, j
    ids = [b.id for s in model.shafts for b in s.bearings]
    raise _err(path, f"no bearing '{bid}'", f"one of {ids}")


def _find_element(model: Model, eid: str, path: str) -> tuple[Shaft, int]:
    for s in model.shafts:
        for j, e in enumerate(s.elements):
            if e.id == eid:
                return s, j
    ids = [e.id for s in model.shafts for e in s.elements]
    raise _err(path, f"no element '{eid}'", f"one of {ids}")


def parse_quantity(model: Model, path: str, seat: bool = False) -> Quantity:
    """Resolve ``path`` against ``model``.

    Raises
    ------
    ModelError: unknown kind, id, index or field (the message names the path and lists
        what would be valid).
    """
    parts = path.strip().split(".")
    kind = parts[0]
    if kind == "bearing":
        if len(parts) != 3:
            raise _err(path, "a bearing path has three parts", "bearing.<id>.<field>")
        shaft, _ = _find_bearing(model, parts[1], path)
        if parts[2] not in BEARING_FIELDS:
            raise _err(path, f"unknown bearing field '{parts[2]}'",
                       f"one of {list(BEARING_FIELDS)}")
        attr, unit, dim = BEARING_FIELDS[parts[2]]
        return Quantity(path, "bearing", (parts[1],), attr, shaft.id, unit, dim, seat)
    if kind == "spacing":
        if len(parts) != 3:
            raise _err(path, "a spacing path names two bearings", "spacing.<a>.<b>")
        sa, _ = _find_bearing(model, parts[1], path)
        sb, _ = _find_bearing(model, parts[2], path)
        if sa.id != sb.id or parts[1] == parts[2]:
            raise _err(path, "spacing needs two different bearings on one shaft",
                       "spacing.<a>.<b> on the same shaft")
        return Quantity(path, "spacing", (parts[1], parts[2]), "x_mm", sa.id, "mm", "length",
                        seat)
    if kind == "step":
        if len(parts) == 3 and len(model.shafts) == 1:
            parts = [parts[0], model.shafts[0].id, parts[1], parts[2]]
        if len(parts) != 4:
            raise _err(path, "a step path names shaft, index and field",
                       "step.<shaft>.<index>.<field> (index from 0)")
        try:
            shaft = model.shaft(parts[1])
        except KeyError:
            raise _err(path, f"no shaft '{parts[1]}'",
                       f"one of {[s.id for s in model.shafts]}") from None
        if not parts[2].isdigit() or int(parts[2]) >= len(shaft.steps):
            raise _err(path, f"no step '{parts[2]}' on shaft '{shaft.id}'",
                       f"an index 0..{len(shaft.steps) - 1}")
        if parts[3] not in STEP_FIELDS:
            raise _err(path, f"unknown step field '{parts[3]}'", f"one of {list(STEP_FIELDS)}")
        attr, unit, dim = STEP_FIELDS[parts[3]]
        return Quantity(path, "step", (parts[2],), attr, shaft.id, unit, dim, seat)
    if kind in ("element", "gear"):
        if len(parts) != 3:
            raise _err(path, f"an {kind} path has three parts", f"{kind}.<id>.<field>")
        shaft, j = _find_element(model, parts[1], path)
        el = shaft.elements[j]
        if kind == "gear" and not isinstance(el, Gear | BevelGear):
            raise _err(path, f"element '{el.id}' is a {el.kind}, not a gear",
                       "a gear or bevel gear id, or element.<id>.<field>")
        spec = ELEMENT_FIELDS.get(parts[2])
        found = next((a for a in (spec[0] if spec else ()) if hasattr(el, a)), None)
        if spec is None or found is None:
            valid = [k for k, (attrs, _, _) in ELEMENT_FIELDS.items()
                     if any(hasattr(el, a) for a in attrs)]
            raise _err(path, f"{el.kind} '{el.id}' has no numeric field '{parts[2]}'",
                       f"one of {valid}")
        return Quantity(path, "element", (parts[1],), found, shaft.id, spec[1], spec[2], seat)
    if kind == "case":
        if len(parts) != 3:
            raise _err(path, "a case path has three parts", "case.<id>.<field>")
        if parts[1] not in {c.id for c in model.cases}:
            raise _err(path, f"no case '{parts[1]}'", f"one of {[c.id for c in model.cases]}")
        if parts[2] not in CASE_FIELDS:
            raise _err(path, f"unknown case field '{parts[2]}'", f"one of {list(CASE_FIELDS)}")
        unit, dim = CASE_FIELDS[parts[2]]
        return Quantity(path, "case", (parts[1],), parts[2], "", unit, dim, seat)
    raise _err(path, f"unknown kind '{kind}'",
               "a path starting with bearing, spacing, step, element, gear or case")


# ----------------------------------------------------------------------------- values
def parse_values(text: str | Sequence[Any] | float, dimension: str = "dimensionless",
                 where: str = "values") -> Array:
    """Values of a quantity: a list, ``start:stop:count`` (inclusive) or one number.

    List items may carry a unit (``"40 kN"``); bare numbers are internal units.

    Raises
    ------
    ModelError: not a list, range or number; count < 1; non-finite values.
    """
    from shaftsys.io.quantities import QuantityProblem, to_internal

    def num(v: Any) -> float:
        try:
            return to_internal(v.strip() if isinstance(v, str) else v, dimension)
        except QuantityProblem as exc:
            raise ModelError(exc.message, field=where, expected=exc.expected) from None

    expected = "a list [a, b, ...], a range 'start:stop:count' or a number"
    if isinstance(text, str):
        s = text.strip()
        if ":" in s:
            bits = s.split(":")
            if len(bits) != 3:
                raise ModelError(f"range '{s}' needs three parts", field=where,
                                 expected="start:stop:count, e.g. 400:600:21")
            try:
                count = int(bits[2])
            except ValueError:
                raise ModelError(f"range count '{bits[2]}' is not a whole number", field=where,
                                 expected="a count >= 1") from None
            if count < 1:
                raise ModelError(f"range count {count} < 1", field=where, expected="a count >= 1")
            return np.linspace(num(bits[0]), num(bits[1]), count)
        if "," in s:
            return np.array([num(v) for v in s.strip("[]").split(",") if v.strip()], float)
        return np.array([num(s)], dtype=float)
    if isinstance(text, list | tuple):
        if not text:
            raise ModelError("empty list of values", field=where, expected=expected)
        return np.array([num(v) for v in text], dtype=float)
    if isinstance(text, int | float) and not isinstance(text, bool):
        return np.array([num(text)], dtype=float)
    raise ModelError(f"{text!r} is not a list of values", field=where, expected=expected)


# --------------------------------------------------------------------------- geometry
@dataclass(frozen=True, eq=False)
class Geometry:
    """Geometry of B variants of one shaft (leading axis = variant).

    step_length_mm, step_d_mm, step_bore_mm: (B, n_steps) [mm]; bearing_x_mm: mid-width
    stations (B, n_bearings) [mm]; bearing_C_N: dynamic ratings (B, n_bearings) [N];
    element_x_mm: (B, n_elements) [mm]; reason: (B,) object array, ``""`` when valid.
    """

    step_length_mm: Array
    step_d_mm: Array
    step_bore_mm: Array
    bearing_x_mm: Array
    bearing_C_N: Array
    element_x_mm: Array
    reason: NDArray[np.object_]

    @property
    def size(self) -> int:
        """Number of variants B."""
        return int(self.step_length_mm.shape[0])

    @property
    def valid(self) -> NDArray[np.bool_]:
        """Mask of geometrically valid variants."""
        return np.asarray(self.reason == "", dtype=bool)


def _note(reason: NDArray[np.object_], mask: NDArray[np.bool_], text: Any) -> None:
    """Record ``text`` (str, or callable(i) -> str) where ``mask`` and no reason yet."""
    if not np.any(mask):     # the usual case: no object comparison over all variants
        return
    for i in np.flatnonzero(mask & (reason == "")):
        reason[i] = text(int(i)) if callable(text) else text


def geometry_of(model: Model, shaft_id: str, quantities: Sequence[Quantity],
                values: Array) -> Geometry:
    """Geometry of every variant of shaft ``shaft_id`` (vectorised over rows of ``values``).

    Parameters
    ----------
    model: the base model.
    shaft_id: the shaft.
    quantities: the swept quantities (those of other shafts or non-geometric ones are
        skipped here).
    values: (B, n_quantities) in the quantities' units.

    Returns
    -------
    Geometry, with the reason of every geometrically impossible variant (see
    :func:`check_geometry`).
    """
    shaft = model.shaft(shaft_id)
    vals = np.atleast_2d(np.asarray(values, dtype=float))
    B = vals.shape[0]

    def tile(seq: Sequence[float]) -> Array:
        return np.tile(np.asarray(seq, dtype=float), (B, 1)).reshape(B, len(seq))

    L = tile([s.length_mm for s in shaft.steps])
    d = tile([s.d_mm for s in shaft.steps])
    bore = tile([s.bore_mm for s in shaft.steps])
    bx = tile([b.x_mm for b in shaft.bearings])
    bC = tile([b.C_N for b in shaft.bearings])
    ex = tile([e.x_mm for e in shaft.elements])
    reason = np.full(B, "", dtype=object)
    bidx = {b.id: j for j, b in enumerate(shaft.bearings)}
    eidx = {e.id: j for j, e in enumerate(shaft.elements)}
    rows = np.arange(B)
    for k, q in enumerate(quantities):
        if q.shaft != shaft_id or not q.geometric:
            continue
        v = vals[:, k]
        if q.kind == "step":
            {"d_mm": d, "bore_mm": bore, "length_mm": L}[q.attr][:, int(q.target[0])] = v
        elif q.kind == "element":
            ex[:, eidx[q.target[0]]] = v
        elif q.kind == "bearing" and q.attr == "C_N":
            bC[:, bidx[q.target[0]]] = v
        else:
            j = bidx[q.moves_bearing or ""]
            new = v if q.kind == "bearing" else bx[:, bidx[q.target[0]]] + v
            if q.seat:
                edges = np.concatenate([np.zeros((B, 1)), np.cumsum(L, axis=1)], axis=1)
                old = bx[:, j]
                seat = np.clip((edges[:, 1:-1] <= old[:, None]).sum(axis=1), 0, L.shape[1] - 1)
                inner = (seat > 0) & (seat < L.shape[1] - 1)
                _note(reason, ~inner, lambda i, s=seat, p=q.path: (
                    f"{p}: seat rule needs a step on both sides of the seat (step {s[i]})"))
                dx = np.where(inner, new - old, 0.0)
                left = np.clip(seat - 1, 0, L.shape[1] - 1)
                right = np.clip(seat + 1, 0, L.shape[1] - 1)
                L[rows, left] += dx
                L[rows, right] -= dx
            bx[:, j] = new
    geom = Geometry(L, d, bore, bx, bC, ex, reason)
    check_geometry(model, shaft, geom)
    return geom


def _overlap(c1: Array, w1: float, c2: Array, w2: float) -> NDArray[np.bool_]:
    """Intervals of width w around the centres c overlap (touching is allowed)."""
    return np.asarray(np.abs(c1 - c2) < 0.5 * (w1 + w2) - STATION_TOL_MM, dtype=bool)


def check_geometry(model: Model, shaft: Shaft, geom: Geometry) -> None:
    """Record in ``geom.reason`` why a variant is geometrically impossible.

    Checks: every step length > 0, 0 <= bore < d; every bearing (with its width when
    given, else its support point) and every element station on the shaft; no two
    bearings overlapping (widths) or acting at one station (1e-9 mm); no bearing and
    element, or two elements, whose given widths overlap. Pairs that already overlap
    in the base model (e.g. a load declared at a gear's station) are accepted.
    """
    r = geom.reason
    L = geom.step_length_mm
    for i in range(L.shape[1]):
        _note(r, ~(L[:, i] > 0.0), lambda k, i=i: f"step {i} length {L[k, i]:.6g} mm <= 0")
        _note(r, ~(geom.step_d_mm[:, i] > 0.0), f"step {i} diameter <= 0")
        _note(r, ~((geom.step_bore_mm[:, i] >= 0.0)
                   & (geom.step_bore_mm[:, i] < geom.step_d_mm[:, i])),
              f"step {i} bore not within 0 <= bore < d")
    total = L.sum(axis=1)
    bx = geom.bearing_x_mm
    for j, b in enumerate(shaft.bearings):
        half = 0.5 * (b.B_mm or 0.0)
        sx = bx[:, j] + (b.support_x_mm - b.x_mm)
        off = ((bx[:, j] - half < -STATION_TOL_MM) | (bx[:, j] + half > total + STATION_TOL_MM)
               | (sx < -STATION_TOL_MM) | (sx > total + STATION_TOL_MM))
        _note(r, off, lambda k, j=j, b=b: (
            f"bearing {b.id} at {bx[k, j]:.6g} mm is off the shaft (0..{total[k]:.6g} mm)"))
    edges = np.concatenate([np.zeros((L.shape[0], 1)), np.cumsum(L, axis=1)], axis=1)
    base_edges = np.asarray([shaft.step_edges_mm])
    base_d = np.asarray([[s.d_mm for s in shaft.steps]])
    for j, b in enumerate(shaft.bearings):
        half = 0.5 * (b.B_mm or 0.0)
        was_bad, _ = seat_fit(base_edges, base_d, np.array([b.x_mm]), half, b.d_mm,
                              b.on_sleeve)
        if was_bad[0]:  # a model built in Python that never passed the loader's rule
            continue
        bad, dia = seat_fit(edges, geom.step_d_mm, bx[:, j], half, b.d_mm, b.on_sleeve)
        _note(r, bad, lambda k, j=j, b=b, dia=dia: (
            f"bearing {b.id} at {bx[k, j]:.6g} mm no longer fits its seat: a {dia[k]:.6g} "
            f"mm step under it, bore {b.d_mm:g} mm (moved across a shoulder, or the seat "
            "step changed)"))
    ex = geom.element_x_mm
    for j, e in enumerate(shaft.elements):
        off = (ex[:, j] < -STATION_TOL_MM) | (ex[:, j] > total + STATION_TOL_MM)
        _note(r, off, lambda k, j=j, e=e: (
            f"element {e.id} at {ex[k, j]:.6g} mm is off the shaft (0..{total[k]:.6g} mm)"))
    items: list[tuple[str, str, float | None, Array, float]] = []
    for j, b in enumerate(shaft.bearings):
        items.append(("bearing", b.id, b.B_mm, bx[:, j], b.x_mm))
    for j, e in enumerate(shaft.elements):
        items.append(("element", e.id, e.width_mm, ex[:, j], e.x_mm))
    for a in range(len(items)):
        ka, ida, wa, xa, xa0 = items[a]
        for c in range(a + 1, len(items)):
            kc, idc, wc, xc, xc0 = items[c]
            both_bearings = ka == kc == "bearing"
            if wa is not None and wc is not None:
                base = bool(_overlap(np.array([xa0]), wa, np.array([xc0]), wc)[0])
                hit = _overlap(xa, wa, xc, wc)
            elif both_bearings:
                base = abs(xa0 - xc0) <= STATION_TOL_MM
                hit = np.abs(xa - xc) <= STATION_TOL_MM
            elif ka == "bearing" and wa is not None and kc == "element" and \
                    shaft.elements[[e.id for e in shaft.elements].index(idc)].kind in HUB_KINDS:
                # a hub element without a width: its station inside the bearing's width
                base = bool(_overlap(np.array([xa0]), wa, np.array([xc0]), 0.0)[0])
                hit = _overlap(xa, wa, xc, 0.0)
            else:
                continue
            if not base:
                _note(r, hit, f"{ka}s {ida} and {idc} overlap" if ka == kc
                      else f"{ka} {ida} and {kc} {idc} overlap")


# ----------------------------------------------------------------------- model edits
def _set_case(case: Case, field_name: str, value: float, first_shaft: str | None) -> Case:
    if field_name in ("share", "hours"):
        return dataclasses.replace(case, duration=value)
    if field_name == "temperature":
        return dataclasses.replace(case, temperature_C=value)
    drives = dict(case.drives)
    if not drives:
        raise ModelError(f"case '{case.id}' has no drive to change", field=f"cases[{case.id}]")
    order = [s for s in drives if s == first_shaft] + [s for s in drives if s != first_shaft]
    first = drives[order[0]]
    if field_name == "torque":
        for sid, dr in drives.items():
            if dr.input_element is not None:
                drives[sid] = dataclasses.replace(dr, input_torque_Nmm=value)
    elif field_name == "power":
        from shaftsys.units import torque_from_power_Nmm

        if first.speed_rpm == 0.0:
            raise ModelError(f"case '{case.id}': power needs a non-zero speed",
                             field=f"cases[{case.id}].speed", expected="sweep torque instead")
        new_t = torque_from_power_Nmm(value, first.speed_rpm)
        ratio = new_t / first.input_torque_Nmm if first.input_torque_Nmm else None
        for sid, dr in drives.items():
            if sid == order[0]:
                drives[sid] = dataclasses.replace(dr, input_torque_Nmm=new_t)
            elif ratio is not None:
                drives[sid] = dataclasses.replace(dr, input_torque_Nmm=dr.input_torque_Nmm * ratio)
    elif field_name == "speed":
        ratio = value / first.speed_rpm if first.speed_rpm else None
        for sid, dr in drives.items():
            new_n = value if sid == order[0] else (dr.speed_rpm * ratio if ratio else dr.speed_rpm)
            drives[sid] = dataclasses.replace(dr, speed_rpm=new_n)
    else:  # pragma: no cover - guarded by parse_quantity
        raise ValueError(f"unknown case field {field_name!r}")
    return dataclasses.replace(case, drives=drives)


def _replace(obj: Any, attr: str, value: float) -> Any:
    """``dataclasses.replace(obj, **{attr: value})``."""
    return dataclasses.replace(obj, **{attr: value})


def model_with(model: Model, quantities: Sequence[Quantity], values: Sequence[float]
               ) -> tuple[Model, str]:
    """The variant model for one row of values, and why it is impossible (``""`` if not).

    Geometry comes from :func:`geometry_of` (the same rule as the batched evaluator);
    other quantities are set with ``dataclasses.replace`` in the order given.
    """
    row = np.asarray(values, dtype=float).reshape(1, -1)
    shafts = list(model.shafts)
    reason = ""
    for si, shaft in enumerate(shafts):
        if not any(q.shaft == shaft.id and q.geometric for q in quantities):
            continue
        g = geometry_of(model, shaft.id, quantities, row)
        reason = reason or str(g.reason[0])
        steps = tuple(dataclasses.replace(s, length_mm=float(g.step_length_mm[0, i]),
                                          d_mm=float(g.step_d_mm[0, i]),
                                          bore_mm=float(g.step_bore_mm[0, i]))
                      for i, s in enumerate(shaft.steps))
        bearings = tuple(dataclasses.replace(b, x_mm=float(g.bearing_x_mm[0, j]),
                                             C_N=float(g.bearing_C_N[0, j]))
                         for j, b in enumerate(shaft.bearings))
        elements = tuple(dataclasses.replace(e, x_mm=float(g.element_x_mm[0, j]))
                         for j, e in enumerate(shaft.elements))
        shafts[si] = dataclasses.replace(shaft, steps=steps, bearings=bearings,
                                         elements=elements)
    cases = list(model.cases)
    for q, v in zip(quantities, row[0], strict=True):
        if q.geometric:
            continue
        if q.kind == "case":
            k = next(i for i, c in enumerate(cases) if c.id == q.target[0])
            cases[k] = _set_case(cases[k], q.attr, float(v),
                                 model.shafts[0].id if model.shafts else None)
            continue
        si = next(i for i, s in enumerate(shafts) if s.id == q.shaft)
        s = shafts[si]
        if q.kind == "bearing":
            bs = tuple(_replace(b, q.attr, float(v)) if b.id == q.target[0] else b
                       for b in s.bearings)
            shafts[si] = dataclasses.replace(s, bearings=bs)
        elif q.kind == "element":
            es = tuple(_replace(e, q.attr, float(v)) if e.id == q.target[0]
                       else e for e in s.elements)
            shafts[si] = dataclasses.replace(s, elements=es)
    return dataclasses.replace(model, shafts=tuple(shafts), cases=tuple(cases)), reason


def is_finite_row(values: Array) -> NDArray[np.bool_]:
    """Rows of ``values`` that are all finite."""
    return np.asarray(np.all(np.isfinite(values), axis=-1), dtype=bool)


__all__ = [
    "BEARING_FIELDS", "CASE_FIELDS", "ELEMENT_FIELDS", "STEP_FIELDS", "Geometry",
    "Quantity", "check_geometry", "geometry_of", "is_finite_row", "model_with",
    "parse_quantity", "parse_values",
]
