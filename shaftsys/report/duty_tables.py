"""Plain-text tables of a recorded duty's reduction: the generated cases and, per bearing,
the equivalent load and basic life from the cases against the direct integral.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from shaftsys.analysis.duty import DutyReduction


def summary_line(red: DutyReduction) -> str:
    """One line: the series, its samples, hours, revolutions and the template case."""
    return (f"{red.series or 'recording'}: {red.samples} samples, {red.time_s / 3600:.4g} h, "
            f"{red.revs:.5g} revolutions of the input shaft; template case "
            f"'{red.template}'")


def cases_table(red: DutyReduction) -> str:
    """Plain-text table of the generated cases."""
    rows = [f"{'case':<28} {'kind':<5} {'torque_N*m':>11} {'speed_rpm':>10} "
            f"{'time_h':>10} {'revolutions':>12} {'share':>9}"]
    for c in red.cases:
        rows.append(f"{c.id:<28} {c.kind:<5} {c.torque_Nmm / 1000:>11.4g} "
                    f"{c.speed_rpm:>10.5g} {c.time_s / 3600:>10.4g} {c.revs:>12.5g} "
                    f"{c.share:>9.4g}")
    return "\n".join(rows)


def error_table(red: DutyReduction) -> str:
    """Plain-text table: per bearing, equivalent load and basic life, cases vs direct."""
    rows = ["reduction error (cases vs direct integral over the raw samples; basic L10)",
            f"{'bearing':<12} {'p':>5} {'P_cases_N':>11} {'P_direct_N':>11} {'dP_%':>8} "
            f"{'L10_cases_h':>12} {'L10_direct_h':>12} {'dL_%':>8}"]
    for e in red.errors:
        rows.append(f"{e.bearing:<12} {e.exponent:>5.3g} {e.P_cases_N:>11.5g} "
                    f"{e.P_direct_N:>11.5g} {e.P_error_pct:>+8.3f} {e.L10_cases_h:>12.5g} "
                    f"{e.L10_direct_h:>12.5g} {e.L10_error_pct:>+8.3f}")
    rows.append(f"direct integral: loads superposed from probe solves (affine check miss "
                f"{red.affine_mismatch:.2g}), P^p table bound {red.interpolation_error:.2g}")
    return "\n".join(rows)


__all__ = ["cases_table", "error_table", "summary_line"]
