"""Plain-text calculation sheet of one bearing: every step a reviewer can redo by hand.

Every number printed comes from the result objects (solver reactions, the life
engine's :class:`~shaftsys.bearings.engine.BearingLife`) or from the model inputs;
the sheet substitutes them into the published formulas but never recomputes a result
that could disagree with the verdict. The only derived numbers are display products
stated as such (Fa/Fr, a1*aISO_i*L10_i in 10^6 rev).

All numbers are written by :func:`format_value` (6 significant digits, positional
notation), so a test or a reviewer can find a JSON value in the text by formatting it
the same way. Units: N, rpm, h, 10^6 rev, mm^2/s, degC, as labelled on every line.
"""

from __future__ import annotations

import html
import math

import numpy as np

from shaftsys.analysis.results import BearingResult, Result
from shaftsys.bearings.static import static_factors
from shaftsys.model import AxialRole
from shaftsys.units import MEGA_REVOLUTIONS

__all__ = ["explain_bearing", "explain_bearing_html", "explain_deflection", "explain_gear",
           "explain_pulley", "explain_section", "explain_system", "format_value"]

_RULE = "-" * 78


def format_value(value: float | None, digits: int = 6) -> str:
    """Format a number for the sheet: ``digits`` significant digits, no exponent.

    ``None`` and nan give ``"-"``; infinities give ``"inf"``/``"-inf"``; zero of
    either sign gives ``"0"``. Magnitudes below 1e-4 or from 1e12 use scientific
    notation (``.{digits-1}e``).
    """
    if value is None:
        return "-"
    v = float(value)
    if math.isnan(v):
        return "-"
    if math.isinf(v):
        return "inf" if v > 0 else "-inf"
    if v == 0.0:
        return "0"  # also for -0.0, which a reaction of a floating bearing can be
    if not 1e-4 <= abs(v) < 1e12:
        return f"{v:.{digits - 1}e}"
    return str(np.format_float_positional(v, precision=digits, unique=False,
                                          fractional=False, trim="-"))


_f = format_value


def _distinct(value: float | None, limit: float | None) -> tuple[str, str]:
    """``value`` and ``limit`` to 3 significant figures, more (up to 6) where 3 would
    print a value that misses its limit as equal to it.
    """
    for digits in (3, 4, 5, 6):
        a, b = format_value(value, digits), format_value(limit, digits)
        if a != b or value == limit:
            break
    return a, b


def _axial_rule(br: BearingResult) -> list[str]:
    b = br.bearing
    if b.pair is not None:
        return [
            f"adjusted pair with bearing '{b.pair}' (this one stops motion toward "
            f"{b.axial.value}).",
            "Induced axial force Fi: tapered roller 0.5*Fr/Y (common practice); angular-",
            "contact ball 1.32*Fr*tan(alpha) (Harris, Rolling Bearing Analysis).",
            "With P the +x and N the -x bearing, Ka the external thrust on the shaft:",
            "  if Fi_N + Ka >= Fi_P: Fa_P = Fi_N + Ka, Fa_N = Fi_N; else Fa_N = Fi_P - Ka,",
            "  Fa_P = Fi_P (zero clearance, no preload assumed; common practice).",
        ]
    if b.axial is AxialRole.BOTH:
        return ["locating support (axial: both): takes the whole net external thrust Ka of",
                "each case; the other supports of the shaft float. Fa = |Fx|."]
    if b.axial is AxialRole.FLOAT:
        return ["floating support (axial: float): carries no axial load, Fa = 0."]
    return [f"cross-locating support ({b.axial.value}): takes Ka when the thrust pushes the",
            "shaft in its direction, else none. Fa = |Fx|."]


def _aiso_formula(roller: bool) -> list[str]:
    if roller:
        return ["   aISO = 0.1*[1 - (1.5859 - c/kappa^q)*(ec*Cu/P)^0.4]^-9.185   (radial roller)",
                "   (c, q) = (1.3993, 0.054381) for 0.1<=kappa<0.4; (1.2348, 0.19087) for",
                "   0.4<=kappa<1; (1.2348, 0.071739) for 1<=kappa<=4; aISO <= 50."]
    return ["   aISO = 0.1*[1 - (2.5671 - c/kappa^q)^0.83*(ec*Cu/P)^(1/3)]^-9.3  (radial ball)",
            "   (c, q) = (2.2649, 0.054381) for 0.1<=kappa<0.4; (1.9987, 0.19087) for",
            "   0.4<=kappa<1; (1.9987, 0.071739) for 1<=kappa<=4; aISO <= 50.",
            "   (thrust ball: ec*Cu/(3P) in place of ec*Cu/P)."]


