"""Screening checks of pressure drop, tube-side velocity and nozzle momentum flux (ρv²).

Each function takes plain SI numbers and returns a :class:`~revamp.screening.Check`.

References
----------
Sinnott, R. K. (2005). *Coulson & Richardson's Chemical Engineering*, vol. 6, 4th ed., §12.8: allowed
pressure drops of 35-70 kPa for liquids are typical.
TEMA (2007). *Standards of the Tubular Exchanger Manufacturers Association*, 9th ed., paragraph RCB-4.6.1:
shell inlet nozzle ρv² above 1500 lb/(ft·s²) for non-corrosive, non-abrasive single-phase fluids, and above
500 lb/(ft·s²) for other liquids, calls for impingement protection [limits recalled, not read].
"""
from __future__ import annotations

import math

from ..errors import InputError
from ..units import require, to_si
from ._check import Check

__all__ = [
    "DEFAULT_DP_LIQUID",
    "DEFAULT_VELOCITY_MIN",
    "DEFAULT_VELOCITY_MIN_CRUDE",
    "LB_FT_S2",
    "RHO_V2_NO_IMPINGEMENT",
    "RHO_V2_OTHER",
    "nozzle_check",
    "pressure_drop_check",
    "tube_velocity_check",
]

#: Allowed pressure drop per side when the user gives none [Pa]: the top of the 35-70 kPa liquid range (Sinnott 2005).
DEFAULT_DP_LIQUID = 70e3
#: Tube-side velocity below which fouling is favoured, general liquids [m/s] (common practice, no source).
DEFAULT_VELOCITY_MIN = 1.0
#: The same for crude oil [m/s] (common practice against crude fouling, 1.5-2 m/s; no source).
DEFAULT_VELOCITY_MIN_CRUDE = 1.5
#: 1 lb/(ft·s²) in kg/(m·s²).
LB_FT_S2 = 0.45359237 / 0.3048
#: TEMA RCB-4.6.1 ρv² without impingement plate, non-abrasive single-phase fluids [kg/(m·s²)] (1500 lb/ft·s²) [mem].
RHO_V2_NO_IMPINGEMENT = 1500 * LB_FT_S2
#: TEMA RCB-4.6.1 ρv² for all other liquids, e.g. at their boiling point [kg/(m·s²)] (500 lb/ft·s²) [mem].
RHO_V2_OTHER = 500 * LB_FT_S2

_NEAR = 0.9  # a value above 90 % of a maximum is flagged "warn" (common practice, no source)


def pressure_drop_check(dp, allowed=None, side="tube") -> Check:
    """Pressure drop of one side against the allowed value.

    Parameters
    ----------
    dp : float or str
        Pressure drop of the side, whole exchanger [Pa].
    allowed : float, str or None
        Allowed pressure drop [Pa]. ``None`` uses :data:`DEFAULT_DP_LIQUID` (70 kPa, liquids) and says so.
    side : {"tube", "shell"}
        Which side, for the check's name.

    Returns
    -------
    Check
        ``fail`` above the allowed value, ``warn`` above 90 % of it, ``ok`` otherwise.

    Examples
    --------
    >>> pressure_drop_check(50e3, "0.7 bar").status
    'ok'
    >>> pressure_drop_check(75e3).message
    'dp_tube = 75 kPa exceeds the allowed 70 kPa (default for liquids, Sinnott 2005; give your own)'
    """
    if side not in ("tube", "shell"):
        raise InputError("side", side, "'tube' or 'shell'")
    dp = require(to_si(dp, "pressure", f"dp_{side}"), f"dp_{side}", ge=0)
    if allowed is None:
        limit, source = DEFAULT_DP_LIQUID, " (default for liquids, Sinnott 2005; give your own)"
    else:
        limit = require(to_si(allowed, "pressure", f"allowed dp_{side}"), f"allowed dp_{side}", gt=0)
        source = " (user value)"
    name = f"dp_{side}"
    if dp > limit:
        status, verb = "fail", "exceeds"
    elif dp > _NEAR * limit:
        status, verb = "warn", "is within 10 % of"
    else:
        status, verb = "ok", "is within"
    msg = f"{name} = {dp / 1e3:.3g} kPa {verb} the allowed {limit / 1e3:.3g} kPa{source}"
    return Check(name, status, dp, limit, "Pa", msg)


def _erosion_limit(material):
    """The erosion velocity maximum [m/s] from a number, a string with a unit or a Material-like object."""
    if material is None:
        return None, ""
    if hasattr(material, "erosion_velocity_max"):
        v = material.erosion_velocity_max
        name = getattr(material, "name", "the tube material")
        return (None, "") if v is None else (float(v), f"erosion maximum for {name}")
    v = require(to_si(material, "velocity", "velocity_tube_max"), "velocity_tube_max", gt=0)
    return float(v), "erosion maximum (user value)"


