"""Flow-induced vibration screen of a tube bundle in crossflow, after TEMA Section 6 (10th ed., 2019).

Screening only: the functions can flag a design (``warn``/``fail``), never clear one. A full analysis (every span,
the U-bends, acoustic resonance in gases, two-phase flow, real damping) is for a specialist.

Steps, all in SI:

1. Span natural frequency of a uniform beam, ``fn = C/(2π)·sqrt(E·I/(m·L⁴))`` with the end-condition constant
   ``C`` = π² (pinned-pinned), 15.42 (fixed-pinned), 22.37 (fixed-fixed) (TEMA V-5.3, the classical beam
   eigenvalues λ², e.g. Blevins 1979, Table 8-1).
2. Effective mass per length ``m`` = tube metal + fluid inside + hydrodynamic (added) mass
   ``Cm·ρ_shell·π·do²/4`` (TEMA V-7). ``Cm`` from the confined-cylinder potential-flow result
   ``Cm = ((De/do)² + 1)/((De/do)² − 1)`` with an equivalent confining diameter
   ``De/do = (0.96 + 0.5·P/do)·P/do`` (triangular layouts) or ``(1.07 + 0.56·P/do)·P/do`` (square layouts),
   Pettigrew & Taylor (2003) [recalled, not read].
3. Fluidelastic instability, Connors (1970) form ``Vc = β·fn·do·sqrt(m·δ/(ρ·do²))`` with ``δ = 2π·ζ`` the
   logarithmic decrement; design constant β = 3.0 (Pettigrew & Taylor 1991) [recalled]. The crossflow velocity is
   compared with ``Vc``.
4. Vortex shedding ``f_vs = St·V/do`` (Strouhal number, default 0.2 for a single cylinder; TEMA V-12 gives tube-bank
   charts after Chen, give yours), and the amplitude at lock-in of a uniformly loaded pinned-pinned span
   ``y = C_L·ρ·do·V²/(2π²·δ·fn²·m)`` (the TEMA V-11.2 form, derived in the function's notes) against the TEMA
   limit ``0.02·do``.

References
----------
TEMA (2019). *Standards of the Tubular Exchanger Manufacturers Association*, 10th ed., Section 6 (V-5 to V-12).
Connors, H. J. (1970). Fluidelastic vibration of tube arrays excited by cross flow. *Flow-Induced Vibration in
Heat Exchangers*, ASME, 42-56.
Pettigrew, M. J., & Taylor, C. E. (1991). Fluidelastic instability of heat exchanger tube bundles: review and design
recommendations. *J. Pressure Vessel Technology* 113, 242-256.
Pettigrew, M. J., & Taylor, C. E. (2003). Vibration analysis of shell-and-tube heat exchangers: an overview, part 1.
*J. Fluids and Structures* 18, 469-483.
Blevins, R. D. (1979). *Formulas for Natural Frequency and Mode Shape*. Van Nostrand Reinhold.
"""
from __future__ import annotations

import math

import numpy as np

from ..errors import InputError
from ..units import require
from ._check import Check

__all__ = [
    "AMPLITUDE_LIMIT",
    "BETA_DESIGN",
    "DAMPING_DEFAULT",
    "LIFT_DEFAULT",
    "SPAN_CONSTANTS",
    "STROUHAL_DEFAULT",
    "added_mass_coefficient",
    "connors_critical_velocity",
    "mass_per_length",
    "natural_frequency",
    "second_moment",
    "span_check",
    "spans",
    "vibration_checks",
    "vortex_amplitude",
    "vortex_shedding_frequency",
]

#: End-condition constant C = λ² of the first bending mode (TEMA V-5.3; Blevins 1979 Table 8-1).
SPAN_CONSTANTS = {"pinned-pinned": math.pi**2, "fixed-pinned": 15.418, "fixed-fixed": 22.373}
#: Connors design constant (Pettigrew & Taylor 1991) [recalled].
BETA_DESIGN = 3.0
#: Damping ratio used when none is given: 1 %, a low (conservative) value for tubes in liquid (common practice).
DAMPING_DEFAULT = 0.01
#: Strouhal number of a single cylinder (common practice); tube banks range 0.2-0.6 (TEMA V-12 charts).
STROUHAL_DEFAULT = 0.2
#: Lift coefficient used when none is given (order of the TEMA V-11.2 table values; common practice).
LIFT_DEFAULT = 0.1
#: TEMA V-11.2 limit on vortex-shedding amplitude, as a fraction of tube outside diameter.
AMPLITUDE_LIMIT = 0.02
#: TEMA RCB-4.52 aluminium/copper/titanium span maxima over the steel ones, about 52/60 [recalled, not read].
SOFT_METAL_SPAN_FACTOR = 0.87
#: Fluidelastic ratio V/Vc above which the screen warns (common practice, no source).
FLUIDELASTIC_WARN = 0.8