def _a1_lines(method: str, R: float, a1: float) -> list[str]:
    if method == "iso281":
        return ["a1 = 0.95*(ln(100/R%)/ln(100/90))^(2/3) + 0.05   [ISO 281:2007, 9.2]",
                f"   = 0.95*(ln(100/{_f(100 * R)})/ln(100/90))^(2/3) + 0.05 = {_f(a1)}"]
    if method in ("weibull3", "weibull3_approx"):
        lnr = "ln(1/R)" if method == "weibull3" else "(1 - R)"
        return [f"a1 = x0 + (theta - x0)*{lnr}^(1/b), x0 = 0.02, theta = 4.459, b = 1.483",
                "   [Shigley, Mechanical Engineering Design, ch. 11, three-parameter Weibull]",
                f"   R = {_f(R)}: a1 = {_f(a1)}"]
    raise ValueError(f"unknown reliability method {method!r}")


def explain_bearing(result: Result, bearing_id: str) -> str:
    """The calculation sheet of one bearing as plain text.

    Parameters
    ----------
    result:
        A solved result with life verdicts (``shaftsys.analyse(model)``).
    bearing_id:
        The bearing's id.

    Returns
    -------
    str
        Lines of the sheet. Forces [N], speeds [rpm], lives [h] and [10^6 rev],
        viscosities [mm^2/s], temperatures [degC].

    Raises
    ------
    KeyError: no such bearing. ValueError: the bearing has no life result.
    """
    br = result.bearing(bearing_id)
    life = br.life
    if life is None:
        raise ValueError(f"bearing '{bearing_id}' has no life result (analyse with_life)")
    b = br.bearing
    model = result.model
    cases = {c.id: c for c in model.cases}
    p_txt = "(10/3)" if b.kind.is_roller else "3"
    out: list[str] = []
    add = out.append

    add(f"CALCULATION SHEET - bearing {b.id} on shaft {br.shaft_id}")
    add(_RULE)
    add(f"type {b.kind.value}, axial role {b.axial.value}, rows {b.rows}, "
        f"arrangement {b.arrangement.value}")
    add(f"d = {_f(b.d_mm)} mm, D = {_f(b.D_mm)} mm, dm = (d + D)/2 = "
        f"{_f(b.mean_diameter_mm)} mm, mid-width x = {_f(b.x_mm)} mm, "
        f"support x = {_f(b.support_x_mm)} mm")
    add(f"C = {_f(b.C_N)} N, C0 = {_f(b.C0_N)} N (maker's ratings, as entered)")
    factors = [f"{n} = {_f(getattr(b, n))}" for n in ("e", "X", "Y", "Y1", "Y2", "Y0",
                                                       "contact_angle_deg", "f0")
               if getattr(b, n) is not None]
    add("maker's factors: " + (", ".join(factors) if factors else "none given (standard values)"))
    family = "roller" if b.kind.is_roller else "ball"
    add(f"life exponent p = {p_txt.strip('()')} ({family} bearing; ISO 281:2007, 6.3 / 7.3)")
    add(f"application factor af = {_f(life.application_factor)} (P_design = af*P)")

    add("")
    add("1. Reactions from the beam solve (force of the shaft on the bearing, shaft frame) [N]")
    add("   Fr = sqrt(Fy^2 + Fz^2)   [vector resultant]; Fa = |Fx|")
    for ld in br.loads:
        add(f"   {ld.case}: n = {_f(ld.speed_rpm)} rpm, Fy = {_f(ld.Fy_N)}, "
            f"Fz = {_f(ld.Fz_N)}, Fx = {_f(ld.Fx_N)}")
        add(f"      Fr = sqrt(({_f(ld.Fy_N)})^2 + ({_f(ld.Fz_N)})^2) = {_f(ld.Fr_N)} N, "
            f"Fa = {_f(ld.Fa_N)} N"
            + (f", induced Fi = {_f(ld.induced_N)} N" if ld.induced_N else ""))

    add("")
    add("2. Axial load rule")
    out.extend("   " + s for s in _axial_rule(br))

    add("")
    add("3. Equivalent dynamic load P = X*Fr + Y*Fa   [ISO 281:2007, 6.2 (ball) / 7.2 (roller)]")
    add("   X, Y from the e-switch: Fa/Fr <= e -> (X1, Y1), Fa/Fr > e -> (X2, Y2)")
    loads = {ld.case: ld for ld in br.loads}
    for k, cid in enumerate(life.case_ids):
        ld = loads[cid]
        ratio = ld.Fa_N / ld.Fr_N if ld.Fr_N > 0 else math.inf
        e = float(life.e[k])
        if math.isnan(e):
            switch = "no e-switch for this type"
        else:
            switch = f"Fa/Fr = {_f(ratio, 4)} {'<=' if ratio <= e else '>'} e = {_f(e)}"
        add(f"   {cid}: {switch} -> X = {_f(life.X[k])}, Y = {_f(life.Y[k])}")
        add(f"      P = {_f(life.X[k])}*{_f(ld.Fr_N)} + {_f(life.Y[k])}*{_f(ld.Fa_N)} = "
            f"{_f(life.P_N[k])} N; P_design = {_f(life.P_design_N[k])} N")

    add("")
    add("4. Cases in the fatigue spectrum")
    for cid, why in life.static_only_cases:
        add(f"   {cid}: static check only ({why})")
    dyn_idx = [k for k in range(len(life.case_ids)) if bool(life.dynamic[k])]
    if not dyn_idx:
        add("   no dynamic case: fatigue life is infinite, the verdict rests on statics")

    if dyn_idx:
        add("")
        add("5. Basic rating life per case L10_i = (C/P_i)^p [10^6 rev]   "
            "[ISO 281:2007, 6.3 / 7.3]")
        add("   L10h_i = L10_i*10^6/(60*|n_i|) [h]")
        for k in dyn_idx:
            cid = life.case_ids[k]
            add(f"   {cid}: L10 = ({_f(b.C_N)}/{_f(life.P_design_N[k])})^{p_txt} = "
                f"{_f(life.case_L10_mrev[k])}e6 rev; L10h = {_f(life.case_L10_h[k])} h "
                f"at {_f(loads[cid].speed_rpm)} rpm")

        add("")
        add("6. Load spectrum (Palmgren-Miner rule)   [Shigley, Mechanical Engineering Design,")
        add("   ch. 11, bearings under variable loading; ISO 281:2007 basis]")
        add("   revolution weights U_i = |n_i|*t_i / sum_dyn(|n_j|*t_j)")
        terms = " + ".join(f"{_f(abs(loads[life.case_ids[k]].speed_rpm))}*"
                           f"{_f(cases[life.case_ids[k]].duration)}" for k in dyn_idx)
        add(f"   sum_dyn = {terms}")
        for k in dyn_idx:
            cid = life.case_ids[k]
            add(f"   U[{cid}] = {_f(abs(loads[cid].speed_rpm))}*{_f(cases[cid].duration)}"
                f" / sum_dyn = {_f(life.weights[k])}")
        add("   Pm = (sum U_i*P_i^p)^(1/p) = ("
            + " + ".join(f"{_f(life.weights[k])}*{_f(life.P_design_N[k])}^{p_txt}"
                         for k in dyn_idx)
            + f")^(1/{p_txt}) = {_f(life.P_eq_N)} N")
        unit = "h" if model.duration_in_hours else "share"
        add(f"   n_m = sum_dyn(t_i*|n_i|) / sum_all(t_i) = {_f(life.n_m_rpm)} rpm "
            f"(durations in {unit}; standstill counts)")
        add(f"   L10 = (C/Pm)^p = ({_f(b.C_N)}/{_f(life.P_eq_N)})^{p_txt} = "
            f"{_f(life.L10_mrev)}e6 rev")
        add(f"   L10h = L10*10^6/(60*n_m) = {_f(life.L10_mrev)}e6/(60*{_f(life.n_m_rpm)}) = "
            f"{_f(life.L10_h)} h")

        add("")
        add("7. Reliability factor")
        out.extend("   " + s for s in _a1_lines(life.reliability_method, life.reliability,
                                                life.a1))

        modified = life.life_basis.startswith("Lnm")
        add("")
        add(f"8. Life modification factor aISO   [ISO 281:2007, 9.3]  basis: {life.life_basis}")
        if modified and model.lubrication is not None:
            lub = model.lubrication
            add("   viscosity at temperature, Walther relation [ASTM D341]:")
            add("   log10(log10(nu + 0.7)) = A - B*log10(T/K) through "
                f"nu({_f(lub.t1_C)} degC) = {_f(lub.nu1_at_t1_mm2_s)} and "
                f"nu({_f(lub.t2_C)} degC) = {_f(lub.nu2_at_t2_mm2_s)} mm^2/s")
            add("   reference viscosity [ISO 281:2007, 9.3.3]: nu1 = 45000*n^-0.83*dm^-0.5 "
                "(n < 1000 rpm),")
            add("   nu1 = 4500*n^-0.5*dm^-0.5 (n >= 1000 rpm); kappa = nu/nu1, "
                "taken as 4 above 4")
            cu_src = ("estimated from C0, ISO 281:2007 Annex B simplified "
                      "approach" if life.Cu_estimated else "maker's value")
            add(f"   Cu = {_f(life.Cu_N)} N ({cu_src})")
            add("   ec: contamination factor [ISO 281:2007, 9.3 and Annex A]")
            out.extend(_aiso_formula(b.kind.is_roller))
            for k in dyn_idx:
                cid = life.case_ids[k]
                cu = life.Cu_N if life.Cu_N is not None else math.nan
                ecu = float(life.ec[k]) * cu / float(life.P_design_N[k])
                add(f"   {cid}: T = {_f(cases[cid].temperature_C)} degC, "
                    f"nu = {_f(life.nu_mm2_s[k])}, nu1 = {_f(life.nu1_mm2_s[k])} mm^2/s, "
                    f"kappa = {_f(life.kappa[k])}")
                add(f"      ec = {_f(life.ec[k])}, ec*Cu/P = {_f(life.ec[k])}*{_f(cu)}/"
                    f"{_f(life.P_design_N[k])} = {_f(ecu, 4)}, aISO = {_f(life.aISO[k])}")
        else:
            add("   not used (no lubrication data, or life: {modified_life: false}): aISO = 1")

        add("")
        add("9. Life at the target reliability per case and over the spectrum")
        add("   Lnm_i = a1*aISO_i*L10_i   [ISO 281:2007, 9.1]")
        inv: list[str] = []
        for k in dyn_idx:
            cid = life.case_ids[k]
            lnm_mrev = life.a1 * float(life.aISO[k]) * float(life.case_L10_mrev[k])
            inv.append(f"{_f(life.weights[k])}/{_f(lnm_mrev)}")
            add(f"   {cid}: Lnm = {_f(life.a1)}*{_f(life.aISO[k])}*{_f(life.case_L10_mrev[k])}"
                f" = {_f(lnm_mrev)}e6 rev = {_f(life.case_Lnm_h[k])} h")
        add("   1/Lnm = sum U_i/Lnm_i   [Palmgren-Miner; Shigley ch. 11]")
        add(f"   1/Lnm = {' + '.join(inv)}  ->  Lnm = {_f(life.Lnm_mrev)}e6 rev")
        add(f"   Lnm_h = Lnm*10^6/(60*n_m) = {_f(life.Lnm_h)} h   "
            f"(target {_f(life.target_h)} h)")

        add("")
        add("10. Required dynamic rating and margin")
        add("   C_req = (L_target * sum U_i*P_i^p/(a1*aISO_i))^(1/p)   "
            "[ISO 281:2007 life equation solved for C]")
        target_mrev = life.target_h * 60.0 * life.n_m_rpm / MEGA_REVOLUTIONS
        add(f"   L_target = target_h*60*n_m/10^6 = {_f(life.target_h)}*60*{_f(life.n_m_rpm)}"
            f"/10^6 = {_f(target_mrev)}e6 rev")
        add(f"   C_req = {_f(life.C_required_N)} N; margin = C/C_req = {_f(b.C_N)}/"
            f"{_f(life.C_required_N)} = {_f(life.margin)}; life ratio = margin^p = "
            f"{_f(life.life_ratio)}")

    add("")
    add("11. Static safety   [ISO 76:2006]")
    x0, y0, floor, _ = static_factors(b)
    add(f"   P0 = X0*Fr + Y0*Fa, X0 = {_f(x0)}, Y0 = {_f(y0)}"
        + ("; P0 = max(P0, Fr)" if floor else ""))
    add("   s0 = C0/P0; required s0_min (given, or common-practice default: 1.0 ball, "
        "1.5 roller, no source)")
    for k, cid in enumerate(life.case_ids):
        ld = loads[cid]
        add(f"   {cid}: P0 = {_f(x0)}*{_f(ld.Fr_N)} + {_f(y0)}*{_f(ld.Fa_N)} -> "
            f"{_f(life.P0_N[k])} N; s0 = {_f(b.C0_N)}/{_f(life.P0_N[k])} = "
            f"{_f(life.case_s0[k])}")
    add(f"   smallest s0 = {_f(life.s0)} (case {life.s0_case or '-'}) against s0_min = "
        f"{_f(life.s0_min)}")

    add("")
    add("12. Verdict   (results to 3 significant figures; the steps above keep 6 so that")
    add("   their arithmetic can be followed)")
    lf, lt = _distinct(life.Lnm_h, life.target_h)
    add(f"   life:   Lnm_h = {lf} h {'>=' if life.life_ok else '<'} target "
        f"{lt} h -> {'PASS' if life.life_ok else 'FAIL'}")
    sf, st = _distinct(life.s0, life.s0_min)
    add(f"   static: s0 = {sf} {'>=' if life.static_ok else '<'} "
        f"{st} -> {'PASS' if life.static_ok else 'FAIL'}")
    for oc in br.operating:
        if oc.check == "limiting_speed":
            what = "speed:  largest running |n|"
            rel = "<=" if oc.verdict == "pass" else ">"
        else:
            what = "load:   smallest running P (minimum load f*C, f = 0.01 ball, 0.02 roller;"\
                " common practice, no source)"
            rel = ">=" if oc.verdict == "pass" else "<"
        if oc.reason is not None or oc.ratio is None:
            add(f"   {what}: not evaluated ({oc.reason}) [{oc.mode}]")
            continue
        add(f"   {what} = {format_value(oc.value)} {oc.unit} (case {oc.case}) {rel} "
            f"{format_value(oc.limit)} {oc.unit}, ratio {format_value(oc.ratio, 4)} -> "
            f"{oc.verdict.upper()} [{oc.mode}"
            + ("; does not decide the verdict" if not oc.counts else "") + "]")
    add(f"   support {b.id}: {br.verdict.upper()}")
    if life.warnings:
        add("")
        add("Warnings")
        out.extend(f"   - {w}" for w in life.warnings)
    return "\n".join(out) + "\n"


