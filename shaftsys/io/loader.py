"""Read a model file into a frozen :class:`~shaftsys.model.Model`.

All validation that needs the file (lines, field paths) happens here; the numerical
core receives only checked, converted, frozen values.
"""

from __future__ import annotations

import difflib
import hashlib
import itertools
import math
import os
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from shaftsys.errors import ModelError
from shaftsys.fe.mesh import STATION_SNAP_MM
from shaftsys.io import spec as S
from shaftsys.io.spec import Where, read_section, read_value, require_list, require_mapping
from shaftsys.io.thermal_loader import read_thermal
from shaftsys.io.yamlsource import (
    LocatedDict,
    LocatedList,
    parse_yaml,
    read_text_file,
)
from shaftsys.model import (
    AxialRole,
    Bearing,
    BearingKind,
    BevelGear,
    Case,
    CaseKind,
    Coupling,
    Drive,
    Element,
    ElementLoad,
    Gear,
    LifeSettings,
    Link,
    Lubrication,
    LumpedMass,
    Material,
    Model,
    ProcessLoad,
    Pulley,
    SetArrangement,
    Shaft,
    SolverSettings,
    Sprocket,
    Step,
    Unbalance,
)
from shaftsys.model.catalogue import Catalogue
from shaftsys.model.checks import BearingCheckOverride, CheckSettings, GearCheckOverride
from shaftsys.model.interior_rules import INTERIOR_KINDS, estimate_interior, interior_problems
from shaftsys.model.recording import RecordingSpec
from shaftsys.model.selection import Objective, OpenSeat, SelectionSettings

_AXIAL_FREE_TYPES = {BearingKind.NEEDLE_ROLLER}
_TOL_MM = 1e-9


def load_model(path: str | Path) -> Model:
    """Read and check a model file.

    Raises
    ------
    ModelError: anything wrong in the file, with file, line, field and expectation.
    """
    name = str(path)
    text = read_text_file(path, "model file")
    model = load_model_text(text, file=name)
    from dataclasses import replace

    # the text is exactly the file's bytes decoded (UTF-8 round-trips), so this hashes the file
    return replace(model, source=name,
                   sha256=hashlib.sha256(text.encode("utf-8")).hexdigest())


def load_model_text(text: str, file: str | None = None) -> Model:
    """Read a model from YAML text (``file`` names it in messages)."""
    raw = parse_yaml(text, file)
    return build_model(raw, file)


@dataclass
class _Seats:
    """Open bearings (``choose``) while a model is read.

    folder: where relative catalogue paths start (the model file's folder, else the
        current directory). catalogues: each catalogue read so far, by its real path
        (a file named by several seats is read once). found: the open seats, in model
        order.
    """

    folder: Path
    catalogues: dict[str, Catalogue] = field(default_factory=dict)
    found: list[OpenSeat] = field(default_factory=list)


def build_model(raw: Any, file: str | None = None) -> Model:
    """Build a model from located YAML values.

    Catalogues named by open bearings (``choose.catalogue``) are read relative to the
    folder of ``file``, or to the current directory when ``file`` is ``None``.
    """
    top = Where(file, "", raw if isinstance(raw, LocatedDict) else None)
    if not isinstance(raw, LocatedDict):
        raise ModelError("a model file is a mapping with 'shaftsys: 1', 'shafts' and "
                         "'cases'", file=file, line=1, expected="a YAML mapping")
    units = S.read_units(top, raw.get("units"))
    with S.declared_units(units) as notes:
        model = _build_model(raw, file, top)
    from dataclasses import replace

    from shaftsys.io.seats import check_seats

    check_seats(model, file)
    return replace(model, warnings=tuple(notes))


def _read_recording(top: Where, raw: Any, file: str | None) -> RecordingSpec | None:
    """The ``recording:`` section, checked here so that every command names its errors."""
    if raw is None:
        return None
    from shaftsys.io.recording import read_recording

    return read_recording(top, raw, file)


def _build_model(raw: LocatedDict, file: str | None, top: Where) -> Model:
    values = read_section(top, raw, S.MODEL)
    materials = _read_materials(top, raw.get("materials"))
    ids: dict[str, str] = {}
    linked = _linked_elements(values["links"])
    shafts_raw = values["shafts"]
    shafts = []
    seats = _Seats(Path(file).parent if file else Path.cwd())
    for i, item in enumerate(shafts_raw):
        shafts.append(_read_shaft(Where(file, "shafts", shafts_raw), i, item, materials, ids,
                                  linked, seats))
    if not shafts:
        raise top.error("shafts", "the model has no shaft", "at least one shaft")
    shafts = _place_inner_bearings(Where(file, "shafts", shafts_raw), shafts)
    life = _read_life(top, raw.get("life"))
    selection = _read_selection(top, raw.get("selection"))
    lubrication = _read_lubrication(top, raw.get("lubrication"))
    solver = _read_solver(top, raw.get("solver"))
    _check_pair_preloads(Where(file, "shafts", shafts_raw), shafts_raw, shafts, solver)
    checks = (read_section(top, raw["checks"], S.CHECKS, "checks")
              if raw.get("checks") is not None else {"fatigue": "required"})
    check_settings = (_read_checks(top.child("checks", raw["checks"]), checks, shafts)
                      if raw.get("checks") is not None else CheckSettings())
    gravity = values["gravity"] if values["gravity"] is not None else (0.0, -9.80665, 0.0)
    links = _read_links(Where(file, "links", values["links"]), values["links"], shafts)
    cases, in_hours = _read_cases(Where(file, "cases", values["cases"]), values["cases"],
                                  shafts, bool(links))
    if raw.get("thermal") is None:   # with heat-balance data the temperatures are computed
        _check_temperatures(Where(file, "cases", values["cases"]), values["cases"], cases,
                            life, lubrication)
    model = Model(
        name=values["name"],
        shafts=tuple(shafts),
        cases=tuple(cases),
        duration_in_hours=in_hours,
        gravity_m_s2=tuple(gravity),  # type: ignore[arg-type]
        life=life,
        lubrication=lubrication,
        solver=solver,
        source=file,
        links=tuple(links),
        open_seats=tuple(seats.found),
        selection=selection,
        fatigue_required=checks["fatigue"] == "required",
        checks=check_settings,
        thermal=read_thermal(top, raw.get("thermal"), lubrication,
                             {b.id for s in shafts for b in s.bearings}),
        recording=_read_recording(top, raw.get("recording"), file),
    )
    if links:
        from shaftsys.machine.geometry import check_machine

        try:
            check_machine(model)
        except ModelError as exc:
            if exc.file is None:
                raise ModelError(exc.message, file=file, line=exc.line, field=exc.field,
                                 expected=exc.expected) from None
            raise
        # the power flow of every case, as the solve finds it (validate equals check)
        from shaftsys.io.locate import locate_error
        from shaftsys.machine.flow import case_flow, machine_graph

        try:
            machine = machine_graph(model)
            for case in model.cases:
                case_flow(model, case, machine)
        except ModelError as exc:
            raise locate_error(exc, model) from None
    _check_mesh_size(top, raw, shafts, solver)
    return model


