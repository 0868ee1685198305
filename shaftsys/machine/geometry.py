"""Where shafts and elements sit in the housing frame, and whether linked members fit.

Each shaft's frame is placed by ``Shaft.origin_mm`` (its x = 0), ``Shaft.axis`` (+x) and
``Shaft.up`` (+y, made perpendicular to the axis); +z = x × y. Mesh and belt directions,
wrap angles and speed ratios of links follow from these positions: no mesh angle is
entered by hand in a machine model.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike, NDArray

from shaftsys.errors import ModelError
from shaftsys.model import BevelGear, Element, Gear, Link, Model, Pulley, Shaft, Sprocket

Vec = NDArray[np.float64]

#: Centre distance must match the working pitch radii to this (absolute mm, relative).
CENTRE_DISTANCE_TOL_MM = 0.01
CENTRE_DISTANCE_TOL_REL = 1e-4
#: Axes closer than this (sine of the angle) count as parallel.
PARALLEL_TOL = 1e-6


def rotation(shaft: Shaft) -> Vec:
    """3x3 matrix whose columns are the shaft's x, y, z axes in the housing frame."""
    x = np.asarray(shaft.axis, dtype=float)
    x = x / np.linalg.norm(x)
    if shaft.up is not None:
        up = np.asarray(shaft.up, dtype=float)
    else:
        up = np.array([0.0, 1.0, 0.0]) if abs(x[1]) < 0.9 else np.array([0.0, 0.0, 1.0])
    y = up - np.dot(up, x) * x
    y = y / np.linalg.norm(y)
    z = np.cross(x, y)
    return np.column_stack([x, y, z])


def to_housing(shaft: Shaft, v_local: ArrayLike) -> Vec:
    """A vector given in the shaft frame, in the housing frame."""
    return rotation(shaft) @ np.asarray(v_local, dtype=float)


def to_shaft(shaft: Shaft, v_housing: ArrayLike) -> Vec:
    """A vector given in the housing frame, in the shaft frame."""
    return rotation(shaft).T @ np.asarray(v_housing, dtype=float)


def station_point(shaft: Shaft, x_mm: float) -> Vec:
    """Housing-frame point [mm] of station ``x_mm`` on the shaft's axis."""
    return np.asarray(shaft.origin_mm, dtype=float) + x_mm * rotation(shaft)[:, 0]


def angle_in_shaft(shaft: Shaft, u_housing: Vec) -> float:
    """Angle [deg] from the shaft's +y toward +z of a housing-frame direction."""
    u = to_shaft(shaft, u_housing)
    return math.degrees(math.atan2(u[2], u[1]))


def owners(model: Model) -> dict[str, tuple[Shaft, Element]]:
    """Element id -> (its shaft, the element)."""
    return {e.id: (s, e) for s in model.shafts for e in s.elements}


def pitch_radius_mm(el: Element) -> float:
    """Working pitch radius [mm] of a linked element (mean radius for bevels)."""
    if isinstance(el, Gear):
        return el.pitch_diameter_mm / 2
    if isinstance(el, BevelGear):
        return el.mean_pitch_diameter_mm / 2
    if isinstance(el, Pulley):
        return el.diameter_mm / 2
    if isinstance(el, Sprocket):
        return el.pitch_diameter_mm / 2
    raise ValueError(f"element '{el.id}' of type {el.kind} cannot be linked")


@dataclass(frozen=True)
class LinkGeometry:
    """Geometry of one link: per member the direction toward the mesh (housing frame),
    that direction's angle in the member's shaft frame, the radius, and the kinematic
    ratio ``ratio = omega_b / omega_a`` (each about its own shaft's +x).
    """

    link: Link
    shafts: tuple[Shaft, Shaft]
    elements: tuple[Element, Element]
    directions: tuple[Vec, Vec]
    angles_deg: tuple[float, float]
    radii_mm: tuple[float, float]
    ratio: float
    centre_distance_mm: float
    wrap_deg: tuple[float, float] | None = None