def explain_bearing_html(result: Result, bearing_id: str) -> str:
    """The calculation sheet of one bearing as an HTML fragment (escaped ``<pre>``).

    Same text and units as :func:`explain_bearing`.
    """
    text = explain_bearing(result, bearing_id)
    return (f'<pre class="calcsheet" id="calc-{html.escape(bearing_id, quote=True)}">'
            f"{html.escape(text)}</pre>")



def explain_gear(result: Result, gear_id: str) -> str:
    """Calculation sheet of one spur/helical gear: from the torque the power flow gives
    it to its mesh force components (Shigley's force analysis of spur and helical
    gears: Wt = 2T/d, Wr = Wt tan(phi_n)/cos(psi), Wa = Wt tan(psi)), compared with the
    force the solve applied, and the shaft's force balance with the bearing reactions.

    Units: N, mm, N*mm, rpm, kW in the power line. Raises ``KeyError`` for an unknown id.
    """
    from shaftsys.model.elements import Gear

    for sr in result.shafts:
        gear = next((e for e in sr.shaft.elements
                     if e.id == gear_id and isinstance(e, Gear)), None)
        if gear is not None:
            break
    else:
        raise KeyError(gear_id)
    d = gear.pitch_diameter_mm
    phi = math.radians(gear.normal_pressure_angle_deg)
    psi = math.radians(gear.helix_angle_deg)
    src = f" (model line {gear.line})" if gear.line is not None else ""
    out = [f"CALCULATION SHEET - gear {gear_id} on shaft {sr.shaft.id}",
           "Spur/helical mesh forces (Shigley, force analysis of spur and helical gears).",
           f"Inputs{src}: d = {format_value(d)} mm, phi_n = "
           f"{format_value(gear.normal_pressure_angle_deg)} deg, psi = "
           f"{format_value(gear.helix_angle_deg)} deg, x = {format_value(gear.x_mm)} mm"]
    loads = {b.bearing.id: b for b in result.bearings if b.shaft_id == sr.shaft.id}
    for cs in sr.cases:
        own = [a for a in cs.applied if a.element == gear_id]
        T = abs(sum(a.moment_Nmm[0] for a in own))
        fy = sum(a.force_N[1] for a in own)
        fz = sum(a.force_N[2] for a in own)
        fx = sum(a.force_N[0] for a in own)
        omega = 2.0 * math.pi * abs(cs.speed_rpm) / 60.0
        Wt = 2.0 * T / d
        Wr = Wt * math.tan(phi) / math.cos(psi)
        Wa = Wt * math.tan(psi)
        out += [f"case {cs.case}:",
                f"  T  = |Mx of the gear| from the power flow = {format_value(T)} N*mm;"
                f" P = T*omega = {format_value(T)} * {format_value(omega)} / 1e6 = "
                f"{format_value(T * omega / 1e6)} kW at n = {format_value(cs.speed_rpm)} rpm",
                f"  Wt = 2T/d = 2 * {format_value(T)} / {format_value(d)} = "
                f"{format_value(Wt)} N",
                f"  Wr = Wt tan(phi_n)/cos(psi) = {format_value(Wt)} * "
                f"{format_value(math.tan(phi))} / {format_value(math.cos(psi))} = "
                f"{format_value(Wr)} N",
                f"  Wa = Wt tan(psi) = {format_value(Wa)} N",
                f"  |W| = sqrt(Wt^2 + Wr^2 + Wa^2) = "
                f"{format_value(math.sqrt(Wt * Wt + Wr * Wr + Wa * Wa))} N; applied by the "
                f"solve: F = ({format_value(fx)}, {format_value(fy)}, {format_value(fz)}) N, "
                f"|F| = {format_value(math.sqrt(fx * fx + fy * fy + fz * fz))} N"]
        sy = sum(a.force_N[1] for a in cs.applied)
        sz = sum(a.force_N[2] for a in cs.applied)
        ry = sum(ld.Fy_N for b in loads.values() for ld in b.loads if ld.case == cs.case)
        rz = sum(ld.Fz_N for b in loads.values() for ld in b.loads if ld.case == cs.case)
        out.append(f"  equilibrium: sum Fy of element loads = {format_value(sy)} N, of "
                   f"bearing loads = {format_value(ry)} N; sum Fz = {format_value(sz)} N "
                   f"and {format_value(rz)} N (shaft weight aside); force and moment "
                   f"residual of the solve {format_value(cs.force_residual_N)} N, "
                   f"{format_value(cs.moment_residual_Nmm)} N*mm")
    return "\n".join(out)


