"""Nodes and element properties of a stepped straight shaft.

Units: positions and lengths [mm], moduli [MPa], areas [mm^2], second moments [mm^4],
density [kg/m^3], shear coefficient [-].

A shaft is described by contiguous steps ``[x0, x1)`` (the last one closed), each with its
own section and material (:class:`Steps`). :func:`build_mesh` puts a node at every step
edge and every requested station (bearing, gear, load position...), then subdivides each
interval into equal elements no longer than ``max_element_mm``. Every element lies inside
one step, so element properties are constant along an element.

The compulsory nodes are made by three small functions that the design-study evaluator
(:mod:`shaftsys.study.batched`) calls with a batch axis and :func:`build_mesh` with a
batch of one: :func:`snap_stations_batch` (stations within :data:`STATION_SNAP_MM` of a
step edge or of another station move onto it), :func:`node_order` (sort edges and
stations, find the gaps above :data:`COINCIDENT_TOL_MM`) and :func:`cluster_nodes` (one
node per cluster, a step edge fixes its position; the step of every interval).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np
from numpy.typing import ArrayLike, NDArray

from shaftsys.errors import ModelError
from shaftsys.fe.sections import Section, circular_section_arrays

__all__ = [
    "COINCIDENT_TOL_MM",
    "STATION_SNAP_MM",
    "BeamMesh",
    "Steps",
    "build_mesh",
    "cluster_nodes",
    "node_order",
    "snap_stations",
    "snap_stations_batch",
]

#: Stations closer than this [mm] are the same node.
COINCIDENT_TOL_MM = 1e-9
#: Stations (bearing pressure centres, elements) closer than this [mm] to a step edge or
#: to another station share its node (:func:`snap_stations`): a gap of micrometres would
#: make an element a million times shorter than its neighbours and ruin the
#: conditioning of the bending stiffness.
STATION_SNAP_MM = 1e-3
#: Most beam elements a shaft is meshed into (the dense modal analysis of the shaft
#: checks grows with the cube of it: some 30 s at 2000 elements); the loader refuses a
#: longer mesh before solving, the solve again for models built in Python.
MAX_ELEMENTS = 2000

_ELEMENT_FIELDS = ("E_MPa", "G_MPa", "A_mm2", "I_mm4", "J_mm4", "k_shear", "rho_kg_m3")


def _frozen(a: ArrayLike, n: int, name: str) -> NDArray[np.float64]:
    """Float copy of ``a`` broadcast to length ``n``, made read-only."""
    arr = np.array(np.broadcast_to(np.asarray(a, dtype=float), (n,)), dtype=float)
    if arr.shape != (n,):  # pragma: no cover - broadcast_to already enforces it
        raise ModelError(f"{name} has shape {arr.shape}, expected ({n},)")
    arr.setflags(write=False)
    return arr


def _check_properties(obj: object, n: int, owner: str) -> None:
    """Broadcast, freeze and validate the per-element (or per-step) property arrays."""
    for name in _ELEMENT_FIELDS:
        try:
            arr = _frozen(getattr(obj, name), n, name)
        except ValueError as exc:
            raise ModelError(
                f"{owner}.{name} does not match {n} {owner} intervals", expected=f"{n} values"
            ) from exc
        positive = name != "rho_kg_m3"
        bad = ~np.isfinite(arr) | ((arr <= 0.0) if positive else (arr < 0.0))
        if np.any(bad):
            i = int(np.flatnonzero(bad)[0])
            raise ModelError(
                f"{owner}.{name}[{i}] = {arr[i]!r} is not valid",
                field=f"{owner}.{name}",
                expected="a finite value > 0" if positive else "a finite value >= 0",
            )
        object.__setattr__(obj, name, arr)


@dataclass(frozen=True, eq=False)
class Steps:
    """Contiguous shaft steps with constant section and material in each.

    Step ``i`` covers ``[edges_mm[i], edges_mm[i+1])``; the last step includes its end.
    Scalars broadcast to every step.

    Attributes
    ----------
    edges_mm:
        Step edges [mm], strictly increasing, ``n_steps + 1`` values.
    E_MPa, G_MPa:
        Young's and shear moduli [MPa] per step.
    A_mm2, I_mm4, J_mm4:
        Area [mm^2], diametral and polar second moments [mm^4] per step.
    k_shear:
        Timoshenko shear coefficient [-] per step.
    rho_kg_m3:
        Density [kg/m^3] per step (0 allowed for statics).
    """

    edges_mm: NDArray[np.float64]
    E_MPa: NDArray[np.float64]
    G_MPa: NDArray[np.float64]
    A_mm2: NDArray[np.float64]
    I_mm4: NDArray[np.float64]
    J_mm4: NDArray[np.float64]
    k_shear: NDArray[np.float64]
    rho_kg_m3: NDArray[np.float64]

    def __post_init__(self) -> None:
        edges = np.array(self.edges_mm, dtype=float).ravel()
        if edges.size < 2 or not np.all(np.isfinite(edges)):
            raise ModelError("step edges must be at least two finite positions [mm]")
        if np.any(np.diff(edges) <= COINCIDENT_TOL_MM):
            raise ModelError(
                "step edges must be strictly increasing", expected="each step longer than 1e-9 mm"
            )
        edges.setflags(write=False)
        object.__setattr__(self, "edges_mm", edges)
        _check_properties(self, edges.size - 1, "steps")

    @property
    def n_steps(self) -> int:
        """Number of steps."""
        return int(self.edges_mm.size - 1)

    @classmethod
    def from_diameters(
        cls,
        edges_mm: ArrayLike,
        d_outer_mm: ArrayLike,
        d_bore_mm: ArrayLike = 0.0,
        *,
        E_MPa: ArrayLike,
        poisson: ArrayLike,
        G_MPa: ArrayLike | None = None,
        rho_kg_m3: ArrayLike = 0.0,
    ) -> Steps:
        """Build steps of round sections from diameters and material constants.

        Parameters
        ----------
        edges_mm:
            Step edges [mm], ``n_steps + 1`` values.
        d_outer_mm, d_bore_mm:
            Outer and bore diameters [mm] per step (bore 0 for solid).
        E_MPa:
            Young's modulus [MPa].
        poisson:
            Poisson's ratio [-] (enters Cowper's shear coefficient, and G when G is not
            given).
        G_MPa:
            Shear modulus [MPa]; ``None`` = isotropic G = E / (2 (1 + nu)).
        rho_kg_m3:
            Density [kg/m^3].

        Returns
        -------
        Steps
        """
        edges = np.asarray(edges_mm, dtype=float).ravel()
        n = max(edges.size - 1, 0)
        do = np.broadcast_to(np.asarray(d_outer_mm, dtype=float), (n,))
        di = np.broadcast_to(np.asarray(d_bore_mm, dtype=float), (n,))
        nu = np.broadcast_to(np.asarray(poisson, dtype=float), (n,))
        if np.any(~np.isfinite(do) | (do <= 0.0)) or np.any(~(di >= 0.0) | ~(di < do)):
            raise ModelError("step diameters invalid", expected="0 <= bore < outer, outer > 0 mm")
        if np.any(~(nu > -1.0) | ~(nu < 0.5)):
            raise ModelError("Poisson's ratio out of range", expected="-1 < nu < 0.5")
        area, inertia, polar, k = circular_section_arrays(do, di, nu)
        E = np.broadcast_to(np.asarray(E_MPa, dtype=float), (n,))
        return cls(
            edges_mm=edges,
            E_MPa=E,
            G_MPa=E / (2.0 * (1.0 + nu)) if G_MPa is None else np.asarray(G_MPa, dtype=float),
            A_mm2=area,
            I_mm4=inertia,
            J_mm4=polar,
            k_shear=k,
            rho_kg_m3=np.asarray(rho_kg_m3, dtype=float),
        )

    @classmethod
    def from_sections(
        cls,
        edges_mm: ArrayLike,
        sections: list[Section] | tuple[Section, ...],
        *,
        E_MPa: ArrayLike,
        G_MPa: ArrayLike,
        rho_kg_m3: ArrayLike = 0.0,
    ) -> Steps:
        """Build steps from one :class:`~shaftsys.fe.sections.Section` per step.

        Parameters
        ----------
        edges_mm:
            Step edges [mm], ``len(sections) + 1`` values.
        sections:
            Section of each step.
        E_MPa, G_MPa:
            Young's and shear moduli [MPa] (scalar or per step).
        rho_kg_m3:
            Density [kg/m^3] (scalar or per step).

        Returns
        -------
        Steps
        """
        return cls(
            edges_mm=np.asarray(edges_mm, dtype=float),
            E_MPa=np.asarray(E_MPa, dtype=float),
            G_MPa=np.asarray(G_MPa, dtype=float),
            A_mm2=np.array([s.A_mm2 for s in sections], dtype=float),
            I_mm4=np.array([s.I_mm4 for s in sections], dtype=float),
            J_mm4=np.array([s.J_mm4 for s in sections], dtype=float),
            k_shear=np.array([s.k_shear for s in sections], dtype=float),
            rho_kg_m3=np.asarray(rho_kg_m3, dtype=float),
        )


@dataclass(frozen=True, eq=False)
class BeamMesh:
    """Nodes along x and constant properties per element.

    Attributes
    ----------
    x_mm:
        Node positions [mm], strictly increasing, shape (n_nodes,).
    E_MPa, G_MPa:
        Young's and shear moduli [MPa] per element, shape (n_nodes - 1,).
    A_mm2:
        Area [mm^2] per element.
    I_mm4:
        Diametral second moment [mm^4] per element (bending in either plane).
    J_mm4:
        Polar second moment [mm^4] per element (torsion).
    k_shear:
        Shear coefficient [-] per element.
    rho_kg_m3:
        Density [kg/m^3] per element.
    step_of_element:
        Index of the step each element belongs to (``-1`` when built directly).
    """

    x_mm: NDArray[np.float64]
    E_MPa: NDArray[np.float64]
    G_MPa: NDArray[np.float64]
    A_mm2: NDArray[np.float64]
    I_mm4: NDArray[np.float64]
    J_mm4: NDArray[np.float64]
    k_shear: NDArray[np.float64]
    rho_kg_m3: NDArray[np.float64]
    step_of_element: NDArray[np.intp] = field(default_factory=lambda: np.empty(0, dtype=np.intp))

    def __post_init__(self) -> None:
        x = np.array(self.x_mm, dtype=float).ravel()
        if x.size < 2 or not np.all(np.isfinite(x)):
            raise ModelError("a beam mesh needs at least two finite node positions [mm]")
        if np.any(np.diff(x) <= 0.0):
            raise ModelError("mesh node positions must be strictly increasing")
        x.setflags(write=False)
        object.__setattr__(self, "x_mm", x)
        n_e = x.size - 1
        _check_properties(self, n_e, "elements")
        steps = np.asarray(self.step_of_element, dtype=np.intp).ravel()
        if steps.size == 0:
            steps = np.full(n_e, -1, dtype=np.intp)
        if steps.shape != (n_e,):
            raise ModelError("step_of_element must have one entry per element")
        steps.setflags(write=False)
        object.__setattr__(self, "step_of_element", steps)

    @property
    def n_nodes(self) -> int:
        """Number of nodes."""
        return int(self.x_mm.size)

    @property
    def n_elements(self) -> int:
        """Number of elements (n_nodes - 1)."""
        return int(self.x_mm.size - 1)

    @property
    def L_mm(self) -> NDArray[np.float64]:
        """Element lengths [mm], shape (n_elements,)."""
        return np.diff(self.x_mm)

    @property
    def EI_Nmm2(self) -> NDArray[np.float64]:
        """Bending rigidity E*I [N*mm^2] per element."""
        return self.E_MPa * self.I_mm4

    @property
    def kGA_N(self) -> NDArray[np.float64]:
        """Shear rigidity k*G*A [N] per element."""
        return self.k_shear * self.G_MPa * self.A_mm2

    @property
    def EA_N(self) -> NDArray[np.float64]:
        """Axial rigidity E*A [N] per element."""
        return self.E_MPa * self.A_mm2

    @property
    def GJ_Nmm2(self) -> NDArray[np.float64]:
        """Torsional rigidity G*J [N*mm^2] per element."""
        return self.G_MPa * self.J_mm4


def snap_stations_batch(
    stations_mm: ArrayLike, edges_mm: ArrayLike, tol_mm: float = STATION_SNAP_MM
) -> NDArray[np.float64]:
    """Move stations onto the nearest step edge or earlier-placed station within tol_mm.

    For every variant (row) the stations are taken in increasing x (equal positions in
    the order given). A station is compared with the step edges (in their order) and
    then with the stations already placed (in the order they were placed); the first
    place at the smallest distance is its nearest. Within ``tol_mm`` the station takes
    that place's position, otherwise it keeps its own and becomes a place itself. The
    loop runs over the stations; every step of it works on all variants at once.

    Parameters
    ----------
    stations_mm:
        Stations [mm], shape (B, P) (or (P,) for one variant); finite.
    edges_mm:
        Step edges [mm], shape (B, n_steps + 1), or (n_steps + 1,) shared by all rows.
    tol_mm:
        Snap distance [mm] (a distance equal to it snaps).

    Returns
    -------
    numpy.ndarray
        Snapped stations [mm], shape (B, P), in the order given.
    """
    st = np.atleast_2d(np.asarray(stations_mm, dtype=float))
    ed = np.atleast_2d(np.asarray(edges_mm, dtype=float))
    B = max(st.shape[0], ed.shape[0])
    P, n_e = st.shape[1], ed.shape[1]
    st = np.broadcast_to(st, (B, P))
    out = np.array(st, dtype=float)
    if P == 0:
        return out
    order = np.argsort(st, axis=1, kind="stable")
    # place-major (place, variant): edges, then the stations placed so far; the first
    # place at the smallest distance is the first where the distance equals its minimum
    # over the places (argmin's pick; min over the outer axis is the fast reduction)
    places = np.full((n_e + P, B), np.inf)
    places[:n_e] = ed.T
    rows = np.arange(B)
    work = np.empty_like(places)
    for i in range(P):
        col = order[:, i]
        x = st[rows, col]
        k = n_e + i
        dist = np.subtract(places[:k], x, out=work[:k])
        np.abs(dist, out=dist)
        at_min = dist == dist.min(axis=0)
        nearest = places[k - 1].copy()
        for r in range(k - 2, -1, -1):     # the first place at the minimum wins
            np.copyto(nearest, places[r], where=at_min[r])
        snap = np.abs(nearest - x) <= tol_mm
        out[rows, col] = np.where(snap, nearest, x)
        places[n_e + i] = np.where(snap, np.inf, x)
    return out


def snap_stations(
    stations_mm: Sequence[float], edges_mm: Sequence[float], tol_mm: float = STATION_SNAP_MM
) -> list[float]:
    """Stations [mm] snapped as :func:`snap_stations_batch` does, for one shaft.

    ``stations_mm`` and ``edges_mm`` [mm] are sequences; the snapped stations are
    returned in the order given.
    """
    st = np.asarray(stations_mm, dtype=float).reshape(1, -1)
    ed = np.asarray(edges_mm, dtype=float).reshape(1, -1)
    return [float(v) for v in snap_stations_batch(st, ed, tol_mm)[0]]


def node_order(
    points_mm: ArrayLike, tol_mm: float = COINCIDENT_TOL_MM
) -> tuple[NDArray[np.intp], NDArray[np.bool_]]:
    """Sort order of the compulsory points and where a new node starts.

    Parameters
    ----------
    points_mm:
        Step edges followed by stations [mm], shape (B, Q).
    tol_mm:
        Consecutive sorted points farther apart than this [mm] are different nodes (a
        cluster whose consecutive gaps are all below it is one node).

    Returns
    -------
    order : numpy.ndarray of int
        Stable sort order of each row, shape (B, Q).
    gaps : numpy.ndarray of bool
        Shape (B, Q - 1): sorted point ``i + 1`` starts a new node. Rows with equal
        ``order`` and ``gaps`` share one mesh topology (:func:`cluster_nodes`).
    """
    pts = np.atleast_2d(np.asarray(points_mm, dtype=float))
    order = np.argsort(pts, axis=1, kind="stable")
    srt = np.take_along_axis(pts, order, axis=1)
    return order, np.diff(srt, axis=1) > tol_mm


def cluster_nodes(
    points_mm: ArrayLike, n_edges: int, order: ArrayLike, gaps: ArrayLike
) -> tuple[NDArray[np.float64], NDArray[np.intp], NDArray[np.intp]]:
    """Nodes of variants that share one topology (from :func:`node_order`).

    Parameters
    ----------
    points_mm:
        Step edges (the first ``n_edges`` columns) followed by stations [mm], shape
        (B, Q).
    n_edges:
        Number of step edges (n_steps + 1).
    order, gaps:
        One row of :func:`node_order`, shapes (Q,) and (Q - 1,), valid for every row
        of ``points_mm``.

    Returns
    -------
    x : numpy.ndarray
        Node positions [mm], shape (B, n_nodes): the first sorted point of each
        cluster, or the step edge in it (an edge fixes a cluster's position).
    point_node : numpy.ndarray of int
        Node of every point, shape (Q,).
    interval_step : numpy.ndarray of int
        Step of every interval between consecutive nodes, shape (n_nodes - 1,)
        (taken from the first row).
    """
    pts = np.atleast_2d(np.asarray(points_mm, dtype=float))
    order_ = np.asarray(order, dtype=np.intp)
    new = np.concatenate([[True], np.asarray(gaps, dtype=bool)])
    point_node = np.empty(order_.size, dtype=np.intp)
    point_node[order_] = np.cumsum(new) - 1
    x = pts[:, order_[new]]
    x[:, point_node[:n_edges]] = pts[:, :n_edges]  # edge positions win inside a cluster
    mid = 0.5 * (x[0, :-1] + x[0, 1:])
    step = np.clip(
        np.searchsorted(pts[0, :n_edges], mid, side="right") - 1, 0, n_edges - 2
    ).astype(np.intp)
    return x, point_node, step


def build_mesh(
    steps: Steps,
    stations_mm: ArrayLike = (),
    max_element_mm: float = math.inf,
    *,
    snap_mm: float = 0.0,
) -> tuple[BeamMesh, NDArray[np.intp]]:
    """Mesh a stepped shaft with nodes at every step edge and station.

    Parameters
    ----------
    steps:
        Contiguous steps of the shaft (see :class:`Steps`).
    stations_mm:
        Positions [mm] that must be nodes (supports, load points, output points). Must
        lie on the shaft, ``edges[0] <= x <= edges[-1]`` (to within 1e-9 mm).
    max_element_mm:
        Longest allowed element [mm] (> 0; ``inf`` = only the compulsory nodes).
    snap_mm:
        Snap distance [mm]: above 0 the stations are first moved by
        :func:`snap_stations` (pass :data:`STATION_SNAP_MM` for the rule of the single
        run and the design study); 0 = stations as given.

    Returns
    -------
    mesh : BeamMesh
        The mesh; element ``e`` carries the properties of step ``mesh.step_of_element[e]``.
    station_nodes : numpy.ndarray of int
        Node index of each requested station, in the order given. Positions closer than
        :data:`COINCIDENT_TOL_MM` share one node (a cluster whose consecutive gaps are all
        below the tolerance is one node; a step edge in a cluster fixes its position).

    Raises
    ------
    ModelError
        A station off the shaft or an invalid ``max_element_mm``.
    """
    if not (max_element_mm > 0.0):
        raise ModelError(f"max_element_mm = {max_element_mm!r}", expected="> 0 mm")
    edges = steps.edges_mm
    stations = np.asarray(stations_mm, dtype=float).ravel()
    if snap_mm > 0.0 and stations.size and np.all(np.isfinite(stations)):
        stations = snap_stations_batch(stations[None], edges[None], snap_mm)[0]
    if stations.size and (
        not np.all(np.isfinite(stations))
        or stations.min() < edges[0] - COINCIDENT_TOL_MM
        or stations.max() > edges[-1] + COINCIDENT_TOL_MM
    ):
        bad = stations[
            ~np.isfinite(stations)
            | (stations < edges[0] - COINCIDENT_TOL_MM)
            | (stations > edges[-1] + COINCIDENT_TOL_MM)
        ]
        raise ModelError(
            f"station at x = {bad[0]!r} mm is off the shaft",
            expected=f"{edges[0]!r} <= x <= {edges[-1]!r} mm",
        )

    # Merge edges and stations into unique compulsory nodes (shared with the study).
    pts = np.concatenate([edges, stations])[None]
    order, gaps = node_order(pts)
    x_nodes, cluster, interval_step = cluster_nodes(pts, edges.size, order[0], gaps[0])
    nodes = x_nodes[0]

    # Subdivide every interval into equal elements no longer than max_element_mm.
    lengths = np.diff(nodes)
    if math.isinf(max_element_mm):
        n_sub = np.ones(lengths.size, dtype=np.intp)
    else:
        n_sub = np.maximum(1, np.ceil(lengths / max_element_mm - 1e-9)).astype(np.intp)
    first = np.concatenate([[0], np.cumsum(n_sub)])
    total = int(first[-1])
    interval = np.repeat(np.arange(lengths.size), n_sub)
    j = np.arange(total) - first[interval]
    x = np.empty(total + 1)
    x[:-1] = nodes[interval] + lengths[interval] * (j / n_sub[interval])
    x[-1] = nodes[-1]

    step = np.repeat(interval_step, n_sub)
    mesh = BeamMesh(
        x_mm=x,
        E_MPa=steps.E_MPa[step],
        G_MPa=steps.G_MPa[step],
        A_mm2=steps.A_mm2[step],
        I_mm4=steps.I_mm4[step],
        J_mm4=steps.J_mm4[step],
        k_shear=steps.k_shear[step],
        rho_kg_m3=steps.rho_kg_m3[step],
        step_of_element=step,
    )
    station_nodes = first[cluster[edges.size :]].astype(np.intp)
    return mesh, station_nodes
