"""Load-duration reduction of a torque/speed time series into operating cases.

Pure numerics (numpy), no I/O: the reader (:mod:`shaftsys.io.timeseries`) hands over
chunks of samples with their durations; this module

* scans the series (:class:`SeriesScan`: time, revolutions, ranges per sign region),
* bins it (:class:`BinAccumulator`) in |torque| (1-D) or |torque| x |speed| (2-D), one
  set of bins per sign region of (torque, speed), so reversed and back-driven running
  become cases of their own,
* gives each bin a representative torque that keeps its damage: the revolution-weighted
  p-th power mean ``T_rep = (sum n_i |T_i|^p / sum n_i)^(1/p)`` (n_i revolutions of
  sample i), its speed ``n_rep = revolutions / time`` (so its revolutions are kept) and
  its time share,
* integrates P^p directly over the raw samples (:class:`DirectIntegral`) with the
  bearing loads superposed from a few solves (the shaft model is affine in the input
  torque within one sign region: :class:`AffineLoads`).

Units: time s, torque N*mm, speed rpm, forces N; revolutions are revolutions.
Standstill samples (|n| below the standstill speed, the life settings' ``min_speed_rpm``)
count for time but not for revolutions.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field

import numpy as np
import numpy.typing as npt

from shaftsys.bearings.arrays import BearingArrays
from shaftsys.bearings.axial import axial_reactions
from shaftsys.bearings.equivalent import equivalent_dynamic_load_arrays
from shaftsys.model import Bearing

FloatArray = npt.NDArray[np.float64]

#: sign regions: (name, sign of torque, sign of speed)
REGIONS: tuple[tuple[str, float, float], ...] = (
    ("forward", 1.0, 1.0),
    ("back_driven", -1.0, 1.0),
    ("reverse_back_driven", 1.0, -1.0),
    ("reverse", -1.0, -1.0),
)


def region_codes(T_Nmm: FloatArray, n_rpm: FloatArray) -> npt.NDArray[np.intp]:
    """Sign region of every sample: 0 forward (T >= 0, n >= 0), 1 back-driven
    (T < 0, n >= 0), 2 reversed and back-driven (T >= 0, n < 0), 3 reversed (T < 0, n < 0).
    """
    return ((T_Nmm < 0).astype(np.intp) + 2 * (n_rpm < 0).astype(np.intp))


@dataclass
class SeriesScan:
    """First pass over the series: totals and ranges per sign region.

    ``time_s``: total duration [s]; ``revs``: revolutions of running samples;
    ``T_min_Nmm``/``T_max_Nmm``: range of |T| of running samples per region;
    ``n_min_rpm``/``n_max_rpm``: range of |n| per region; ``run_time_s``,
    ``run_revs``: per region; ``samples``: number of samples.
    """

    standstill_rpm: float
    time_s: float = 0.0
    samples: int = 0
    T_min_Nmm: FloatArray = field(default_factory=lambda: np.full(4, np.inf))
    T_max_Nmm: FloatArray = field(default_factory=lambda: np.full(4, -np.inf))
    n_min_rpm: FloatArray = field(default_factory=lambda: np.full(4, np.inf))
    n_max_rpm: FloatArray = field(default_factory=lambda: np.full(4, -np.inf))
    run_time_s: FloatArray = field(default_factory=lambda: np.zeros(4))
    run_revs: FloatArray = field(default_factory=lambda: np.zeros(4))

    def add(self, dt_s: FloatArray, T_Nmm: FloatArray, n_rpm: FloatArray) -> None:
        """Add a chunk of samples (durations [s], torques [N*mm], speeds [rpm])."""
        self.time_s += float(dt_s.sum())
        self.samples += int(dt_s.size)
        run = np.abs(n_rpm) >= self.standstill_rpm
        reg = region_codes(T_Nmm, n_rpm)
        aT, an = np.abs(T_Nmm), np.abs(n_rpm)
        for r in range(4):
            m = run & (reg == r)
            if not m.any():
                continue
            self.T_min_Nmm[r] = min(self.T_min_Nmm[r], float(aT[m].min()))
            self.T_max_Nmm[r] = max(self.T_max_Nmm[r], float(aT[m].max()))
            self.n_min_rpm[r] = min(self.n_min_rpm[r], float(an[m].min()))
            self.n_max_rpm[r] = max(self.n_max_rpm[r], float(an[m].max()))
            self.run_time_s[r] += float(dt_s[m].sum())
            self.run_revs[r] += float((an[m] * dt_s[m]).sum()) / 60.0

    @property
    def revs(self) -> float:
        """Revolutions of the whole series (running samples only)."""
        return float(self.run_revs.sum())

    def regions(self) -> list[int]:
        """Sign regions with running samples."""
        return [r for r in range(4) if self.run_time_s[r] > 0.0]

    def mean_speed_rpm(self, r: int) -> float:
        """Mean |speed| of the running samples of region ``r`` [rpm] (revolutions/time)."""
        return 60.0 * float(self.run_revs[r]) / float(self.run_time_s[r])


@dataclass(frozen=True)
class BinSettings:
    """How to bin.

    ``torque_bins``: number of equal-width bins of |T| per region between the region's
    smallest and largest |T| (ignored when ``torque_edges_Nmm`` is given: edges on |T|
    [N*mm], the same for every region; values outside go to the end bins);
    ``speed_bins`` / ``speed_edges_rpm``: likewise for |n| (1 = 1-D binning in torque);
    ``exponent``: p of the representative torque (3 ball, 10/3 roller bearings);
    ``peak_above_Nmm``: |T| above which samples also make a ``peak`` case per region
    (``None``: no peak cases).
    """

    torque_bins: int = 16
    torque_edges_Nmm: tuple[float, ...] | None = None
    speed_bins: int = 1
    speed_edges_rpm: tuple[float, ...] | None = None
    exponent: float = 10.0 / 3.0
    peak_above_Nmm: float | None = None


def _edges(lo: float, hi: float, count: int, given: tuple[float, ...] | None) -> FloatArray:
    if given is not None:
        return np.asarray(given, dtype=float)
    if not math.isfinite(lo):
        lo, hi = 0.0, 1.0
    if hi <= lo:
        hi = lo + max(abs(lo) * 1e-9, 1e-9)
    return np.linspace(lo, hi, count + 1)


def _bin_index(values: FloatArray, edges: FloatArray) -> npt.NDArray[np.intp]:
    k = np.searchsorted(edges, values, side="right") - 1
    return np.clip(k, 0, edges.size - 2).astype(np.intp)


@dataclass(frozen=True)
class DutyCase:
    """One generated case.

    ``kind``: ``duty`` or ``peak``; ``region``: sign region name (or ``standstill``);
    ``torque_Nmm``, ``speed_rpm``: signed representative values; ``time_s``,
    ``revs``: time and revolutions at this level; ``share``: time share [-] (0 for peak
    cases); ``samples``: number of samples in the bin; ``T_lo_Nmm``/``T_hi_Nmm``:
    the bin's |T| edges.
    """

    id: str
    kind: str
    region: str
    torque_Nmm: float
    speed_rpm: float
    time_s: float
    revs: float
    share: float
    samples: int
    T_lo_Nmm: float = math.nan
    T_hi_Nmm: float = math.nan
    temperature_C: float = math.nan
    loads_N: tuple[float, ...] = ()


class BinAccumulator:
    """Second pass: time, revolutions and sum n*|T|^p per bin of every sign region.

    ``channels``: kinds of the extra rows each chunk may carry, ``"temperature"``
    (time-mean per bin) or ``"load"`` (revolution-weighted mean per bin).
    """

    def __init__(self, scan: SeriesScan, settings: BinSettings,
                 channels: tuple[str, ...] = ()) -> None:
        self.scan = scan
        self.settings = settings
        self.channels = channels
        nt = (settings.torque_bins if settings.torque_edges_Nmm is None
              else len(settings.torque_edges_Nmm) - 1)
        ns = (settings.speed_bins if settings.speed_edges_rpm is None
              else len(settings.speed_edges_rpm) - 1)
        if nt < 1 or ns < 1:
            raise ValueError("at least one torque bin and one speed bin")
        self.nt, self.ns = nt, ns
        self.T_edges = [_edges(scan.T_min_Nmm[r], scan.T_max_Nmm[r], nt,
                               settings.torque_edges_Nmm) for r in range(4)]
        self.n_edges = [_edges(scan.n_min_rpm[r], scan.n_max_rpm[r], ns,
                               settings.speed_edges_rpm) for r in range(4)]
        size = 4 * nt * ns
        self.time = np.zeros(size)
        self.revs = np.zeros(size)
        self.sum_Tp = np.zeros(size)
        self.count = np.zeros(size, dtype=np.int64)
        self.chan_sum = np.zeros((len(channels), size))
        self.still_chan = np.zeros(len(channels))
        self.still_time = 0.0
        self.still_T_time = 0.0
        self.still_count = 0
        self.peak_T = np.full(4, -np.inf)
        self.peak_n = np.zeros(4)

    def add(self, dt_s: FloatArray, T_Nmm: FloatArray, n_rpm: FloatArray,
            extra: FloatArray | None = None) -> None:
        """Add a chunk of samples (durations [s], torques [N*mm], speeds [rpm]; ``extra``:
        rows of the extra channels, temperatures [degC] and forces [N]).
        """
        aT, an = np.abs(T_Nmm), np.abs(n_rpm)
        run = an >= self.scan.standstill_rpm
        reg = region_codes(T_Nmm, n_rpm)
        idx = np.empty(T_Nmm.size, dtype=np.intp)
        for r in range(4):
            m = reg == r
            if not m.any():
                continue
            kt = _bin_index(aT[m], self.T_edges[r])
            kn = _bin_index(an[m], self.n_edges[r])
            idx[m] = (r * self.nt + kt) * self.ns + kn
        p = self.settings.exponent
        i, t = idx[run], dt_s[run]
        rev = an[run] * t / 60.0
        size = self.time.size
        self.time += np.bincount(i, t, minlength=size)
        self.revs += np.bincount(i, rev, minlength=size)
        self.sum_Tp += np.bincount(i, rev * aT[run] ** p, minlength=size)
        self.count += np.bincount(i, minlength=size)
        still = ~run
        if extra is not None:
            for c, kind in enumerate(self.channels):
                w = t if kind == "temperature" else rev
                self.chan_sum[c] += np.bincount(i, w * extra[c][run], minlength=size)
                self.still_chan[c] += float((dt_s[still] * extra[c][still]).sum())
        self.still_time += float(dt_s[still].sum())
        self.still_T_time += float((dt_s[still] * T_Nmm[still]).sum())
        self.still_count += int(still.sum())
        if self.settings.peak_above_Nmm is not None:
            over = aT > self.settings.peak_above_Nmm
            for r in range(4):
                m = over & (reg == r)
                if m.any():
                    j = int(np.argmax(np.where(m, aT, -np.inf)))
                    if aT[j] > self.peak_T[r]:
                        self.peak_T[r], self.peak_n[r] = float(aT[j]), float(n_rpm[j])

    def _temperature(self, sums: FloatArray, time_s: float) -> float:
        rows = [c for c, k in enumerate(self.channels) if k == "temperature"]
        return float(sums[rows[0]]) / time_s if rows and time_s > 0 else math.nan

    def _loads(self, sums: FloatArray, weight: float) -> tuple[float, ...]:
        return tuple(float(sums[c]) / weight if weight > 0 else 0.0
                     for c, k in enumerate(self.channels) if k == "load")

    def cases(self, prefix: str = "rec") -> list[DutyCase]:
        """The generated cases: one per occupied bin, a standstill case, peak cases."""
        total = self.scan.time_s
        p = self.settings.exponent
        out: list[DutyCase] = []
        for j in np.flatnonzero(self.count):
            r, rest = divmod(int(j), self.nt * self.ns)
            kt, kn = divmod(rest, self.ns)
            name, sT, sn = REGIONS[r]
            revs = float(self.revs[j])
            T_rep = (float(self.sum_Tp[j]) / revs) ** (1.0 / p) if revs > 0 else 0.0
            n_rep = 60.0 * revs / float(self.time[j])
            suffix = f"{kt + 1:02d}" + (f"_n{kn + 1:02d}" if self.ns > 1 else "")
            out.append(DutyCase(
                id=f"{prefix}_{name}_{suffix}", kind="duty", region=name,
                torque_Nmm=sT * T_rep, speed_rpm=sn * n_rep, time_s=float(self.time[j]),
                revs=revs, share=float(self.time[j]) / total, samples=int(self.count[j]),
                T_lo_Nmm=float(self.T_edges[r][kt]), T_hi_Nmm=float(self.T_edges[r][kt + 1]),
                temperature_C=self._temperature(self.chan_sum[:, j], float(self.time[j])),
                loads_N=self._loads(self.chan_sum[:, j], revs)))
        if self.still_count:
            out.append(DutyCase(
                id=f"{prefix}_standstill", kind="duty", region="standstill",
                torque_Nmm=self.still_T_time / self.still_time if self.still_time else 0.0,
                speed_rpm=0.0, time_s=self.still_time, revs=0.0,
                share=self.still_time / total, samples=self.still_count,
                temperature_C=self._temperature(self.still_chan, self.still_time),
                loads_N=self._loads(self.still_chan, self.still_time)))
        for r in range(4):
            if math.isfinite(self.peak_T[r]):
                name, sT, _ = REGIONS[r]
                out.append(DutyCase(
                    id=f"{prefix}_peak_{name}", kind="peak", region=name,
                    torque_Nmm=sT * float(self.peak_T[r]), speed_rpm=float(self.peak_n[r]),
                    time_s=0.0, revs=0.0, share=0.0, samples=1))
        return out


@dataclass(frozen=True)
class ShaftAffine:
    """Bearing loads of one shaft affine in the input torque T [N*mm] in one region.

    ``shaft_id``: the shaft; ``bearings``: its supports (as the axial rule sees them);
    ``Fy0``, ``Fy1``, ``Fz0``, ``Fz1``: per bearing id, radial components of the force
    the shaft puts on the bearing, ``F = F0 + F1*T`` [N, N/(N*mm)]; ``Ka0``, ``Ka1``:
    net external thrust on the shaft (sum of the bearings' Fx) [N, N/(N*mm)];
    ``Fy2``, ``Fz2``, ``Ka2``: per process-load channel, the change per N of it [N/N].
    """

    shaft_id: str
    bearings: tuple[Bearing, ...]
    Fy0: Mapping[str, float]
    Fy1: Mapping[str, float]
    Fz0: Mapping[str, float]
    Fz1: Mapping[str, float]
    Ka0: float
    Ka1: float
    Fy2: tuple[Mapping[str, float], ...] = ()
    Fz2: tuple[Mapping[str, float], ...] = ()
    Ka2: tuple[float, ...] = ()


@dataclass(frozen=True)
class AffineLoads:
    """Per sign region: every shaft's affine bearing loads; ``mismatch``: the largest
    relative miss of the affine prediction at the check torque (0 = exactly affine);
    ``speed_ratio``: (shaft id, bearing id) -> |bearing speed / input shaft speed| [-].
    """

    regions: Mapping[int, tuple[ShaftAffine, ...]]
    mismatch: float
    speed_ratio: Mapping[tuple[str, str], float] = field(default_factory=dict)


def affine_from_probes(T_lo: float, T_hi: float,
                       lo: Mapping[str, tuple[float, float, float]],
                       hi: Mapping[str, tuple[float, float, float]]
                       ) -> tuple[dict[str, tuple[float, float]], dict[str, tuple[float, float]],
                                  dict[str, tuple[float, float]]]:
    """Intercepts and slopes of (Fy, Fz, Fx) per bearing from two probe torques [N*mm].

    Returns three maps bearing id -> (value at T = 0, slope per N*mm).
    """
    out: tuple[dict[str, tuple[float, float]], ...] = ({}, {}, {})
    for bid in lo:
        for c in range(3):
            slope = (hi[bid][c] - lo[bid][c]) / (T_hi - T_lo)
            out[c][bid] = (hi[bid][c] - slope * T_hi, slope)
    return out[0], out[1], out[2]


#: points of the exact P(|T|) table per sign region of :class:`DirectIntegral`
GRID_POINTS = 16385


@dataclass
class DirectIntegral:
    """Sum over the raw samples of n_i * P_i^p per bearing (P from the affine loads).

    ``bearings``: (shaft id, bearing) of every support; ``affine``: the superposition;
    ``ranges``: sign region -> (smallest, largest) |T| of its running samples [N*mm];
    ``application_factor``: af applied to P (as the life engine does).

    Within one sign region every bearing's P is a function of the one scalar T (loads
    affine in T, then the axial rule and X, Y of ISO 281). A chunk larger than the table
    takes P^p from an exact table at ``GRID_POINTS`` torques over the region's range by
    linear interpolation (numpy, no loop per sample: each sample's revolutions go to its
    two neighbouring table points); ``interpolation_error`` is a bound on the relative
    error of Pm this causes (per table cell: its revolutions times twice the table's
    miss at the cell's midpoint, found against exact values when the table is built).
    Smaller chunks are evaluated exactly.
    """

    bearings: Sequence[tuple[str, Bearing]]
    affine: AffineLoads
    standstill_rpm: float
    ranges: Mapping[int, tuple[float, float]]
    application_factor: float = 1.0
    grid_points: int = GRID_POINTS
    sum_nPp: FloatArray = field(init=False)
    revs: float = field(init=False, default=0.0)
    time_s: float = field(init=False, default=0.0)
    P_max_N: FloatArray = field(init=False)

    def __post_init__(self) -> None:
        self._arrays = BearingArrays.from_bearings([b for _, b in self.bearings])
        self._p = np.asarray(self._arrays.life_exponent, dtype=float)
        self._row = {(s, b.id): i for i, (s, b) in enumerate(self.bearings)}
        self.sum_nPp = np.zeros(len(self.bearings))
        self.P_max_N = np.zeros(len(self.bearings))
        self._tables: dict[int, tuple[float, float, FloatArray, FloatArray]] = {}
        self._err_sum = np.zeros(len(self.bearings))
        with_loads = any(sa.Ka2 for shafts in self.affine.regions.values() for sa in shafts)
        for r, (lo, hi) in self.ranges.items():
            if with_loads or r not in self.affine.regions or not hi > lo:
                continue
            sT = REGIONS[r][1]
            grid = np.linspace(lo, hi, self.grid_points)
            Q = self._exact_P(r, sT * grid) ** self._p[:, None]
            mid = 0.5 * (grid[1:] + grid[:-1])
            exact = self._exact_P(r, sT * mid) ** self._p[:, None]
            # twice the miss at a cell's midpoint bounds the miss inside it (a smooth
            # P; a jump of the X, Y switch inside the cell is at most twice that too)
            miss = 2.0 * np.abs(0.5 * (Q[:, 1:] + Q[:, :-1]) - exact)
            self._tables[r] = (lo, (hi - lo) / (self.grid_points - 1), Q, miss)

    def _exact_P(self, r: int, T: FloatArray, F: FloatArray | None = None) -> FloatArray:
        """af*P [N] of every bearing (rows) at the input torques ``T`` [N*mm] of region r
        and the process-load channels ``F`` [N] (rows), if any.
        """
        nb = len(self.bearings)
        Fr = np.zeros((nb, T.size))
        Fa = np.zeros((nb, T.size))
        for sa in self.affine.regions[r]:
            fy = {b.id: sa.Fy0[b.id] + sa.Fy1[b.id] * T for b in sa.bearings}
            fz = {b.id: sa.Fz0[b.id] + sa.Fz1[b.id] * T for b in sa.bearings}
            ka = sa.Ka0 + sa.Ka1 * T
            if F is not None:
                for c in range(len(sa.Ka2)):
                    for b in sa.bearings:
                        fy[b.id] = fy[b.id] + sa.Fy2[c][b.id] * F[c]
                        fz[b.id] = fz[b.id] + sa.Fz2[c][b.id] * F[c]
                    ka = ka + sa.Ka2[c] * F[c]
            radial = {b.id: np.hypot(fy[b.id], fz[b.id]) for b in sa.bearings}
            on_shaft, _ = axial_reactions(sa.bearings, ka, radial)
            for b in sa.bearings:
                i = self._row[(sa.shaft_id, b.id)]
                Fr[i] = radial[b.id]
                Fa[i] = np.abs(np.broadcast_to(on_shaft[b.id], T.shape))
        eq = equivalent_dynamic_load_arrays(self._arrays, Fr, Fa)
        for exc in eq.errors:
            if exc is not None:
                raise exc
        return self.application_factor * np.asarray(eq.P_N, dtype=float)

    def add(self, dt_s: FloatArray, T_Nmm: FloatArray, n_rpm: FloatArray,
            loads_N: FloatArray | None = None) -> None:
        """Add a chunk of samples (durations [s], torques [N*mm], speeds [rpm], process-load
        channels [N] as rows, if any).
        """
        self.time_s += float(dt_s.sum())
        an = np.abs(n_rpm)
        run = an >= self.standstill_rpm
        reg = region_codes(T_Nmm, n_rpm)
        for r in self.affine.regions:
            m = run & (reg == r)
            if not m.any():
                continue
            T = T_Nmm[m]
            rev = an[m] * dt_s[m] / 60.0
            self.revs += float(rev.sum())
            table = self._tables.get(r)
            if table is None or T.size <= 2 * self.grid_points:
                P = self._exact_P(r, T, None if loads_N is None else loads_N[:, m])
                self.sum_nPp += (P ** self._p[:, None]) @ rev
                self.P_max_N = np.maximum(self.P_max_N, P.max(axis=1))
                continue
            # linear interpolation in the table of P^p, summed per table point:
            # sum_i rev_i*Q(T_i) = Q @ (weights of the two neighbouring points)
            lo, h, Q, miss = table
            x = np.clip((np.abs(T) - lo) / h, 0.0, self.grid_points - 1.0)
            k = np.minimum(x.astype(np.intp), self.grid_points - 2)
            f = x - k
            size = self.grid_points
            w = (np.bincount(k, rev * (1.0 - f), minlength=size)
                 + np.bincount(k + 1, rev * f, minlength=size))
            self.sum_nPp += Q @ w
            self._err_sum += miss @ np.bincount(k, rev, minlength=size - 1)
            used = np.flatnonzero(w)
            self.P_max_N = np.maximum(self.P_max_N,
                                      Q[:, used].max(axis=1) ** (1.0 / self._p))

    @property
    def interpolation_error(self) -> float:
        """Bound on the relative error of the direct Pm from the table (largest bearing)."""
        with np.errstate(divide="ignore", invalid="ignore"):
            rel = np.where(self.sum_nPp > 0, self._err_sum / self.sum_nPp, 0.0) / self._p
        return float(rel.max()) if rel.size else 0.0

    def equivalent_loads_N(self) -> FloatArray:
        """Pm = (sum n_i P_i^p / sum n_i)^(1/p) per bearing [N] (ISO 281 Palmgren-Miner)."""
        if self.revs <= 0.0:
            return np.zeros(len(self.bearings))
        return np.asarray((self.sum_nPp / self.revs) ** (1.0 / self._p), dtype=float)

    def mean_speed_rpm(self) -> float:
        """n_m of the input shaft = revolutions / total time (standstill counts) [rpm]."""
        return 60.0 * self.revs / self.time_s if self.time_s > 0 else 0.0

    def bearing_mean_speeds_rpm(self) -> FloatArray:
        """n_m of every bearing [rpm]: the input's n_m times the bearing's speed ratio."""
        ratio = np.array([self.affine.speed_ratio.get((s, b.id), 1.0)
                          for s, b in self.bearings])
        return ratio * self.mean_speed_rpm()

    @property
    def exponents(self) -> FloatArray:
        """Life exponent p per bearing [-]."""
        return self._p


def basic_life(C_N: float, Pm_N: float, p: float, n_m_rpm: float) -> tuple[float, float]:
    """(L10 [10^6 rev], L10 [h]) of rating C [N] under Pm [N] at mean speed n_m [rpm]."""
    if Pm_N <= 0.0:
        return math.inf, math.inf
    L = (C_N / Pm_N) ** p
    return L, (L * 1e6 / (60.0 * n_m_rpm) if n_m_rpm > 0 else math.inf)


__all__ = ["REGIONS", "AffineLoads", "BinAccumulator", "BinSettings", "DirectIntegral",
           "DutyCase", "SeriesScan", "ShaftAffine", "affine_from_probes", "basic_life",
           "region_codes"]