def explain_pulley(result: Result, pulley_id: str) -> str:
    """Calculation sheet of one belt pulley: from the torque the power flow gives it to the
    strand tensions (T1 - T2 = |T|/r with T1 + T2 = 2 T_i for an installed pretension, or
    T2 held by a take-up), the slip check against the capstan limit (Euler-Eytelwein;
    e^(mu phi / sin(beta/2)) for a V-belt, Shigley, flexible elements), and the hub force
    as the vector sum of the strand tensions, against the force the solve applied.

    Units: N, mm, N*mm, rpm, deg. Raises ``KeyError`` for an unknown id.
    """
    from shaftsys.model.elements import Pulley

    for sr in result.shafts:
        pulley = next((e for e in sr.shaft.elements
                       if e.id == pulley_id and isinstance(e, Pulley)), None)
        if pulley is not None:
            break
    else:
        raise KeyError(pulley_id)
    r = pulley.diameter_mm / 2.0
    src = f" (model line {pulley.line})" if pulley.line is not None else ""
    kind = ("V-belt, groove angle beta = " + format_value(pulley.groove_angle_deg) + " deg"
            if pulley.groove_angle_deg else "flat belt")
    out = [f"CALCULATION SHEET - pulley {pulley_id} on shaft {sr.shaft.id}",
           "Belt strand tensions and hub force (Shigley, flexible mechanical elements).",
           f"Inputs{src}: D = {format_value(pulley.diameter_mm)} mm (r = "
           f"{format_value(r)} mm), {kind}, wrap phi = {format_value(pulley.wrap_angle_deg)}"
           f" deg, mu = {format_value(pulley.friction_coefficient)}, x = "
           f"{format_value(pulley.x_mm)} mm"]
    for cs in sr.cases:
        own = [a for a in cs.applied if a.element == pulley_id and not a.weight]
        details = {k: v for a in own for k, v in a.details}
        T = sum(a.moment_Nmm[0] for a in own)
        F = np.sum([a.force_N for a in own], axis=0) if own else np.zeros(3)
        out.append(f"case {cs.case}: T = {format_value(T)} N*mm at n = "
                   f"{format_value(cs.speed_rpm)} rpm")
        if "T_tight_N" not in details:
            out.append("  no strand tensions for this case (the pulley carries no belt "
                       "load in it)")
            continue
        T1, T2 = details["T_tight_N"], details.get("T_slack_N", 0.0)
        out.append(f"  T1 - T2 = |T|/r = {format_value(abs(T))} / {format_value(r)} = "
                   f"{format_value(abs(T) / r)} N; T1 = {format_value(T1)} N, T2 = "
                   f"{format_value(T2)} N (T1 + T2 = {format_value(T1 + T2)} N)")
        if "capstan_limit" in details:
            ratio = details.get("tension_ratio", math.inf)
            limit = details["capstan_limit"]
            out.append(f"  slip: T1/T2 = {format_value(ratio)} against the capstan limit "
                       f"{format_value(limit)} -> {'holds' if ratio <= limit else 'SLIPS'}")
        a1 = details.get("tight_strand_angle_deg")
        a2 = details.get("slack_strand_angle_deg")
        if a1 is not None and a2 is not None:
            hy = T1 * math.cos(math.radians(a1)) + T2 * math.cos(math.radians(a2))
            hz = T1 * math.sin(math.radians(a1)) + T2 * math.sin(math.radians(a2))
            out.append(f"  hub force = T1 u_r({format_value(a1)} deg) + T2 u_r("
                       f"{format_value(a2)} deg) = ({format_value(hy)}, {format_value(hz)}) N"
                       f", |F| = {format_value(math.hypot(hy, hz))} N; applied by the solve:"
                       f" ({format_value(float(F[1]))}, {format_value(float(F[2]))}) N")
    return "\n".join(out)