_TRIANGULAR = (30, 60)
_SQUARE = (45, 90)


def second_moment(tube_od, tube_id):
    """Area moment of inertia of a tube section, ``π(do⁴ − di⁴)/64`` [m⁴].

    Parameters
    ----------
    tube_od, tube_id : float or array_like
        Outside and inside diameters [m].

    >>> round(float(second_moment(0.0254, 0.0)) * 1e9, 2)  # solid bar 1 inch
    20.43
    """
    do, di = np.asarray(tube_od, float), np.asarray(tube_id, float)
    return np.pi * (do**4 - di**4) / 64


def added_mass_coefficient(pitch_ratio, layout):
    """Hydrodynamic (added) mass coefficient Cm of a tube in a bundle.

    Parameters
    ----------
    pitch_ratio : float or array_like
        Tube pitch over tube outside diameter P/do [-], > 1.
    layout : int
        30 or 60 (triangular) or 45 or 90 (square).

    Returns
    -------
    float or ndarray
        Cm [-]; tends to 1 (the isolated cylinder) as P/do grows.

    Notes
    -----
    Potential flow around a cylinder of diameter do inside a rigid concentric cylinder of diameter De gives
    ``Cm = (De² + do²)/(De² − do²)``; the equivalent De/do of a bundle is ``(0.96 + 0.5·P/do)·P/do`` (triangular)
    or ``(1.07 + 0.56·P/do)·P/do`` (square) (Pettigrew & Taylor 2003) [recalled, not read]. TEMA Fig. V-7.11
    charts the same quantity.

    Examples
    --------
    >>> round(float(added_mass_coefficient(1.25, 30)), 3)
    1.684
    """
    pr = np.asarray(pitch_ratio, float)
    require(pr, "pitch_ratio", gt=1.0)
    if layout in _TRIANGULAR:
        de = (0.96 + 0.5 * pr) * pr
    elif layout in _SQUARE:
        de = (1.07 + 0.56 * pr) * pr
    else:
        raise InputError("layout", layout, "30 or 60 (triangular) or 45 or 90 (square)")
    return (de**2 + 1) / (de**2 - 1)


def mass_per_length(tube_od, tube_id, metal_density, rho_inside, rho_outside, cm):
    """Effective mass per unit length of a tube [kg/m]: metal + contained fluid + added mass (TEMA V-7).

    Parameters
    ----------
    tube_od, tube_id : float
        Outside and inside diameter [m].
    metal_density : float
        Tube metal density [kg/m³].
    rho_inside, rho_outside : float
        Tube-side and shell-side fluid densities [kg/m³].
    cm : float
        Added-mass coefficient [-] (:func:`added_mass_coefficient`).
    """
    a_metal = np.pi / 4 * (np.asarray(tube_od) ** 2 - np.asarray(tube_id) ** 2)
    return (metal_density * a_metal + rho_inside * np.pi / 4 * np.asarray(tube_id) ** 2
            + cm * rho_outside * np.pi / 4 * np.asarray(tube_od) ** 2)


def natural_frequency(modulus, moment, mass, span, ends="pinned-pinned"):
    """First bending natural frequency of a tube span [Hz], ``fn = C/(2π)·sqrt(E·I/(m·L⁴))``.

    Parameters
    ----------
    modulus : float
        Elastic modulus of the tube metal [Pa].
    moment : float
        Area moment of inertia [m⁴].
    mass : float
        Effective mass per length [kg/m].
    span : float or array_like
        Unsupported span length [m].
    ends : {"pinned-pinned", "fixed-pinned", "fixed-fixed"}
        End conditions; a span between baffles is pinned-pinned, a span from the tubesheet fixed-pinned (TEMA V-5.3).

    Examples
    --------
    >>> round(float(natural_frequency(200e9, 1e-8, 1.0, 1.0)), 3)  # (π/2)·sqrt(EI/(mL⁴)) = π/2·sqrt(2000)
    70.248
    """
    if ends not in SPAN_CONSTANTS:
        raise InputError("ends", ends, f"one of {sorted(SPAN_CONSTANTS)}")
    return SPAN_CONSTANTS[ends] / (2 * np.pi) * np.sqrt(modulus * moment / (mass * np.asarray(span, float) ** 4))