def _read_checks(where: Where, values: dict[str, Any], shafts: list[Shaft]
                 ) -> CheckSettings:
    """The ``checks:`` section (already read against ``S.CHECKS``) as
    :class:`CheckSettings`: nested sections read, every id checked against the model.
    """
    bearing_ids = [b.id for s in shafts for b in s.bearings]
    gear_ids = [e.id for s in shafts for e in s.elements if isinstance(e, Gear | BevelGear)]
    shaft_ids = [s.id for s in shafts]
    by_type: dict[str, float] = {}
    if values["bearing_slope"] is not None:
        slopes = read_section(where, values["bearing_slope"], S.CHECKS_BEARING_SLOPE,
                              "bearing_slope")
        by_type = {k: v for k, v in slopes.items() if v is not None}
    if values["gear_deflection"] is not None and values["gear_deflection_per_module"] \
            is not None:
        raise where.error("gear_deflection_per_module", "both 'gear_deflection' and "
                          "'gear_deflection_per_module' are given",
                          "one of them (a value, or a fraction of the module)")

    def per_id(key: str, known: list[str], what: str, fields: dict[str, S.Field]
               ) -> dict[str, dict[str, Any]]:
        raw = values[key]
        if raw is None:
            return {}
        here = where.child(key, raw)
        out: dict[str, dict[str, Any]] = {}
        for ident, item in raw.items():
            if str(ident) not in known:
                close = difflib.get_close_matches(str(ident)[:S.MAX_TEXT], known, n=1,
                                                  cutoff=0.6)
                hint = f"; did you mean '{close[0]}'?" if close else ""
                shown = ident if len(str(ident)) <= 40 else str(ident)[:40] + "..."
                raise here.error(ident, f"'{shown}' is not a {what} of the model{hint}",
                                 f"one of the {what} ids: " + (", ".join(known) or "none"))
            out[str(ident)] = read_section(here, item, fields, ident)
        return out

    bearings = {k: BearingCheckOverride(v["slope"], v["speed"], v["min_load"])
                for k, v in per_id("bearings", bearing_ids, "bearing",
                                   S.CHECKS_BEARING).items()}
    gear_values = per_id("gears", gear_ids, "gear", S.CHECKS_GEAR)
    modules = {e.id: e.normal_module_mm for s in shafts for e in s.elements
               if isinstance(e, Gear)}
    for gid, v in gear_values.items():
        here = where.child("gears", values["gears"]).child(gid, values["gears"][gid])
        if v["deflection"] is not None and v["deflection_per_module"] is not None:
            raise here.error("deflection_per_module", "both 'deflection' and "
                             "'deflection_per_module' are given",
                             "one of them (a value, or a fraction of the module)")
        if v["deflection_per_module"] is not None and modules.get(gid) is None:
            raise here.error("deflection_per_module", f"gear '{gid}' has no module to take "
                             "a fraction of", f"a 'module' on gear '{gid}', or "
                             "'deflection' (a length)")
    gears = {k: GearCheckOverride(v["slope"], v["deflection"], v["deflection_per_module"])
             for k, v in gear_values.items()}
    shaft_targets = {k: v["system_life_target"]
                     for k, v in per_id("shafts", shaft_ids, "shaft", S.CHECKS_SHAFT).items()
                     if v["system_life_target"] is not None}
    sl = (read_section(where, values["system_life"], S.CHECKS_SYSTEM_LIFE, "system_life")
          if values["system_life"] is not None
          else {k: f.default for k, f in S.CHECKS_SYSTEM_LIFE.items()})
    return CheckSettings(
        bearing_slope_by_type=by_type, bearings=bearings,
        gear_slope_rad=values["gear_slope"], gear_deflection_mm=values["gear_deflection"],
        gear_deflection_per_module=values["gear_deflection_per_module"], gears=gears,
        fatigue_safety=values["fatigue_safety"], yield_safety=values["yield_safety"],
        fatigue_criterion=values["fatigue_criterion"], speed=values["speed"],
        min_load=values["min_load"], system_life_target_h=sl["target"],
        shaft_system_life_target_h=sl["shaft_target"], shaft_targets_h=shaft_targets,
        weibull_slope_ball=sl["weibull_slope_ball"],
        weibull_slope_roller=sl["weibull_slope_roller"],
        system_reliability=sl["reliability"])


def _check_mesh_size(top: Where, raw: LocatedDict, shafts: list[Shaft],
                     solver: SolverSettings) -> None:
    """A shaft may be meshed into at most :data:`shaftsys.fe.mesh.MAX_ELEMENTS` beam
    elements (the solve's own limit, checked here before solving).
    """
    from shaftsys.fe.mesh import MAX_ELEMENTS

    solver_raw = raw.get("solver")
    given = isinstance(solver_raw, LocatedDict) and "max_element" in solver_raw
    for shaft in shafts:
        if not shaft.length_mm / solver.max_element_mm <= MAX_ELEMENTS:
            message = (f"shaft '{shaft.id}' ({shaft.length_mm:g} mm long) would need "
                       f"{shaft.length_mm / solver.max_element_mm:.3g} beam elements of at "
                       f"most {solver.max_element_mm:g} mm; shaftsys meshes a shaft into at "
                       f"most {MAX_ELEMENTS}")
            expected = (f"solver max_element of at least {shaft.length_mm / MAX_ELEMENTS:.3g}"
                        " mm or a shorter shaft")
            if given:  # the user's max_element is what to change
                raise top.child("solver", solver_raw).error("max_element", message, expected)
            raise ModelError(message, file=top.file, line=shaft.line,
                             field=f"shafts[{shaft.id}].steps", expected=expected)


# ----------------------------------------------------------------------------- sections
def _read_materials(top: Where, raw: Any) -> dict[str, Material]:
    out: dict[str, Material] = {}
    if raw is None:
        return out
    mapping = require_mapping(top, "materials", raw)
    where = top.child("materials", mapping)
    for name, item in mapping.items():
        out[name] = _material(where, name, item, name)
    return out


def _material(where: Where, key: str | int, item: Any, name: str) -> Material:
    v = read_section(where, item, S.MATERIAL, key)
    E, nu = v["E"], v["nu"]
    if v["Su"] is not None and v["Sy"] is not None and v["Sy"] > v["Su"]:
        raise where.child(key, item).error(
            "Sy", f"yield strength {v['Sy']:g} MPa is above the ultimate strength "
            f"{v['Su']:g} MPa", "Sy <= Su")
    G = v["G"] if v["G"] is not None else E / (2.0 * (1.0 + nu))
    return Material(name=name, E_MPa=E, G_MPa=G, poisson=nu, density_kg_m3=v["density"],
                    Su_MPa=v["Su"], Sy_MPa=v["Sy"])


def _claim_id(where: Where, key: str | int, ident: str, what: str, ids: dict[str, str]
              ) -> None:
    if ident in ids:
        raise where.error(key, f"id '{ident}' is used twice (already a {ids[ident]})",
                          "ids that are unique in the model")
    ids[ident] = what


def _place_inner_bearings(where: Where, shafts: list[Shaft]) -> list[Shaft]:
    """Check bearings held by another shaft (``within``) and find their station there."""
    from dataclasses import replace

    import numpy as np

    by_id = {s.id: s for s in shafts}
    out = []
    for shaft in shafts:
        bearings = list(shaft.bearings)
        for bi, b in enumerate(bearings):
            if b.within is None:
                continue
            bw = Where(where.file, f"shafts[{shaft.id}].bearings[{b.id}]", None)

            def fail(msg: str, expected: str, bw: Where = bw, b: Bearing = b) -> ModelError:
                return ModelError(msg, file=bw.file, line=b.line, field=f"{bw.path}.within",
                                  expected=expected)

            outer = by_id.get(b.within)
            if outer is None or outer.id == shaft.id:
                raise fail(f"'{b.within}' is not another shaft of the model",
                           "the id of the shaft that holds the outer ring")
            if b.axial is not AxialRole.FLOAT or b.kind is BearingKind.THRUST_BALL:
                raise fail("a bearing between two shafts carries radial load only here",
                           "axial: float and a radial bearing type")
            a_ax = np.asarray(shaft.axis)
            b_ax = np.asarray(outer.axis)
            if float(np.dot(a_ax, b_ax)) < 1 - 1e-9:
                raise fail(f"shafts '{shaft.id}' and '{outer.id}' do not run in the same "
                           "direction", "coaxial shafts with the same axis")
            p = np.asarray(shaft.origin_mm) + b.support_x_mm * a_ax - np.asarray(
                outer.origin_mm)
            x_outer = float(np.dot(p, b_ax))
            off = float(np.linalg.norm(p - x_outer * b_ax))
            if off > 0.01:
                raise fail(f"shafts '{shaft.id}' and '{outer.id}' are not coaxial (axes "
                           f"{off:.3g} mm apart)", "coaxial shafts")
            if not -_TOL_MM <= x_outer <= outer.length_mm + _TOL_MM:
                raise fail(f"the bearing lies at {x_outer:g} mm of shaft '{outer.id}', "
                           f"outside it (0 to {outer.length_mm:g} mm)",
                           "a station inside the outer shaft")
            bearings[bi] = replace(b, within_x_mm=x_outer)
        out.append(replace(shaft, bearings=tuple(bearings)))
    return out


