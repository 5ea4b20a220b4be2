"""What a TEMA shell type means for the shell-and-tube rating (:func:`revamp.rating.rate`).

:func:`arrangement` gives the effectiveness-NTU relation of an exchanger (E, F, J, X shells, tube passes, shells in
series); :func:`_shell_side_by_type` and :func:`_shell_flow_geometry` adapt the shell-side method of one E shell to
the F, J and X types; :func:`_bell_loop` is Bell-Delaware as the rating loop calls it. Moved verbatim from
``revamp.rating`` (which still re-exports every name).

References
----------
Shah, R. K., Sekulić, D. P. (2003). *Fundamentals of Heat Exchanger Design*, Wiley, ch. 3 (TEMA F, J and X shells).
Taborek, J. (1983). Shell-and-tube heat exchangers: single-phase flow. *Heat Exchanger Design Handbook* §3.3,
Hemisphere (Bell-Delaware).
"""
from __future__ import annotations

import dataclasses
import inspect

from .correlations import shell as shell_corr
from .correlations import shell_bell


def arrangement(exchanger) -> tuple[str, int]:
    """The effectiveness-NTU arrangement of an exchanger: ``(name, units in series)``.

    E shell: one tube pass runs in counterflow (N counterflow shells in series are one counterflow exchanger);
    two or more passes use the 1-2N relation, identical shells in series by the series formula. F shell: two tube
    passes are pure counterflow; four or more are two 1-2N shells in series per F shell (no leakage or heat
    conduction across the longitudinal baffle). J shell: the J 1-1, 1-2 or 1-4 relation (six or more passes use
    1-4); with two or more tube passes that relation passes a maximum in NTU (a temperature cross in the second
    pass), so a longer J shell can give less duty. X shell: single-pass crossflow with both fluids unmixed, per shell. Names are keys of
    :data:`revamp.thermal.EFFECTIVENESS_ARRANGEMENTS`.
    """
    kind = getattr(exchanger, "shell_type", "E")
    passes, shells = exchanger.tube_passes, int(exchanger.shells)
    if kind == "F":
        return ("counterflow", 1) if passes == 2 else ("E", 2 * shells)
    if kind == "J":
        return ("J1" if passes == 1 else "J2" if passes == 2 else "J4"), shells
    if kind == "X":
        return "crossflow", shells
    if passes == 1:
        return "counterflow", 1
    return "E", shells


def _bell_loop(geom, m, rho, cp, mu, k, mu_wall=None, d_nozzle=None, h_only=False):
    """Bell-Delaware in the rating loop: the unchecked kernel, without its warnings (the rating collects them once,
    at the converged state); ``h_only`` inside the iteration."""
    return shell_bell.bell_delaware_kernel(geom, m, rho, cp, mu, k, mu_wall, d_nozzle, warn=False, h_only=h_only)


def _accepts(fn, name: str) -> bool:
    try:
        return name in inspect.signature(fn).parameters
    except (TypeError, ValueError):  # pragma: no cover - builtins
        return False


def _scaled_dp(res, factor):
    """A shell-side result with its pressure drops multiplied by ``factor`` (two shell passes in series)."""
    if res.dp is None:  # a heat-transfer-only result (inside the iteration)
        return res
    return dataclasses.replace(res, dp=res.dp * factor, dp_crossflow=res.dp_crossflow * factor,
                               dp_window=res.dp_window * factor, dp_ends=res.dp_ends * factor)


def _shell_side_by_type(kind, shell_fn, geom):
    """The shell-side calculation of one shell adapted to its TEMA type, and what the adaptation assumes.

    - E: the method as published.
    - F (two shell passes, longitudinal baffle): each pass carries the whole stream through half the shell's flow
      areas, which is the method at twice the flow on the full geometry (every area halves together); the pressure
      drop is that of two passes. The longitudinal baffle is taken as sealed (no bypass or heat conduction across
      it): a leaking baffle lowers both the effectiveness and the pressure drop.
    - J (divided flow): each half of the stream flows through half the shell length, with half the baffles; the
      pressure drop is that of one half.
    - X (crossflow): :func:`revamp.correlations.shell.crossflow_bundle`.

    Returns ``(fn(m, rho, cp, mu, k, mu_wall, **kw), nozzle_scale, note)``; ``nozzle_scale`` turns the nozzle
    diameter into the one that gives the right nozzle loss at the flow the method sees (a loss in velocity heads
    scales as m²/d⁴).
    """
    if kind == "X":
        return (lambda m, *p, **kw: shell_corr.crossflow_bundle(geom, m, *p)), None, ()
    if kind == "F":
        def f_shell(m, *p, **kw):
            return _scaled_dp(shell_fn(geom, 2.0 * m, *p, **kw), 2.0)
        return f_shell, 8.0 ** 0.25, ("F shell: two shell passes, each with half the flow area; the longitudinal "
                                      "baffle is assumed sealed (no leakage or heat conduction across it)",)
    if kind == "J":
        half = _shell_flow_geometry("J", geom)[0]
        return ((lambda m, *p, **kw: shell_fn(half, 0.5 * m, *p, **kw)), 0.5 ** 0.5,
                ("J shell: divided flow, each half of the stream through half the length and half the baffles",))
    return (lambda m, *p, **kw: shell_fn(geom, m, *p, **kw)), 1.0, ()


def _shell_flow_geometry(kind, geom):
    """The geometry and the flow multiplier the shell-side method sees for one shell of a TEMA type (E, F, J; see
    :func:`_shell_side_by_type`): F, the whole geometry at twice the flow; J, half the length and baffles at half
    the flow."""
    if kind == "F":
        return geom, 2.0
    if kind == "J":
        return dataclasses.replace(geom, Nb=max(1, geom.Nb // 2), length=geom.length / 2.0), 0.5
    return geom, 1.0