def connors_critical_velocity(fn, tube_od, mass, rho, damping=DAMPING_DEFAULT, beta=BETA_DESIGN):
    """Fluidelastic critical crossflow velocity, Connors (1970) form [m/s].

    ``Vc = β·fn·do·sqrt(m·δ/(ρ·do²))`` with the logarithmic decrement ``δ = 2π·ζ``.

    Parameters
    ----------
    fn : float
        Natural frequency [Hz].
    tube_od : float
        Tube outside diameter [m].
    mass : float
        Effective mass per length, with added mass [kg/m].
    rho : float
        Shell-side fluid density [kg/m³].
    damping : float
        Damping ratio ζ [-].
    beta : float
        Connors constant [-]; 3.0 is the Pettigrew & Taylor (1991) design value.
    """
    delta = 2 * np.pi * np.asarray(damping, float)
    return beta * fn * tube_od * np.sqrt(mass * delta / (rho * tube_od**2))


def vortex_shedding_frequency(velocity, tube_od, strouhal=STROUHAL_DEFAULT):
    """Vortex-shedding frequency ``St·V/do`` [Hz] for crossflow velocity V [m/s] and tube od [m]."""
    return strouhal * np.asarray(velocity, float) / tube_od


def vortex_amplitude(lift, rho, tube_od, velocity, fn, mass, damping=DAMPING_DEFAULT):
    """Peak amplitude of a span at vortex-shedding lock-in [m], ``C_L·ρ·do·V²/(2π²·δ·fn²·m)``.

    Parameters
    ----------
    lift : float
        Fluctuating lift coefficient C_L [-].
    rho : float
        Shell-side density [kg/m³].
    tube_od : float
        Tube outside diameter [m].
    velocity : float
        Crossflow velocity [m/s].
    fn : float
        Natural frequency [Hz].
    mass : float
        Effective mass per length [kg/m].
    damping : float
        Damping ratio ζ [-], δ = 2πζ.

    Notes
    -----
    A uniform harmonic load per length F = ½·C_L·ρ·V²·do on a pinned-pinned span at resonance: the first mode
    sin(πx/L) has modal force 2FL/π and modal mass mL/2, so the midspan amplitude is
    (2FL/π)/((mL/2)·(2πfn)²·2ζ) = F/(π²·m·fn²·δ), the form TEMA V-11.2 writes in US units.
    """
    delta = 2 * np.pi * np.asarray(damping, float)
    return lift * rho * tube_od * np.asarray(velocity, float) ** 2 / (2 * np.pi**2 * delta * fn**2 * mass)


def spans(exchanger):
    """Candidate longest unsupported spans of a segmentally baffled bundle: list of (length [m], ends, where).

    Tubes in the baffle windows pass through every second baffle: inside the bundle their span is twice the baffle
    spacing (pinned-pinned); at the ends it is the inlet or outlet spacing plus one central spacing, fixed at the
    tubesheet (fixed-pinned). Without baffles the span is the tube length (fixed-fixed).
    """
    lb = float(exchanger.baffle_spacing)
    lbi = float(getattr(exchanger, "baffle_spacing_in", None) or lb)
    lbo = float(getattr(exchanger, "baffle_spacing_out", None) or lb)
    length = float(exchanger.tube_length)
    nb = int(getattr(exchanger, "n_baffles", max(round(length / lb) - 1, 0)))
    if nb <= 0:
        return [(length, "fixed-fixed", "unbaffled tube")]
    out = [(min(lbi + lb, length), "fixed-pinned", "inlet window tubes"),
           (min(lbo + lb, length), "fixed-pinned", "outlet window tubes")]
    if nb >= 3:
        out.append((2 * lb, "pinned-pinned", "interior window tubes"))
    return out