def link_geometry(model: Model, link: Link) -> LinkGeometry:
    """Directions, angles, radii, wrap angles and speed ratio of a link."""
    own = owners(model)
    (sa, ea), (sb, eb) = own[link.members[0]], own[link.members[1]]
    ca = station_point(sa, ea.x_mm)
    cb = station_point(sb, eb.x_mm)
    ax_a = rotation(sa)[:, 0]
    ax_b = rotation(sb)[:, 0]
    d_ab = cb - ca
    perp_a = d_ab - np.dot(d_ab, ax_a) * ax_a
    perp_b = -d_ab - np.dot(-d_ab, ax_b) * ax_b
    dist = float(np.linalg.norm(perp_a))
    if dist < 1e-9 or np.linalg.norm(perp_b) < 1e-9:
        raise ModelError(f"link '{link.id}': the members '{ea.id}' and '{eb.id}' sit on one "
                         "axis; their shafts cannot mesh", line=link.line,
                         field=f"links[{link.id}]", expected="shafts placed side by side")
    ua = perp_a / np.linalg.norm(perp_a)
    ub = perp_b / np.linalg.norm(perp_b)
    ra, rb = pitch_radius_mm(ea), pitch_radius_mm(eb)
    wrap = None
    if isinstance(ea, Gear) and isinstance(eb, Gear) and (ea.internal or eb.internal):
        # internal mesh: the pitch point lies beyond the pinion, away from the ring's axis
        if ea.internal:
            ub = -ub
        else:
            ua = -ua
    if link.kind in {"gear_mesh", "bevel_mesh"}:
        sign = float(np.sign(np.dot(np.cross(ax_a, ua), np.cross(ax_b, ub))))
        ratio = sign * ra / rb
    else:
        sign = float(np.sign(np.dot(ax_a, ax_b)))
        ratio = sign * ra / rb
        wrap = open_wrap_angles_deg(ra, rb, dist)
    return LinkGeometry(link=link, shafts=(sa, sb), elements=(ea, eb), directions=(ua, ub),
                        angles_deg=(angle_in_shaft(sa, ua), angle_in_shaft(sb, ub)),
                        radii_mm=(ra, rb), ratio=ratio, centre_distance_mm=dist, wrap_deg=wrap)


def open_wrap_angles_deg(ra: float, rb: float, centre_mm: float) -> tuple[float, float]:
    """Wrap angles [deg] of an open belt or chain: 180 -/+ 2 asin((R - r)/C)."""
    s = (rb - ra) / centre_mm
    if abs(s) >= 1:
        raise ValueError("pulleys overlap")
    beta = math.degrees(math.asin(s))
    return 180.0 - 2 * beta, 180.0 + 2 * beta


def check_machine(model: Model) -> None:
    """Refuse links whose geometry does not fit (ModelError naming the link and line)."""
    for link in model.links:
        _check_link(model, link)


def _fail(link: Link, message: str, expected: str) -> ModelError:
    return ModelError(f"link '{link.id}': {message}", line=link.line,
                      field=f"links[{link.id}]", expected=expected)