def tube_velocity_check(velocity, minimum=None, maximum=None) -> Check:
    """Tube-side velocity against a fouling minimum and an erosion maximum.

    Parameters
    ----------
    velocity : float or str
        Mean tube-side velocity [m/s].
    minimum : float, str or None
        Velocity below which fouling is favoured [m/s]; ``None`` uses :data:`DEFAULT_VELOCITY_MIN` (1 m/s,
        common practice). Use about 1.5-2 m/s for crude oil (:data:`DEFAULT_VELOCITY_MIN_CRUDE`).
    maximum : float, str, Material or None
        Erosion maximum [m/s], or a material object with ``erosion_velocity_max`` (``revamp.materials``).
        ``None``: no maximum checked.

    Returns
    -------
    Check
        ``fail`` above the erosion maximum, ``warn`` below the fouling minimum or above 90 % of the maximum.

    Examples
    --------
    >>> tube_velocity_check(0.6).status
    'warn'
    >>> tube_velocity_check("10 ft/s", maximum=2.5).status
    'fail'
    """
    v = require(to_si(velocity, "velocity", "velocity_tube"), "velocity_tube", ge=0)
    if minimum is None:
        vmin, min_src = DEFAULT_VELOCITY_MIN, "default 1 m/s, common practice"
    else:
        vmin = require(to_si(minimum, "velocity", "velocity_tube_min"), "velocity_tube_min", ge=0)
        min_src = "user value"
    vmax, max_src = _erosion_limit(maximum)
    if vmax is not None and v > vmax:
        return Check("velocity_tube", "fail", v, vmax, "m/s",
                     f"tube velocity {v:.3g} m/s exceeds the {max_src} {vmax:.3g} m/s")
    if v < vmin:
        return Check("velocity_tube", "warn", v, vmin, "m/s",
                     f"tube velocity {v:.3g} m/s is below the fouling minimum {vmin:.3g} m/s ({min_src})")
    if vmax is not None and v > _NEAR * vmax:
        return Check("velocity_tube", "warn", v, vmax, "m/s",
                     f"tube velocity {v:.3g} m/s is within 10 % of the {max_src} {vmax:.3g} m/s")
    upper = f" and below the {max_src} {vmax:.3g} m/s" if vmax is not None else " (no erosion maximum given)"
    return Check("velocity_tube", "ok", v, vmax if vmax is not None else vmin, "m/s",
                 f"tube velocity {v:.3g} m/s is above the fouling minimum {vmin:.3g} m/s ({min_src}){upper}")


def nozzle_check(flow, density, diameter, limit=None, side="shell") -> Check:
    """Nozzle momentum flux ρv² against the TEMA RCB-4.6.1 impingement limit.

    Parameters
    ----------
    flow : float or str
        Mass flow through the nozzle [kg/s].
    density : float or str
        Fluid density at the nozzle [kg/m³].
    diameter : float or str
        Nozzle inside diameter [m].
    limit : float or None
        Allowed ρv² [kg/(m·s²)]. ``None`` uses :data:`RHO_V2_NO_IMPINGEMENT` (non-abrasive single-phase fluid
        without impingement plate); use :data:`RHO_V2_OTHER` for other liquids.
    side : str
        Which nozzle, for the check's name.

    Returns
    -------
    Check
        ``warn`` above the limit: TEMA then asks for impingement protection; ``ok`` otherwise.

    Examples
    --------
    >>> c = nozzle_check(10.0, 800.0, 0.1)
    >>> round(c.value), c.status
    (2026, 'ok')
    """
    m = require(to_si(flow, "mass_flow", f"{side} nozzle flow"), f"{side} nozzle flow", ge=0)
    rho = require(to_si(density, "density", f"{side} nozzle density"), f"{side} nozzle density", gt=0)
    d = require(to_si(diameter, "length", f"nozzle_{side}"), f"nozzle_{side}", gt=0)
    if limit is None:
        lim, src = RHO_V2_NO_IMPINGEMENT, "TEMA RCB-4.6.1, non-abrasive single-phase fluid"
    else:
        lim, src = float(require(limit, f"{side} nozzle rho_v2 limit", gt=0)), "user value"
    v = m / rho / (math.pi * d**2 / 4)
    rv2 = rho * v**2
    if rv2 > lim:
        return Check(f"nozzle_{side}", "warn", rv2, lim, "kg/(m·s²)",
                     f"{side} nozzle ρv² = {rv2:.4g} kg/(m·s²) exceeds {lim:.4g} ({src}): impingement "
                     "protection needed")
    return Check(f"nozzle_{side}", "ok", rv2, lim, "kg/(m·s²)",
                 f"{side} nozzle ρv² = {rv2:.4g} kg/(m·s²) is within {lim:.4g} ({src})")