def vibration_checks(exchanger, rho_tube, rho_shell, velocity_crossflow, *, damping=None, beta=BETA_DESIGN,
                     strouhal=STROUHAL_DEFAULT, lift=LIFT_DEFAULT):
    """Fluidelastic and vortex-shedding screens of the span with the lowest natural frequency.

    Parameters
    ----------
    exchanger : ShellAndTube
        Geometry (tube_od, tube_id, tube_pitch, layout, baffle spacings, tube_material with ``elastic_modulus``
        [Pa] and ``density`` [kg/m³]).
    rho_tube, rho_shell : float
        Tube-side and shell-side densities [kg/m³].
    velocity_crossflow : float
        Shell-side crossflow velocity [m/s] (the rating's ``velocity_shell``, at the bundle centre line; TEMA's
        reference crossflow velocity differs somewhat).
    damping : float or None
        Damping ratio ζ [-]; ``None`` uses :data:`DAMPING_DEFAULT` and says so.
    beta, strouhal, lift : float
        Connors constant, Strouhal number and lift coefficient [-].

    Returns
    -------
    tuple of Check
        ``fluidelastic`` (V/Vc: ``fail`` ≥ 1, ``warn`` ≥ 0.8) and ``vortex_shedding`` (``ok`` when f_vs < 0.5·fn,
        else the amplitude against 0.02·do: ``warn`` within, ``fail`` beyond). Messages say "screening only".
    """
    mat = exchanger.tube_material
    notes = []
    E = getattr(mat, "elastic_modulus", None)
    rho_metal = getattr(mat, "density", None)
    if E is None or rho_metal is None:
        E, rho_metal = E or 200e9, rho_metal or 7850.0
        notes.append("carbon-steel modulus/density assumed")
    zeta = DAMPING_DEFAULT if damping is None else float(require(damping, "damping", gt=0, lt=1))
    if damping is None:
        notes.append(f"damping ζ = {zeta:g} assumed")
    do, di = float(exchanger.tube_od), float(exchanger.tube_id)
    cm = float(added_mass_coefficient(float(exchanger.tube_pitch) / do, int(exchanger.layout)))
    m = float(mass_per_length(do, di, rho_metal, rho_tube, rho_shell, cm))
    inertia = float(second_moment(do, di))
    cands = [(float(natural_frequency(E, inertia, m, L, ends)), L, ends, where) for L, ends, where in spans(exchanger)]
    fn, L, ends, where = min(cands)
    v = float(velocity_crossflow)
    span_txt = f"{where}, span {L:.3g} m {ends}, fn {fn:.3g} Hz, Cm {cm:.3g}"
    if getattr(exchanger, "rear_head", "") == "u-tube":
        notes.append("U-bends not screened")
    extra = ("; " + ", ".join(notes)) if notes else ""

    vc = float(connors_critical_velocity(fn, do, m, rho_shell, zeta, beta))
    ratio = v / vc
    status = "fail" if ratio >= 1 else ("warn" if ratio >= FLUIDELASTIC_WARN else "ok")
    fe = Check("fluidelastic", status, v, vc, "m/s",
               f"crossflow {v:.3g} m/s vs fluidelastic critical {vc:.3g} m/s (Connors, β = {beta:g}; {span_txt}"
               f"{extra}); screening only")

    fvs = float(vortex_shedding_frequency(v, do, strouhal))
    amp = float(vortex_amplitude(lift, rho_shell, do, v, fn, m, zeta))
    amp_lim = AMPLITUDE_LIMIT * do
    if fvs < 0.5 * fn:
        status = "ok"
    else:
        status = "warn" if amp <= amp_lim else "fail"
    vs = Check("vortex_shedding", status, amp, amp_lim, "m",
               f"shedding {fvs:.3g} Hz (St = {strouhal:g}) vs fn {fn:.3g} Hz; lock-in amplitude {amp * 1e3:.3g} mm "
               f"vs TEMA 0.02·do = {amp_lim * 1e3:.3g} mm (C_L = {lift:g}; {where}{extra}); screening only")
    return fe, vs


def span_check(exchanger) -> Check:
    """Longest unsupported span against the TEMA RCB-4.52 maximum.

    The steel and high-alloy column comes from :func:`revamp.geometry.tema_max_unsupported_span`. TEMA's column for
    aluminium, copper and titanium alloys is shorter, about 0.87 of the steel value (e.g. 52 against 60 in for
    3/4 in tubes) [recalled, not read]: that factor is applied to those metals and the message says so.
    """
    from ..geometry import tema_max_unsupported_span

    longest = max(length for length, _, _ in spans(exchanger))
    limit = float(tema_max_unsupported_span(float(exchanger.tube_od)))
    name = str(getattr(exchanger.tube_material, "name", "")).lower()
    soft = any(w in name for w in ("copper", "cu-ni", "cuni", "brass", "titanium", "alumin", "admiralty"))
    column = "steel column"
    if soft:
        limit *= SOFT_METAL_SPAN_FACTOR
        column = f"copper/aluminium/titanium column taken as {SOFT_METAL_SPAN_FACTOR:g} × steel, recalled"
    status = "fail" if longest > limit else ("warn" if longest > 0.9 * limit else "ok")
    return Check("tube_span", status, longest, limit, "m",
                 f"longest unsupported span {longest:.3g} m vs TEMA RCB-4.52 maximum {limit:.3g} m ({column}); "
                 "screening only")
