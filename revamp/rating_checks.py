"""The validity checks of a shell-and-tube rating: streams that leave their fluid's single-phase range, and the
warnings a :class:`~revamp.rating.Rating` carries (correlation ranges, fluid methods' ranges, wall temperatures,
cases that did not settle, undefined F, equal inlets). Internal to :func:`revamp.rating.rate`, which calls them once
on its final evaluation (never inside the iteration).
"""
from __future__ import annotations

import numpy as np

from .correlations import shell_bell
from .correlations import tube as tube_corr
from .errors import InputError
from .rating_loop import _below


def out_of_range(s_fluid, t_fluid, ts_in, tt_in, to_s, to_t, shape):
    """The cases whose stream leaves its fluid's single-phase range at an inlet or an outlet, and one message per
    side that has such cases. A single case (``shape == ()``) raises InputError instead (the rating does not apply).
    """
    invalid = np.zeros(np.shape(ts_in), dtype=bool)
    msgs = []
    for side, fluid, t_i, t_o in (("shell", s_fluid, ts_in, to_s), ("tube", t_fluid, tt_in, to_t)):
        out = (np.minimum(t_i, t_o) < fluid.t_min) | (np.maximum(t_i, t_o) >= fluid.t_max)
        if out.any():
            t_bad = np.where(t_o >= fluid.t_max, t_o, np.where(t_i >= fluid.t_max, t_i, np.minimum(t_i, t_o)))
            if shape == ():
                where = "outlet" if fluid.t_min <= t_i[0] < fluid.t_max else "inlet"
                raise InputError(f"service.{side}", f"{fluid.name} at its {where}, {float(t_bad[0]):.1f} K",
                                 f"within the fluid's single-phase range {fluid.t_min:.1f}..{fluid.t_max:.1f} K "
                                 "(the stream would boil or freeze: this rating does not apply)")
            invalid |= out
            msgs.append(f"{side} side: {int(np.sum(out))} case(s) would leave the single-phase range of "
                        f"{fluid.name} ({fluid.t_min:.1f}..{fluid.t_max:.1f} K) at an inlet or an outlet; "
                        "their results are NaN")
    return invalid, msgs


def rating_warnings(hx, notes, ev, insert, geom, bell_kernel, s_fluid, t_fluid, temps, invalid, unsettled, residual,
                    undefined, same, shape, range_msgs):
    """The warnings of a rating at its final evaluation ``ev``: ``(all, tube side's, shell side's)``.

    ``temps``: ``(ts_in, to_s, tt_in, to_t)``; ``notes``: the shell type's notes; ``invalid``, ``unsettled``,
    ``undefined`` and ``same``: per case, out of a fluid's range, not settled, F undefined, equal inlets."""
    ts_in, to_s, tt_in, to_t = temps
    warnings = [f"geometry: {note}" for note in getattr(hx, "notes", ())] + list(notes)
    tube_warnings = tube_corr.tube_side_warnings(ev.tube.Re, ev.tube.Pr, ev.mu_ratio_t, insert)
    shell_warnings = (shell_bell.bell_delaware_warnings(geom, ev.shell.Re, ev.shell.Jl, ev.shell.Jb) if bell_kernel
                      else list(ev.shell.warnings))
    warnings += tube_warnings + shell_warnings
    ok = ~invalid
    for side, fluid, pair in (("shell", s_fluid, (ts_in, to_s)), ("tube", t_fluid, (tt_in, to_t))):
        warnings += [f"{side} side: {w}" for w in fluid.check(np.concatenate([t[ok] for t in pair]))]
    for side, fluid, tw in (("shell", s_fluid, ev.tw_s), ("tube", t_fluid, ev.tw_t)):
        hi_, lo_ = np.any(tw[ok] > _below(fluid.t_max)), np.any(tw[ok] < fluid.t_min)
        if hi_ or lo_:
            warnings.append(f"{side} side: wall temperature outside the range of {fluid.name} "
                            f"({fluid.t_min:.1f}..{fluid.t_max:.1f} K); wall viscosity taken at the range limit"
                            + ("; local boiling or cracking at the wall is possible" if hi_ else
                               "; freezing or waxing at the wall is possible"))
    if np.any(unsettled & ok):
        worst = float(np.max(residual[ok]))
        if shape == ():
            warnings.append(f"property iteration: outlet temperatures settled only to within {worst:.2g} K "
                            "(a correlation changes form near this flow)")
        else:
            warnings.append(f"property iteration: {int(np.sum(unsettled & ok))} case(s) settled only to within "
                            f"{worst:.2g} K (a correlation changes form near these flows)")
    if np.any(undefined):
        warnings.append(f"F and LMTD: {int(np.sum(undefined))} case(s) with a temperature approach below "
                        "floating-point resolution: F is undefined there (NaN); the duty is eps Cmin dTmax")
    if np.any(same & ok) and shape != ():
        warnings.append(f"{int(np.sum(same))} case(s) with equal inlet temperatures: no driving force, zero duty")
    warnings += range_msgs
    return warnings, tube_warnings, shell_warnings