def _linked_elements(raw: Any) -> set[str]:
    """Ids of the elements that some link names (read before the shafts)."""
    out: set[str] = set()
    if isinstance(raw, LocatedList):
        for item in raw:
            if isinstance(item, LocatedDict) and isinstance(item.get("members"), LocatedList):
                out.update(str(m) for m in item["members"])
    return out


def _unit_vector(where: Where, key: str, value: tuple[float, float, float] | None,
                 default: tuple[float, float, float] | None
                 ) -> tuple[float, float, float] | None:
    if value is None:
        return default
    norm = math.sqrt(sum(c * c for c in value))
    if norm < 1e-12:
        raise where.error(key, "a direction cannot be the zero vector", "e.g. [1, 0, 0]")
    return (value[0] / norm, value[1] / norm, value[2] / norm)


def _read_shaft(where: Where, index: int, item: Any, materials: dict[str, Material],
                ids: dict[str, str], linked: set[str] | None = None,
                seats: _Seats | None = None) -> Shaft:
    v = read_section(where, item, S.SHAFT, index)
    sid = v["id"]
    here = where.child(index, item, label=sid)
    _claim_id(here, "id", sid, "shaft", ids)
    # material
    mat_raw = v["material"]
    if isinstance(mat_raw, str):
        if mat_raw not in materials:
            raise here.error("material", f"material '{mat_raw}' is not defined",
                             "a name from 'materials': " + ", ".join(materials) if materials
                             else "a 'materials' section or a material mapping")
        material = materials[mat_raw]
    else:
        material = _material(here, "material", mat_raw, f"{sid} material")
    steps = _read_steps(here, v["steps"])
    if material.Su_MPa is not None and material.Sy_MPa is not None:
        # the fatigue check then runs at every step; Marin's size factor kb (Shigley)
        # is fitted from 2.79 mm up and refused below (shaftsys.checks.fatigue)
        from shaftsys.checks.fatigue import KB_D_MIN_MM

        sw = here.child("steps", v["steps"])
        for i, step in enumerate(steps):
            if step.d_mm < KB_D_MIN_MM:
                raise sw.child(i, v["steps"][i]).error(
                    "d", f"diameter {step.d_mm:g} mm is below {KB_D_MIN_MM} mm, where the "
                    "fatigue check's size factor (Shigley) is defined; it runs because "
                    "the material gives Su and Sy", f"d >= {KB_D_MIN_MM} mm, or a material "
                    "without Su and Sy")
    length = sum(s.length_mm for s in steps)
    bearings_raw = v["bearings"]
    bw = here.child("bearings", bearings_raw)
    seats = seats if seats is not None else _Seats(Path.cwd())
    already_open = len(seats.found)
    bearings = [_read_bearing(bw, i, b, length, ids, steps, seats, sid)
                for i, b in enumerate(bearings_raw)]
    open_ids = {seat.bearing_id for seat in seats.found[already_open:]}
    elements: list[Element] = []
    if v["elements"] is not None:
        ew = here.child("elements", v["elements"])
        elements = [_read_element(ew, i, e, length, ids, linked or set())
                    for i, e in enumerate(v["elements"])]
    axis = _unit_vector(here, "axis", v["axis"], (1.0, 0.0, 0.0))
    up = _unit_vector(here, "up", v["up"], None)
    assert axis is not None
    if up is not None and abs(sum(a * b for a, b in zip(axis, up, strict=True))) > 0.999:
        raise here.error("up", "'up' is (nearly) parallel to the shaft axis",
                         "a direction across the axis")
    shaft = Shaft(id=sid, steps=tuple(steps), material=material, bearings=tuple(bearings),
                  elements=tuple(elements), line=here.line_of(None),
                  origin_mm=v["origin"] or (0.0, 0.0, 0.0), axis=axis, up=up)
    _check_support(here, shaft, bearings_raw, open_ids)
    return shaft


def _read_steps(where: Where, raw: LocatedList) -> list[Step]:
    sw = where.child("steps", raw)
    steps: list[Step] = []
    x = 0.0
    if not raw:
        raise where.error("steps", "a shaft needs at least one step", "a list of steps")
    for i, item in enumerate(raw):
        v = read_section(sw, item, S.STEP, i)
        iw = sw.child(i, item)
        if (v["length"] is None) == (v["to"] is None):
            raise iw.error(None, "give either 'length' or 'to' for a step",
                           "exactly one of length, to")
        length = v["length"] if v["length"] is not None else v["to"] - x
        if length <= 0:
            raise iw.error("to", f"step ends at {v['to']:g} mm, not after its start "
                           f"{x:g} mm", f"a station beyond {x:g} mm")
        if length < STATION_SNAP_MM:  # stations closer than this share one node
            key = "length" if v["length"] is not None else "to"
            raise iw.error(key, f"a step {length:.3g} mm long is shorter than "
                           f"{STATION_SNAP_MM:g} mm", f"a step of at least "
                           f"{STATION_SNAP_MM:g} mm (or none: join it to its neighbour)")
        if v["bore"] >= v["d"]:
            raise iw.error("bore", f"bore {v['bore']:g} mm is not smaller than the "
                           f"diameter {v['d']:g} mm", "bore < d")
        steps.append(Step(length_mm=length, d_mm=v["d"], bore_mm=v["bore"],
                          fillet_mm=v["fillet"], keyway=v["keyway"], groove=v["groove"],
                          surface=v["surface"], line=sw.line_of(i)))
        x += length
    return steps


def _read_bearing(where: Where, index: int, item: Any, length: float, ids: dict[str, str],
                  steps: list[Step] | None = None, seats: _Seats | None = None,
                  shaft_id: str = "") -> Bearing:
    """One bearing; an open one (``choose``) also adds its :class:`OpenSeat` to ``seats``."""
    v = read_section(where, item, S.BEARING, index)
    _check_bearing_form(where, index, item, v)
    bid = v["id"]
    here = where.child(index, item, label=bid)
    _claim_id(here, "id", bid, "bearing", ids)
    if not 0.0 <= v["at"] <= length + _TOL_MM:
        raise here.error("at", f"bearing at {v['at']:g} mm is outside the shaft "
                         f"(0 to {length:g} mm)", f"a station between 0 and {length:g} mm")
    axial = AxialRole(v["axial"])
    if v["pair"] is not None and axial not in {AxialRole.PLUS_X, AxialRole.MINUS_X}:
        raise here.error("axial", "a bearing of an adjusted pair takes thrust in one "
                         "direction", "axial: +x or -x")
    if v["choose"] is not None:
        seats = seats if seats is not None else _Seats(Path.cwd())
        seat = _read_open_seat(here, v, steps or [], seats, shaft_id)
        seats.found.append(seat)
        return _placeholder(v, seat, axial, here.line_of(None))
    kind = BearingKind(v["type"])
    _note_bore(here, "d", v["d"])
    if v["D"] <= v["d"]:
        raise here.error("D", f"outside diameter {v['D']:g} mm is not larger than the bore "
                         f"{v['d']:g} mm", "D > d")
    rows = v["rows"]
    C, C0 = v["C"], v["C0"]
    if v["ratings"] == "per_row" and rows > 1:
        # ISO 281:2007, 6.2 / 7.2: i identical bearings side by side as one unit:
        # C = i^0.7 C_single (ball), i^(7/9) C_single (roller); C0 = i C0_single.
        C = C * rows ** (7.0 / 9.0 if kind.is_roller else 0.7)
        C0 = C0 * rows
    no_ribs = kind in _AXIAL_FREE_TYPES or (kind is BearingKind.CYLINDRICAL_ROLLER
                                            and not v["ribs"])
    if axial is not AxialRole.FLOAT and no_ribs:
        raise here.error("axial", f"a {kind.value} bearing without ribs cannot locate "
                         "the shaft axially", "axial: float")
    if kind in {BearingKind.ANGULAR_CONTACT_BALL, BearingKind.THRUST_BALL} and \
            v["contact_angle"] is None:
        raise here.error(None, f"a {kind.value} bearing needs 'contact_angle'",
                         "a key 'contact_angle'")
    return Bearing(
        id=bid, kind=kind, x_mm=v["at"], d_mm=v["d"], D_mm=v["D"], B_mm=v["B"], C_N=C,
        C0_N=C0, Cu_N=v["Cu"], limiting_speed_rpm=v["limiting_speed"], e=v["e"], Y=v["Y"],
        Y0=v["Y0"], Y1=v["Y1"], Y2=v["Y2"], X=v["X"], contact_angle_deg=v["contact_angle"],
        f0=v["f0"], rows=rows, arrangement=SetArrangement(v["arrangement"]), axial=axial,
        pair=v["pair"], pressure_centre_offset_mm=v["pressure_centre_offset"],
        radial_stiffness_N_mm=v["radial_stiffness"],
        tilt_stiffness_Nmm_rad=v["tilt_stiffness"], ribs=v["ribs"],
        target_life_h=v["target_life"], target_reliability=v["reliability"],
        s0_min=v["s0_min"], ec=v["ec"], line=here.line_of(None), within=v["within"],
        on_sleeve=v["mounting"] == "sleeve", **_read_interior(here, v, kind, axial),
    )