def explain_section(result: Result, shaft_id: str, x_mm: float) -> str:
    """Calculation sheet of one fatigue section: the loads at the section (alternating and
    mean parts), the notch chain Kt -> q -> Kf = 1 + q (Kt - 1), the Marin chain
    Se = ka kb kc kd ke Se', the stresses sigma = Kf 32 M/(pi d^3), tau = Kfs 16 T/(pi d^3)
    (hollow: d^4 - di^4), their von Mises combination, the criterion with its numbers and
    the first-cycle yield (Shigley, shafts and fatigue; the criterion of the settings).

    ``x_mm``: the section's station (the nearest section within 0.5 mm). Units: N*mm, N,
    mm, MPa. Raises ``KeyError`` for an unknown shaft or a station without a section.
    """
    if result.checks is None:
        raise KeyError(shaft_id)
    sc = result.checks.shaft(shaft_id)
    near = [s for s in sc.sections if abs(s.x_mm - x_mm) <= 0.5]
    if not near:
        raise KeyError(f"{shaft_id}@{x_mm:g}")
    shaft = next(s.shaft for s in result.shafts if s.shaft.id == shaft_id)
    mat = shaft.material
    out = [f"CALCULATION SHEET - fatigue sections of shaft {shaft_id} at x = "
           f"{format_value(near[0].x_mm)} mm",
           "Shaft fatigue and first-cycle yield (Shigley, Mechanical Engineering Design, "
           "fatigue failure and shafts).",
           f"Material {mat.name if hasattr(mat, 'name') else ''}: Sut = "
           f"{format_value(mat.Su_MPa)} MPa, Sy = {format_value(mat.Sy_MPa)} MPa"]
    criterion = result.checks.settings.criterion
    for sec in near:
        t = sec.trace
        step = shaft.steps[sec.step] if sec.step is not None else None
        src = (f" (model line {step.line})" if step is not None and step.line is not None
               else "")
        out.append("")
        out.append(f"feature {sec.feature}: d = {format_value(sec.d_mm)} mm{src}"
                   + (f", D = {format_value(sec.D_mm)} mm" if sec.D_mm else "")
                   + (f", r = {format_value(sec.r_mm)} mm" if sec.r_mm else ""))
        if t is None:
            out.append("  (no trace kept for this section)")
            continue
        L, nt, mf, st = t.loads, t.notch, t.marin, t.stresses
        out += [f"  loads ({L.rule} rule): Ma = {format_value(L.M_a_Nmm)} N*mm, Mm = "
                f"{format_value(L.M_m_Nmm)} N*mm, Ta = {format_value(L.T_a_Nmm)} N*mm, Tm = "
                f"{format_value(L.T_m_Nmm)} N*mm, Fa = {format_value(L.F_a_N)} N, Fm = "
                f"{format_value(L.F_m_N)} N",
                f"  notch: Kt = {format_value(nt.Kt)}, q = {format_value(nt.q)} -> Kf = 1 + "
                f"q (Kt - 1) = {format_value(nt.Kf)}; Kts = {format_value(nt.Kts)}, qs = "
                f"{format_value(nt.qs)} -> Kfs = {format_value(nt.Kfs)}",
                f"  endurance: Se' = {format_value(mf.Se_prime_MPa)} MPa; ka = "
                f"{format_value(mf.ka)} ({mf.finish}), kb = {format_value(mf.kb)} (d = "
                f"{format_value(mf.d_mm)} mm), kc = {format_value(mf.kc)}, kd = "
                f"{format_value(mf.kd)} ({format_value(mf.temperature_C)} degC), ke = "
                f"{format_value(mf.ke)} (R = {format_value(mf.reliability)}), kf = "
                f"{format_value(mf.kf)} -> Se = {format_value(mf.Se_MPa)} MPa",
                f"  stresses: sigma_a = Kf 32 Ma/(pi d^3) = {format_value(st.sigma_b_a_MPa)}"
                f" MPa, sigma_m = {format_value(st.sigma_b_m_MPa)} MPa, tau_a = Kfs 16 Ta/"
                f"(pi d^3) = {format_value(st.tau_a_MPa)} MPa, tau_m = "
                f"{format_value(st.tau_m_MPa)} MPa"
                + (f" (bore {format_value(st.bore_mm)} mm)" if st.bore_mm else ""),
                f"  von Mises: sigma_a' = sqrt((sigma_a + sigma_ax,a/0.85)^2 + 3 tau_a^2) = "
                f"{format_value(st.sigma_vm_a_MPa)} MPa, sigma_m' = "
                f"{format_value(st.sigma_vm_m_MPa)} MPa"]
        sa, sm = st.sigma_vm_a_MPa, st.sigma_vm_m_MPa
        if str(criterion) == "goodman":
            out.append(f"  DE-Goodman: 1/n = sa'/Se + sm'/Sut = {format_value(sa)}/"
                       f"{format_value(mf.Se_MPa)} + {format_value(sm)}/"
                       f"{format_value(mf.Sut_MPa)} -> n_f = {format_value(sec.n_fatigue)}")
        elif str(criterion) == "asme_elliptic":
            out.append(f"  DE-ASME elliptic: n = 1/sqrt((sa'/Se)^2 + (sm'/Sy)^2) with sa' = "
                       f"{format_value(sa)}, sm' = {format_value(sm)} -> n_f = "
                       f"{format_value(sec.n_fatigue)}")
        else:
            out.append(f"  {criterion}: sa' = {format_value(sa)}, sm' = {format_value(sm)}, "
                       f"Se = {format_value(mf.Se_MPa)}, Sut = {format_value(mf.Sut_MPa)} "
                       f"-> n_f = {format_value(sec.n_fatigue)}")
        need = result.checks.settings
        out += [f"  yield: n_y = Sy / sigma'_max = {format_value(mat.Sy_MPa)} / "
                f"{format_value(sec.sigma_max_MPa)} = {format_value(sec.n_yield)} (largest "
                "single case)",
                f"  required: n_f >= {format_value(need.required_fatigue_safety)}, n_y >= "
                f"{format_value(need.required_yield_safety)} -> {sec.verdict.upper()}"]
        out += [f"  note: {n}" for n in sec.notes]
    return "\n".join(out)


