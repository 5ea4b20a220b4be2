"""Screening checks of a rated exchanger: pressure drops, tube velocity, flow-induced vibration, nozzle ρv².

Each check returns a frozen :class:`Check` (``ok`` / ``warn`` / ``fail``, the number, the limit and a message
that says where the limit came from). :func:`screen` runs them all on a :class:`~revamp.rating.Rating`.
The screens can flag a design; they never clear one.
"""
from __future__ import annotations

from dataclasses import dataclass, fields

from ..errors import InputError
from ._check import STATUSES, Check, worst
from .limits import (
    DEFAULT_DP_LIQUID,
    DEFAULT_VELOCITY_MIN,
    DEFAULT_VELOCITY_MIN_CRUDE,
    RHO_V2_NO_IMPINGEMENT,
    RHO_V2_OTHER,
    nozzle_check,
    pressure_drop_check,
    tube_velocity_check,
)
from .vibration import (
    BETA_DESIGN,
    LIFT_DEFAULT,
    STROUHAL_DEFAULT,
    span_check,
    vibration_checks,
)

__all__ = [
    "DEFAULT_DP_LIQUID",
    "DEFAULT_VELOCITY_MIN",
    "DEFAULT_VELOCITY_MIN_CRUDE",
    "RHO_V2_NO_IMPINGEMENT",
    "RHO_V2_OTHER",
    "STATUSES",
    "Check",
    "Limits",
    "nozzle_check",
    "pressure_drop_check",
    "screen",
    "span_check",
    "tube_velocity_check",
    "vibration_checks",
    "worst",
]


@dataclass(frozen=True)
class Limits:
    """The limits a study screens against; every field optional.

    Parameters
    ----------
    dp_shell, dp_tube : float, str or None
        Allowed pressure drop per side [Pa]; ``None``: 70 kPa (liquids, common practice; the check says so).
    velocity_tube_min : float, str or None
        Fouling minimum tube velocity [m/s]; ``None``: 1 m/s (common practice; use 1.5-2 m/s for crude).
    velocity_tube_max : float, str or None
        Erosion maximum [m/s]; ``None``: the tube material's ``erosion_velocity_max`` if it has one.
    damping : float or None
        Tube damping ratio for the vibration screen [-]; ``None``: 1 % (conservative, common practice).
    beta, strouhal, lift : float
        Connors constant, Strouhal number, lift coefficient for the vibration screen [-].
    nozzle_rho_v2 : float or None
        Allowed shell inlet nozzle ρv² [kg/(m·s²)]; ``None``: TEMA RCB-4.6.1 non-abrasive single-phase value.
    vibration : bool
        Run the vibration screen.
    """

    dp_shell: object = None
    dp_tube: object = None
    velocity_tube_min: object = None
    velocity_tube_max: object = None
    damping: object = None
    beta: float = BETA_DESIGN
    strouhal: float = STROUHAL_DEFAULT
    lift: float = LIFT_DEFAULT
    nozzle_rho_v2: object = None
    vibration: bool = True

    @classmethod
    def of(cls, value) -> Limits:
        """A Limits from ``None``, a dict of its fields or a Limits."""
        if value is None:
            return cls()
        if isinstance(value, cls):
            return value
        if isinstance(value, dict):
            known = {f.name for f in fields(cls)}
            bad = sorted(set(value) - known)
            if bad:
                raise InputError(f"limits.{bad[0]}", value[bad[0]], f"a field among {sorted(known)}")
            return cls(**value)
        raise InputError("limits", value, "None, a dict or a Limits")


def screen(rating, limits=None) -> tuple:
    """Run every screening check on a scalar rating.

    Parameters
    ----------
    rating : Rating
        A rating of one case (scalar fields), from :func:`revamp.rate`.
    limits : Limits, dict or None
        The limits; see :class:`Limits`.

    Returns
    -------
    tuple of Check
        ``dp_shell``, ``dp_tube``, ``velocity_tube``, then ``fluidelastic`` and ``vortex_shedding`` (unless
        ``limits.vibration`` is False) and ``tube_span``, then ``nozzle_shell`` when the exchanger has a shell nozzle diameter.
    """
    lim = Limits.of(limits)
    if getattr(rating, "shape", ()) != ():
        raise InputError("rating", f"array of shape {rating.shape}", "a single case for screen() (rate one case)")
    ex = rating.exchanger
    vmax = lim.velocity_tube_max if lim.velocity_tube_max is not None else ex.tube_material
    checks = [
        pressure_drop_check(float(rating.dp_shell), lim.dp_shell, "shell"),
        pressure_drop_check(float(rating.dp_tube), lim.dp_tube, "tube"),
        tube_velocity_check(float(rating.velocity_tube), lim.velocity_tube_min, vmax),
    ]
    if lim.vibration:
        checks += vibration_checks(ex, float(rating.rho_tube), float(rating.rho_shell), float(rating.velocity_shell),
                                   damping=lim.damping, beta=lim.beta, strouhal=lim.strouhal, lift=lim.lift)
        checks.append(span_check(ex))
    nozzle = getattr(ex, "nozzle_shell", None)
    if nozzle is not None:
        flow = float(rating.service.shell.flow) / int(getattr(ex, "shells_parallel", 1))
        checks.append(nozzle_check(flow, float(rating.rho_shell), nozzle, lim.nozzle_rho_v2, "shell"))
    return tuple(checks)