def _read_interior(here: Where, v: dict[str, Any], kind: BearingKind, axial: AxialRole
                   ) -> dict[str, Any]:
    """``interior`` of a typed bearing: the given internal geometry,
    the rest estimated (flagged), impossible geometry refused at its key.
    """
    raw = v.get("interior")
    if raw is None:
        return {}
    g = read_section(here, raw, S.INTERIOR, "interior")
    iw = here.child("interior", raw)
    if kind not in INTERIOR_KINDS:
        raise here.error("interior", f"the load distribution does not model a "
                         f"{kind.value} bearing", "remove 'interior' (modelled: "
                         "deep_groove_ball, angular_contact_ball, cylindrical_roller, "
                         "tapered_roller, needle_roller)")
    for key in ("fi", "fo"):
        if kind.is_roller and g[key] is not None:
            raise iw.error(key, f"'{key}' is the groove osculation of a ball bearing",
                           f"remove '{key}' (a roller bearing gives 'Lwe')")
    if not kind.is_roller and g["Lwe"] is not None:
        raise iw.error("Lwe", "'Lwe' is the roller length of a roller bearing",
                       "remove 'Lwe' (a ball bearing gives 'fi', 'fo')")
    if g["preload"] is not None and v["pair"] is None and (v["arrangement"] not in {
            "back_to_back", "face_to_face"} or v["rows"] < 2):
        raise iw.error("preload", "an axial preload needs an adjusted pair: a matched set "
                       "at one seat, or a 'pair' at separate seats (solved with "
                       "solver: {bearing_stiffness: nonlinear})", "rows: 2 and arrangement "
                       "back_to_back or face_to_face, or a 'pair'; else remove 'preload'")
    if g["preload"] is not None and g["clearance"] not in (None, 0.0):
        raise iw.error("clearance", "a preloaded pair has no clearance",
                       "either 'clearance' or 'preload'")
    interior = estimate_interior(
        kind, v["d"], v["D"], v["B"], v["contact_angle"], v["e"], Dw_mm=g["Dw"], Z=g["Z"],
        dm_mm=g["pitch_diameter"], fi=g["fi"], fo=g["fo"], Lwe_mm=g["Lwe"],
        clearance_mm=g["clearance"], preload_N=g["preload"], source="model")
    problems = interior_problems(kind, v["d"], v["D"], v["B"], interior)
    if problems:
        key, message, expected = problems[0]
        names = {"dm": "pitch_diameter", "contact_angle": None}
        if key == "contact_angle":
            raise here.error("contact_angle" if "contact_angle" in raw or v[
                "contact_angle"] is not None else "interior", message, expected)
        key = names.get(key, key) or key
        given = key in raw
        raise iw.error(key if given else None,
                       message + ("" if given else f" ('{key}' estimated: give it)"),
                       expected)
    return {"interior": interior}


def _check_bearing_form(where: Where, index: int, item: LocatedDict, v: dict[str, Any]
                        ) -> None:
    """A bearing with ``choose`` names none of what the catalogue gives; one without has
    its type, dimensions and ratings (:data:`shaftsys.io.spec.BEARING_FORMS`).
    """
    forms = S.BEARING_FORMS
    here = where.child(index, item)  # before the id is checked: the list index
    if v[forms.key] is not None:
        named = where.child(index, item, label=v["id"])
        for key in forms.excludes:
            if key in item:
                raise named.error(key, f"'{key}' comes from the catalogue when the bearing "
                                 f"is chosen; remove '{key}' or '{forms.key}'",
                                 f"either '{forms.key}' or the bearing's type, dimensions "
                                 "and ratings")
        return
    for key in forms.requires:
        if v[key] is None:
            doc = S.BEARING[key].doc.split(" (required unless")[0]
            what = forms.hint if key in {"C", "C0"} else doc
            raise ModelError(f"'{key}' is missing ({what})", file=here.file,
                             line=here.line_of(None), field=here.field(key),
                             expected=f"a key '{key}'" + (
                                 f", or '{forms.key}: {{catalogue: ...}}'"
                                 if key in {"C", "C0"} else ""))


#: Bearing bores [mm] outside which a value is almost certainly a unit slip.
PLAUSIBLE_BORE_MM = (3.0, 2000.0)
#: Smallest plausible drive power [W] (below: a unit slip, e.g. kW written as W).
PLAUSIBLE_POWER_W = 5.0


def _note_bore(where: Where, key: str, bore_mm: float) -> None:
    low, high = PLAUSIBLE_BORE_MM
    if not low <= bore_mm <= high:
        side = "below 3 mm" if bore_mm < low else "above 2 m"
        S.note(where, key, f"bore read as {bore_mm:g} mm, {side}: is the unit right?")


def _read_open_seat(here: Where, v: dict[str, Any], steps: list[Step], seats: _Seats,
                    shaft_id: str) -> OpenSeat:
    """The :class:`OpenSeat` of a bearing with ``choose`` (catalogue read, bore found)."""
    c = read_section(here, v["choose"], S.CHOOSE, "choose")
    cw = here.child("choose", v["choose"])
    catalogue = _open_catalogue(cw, c["catalogue"], seats)
    kinds = tuple(BearingKind(k) for k in c["types"] or ())
    if kinds and not any(catalogue.of_kind(*kinds)):
        held = sorted({k.value for k in catalogue.kind})
        raise cw.error("types", f"the catalogue {catalogue.source} has no bearing of type "
                       + ", ".join(k.value for k in kinds),
                       "types it holds: " + ", ".join(held))
    bore = c["bore"] if c["bore"] is not None else _seat_diameter(here, cw, steps, v["at"])
    if c["bore"] is not None:
        _note_bore(cw, "bore", bore)
    if c["max_D"] is not None and c["max_D"] <= bore:
        raise cw.error("max_D", f"max_D {c['max_D']:g} mm is not larger than the bore "
                       f"{bore:g} mm", "max_D > bore")
    housing = tuple(c["housing_bores"] or ())
    hw = cw.child("housing_bores", v["choose"].get("housing_bores"))
    for i, outside in enumerate(housing):
        if outside <= bore:
            raise hw.error(i, f"housing bore {outside:g} mm is not larger than the bore "
                           f"{bore:g} mm", "outside diameters > bore")
    return OpenSeat(bearing_id=v["id"], shaft_id=shaft_id, catalogue=catalogue,
                    kinds=kinds, bore_mm=bore, max_D_mm=c["max_D"], max_B_mm=c["max_B"],
                    housing_bores_mm=housing, bore_tolerance_mm=c["bore_tolerance"],
                    line=here.line_of(None))