def explain_deflection(result: Result, item_id: str) -> str:
    """Sheet of the slope (and, for gears, deflection) check at one bearing or gear: per
    case the plane values from the solve, the resultants, the limit and the rule that set
    it. Raises ``KeyError`` for an id without such a check.
    """
    if result.checks is None:
        raise KeyError(item_id)
    chk = next((c for c in (*result.checks.bearings, *result.checks.gears)
                if c.id == item_id), None)
    if chk is None:
        raise KeyError(item_id)
    out = [f"SLOPE AND DEFLECTION at {chk.kind} {chk.id} (shaft {chk.shaft}, x = "
           f"{format_value(chk.x_mm)} mm)",
           f"  slope limit {format_value(chk.slope_limit_rad)} rad"
           + (f" (ok up to {format_value(chk.slope_limit_low_rad)} rad)"
              if chk.slope_limit_low_rad != chk.slope_limit_rad else "")
           + (f", deflection limit {format_value(chk.deflection_limit_mm)} mm"
              if chk.deflection_limit_mm is not None else "")
           + f"; source: {chk.source}",
           f"  rule: slope {chk.slope_rule}"
           + (f"; deflection {chk.deflection_rule}" if chk.deflection_rule else "")]
    for c in chk.cases:
        out.append(f"  {c.case}: slope = sqrt(dv/dx^2 + dw/dx^2) = sqrt(("
                   f"{format_value(c.slope_xy_rad)})^2 + ({format_value(c.slope_xz_rad)})^2)"
                   f" = {format_value(c.slope_rad)} rad; deflection = sqrt(v^2 + w^2) = "
                   f"sqrt(({format_value(c.deflection_y_mm)})^2 + ("
                   f"{format_value(c.deflection_z_mm)})^2) = {format_value(c.deflection_mm)}"
                   f" mm -> {c.status}")
    out.append(f"  verdict: {chk.verdict.upper()}")
    return "\n".join(out)