def _check_link(model: Model, link: Link) -> None:
    own = owners(model)
    (sa, ea), (sb, eb) = own[link.members[0]], own[link.members[1]]
    ax_a = rotation(sa)[:, 0]
    ax_b = rotation(sb)[:, 0]
    sin_angle = float(np.linalg.norm(np.cross(ax_a, ax_b)))
    if link.kind in {"gear_mesh", "belt", "chain"} and sin_angle > PARALLEL_TOL:
        raise _fail(link, f"the axes of shafts '{sa.id}' and '{sb.id}' are not parallel "
                    f"({math.degrees(math.asin(min(sin_angle, 1.0))):.3g} deg apart)",
                    "parallel shaft axes for spur/helical meshes, belts and chains")
    geo = link_geometry(model, link)
    ra, rb = geo.radii_mm
    dist = geo.centre_distance_mm
    if link.kind == "gear_mesh":
        assert isinstance(ea, Gear) and isinstance(eb, Gear)
        if ea.internal and eb.internal:
            raise _fail(link, "two internal gears cannot mesh", "one internal gear at most")
        internal = ea.internal or eb.internal
        expected = abs(ra - rb) if internal else ra + rb
        tol = max(CENTRE_DISTANCE_TOL_MM, CENTRE_DISTANCE_TOL_REL * expected)
        if abs(dist - expected) > tol:
            what = "difference" if internal else "sum"
            raise _fail(link, f"centre distance {dist:.4f} mm does not match the {what} of "
                        f"the working pitch radii {expected:.4f} mm",
                        f"a centre distance within {tol:.3g} mm of {expected:.4f} mm")
        if ea.normal_module_mm and eb.normal_module_mm and \
                abs(ea.normal_module_mm - eb.normal_module_mm) > 1e-9:
            raise _fail(link, f"normal modules differ ({ea.normal_module_mm:g} and "
                        f"{eb.normal_module_mm:g} mm)", "equal normal modules")
        if abs(ea.normal_pressure_angle_deg - eb.normal_pressure_angle_deg) > 1e-9:
            raise _fail(link, "normal pressure angles differ "
                        f"({ea.normal_pressure_angle_deg:g} and "
                        f"{eb.normal_pressure_angle_deg:g} deg)", "equal pressure angles")
        if abs(ea.helix_angle_deg - eb.helix_angle_deg) > 1e-9:
            raise _fail(link, f"helix angles differ ({ea.helix_angle_deg:g} and "
                        f"{eb.helix_angle_deg:g} deg)", "equal helix angles")
        if ea.helix_angle_deg > 0:
            same = ea.hand == eb.hand
            # with antiparallel axes the hand seen in each frame is the same physical hand
            if internal and not same:
                raise _fail(link, "an internal helical pair needs the same hand on both "
                            "gears", "equal hands")
            if not internal and same:
                raise _fail(link, f"both gears are {ea.hand}-hand: an external helical "
                            "pair needs opposite hands", "one right-hand, one left-hand")
        _check_faces(link, sa, ea, sb, eb)
    elif link.kind == "bevel_mesh":
        _check_bevel(link, sa, ea, sb, eb)
    else:
        _check_faces(link, sa, ea, sb, eb)


def _check_faces(link: Link, sa: Shaft, ea: Element, sb: Shaft, eb: Element) -> None:
    """The members' faces must overlap along the (parallel) axes (when widths are given)."""
    ax = rotation(sa)[:, 0]
    offset = float(np.dot(station_point(sb, eb.x_mm) - station_point(sa, ea.x_mm), ax))
    if ea.width_mm is not None and eb.width_mm is not None:
        reach = (ea.width_mm + eb.width_mm) / 2
        if abs(offset) >= reach:
            raise _fail(link, f"the faces of '{ea.id}' and '{eb.id}' do not overlap along "
                        f"the axis (centre planes {abs(offset):.3g} mm apart, widths "
                        f"{ea.width_mm:g} and {eb.width_mm:g} mm)",
                        "centre planes closer than half the sum of the widths")


def _check_bevel(link: Link, sa: Shaft, ea: Element, sb: Shaft, eb: Element) -> None:
    """Bevel axes must intersect and the pitch cone angles add up to the shaft angle."""
    assert isinstance(ea, BevelGear) and isinstance(eb, BevelGear)
    pa, pb = station_point(sa, 0.0), station_point(sb, 0.0)
    xa, xb = rotation(sa)[:, 0], rotation(sb)[:, 0]
    n = np.cross(xa, xb)
    if np.linalg.norm(n) < PARALLEL_TOL:
        raise _fail(link, "a bevel pair needs crossing axes", "shaft axes at an angle")
    gap = abs(float(np.dot(pb - pa, n / np.linalg.norm(n))))
    if gap > CENTRE_DISTANCE_TOL_MM:
        raise _fail(link, f"the shaft axes miss each other by {gap:.4g} mm", "axes that "
                    "intersect (offset axes are hypoid gears, not bevels)")
    shaft_angle = math.degrees(math.acos(max(-1.0, min(1.0, float(np.dot(xa, xb))))))
    cones = ea.pitch_cone_angle_deg + eb.pitch_cone_angle_deg
    if abs(cones - shaft_angle) > 0.01 and abs(cones - (180 - shaft_angle)) > 0.01:
        raise _fail(link, f"pitch cone angles add up to {cones:g} deg but the shafts are "
                    f"{shaft_angle:.4g} deg apart", "cone angles that add up to the shaft "
                    "angle")