def _open_catalogue(cw: Where, name: str, seats: _Seats) -> Catalogue:
    """The catalogue ``name`` (relative to ``seats.folder``), read once per real path.

    A catalogue that cannot be opened is refused at the model's ``choose.catalogue`` key;
    errors inside it name the catalogue file and its line.
    """
    from shaftsys.io.catalogue import read_catalogue

    path = Path(name)
    if not path.is_absolute():
        path = seats.folder / path
    tried = os.path.abspath(path)
    if path.suffix.lower() not in {".csv", ".yaml", ".yml"}:
        raise cw.error("catalogue", f"cannot tell the form of the catalogue '{name}' from "
                       "its name", "a .csv, .yaml or .yml file")
    try:
        key = os.path.realpath(path)
        if key in seats.catalogues:
            return seats.catalogues[key]
        if not path.is_file():
            problem = "is a folder" if path.is_dir() else "does not exist"
            raise cw.error("catalogue", f"cannot read the catalogue: {tried} {problem}",
                           "the path of a catalogue file, relative to the model file")
        with open(path, "rb"):
            pass
    except OSError as exc:
        raise cw.error("catalogue", f"cannot read the catalogue {tried}: "
                       f"{exc.strerror or exc}", "a readable catalogue file") from None
    catalogue = read_catalogue(path)
    seats.catalogues[key] = catalogue
    return catalogue


def _seat_diameter(here: Where, cw: Where, steps: list[Step], x: float) -> float:
    """Diameter [mm] of the step at station ``x`` [mm]; a station on the edge between
    two steps of different diameter is ambiguous (refused at the ``choose`` key).
    """
    edge = 0.0
    for left, right in itertools.pairwise(steps):
        edge += left.length_mm
        if abs(x - edge) <= STATION_SNAP_MM and left.d_mm != right.d_mm:
            raise ModelError(f"the bearing at {x:g} mm sits on the shoulder between steps "
                             f"of {left.d_mm:g} mm and {right.d_mm:g} mm: give the seat "
                             "diameter as choose.bore", file=here.file,
                             line=here.line_of("choose"), field=cw.field("bore"),
                             expected="a key 'bore' under 'choose'")
    end = 0.0
    for step in steps:
        end += step.length_mm
        if x <= end + _TOL_MM:
            return step.d_mm
    return steps[-1].d_mm


def _placeholder(v: dict[str, Any], seat: OpenSeat, axial: AxialRole, line: int | None
                 ) -> Bearing:
    """The stand-in :class:`Bearing` of an open seat until one is chosen.

    A deep groove ball bearing (it may float and locate; the solve treats every radial
    type alike) of the seat bore, D = 1.5 bore, ratings of 1 N, pressure centre at
    mid-width; station, axial role, pair, set, stiffness and targets are the designer's.
    """
    return Bearing(
        id=v["id"], kind=BearingKind.DEEP_GROOVE_BALL, x_mm=v["at"], d_mm=seat.bore_mm,
        D_mm=1.5 * seat.bore_mm, B_mm=None, C_N=1.0, C0_N=1.0, rows=v["rows"],
        arrangement=SetArrangement(v["arrangement"]), axial=axial, pair=v["pair"],
        pressure_centre_offset_mm=0.0, radial_stiffness_N_mm=v["radial_stiffness"],
        tilt_stiffness_Nmm_rad=v["tilt_stiffness"], ribs=v["ribs"],
        target_life_h=v["target_life"], target_reliability=v["reliability"],
        s0_min=v["s0_min"], ec=v["ec"], line=line, within=v["within"],
        on_sleeve=v["mounting"] == "sleeve",
    )


def _geometry_angle(here: Where, v: dict[str, Any], key: str, linked: bool) -> float:
    """An angle that single shafts state and machine links derive from the geometry."""
    if linked:
        if v[key] is not None:
            raise here.error(key, f"'{key}' of a linked element follows from the shaft "
                             "positions in a machine model; remove it",
                             "no angle on elements that a link joins")
        return 0.0
    if v[key] is None:
        raise here.error(None, f"'{key}' is missing: say where the mating member sits, or "
                         "join the element to its mate with a link", f"a key '{key}'")
    return float(v[key])


def _read_element(where: Where, index: int, item: Any, length: float, ids: dict[str, str],
                  linked_ids: set[str]) -> Element:
    mapping = require_mapping(where, index, item)
    etype = mapping.get("type")
    if not isinstance(etype, str) or etype not in S.ELEMENT_TYPES:
        # read the common part to get a proper message on 'type'
        read_value(where.child(index, mapping), "type", etype, S._ELEMENT_COMMON["type"])
    fields = {**S._ELEMENT_COMMON, **S.ELEMENT_TYPES[str(etype)]}
    v = read_section(where, mapping, fields, index)
    eid = v["id"]
    here = where.child(index, mapping, label=eid)
    _claim_id(here, "id", eid, "element", ids)
    linked = eid in linked_ids
    if not 0.0 <= v["at"] <= length + _TOL_MM:
        raise here.error("at", f"element at {v['at']:g} mm is outside the shaft "
                         f"(0 to {length:g} mm)", f"a station between 0 and {length:g} mm")
    common = dict(id=eid, x_mm=v["at"], mass_kg=v["mass"],
                  polar_inertia_kgm2=v["polar_inertia"],
                  diametral_inertia_kgm2=v["diametral_inertia"], width_mm=v["width"],
                  line=here.line_of(None))
    if etype == "gear":
        helix = v["helix_angle"]
        if helix > 0 and v["hand"] is None:
            raise here.error("hand", "a helical gear needs its helix hand",
                             "hand: right or left")
        d = v["pitch_diameter"]
        if d is None:
            if v["module"] is None or v["teeth"] is None:
                raise here.error(None, "give 'pitch_diameter', or 'module' and 'teeth'",
                                 "pitch_diameter or module + teeth")
            d = v["module"] * v["teeth"] / math.cos(math.radians(helix))
        return Gear(**common, pitch_diameter_mm=d,  # type: ignore[arg-type]
                    normal_pressure_angle_deg=v["pressure_angle"], helix_angle_deg=helix,
                    hand=v["hand"] if helix > 0 else None,
                    mesh_angle_deg=_geometry_angle(here, v, "mesh_angle", linked),
                    internal=v["internal"], normal_module_mm=v["module"], teeth=v["teeth"])
    if etype == "bevel_gear":
        return BevelGear(**common,  # type: ignore[arg-type]
                         mean_pitch_diameter_mm=v["mean_pitch_diameter"],
                         pitch_cone_angle_deg=v["pitch_cone_angle"],
                         pressure_angle_deg=v["pressure_angle"],
                         mesh_angle_deg=_geometry_angle(here, v, "mesh_angle", linked),
                         apex=1 if v["apex"] == "+x" else -1)
    if etype == "pulley":
        if linked and v["slack_tension"] is not None:
            raise here.error("slack_tension", "a linked pulley takes its tensions from "
                             "the link's pretension", "no slack_tension on a linked pulley")
        if v["pretension"] is not None and v["slack_tension"] is not None:
            raise here.error("slack_tension", "give 'pretension' (fixed centres) or "
                             "'slack_tension' (take-up), not both", "one of the two")
        if not linked and v["pretension"] is None and v["slack_tension"] is None:
            raise here.error(None, "'pretension' is missing (or 'slack_tension' for a "
                             "take-up)", "pretension: 800 N, or slack_tension: 6 kN")
        hubs = tuple(v["hubs"] or ())
        if hubs:
            hw = here.child("hubs", mapping.get("hubs"))
            if len(hubs) < 2:
                raise here.error("hubs", "a drum with hubs needs at least two hub "
                                 "stations", "two or more stations, or no 'hubs'")
            for k, x in enumerate(hubs):
                if x > length + _TOL_MM:
                    raise hw.error(k, f"hub at {x:g} mm is outside the shaft (0 to "
                                   f"{length:g} mm)", f"a station between 0 and {length:g} mm")
            if linked:
                raise here.error("hubs", "a linked pulley has one hub",
                                 "no 'hubs' on a linked pulley")
        return Pulley(**common, diameter_mm=v["diameter"],  # type: ignore[arg-type]
                      mesh_angle_deg=_geometry_angle(here, v, "belt_angle", linked),
                      wrap_angle_deg=v["wrap_angle"],
                      pretension_N=v["pretension"] or 0.0,
                      friction_coefficient=v["friction"],
                      groove_angle_deg=v["groove_angle"],
                      slack_tension_N=v["slack_tension"], hubs_mm=hubs)
    if etype == "sprocket":
        return Sprocket(**common, pitch_diameter_mm=v["pitch_diameter"],  # type: ignore[arg-type]
                        mesh_angle_deg=_geometry_angle(here, v, "chain_angle", linked),
                        wrap_angle_deg=v["wrap_angle"])
    if etype == "coupling":
        return Coupling(**common, radial_force_N=v["radial_force"],  # type: ignore[arg-type]
                        radial_angle_deg=v["radial_angle"])
    if etype == "load":
        return ProcessLoad(**common,  # type: ignore[arg-type]
                           force_N=v["force"] or (0.0, 0.0, 0.0),
                           moment_Nmm=v["moment"] or (0.0, 0.0, 0.0))
    if etype == "mass":
        return LumpedMass(**common)  # type: ignore[arg-type]
    return Unbalance(**common, unbalance_gmm=v["unbalance"],  # type: ignore[arg-type]
                     phase_deg=v["phase"])