def explain_system(result: Result) -> str:
    """Sheet of the system lives (each shaft's and the machine's): the bearings' lives at
    90 % reliability on the verdict's basis (Lnm/a1), the Weibull combination of
    independent bearings S_sys(L) = prod 0.9^((L/L_i)^e_i) (Lundberg-Palmgren dispersion,
    e the Weibull slope of each type), the life at the stated reliability R from
    sum (L/L_i)^e_i = ln R / ln 0.9, that sum recomputed at the reported life, and the
    target with its verdict (information only without a target). Units: h.
    """
    out = ["SYSTEM LIFE (all supports of a group surviving together)",
           "  S_sys(L) = prod_i 0.9^((L/L_i)^e_i), L_i = Lnm_i/a1 (90 % life on the "
           "verdict basis); L at reliability R solves sum_i (L/L_i)^e_i = ln R/ln 0.9"]
    by_shaft = {s.shaft.id: s for s in result.shafts}
    groups = [(f"shaft {sid}", [b for b in result.bearings if b.shaft_id == sid],
               s.system) for sid, s in by_shaft.items()]
    groups.append(("the machine", list(result.bearings), result.system))
    for label, bearings, sysl in groups:
        if sysl is None:
            continue
        out.append("")
        out.append(f"{label}: Weibull slopes ball {format_value(sysl.weibull_slope_ball)}, "
                   f"roller {format_value(sysl.weibull_slope_roller)}; stated at "
                   f"R = {format_value(sysl.reliability)} ({sysl.stated_at})")
        L = sysl.life_h
        total = 0.0
        for b in bearings:
            if b.life is None:
                out.append(f"  {b.bearing.id}: not evaluated")
                continue
            Li = b.life.Lnm_h / b.life.a1
            e = (sysl.weibull_slope_roller if b.bearing.kind.is_roller
                 else sysl.weibull_slope_ball)
            term = (L / Li) ** e if L is not None and math.isfinite(L) and Li > 0 else 0.0
            total += term
            out.append(f"  {b.bearing.id}: L_i = {format_value(b.life.Lnm_h)} / "
                       f"{format_value(b.life.a1)} = {format_value(Li)} h, e = "
                       f"{format_value(e)}, (L/L_i)^e = {format_value(term)}")
        if L is None:
            out.append("  system life not evaluated (a bearing was not)")
            continue
        want = math.log(sysl.reliability) / math.log(0.9)
        out.append(f"  L = {format_value(L)} h: sum = {format_value(total)} against "
                   f"ln R/ln 0.9 = {format_value(want)}; limiting bearing "
                   f"{sysl.limiting_bearing}")
        if sysl.target_h is None:
            out.append("  no target: information, not a criterion")
        else:
            out.append(f"  target {format_value(sysl.target_h)} h -> "
                       f"{(sysl.verdict or '').upper()}")
    return "\n".join(out)