def _check_support(where: Where, shaft: Shaft, raw: LocatedList,
                   open_ids: set[str] | None = None) -> None:
    """Refuse shafts that the bearings cannot hold.

    The rules on a bearing's type (adjusted pairs, the tapered Y) are not applied to
    the placeholders of open seats (``open_ids``): the choice offers suitable types.
    """
    open_ids = open_ids or set()
    bw = where.child("bearings", raw)

    def at(i: int) -> Where:  # the i-th bearing's mapping, so errors name its keys
        return bw.child(i, raw[i], label=shaft.bearings[i].id)

    radial = [b for b in shaft.bearings if b.kind is not BearingKind.THRUST_BALL]
    tilt = any(b.tilt_stiffness_Nmm_rad for b in radial)
    if len(radial) == 0 or (len(radial) == 1 and not tilt):
        raise where.error("bearings", f"shaft '{shaft.id}' has {len(radial)} radial "
                          "support(s) and no tilting stiffness: it cannot be held",
                          "at least two radial bearings, or one with tilt_stiffness")
    positions = sorted(b.support_x_mm for b in radial)
    if len(radial) >= 2 and positions[-1] - positions[0] <= STATION_SNAP_MM and not tilt:
        raise where.error("bearings", f"the radial supports of shaft '{shaft.id}' all "
                          "act at one station: the shaft can tilt",
                          "supports at two different stations")
    # two rigid supports within STATION_SNAP_MM share a node: their split is undetermined
    rigid = sorted((i for i, b in enumerate(shaft.bearings)
                    if b.kind is not BearingKind.THRUST_BALL
                    and b.radial_stiffness_N_mm is None
                    and getattr(b, "within", None) is None),
                   key=lambda i: shaft.bearings[i].support_x_mm)
    for i, j in itertools.pairwise(rigid):
        first, second = shaft.bearings[i], shaft.bearings[j]
        if second.support_x_mm - first.support_x_mm <= STATION_SNAP_MM:
            raise at(j).error("at", f"bearings '{first.id}' and '{second.id}' support the "
                              f"shaft at one station ({second.support_x_mm:g} mm): how "
                              "the load splits between two rigid supports there is "
                              "undetermined", f"supports more than {STATION_SNAP_MM:g} mm "
                              "apart, or a radial_stiffness on one of them")
    for i, b in enumerate(shaft.bearings):
        if not -_TOL_MM <= b.support_x_mm <= shaft.length_mm + _TOL_MM:
            raise at(i).error("pressure_centre_offset",
                              f"the pressure centre of bearing '{b.id}' "
                              f"({b.support_x_mm:g} mm) lies outside the shaft",
                              "a smaller pressure_centre_offset")
    both = [b for b in shaft.bearings if b.axial is AxialRole.BOTH]
    plus = [b for b in shaft.bearings if b.axial is AxialRole.PLUS_X]
    minus = [b for b in shaft.bearings if b.axial is AxialRole.MINUS_X]
    index = {b.id: i for i, b in enumerate(shaft.bearings)}
    if len(both) > 1:
        raise at(index[both[1].id]).error(
            "axial", f"bearings '{both[0].id}' and '{both[1].id}' both locate in both "
            "directions: the shaft would be clamped axially",
            "one locating bearing (axial: both), the others float")
    if both and (plus or minus):
        b = (plus or minus)[0]
        raise at(index[b.id]).error(
            "axial", f"bearing '{b.id}' takes thrust in one direction while "
            f"'{both[0].id}' already locates in both",
            "either one bearing with axial: both, or one +x and one -x")
    if not both and not (plus and minus):
        # a +x bearing stops motion toward +x: the shaft then slides freely toward -x
        free = "-x" if plus else "+x" if minus else "+x and -x"
        raise where.error("bearings", f"shaft '{shaft.id}' can slide axially toward {free}: "
                          "no bearing takes axial load" + (" toward -x" if plus else
                                                           " toward +x" if minus else ""),
                          "one bearing with axial: both, or one with +x and one with -x")
    if len(plus) > 1 or len(minus) > 1:
        b = plus[1] if len(plus) > 1 else minus[1]
        raise at(index[b.id]).error(
            "axial", "more than one bearing takes thrust in the same direction",
            "one +x and one -x bearing")
    for b in plus + minus:
        if b.pair is not None:
            partner = (minus if b in plus else plus)[0]
            if b.pair != partner.id or partner.pair != b.id:
                raise at(index[b.id]).error(
                    "pair", f"adjusted pair: '{b.id}' names '{b.pair}' but its opposite "
                    f"bearing is '{partner.id}'", "two bearings naming each other with 'pair'")
            if b.id in open_ids:
                continue
            if b.kind not in {BearingKind.ANGULAR_CONTACT_BALL, BearingKind.TAPERED_ROLLER}:
                raise at(index[b.id]).error(
                    "type", "an adjusted pair is made of single-row angular-contact ball or "
                    "tapered roller bearings", "type angular_contact_ball or tapered_roller")
            if b.kind is BearingKind.TAPERED_ROLLER and not b.Y:
                here = at(index[b.id])
                raise ModelError("the induced axial force of a tapered roller bearing "
                                 "needs the maker's Y", file=here.file,
                                 line=here.line_of("Y"), field=here.field("Y"),
                                 expected="a key 'Y' > 0")


def _read_life(top: Where, raw: Any) -> LifeSettings:
    if raw is None:
        return LifeSettings()
    v = read_section(top, raw, S.LIFE, "life")
    from shaftsys.bearings.reliability import life_factor

    try:  # the reliability must lie where the method is defined (ISO 281: 0.90..0.9995)
        life_factor(v["reliability"], v["reliability_method"], "life.reliability")
    except ModelError as exc:
        raise top.child("life", raw).error("reliability", exc.message,
                                           exc.expected) from None
    return LifeSettings(target_life_h=v["target"], target_reliability=v["reliability"],
                        reliability_method=v["reliability_method"],
                        application_factor=v["application_factor"],
                        min_speed_rpm=v["min_speed"], s0_min=v["s0_min"],
                        use_modified_life=v["modified_life"],
                        from_element_loads=v["from_element_loads"])


def _read_selection(top: Where, raw: Any) -> SelectionSettings:
    if raw is None:
        return SelectionSettings()
    v = read_section(top, raw, S.SELECTION, "selection")
    return SelectionSettings(objective=Objective(v["objective"]),
                             max_passes=v["max_passes"], runners_up=v["runners_up"])


def _read_lubrication(top: Where, raw: Any) -> Lubrication | None:
    if raw is None:
        return None
    v = read_section(top, raw, S.LUBRICATION, "lubrication")
    lw = top.child("lubrication", raw)
    if v["ec"] is None and v["cleanliness"] is None:
        raise lw.error(None, "give the contamination factor 'ec' or a 'cleanliness' code",
                       "ec or cleanliness")
    # what the Walther relation (bearings.lubrication) needs, located in the file
    for key in ("viscosity_40C", "viscosity_100C"):
        if v[key] <= 0.3:
            raise lw.error(key, f"{v[key]:g} mm^2/s is too thin for the Walther relation",
                           "a viscosity above 0.3 mm^2/s")
    if v["viscosity_100C"] >= v["viscosity_40C"]:
        raise lw.error("viscosity_100C", f"the viscosity at 100 degC ({v['viscosity_100C']:g} "
                       f"mm^2/s) is not below the one at 40 degC ({v['viscosity_40C']:g} "
                       "mm^2/s)", "an oil that thins as it warms up")
    return Lubrication(nu1_at_t1_mm2_s=v["viscosity_40C"], nu2_at_t2_mm2_s=v["viscosity_100C"],
                       t1_C=40.0, t2_C=100.0, ec=v["ec"], cleanliness=v["cleanliness"],
                       filtration_beta=v["filtration_beta"], method=v["method"],
                       ep_additives=v["ep_additives"])


def _check_pair_preloads(sw: Where, shafts_raw: Any, shafts: list[Shaft],
                         solver: SolverSettings) -> None:
    """A preload on a bearing of an adjusted pair at separate seats is the pair's
    mounted axial force: it needs the nonlinear bearing solve (the shaft's axial
    compatibility shares it) and an interior on both bearings, given once.
    """
    for i, (item, shaft) in enumerate(zip(shafts_raw, shafts, strict=True)):
        by_id = {b.id: b for b in shaft.bearings}
        braw = item.get("bearings") or []
        bw = sw.child(i, item).child("bearings", braw)
        for j, (b_raw, b) in enumerate(zip(braw, shaft.bearings, strict=False)):
            if (b.pair is None or b.interior is None or b.interior.preload_N is None
                    or b.rows >= 2):
                continue
            here = bw.child(j, b_raw).child("interior", b_raw.get("interior"))
            partner = by_id.get(b.pair)
            if solver.bearing_stiffness != "nonlinear":
                raise here.error("preload", f"the preload of the adjusted pair '{b.id}', "
                                 f"'{b.pair}' at separate seats is shared by the shaft's "
                                 "axial compatibility, which the rigid-support solve "
                                 "does not model", "solver: {bearing_stiffness: "
                                 "nonlinear}, or remove 'preload'")
            if partner is None or partner.interior is None:
                raise here.error("preload", f"a preloaded pair needs the interior of both "
                                 f"bearings; '{b.pair}' has none",
                                 f"an 'interior' on bearing '{b.pair}' too")
            if (partner.interior.preload_N is not None
                    and partner.interior.preload_N != b.interior.preload_N):
                raise here.error("preload", f"bearings '{b.id}' and '{b.pair}' give "
                                 "different preloads of their pair",
                                 "the preload on one bearing of the pair")


def _read_solver(top: Where, raw: Any) -> SolverSettings:
    if raw is None:
        return SolverSettings()
    v = read_section(top, raw, S.SOLVER, "solver")
    return SolverSettings(shear_deformation=v["shear_deformation"],
                          max_element_mm=v["max_element"],
                          residual_tolerance=v["residual_tolerance"],
                          include_shaft_weight=v["shaft_weight"],
                          bearing_stiffness=v["bearing_stiffness"],
                          nonlinear_tolerance=v["nonlinear_tolerance"],
                          nonlinear_max_iterations=v["nonlinear_max_iterations"])


def _read_links(where: Where, raw: LocatedList | None, shafts: list[Shaft]) -> list[Link]:
    """Links between elements on different shafts; kinds must match their members."""
    if raw is None:
        return []
    owner = {e.id: (s, e) for s in shafts for e in s.elements}
    wanted = {"gear_mesh": Gear, "bevel_mesh": BevelGear, "belt": Pulley, "chain": Sprocket}
    links: list[Link] = []
    seen: set[str] = set()
    for i, item in enumerate(raw):
        v = read_section(where, item, S.LINK, i)
        lid = v["id"]
        here = where.child(i, item, label=lid)
        if lid in seen:
            raise here.error("id", f"link id '{lid}' is used twice", "unique link ids")
        seen.add(lid)
        members = require_list(here, "members", v["members"])
        if len(members) != 2:
            raise here.error("members", f"a link joins two elements, got {len(members)}",
                             "[element_a, element_b]")
        mw = here.child("members", members)
        names = []
        for k, m in enumerate(members):
            name = str(m)
            if name not in owner:
                raise mw.error(k, f"no element '{name}'", "the id of an element on a shaft")
            if not isinstance(owner[name][1], wanted[v["type"]]):
                raise mw.error(k, f"'{name}' is a {owner[name][1].kind}, which a "
                               f"{v['type']} cannot join",
                               f"a {wanted[v['type']].__name__.lower()} element")
            names.append(name)
        if owner[names[0]][0].id == owner[names[1]][0].id:
            raise here.error("members", "both members sit on the same shaft",
                             "elements on two different shafts")
        if v["type"] == "belt" and v["pretension"] is None:
            raise here.error(None, "a belt link needs the installation 'pretension'",
                             "pretension: 900 N")
        links.append(Link(id=lid, kind=v["type"], members=(names[0], names[1]),
                          efficiency=v["efficiency"], pretension_N=v["pretension"],
                          line=here.line_of(None)))
    return links


def _read_cases(where: Where, raw: LocatedList, shafts: list[Shaft],
                linked_model: bool = False) -> tuple[list[Case], bool]:
    cases: list[Case] = []
    ids: set[str] = set()
    uses_share: list[int] = []
    uses_hours: list[int] = []
    elements = {e.id: (s, e) for s in shafts for e in s.elements}
    for i, item in enumerate(raw):
        v = read_section(where, item, S.CASE, i)
        cid = v["id"]
        here = where.child(i, item, label=cid)
        if cid in ids:
            raise here.error("id", f"case id '{cid}' is used twice", "unique case ids")
        ids.add(cid)
        kind = CaseKind(v["kind"])
        duration = 0.0
        if kind is CaseKind.DUTY:
            if v["share"] is None and v["hours"] is None:
                raise here.error(None, "a duty case needs 'share' or 'hours'",
                                 "share: 0.4 or hours: 2000 h")
            if v["share"] is not None and v["hours"] is not None:
                raise here.error("hours", "give 'share' or 'hours', not both",
                                 "one of share, hours")
            if v["share"] is not None:
                uses_share.append(i)
                duration = v["share"]
            else:
                uses_hours.append(i)
                duration = v["hours"]
        elif v["share"] not in (None, 0.0) or v["hours"] not in (None, 0.0):
            raise here.error("share" if v["share"] else "hours",
                             f"a {kind.value} case has no time share",
                             "no share or hours on peak and static cases")
        if uses_share and uses_hours:
            raise here.error("hours" if uses_hours[-1] == i else "share",
                             "time shares are mixed between fractions ('share') and "
                             "hours ('hours')", "the same one of share or hours in every "
                             "duty case")
        drives = (_read_machine_drive(here, v, shafts) if linked_model
                  else _read_drives(here, item, v, shafts))
        loads = _read_case_loads(here, v["loads"], item, elements)
        slack = _read_slack_tensions(here, v["slack_tensions"], elements)
        temperature = v["temperature"] if v["temperature"] is not None else float("nan")
        cases.append(Case(id=cid, kind=kind, duration=duration, drives=drives,
                          loads=tuple(loads), temperature_C=temperature,
                          line=here.line_of(None), slack_tensions=slack))
    duty = [c for c in cases if c.kind is CaseKind.DUTY]
    if not cases:
        raise where.error(None, "the model has no operating case", "at least one case")
    if duty and sum(c.duration for c in duty) <= 0:
        raise where.error(None, "the duty cases' shares add up to zero",
                          "positive shares or hours")
    if uses_share:
        total = sum(c.duration for c in duty)
        if abs(total - 1.0) > 1e-6:
            first = uses_share[0]
            fw = where.child(first, raw[first], label=cases[first].id)
            raise fw.error("share", f"the duty cases' shares add up to {total:.6g}, "
                           "not 1", "shares that sum to 1 (or use 'hours')")
    return cases, bool(uses_hours)


def _check_temperatures(where: Where, raw: LocatedList, cases: list[Case],
                        life: LifeSettings, lubrication: Lubrication | None) -> None:
    """The modified life (lubrication given, ``life.modified_life``) needs the operating
    temperature of every running duty case, as the life engine does
    (:func:`shaftsys.bearings.kernel.dynamic_cases`): refused here, before solving.
    """
    if lubrication is None or not life.use_modified_life:
        return
    for i, case in enumerate(cases):
        fast = any(abs(d.speed_rpm) >= life.min_speed_rpm and d.speed_rpm != 0.0
                   for d in case.drives.values())
        if case.kind is CaseKind.DUTY and case.duration > 0 and fast and \
                not math.isfinite(case.temperature_C):
            here = where.child(i, raw[i], label=case.id)
            raise ModelError("operating temperature is missing: with 'lubrication' given, "
                             "the modified life needs the lubricant's viscosity in every "
                             "running case", file=here.file, line=here.line_of(None),
                             field=here.field("temperature"),
                             expected="a key 'temperature' (e.g. temperature: 70 degC), or "
                             "life: {modified_life: false}")


def _read_drives(here: Where, item: LocatedDict, v: dict[str, Any], shafts: list[Shaft]
                 ) -> dict[str, Drive]:
    drives: dict[str, Drive] = {}
    if v["shafts"] is not None:
        if v["speed"] is not None or v["input"] is not None or v["outputs"] is not None:
            raise here.error("shafts", "give speed/input/outputs either per shaft under "
                             "'shafts' or at the case's top level", "one of the two")
        mapping = require_mapping(here, "shafts", v["shafts"])
        sw = here.child("shafts", mapping)
        known = {s.id: s for s in shafts}
        for sid, sub in mapping.items():
            if sid not in known:
                raise sw.error(sid, f"no shaft '{sid}'", "one of: " + ", ".join(known))
            dv = read_section(sw, sub, S.DRIVE, sid)
            drives[sid] = _drive(sw.child(sid, sub), dv, known[sid])
        for s in shafts:
            if s.id not in drives:
                raise here.error("shafts", f"no speed given for shaft '{s.id}'",
                                 "an entry for every shaft")
        return drives
    if len(shafts) > 1:
        raise here.error(None, "with several shafts, give each shaft's speed under "
                         "'shafts'", "shafts: {<id>: {speed: ...}}")
    if v["speed"] is None:
        raise here.error(None, "the case needs the shaft's 'speed'", "speed: 1450 rpm")
    drives[shafts[0].id] = _drive(here, v, shafts[0])
    return drives


def _read_machine_drive(here: Where, v: dict[str, Any], shafts: list[Shaft]
                        ) -> dict[str, Drive]:
    """A machine case: speed of the input element's shaft, input and outputs anywhere."""
    if v["shafts"] is not None:
        raise here.error("shafts", "in a machine model with links every shaft's speed "
                         "follows from the input; give speed, input and outputs once",
                         "speed, input, outputs at the case's top level")
    if v["speed"] is None or v["input"] is None:
        raise here.error(None, "a machine case needs 'speed' and 'input' (the speed is that "
                         "of the input element's shaft)", "speed: 1450 rpm, input: {...}")
    element = v["input"].get("element") if isinstance(v["input"], LocatedDict) else None
    owner = next((s for s in shafts for e in s.elements if e.id == element), None)
    if owner is None:
        # let _drive produce the located message about the input element
        owner = shafts[0]
    return {owner.id: _drive(here, v, owner, shafts)}


def _drive(here: Where, v: dict[str, Any], shaft: Shaft,
           machine: list[Shaft] | None = None) -> Drive:
    speed = v["speed"]
    torque_elements = {e.id: e for s in (machine or [shaft]) for e in s.elements
                       if e.carries_torque}
    if v["input"] is None:
        if v.get("outputs"):
            raise here.error("outputs", "outputs without an input", "an 'input'")
        return Drive(speed_rpm=speed)
    iv = read_section(here, v["input"], S.INPUT, "input")
    iw = here.child("input", v["input"])
    el = iv["element"]
    if el not in torque_elements:
        where_txt = "the machine" if machine else f"shaft '{shaft.id}'"
        raise iw.error("element", f"'{el}' is not a torque-carrying element of "
                       f"{where_txt}", "one of: " + (", ".join(torque_elements) or "none"))
    if (iv["power"] is None) == (iv["torque"] is None):
        raise iw.error(None, "give the input 'power' or 'torque' (one of them)",
                       "power: 7.5 kW or torque: 50 N*m")
    if iv["torque"] is not None:
        torque = iv["torque"]
    else:
        if speed == 0.0:
            raise iw.error("power", "power cannot be carried at zero speed; give 'torque'",
                           "torque: 50 N*m")
        from shaftsys.units import torque_from_power_Nmm

        torque = torque_from_power_Nmm(iv["power"], speed)
        if 0.0 < abs(iv["power"]) < PLAUSIBLE_POWER_W:
            S.note(iw, "power", f"drive power read as {iv['power']:g} W, below "
                   f"{PLAUSIBLE_POWER_W:g} W: is the unit right (kW)?")
    outputs_raw = v.get("outputs")
    if outputs_raw is None:
        raise here.error(None, "where does the power leave? give 'outputs'",
                         "outputs: {<element id>: 1.0}")
    outputs_map = require_mapping(here, "outputs", outputs_raw)
    ow = here.child("outputs", outputs_map)
    outputs: list[tuple[str, float]] = []
    for key, share in outputs_map.items():
        if key not in torque_elements:
            where_txt = "the machine" if machine else f"shaft '{shaft.id}'"
            raise ow.error(key, f"'{key}' is not a torque-carrying element of "
                           f"{where_txt}", "one of: " + ", ".join(torque_elements))
        if key == el:
            raise ow.error(key, "the input element cannot also be an output",
                           "another element")
        value = read_value(ow, key, share, S.Field("number", "share", minimum=0.0,
                                                  maximum=1.0))
        outputs.append((key, value))
    total = sum(s for _, s in outputs)
    if abs(total - 1.0) > 1e-6:
        raise ow.error(None, f"output shares add up to {total:.6g}, not 1",
                       "shares that sum to 1")
    return Drive(speed_rpm=speed, input_element=el, input_torque_Nmm=torque,
                 outputs=tuple(outputs))


def _read_slack_tensions(here: Where, raw: Any, elements: dict[str, tuple[Shaft, Element]]
                         ) -> tuple[tuple[str, float], ...]:
    """A case's ``slack_tensions``: pulley id -> slack-side tension [N] (take-ups)."""
    if raw is None:
        return ()
    mapping = require_mapping(here, "slack_tensions", raw)
    sw = here.child("slack_tensions", mapping)
    pulleys = [k for k, (_, e) in elements.items() if isinstance(e, Pulley)
               and (e.slack_tension_N is not None or e.pretension_N > 0)]
    out = []
    for key, value in mapping.items():
        if key not in pulleys:
            raise sw.error(key, f"'{key}' is not a pulley of a single shaft",
                           "one of: " + (", ".join(pulleys) or "(no unlinked pulley)"))
        out.append((str(key), read_value(sw, key, value, S.Field(
            "quantity", "slack-side tension", dim="force", positive=True))))
    return tuple(out)


def _read_case_loads(here: Where, raw: Any, item: LocatedDict,
                     elements: dict[str, tuple[Shaft, Element]]) -> list[ElementLoad]:
    if raw is None:
        return []
    mapping = require_mapping(here, "loads", raw)
    lw = here.child("loads", mapping)
    out = []
    for key, sub in mapping.items():
        if key not in elements or not isinstance(elements[key][1], ProcessLoad):
            loads = [k for k, (_, e) in elements.items() if isinstance(e, ProcessLoad)]
            raise lw.error(key, f"'{key}' is not a load element",
                           "one of: " + (", ".join(loads) or "(no element of type load)"))
        v = read_section(lw, sub, S.CASE_LOAD, key)
        out.append(ElementLoad(element=key, force_N=v["force"] or (0.0, 0.0, 0.0),
                               moment_Nmm=v["moment"] or (0.0, 0.0, 0.0)))
    return out
