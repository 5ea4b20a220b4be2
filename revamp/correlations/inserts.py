"""Tube inserts: twisted tapes, wire coils and user-supplied enhancement factors.

Every insert is a frozen dataclass with

- ``nu(Re, Pr, d_over_L)``: mean Nusselt number on the plain-tube inside diameter d [-];
- ``friction(Re)``: Darcy friction factor referred to d and the empty-tube mean velocity, so that the caller's
  ``dp = f (L/d) rho v²/2`` with the empty-tube velocity v works unchanged [-];
- ``check(Re, Pr) -> list[str]``: validity warnings;
- ``label``: a short description for reports.

Re is always the empty-tube Reynolds number, Re = rho v d / mu with v = m_dot / (rho pi d²/4). The viscosity-ratio
factor is applied by the caller (:func:`revamp.correlations.tube.tube_side`), not here.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .._arrays import as_array as _arr
from .._arrays import as_out as _out
from ..errors import InputError
from ._validity import range_warning
from .tube import RE_LAMINAR, RE_TURBULENT, friction_darcy, nu_laminar, nu_tube

__all__ = ["FactorInsert", "TwistedTapeInsert", "WireCoilInsert"]


def _blend(Re, lo, hi, f_lo, f_hi, lam, turb):
    """Laminar value below lo, turbulent above hi, linear between the two end values."""
    g = np.clip((Re - lo) / (hi - lo), 0.0, 1.0)
    mid = (1.0 - g) * f_lo + g * f_hi
    return np.where(Re <= lo, lam, np.where(Re >= hi, turb, mid))


def _number(value, field, low, high, what):
    try:
        v = float(value)
    except (TypeError, ValueError):
        raise InputError(field, value, what) from None
    if not (np.isfinite(v) and low < v < high):
        raise InputError(field, value, what)
    return v


# ------------------------------------------------------------------------------------------------ twisted tape
@dataclass(frozen=True)
class TwistedTapeInsert:
    """Full-length twisted tape, Manglik & Bergles (1993).

    Parameters
    ----------
    twist_ratio : float
        y = H/d, the length of a 180° twist over the tube inside diameter [-], > 1; data y = 3 to infinity
        (straight tape) [mem].
    thickness_ratio : float
        Tape thickness over tube inside diameter delta/d [-], 0 <= delta/d < 0.25.
    label : str
        Description for reports.

    Notes
    -----
    With B = pi/(pi - 4 delta/d) (empty over free flow area) and D = (pi + 2 - 2 delta/d)/(pi - 4 delta/d)
    (d over the hydraulic diameter of the taped tube), Re the empty-tube Reynolds number:

    Turbulent, Re >= 1e4 (Part II):
        Nu = 0.023 Re^0.8 Pr^0.4 (1 + 0.769/y) B^0.8 D^0.2
        f_Fanning = 0.0791 Re^-0.25 (1 + 2.752/y^1.29) B^1.75 D^1.25, Darcy f = 4 f_Fanning.
        Both follow from the Dittus-Boelter and Blasius laws written on the hydraulic diameter and the free-area
        velocity and referred back to d and the empty-tube velocity: that derivation fixes the exponents
        (0.8 on B and 0.2 on D for Nu; 1.75 and 1.25 for f) and shows Re is the empty-tube value. An independent
        implementation (pychemqt, ``Nu_twisted_Manglik``) writes Nu the same way.

    Laminar, Re <= 2300 (Part I, fully developed swirl, no free convection):
        Sw = Re_s / sqrt(y), Re_s = Re B (1 + (pi/(2y))²)^0.5 (swirl Reynolds number on the free-area velocity),
        Gz = (pi/4) Re Pr d/L,
        Nu = 4.612 [(1 + 0.0951 Gz^0.894)^2.5 + 6.413e-9 (Sw Pr^0.391)^3.835]^0.2,
        f_Fanning,a Re_a = 15.767 D² (1 + 1e-6 Sw^2.55)^(1/6) on the free-area velocity (Re_a = B Re);
        referred to the empty-tube velocity f = f_a B². The constants are [mem]; the basis of Re in the laminar
        friction law was not verified against the paper (it changes f by the factor B, 1.03-1.1 for usual tapes).

    Between 2300 and 1e4: linear blend of the laminar value at 2300 and the turbulent value at 1e4, as in
    :func:`revamp.correlations.tube.nu_tube` (Gnielinski 2013 form; not from Manglik & Bergles).

    References
    ----------
    Manglik, R. M., Bergles, A. E. (1993). Heat transfer and pressure drop correlations for twisted-tape inserts
    in isothermal tubes: Part I - Laminar flows. J. Heat Transfer 115(4), 881-889.
    Manglik, R. M., Bergles, A. E. (1993). Part II - Transition and turbulent flows. J. Heat Transfer 115(4),
    890-896.
    """

    twist_ratio: float
    thickness_ratio: float = 0.0
    label: str = "twisted tape"

    def __post_init__(self):
        y = _number(self.twist_ratio, "insert.twist_ratio", 1.0, np.inf, "a twist ratio H/d > 1")
        t = _number(self.thickness_ratio, "insert.thickness_ratio", -1e-300, 0.25,
                    "a thickness ratio delta/d with 0 <= delta/d < 0.25")
        object.__setattr__(self, "twist_ratio", y)
        object.__setattr__(self, "thickness_ratio", t)

    @property
    def _B(self):
        return np.pi / (np.pi - 4.0 * self.thickness_ratio)

    @property
    def _D(self):
        t = self.thickness_ratio
        return (np.pi + 2.0 - 2.0 * t) / (np.pi - 4.0 * t)

    def _swirl(self, Re):
        y = self.twist_ratio
        return Re * self._B * np.sqrt(1.0 + (np.pi / (2.0 * y)) ** 2) / np.sqrt(y)

    def _nu_turb(self, Re, Pr):
        return 0.023 * Re**0.8 * Pr**0.4 * (1.0 + 0.769 / self.twist_ratio) * self._B**0.8 * self._D**0.2

    def _nu_lam(self, Re, Pr, d_over_L):
        gz = np.pi / 4.0 * Re * Pr * d_over_L
        sw = self._swirl(Re)
        return 4.612 * ((1.0 + 0.0951 * gz**0.894) ** 2.5 + 6.413e-9 * (sw * Pr**0.391) ** 3.835) ** 0.2

    def _f_turb(self, Re):
        fan = (0.0791 * Re**-0.25 * (1.0 + 2.752 / self.twist_ratio**1.29) * self._B**1.75 * self._D**1.25)
        return 4.0 * fan

    def _f_lam(self, Re):
        re_a = Re * self._B
        fan_a = 15.767 * self._D**2 * (1.0 + 1e-6 * self._swirl(Re) ** 2.55) ** (1.0 / 6.0) / re_a
        return 4.0 * fan_a * self._B**2

    def nu(self, Re, Pr, d_over_L):
        """Mean Nusselt number on d [-] (Re empty-tube [-], Pr [-], d/L [-])."""
        Re, Pr, dl = _arr(Re), _arr(Pr), _arr(d_over_L)
        lam = self._nu_lam(np.minimum(Re, RE_LAMINAR), Pr, dl)
        turb = self._nu_turb(np.maximum(Re, RE_TURBULENT), Pr)
        out = _blend(Re, RE_LAMINAR, RE_TURBULENT, self._nu_lam(RE_LAMINAR, Pr, dl),
                     self._nu_turb(RE_TURBULENT, Pr), lam, turb)
        return _out(out)

    def friction(self, Re):
        """Darcy friction factor on d and the empty-tube velocity [-] (Re empty-tube [-])."""
        Re = _arr(Re)
        lam = self._f_lam(np.minimum(Re, RE_LAMINAR))
        turb = self._f_turb(np.maximum(Re, RE_TURBULENT))
        out = _blend(Re, RE_LAMINAR, RE_TURBULENT, self._f_lam(RE_LAMINAR), self._f_turb(RE_TURBULENT), lam, turb)
        return _out(out)

    def check(self, Re, Pr):
        """Validity warnings (list of str)."""
        src = "Manglik & Bergles (1993) [mem]"
        w = range_warning("Manglik-Bergles twisted tape", "twist ratio y", self.twist_ratio, 2.5, None, src)
        Re = np.atleast_1d(_arr(Re))
        mid = (Re > RE_LAMINAR) & (Re < RE_TURBULENT)
        if np.any(mid):
            w.append(f"Manglik-Bergles twisted tape: {int(mid.sum())} case(s) in transition (2300 < Re < 1e4), "
                     "blended between the laminar and turbulent correlations")
        return w


# ----------------------------------------------------------------------------------------------------- wire coil
@dataclass(frozen=True)
class WireCoilInsert:
    """Helical wire coil in contact with the wall, García, Vicente & Viedma (2005).

    Parameters
    ----------
    pitch_ratio : float
        Helical pitch over tube inside diameter p/d [-]; tested 1.17 to 2.68.
    wire_ratio : float
        Wire diameter over tube inside diameter e/d [-]; tested 0.07 to 0.10.
    label : str
        Description for reports.

    Notes
    -----
    The paper itself was not reached; its abstract gives Re 80 to 90 000, Pr 2.8 to 150, p/d 1.17-2.68,
    e/d 0.07-0.10, pressure drop up to 9x and heat transfer up to 4x the smooth tube in turbulent flow, transition
    advanced to Re about 700. The forms used:

    - Re >= 2000: f_Fanning = 9.35 (p/e)^-1.16 Re^-0.217 (Darcy f = 4 f_Fanning), the paper's eq. 4. Coefficients
      recalled first, then checked against a public reproduction of the paper's equations (an open-source
      process simulator's wire-coil module): identical. Read as a Fanning factor, f is 9.3x the smooth tube
      (Blasius) at p/e = 11.7 (the tightest coil tested) and Re = 1e4, which is the abstract's "up to 9x"; read as
      Darcy it would be 2.3x, so Fanning it is.
    - Re >= 2000: Nu = 0.132 (p/d)^-0.372 Re^0.72 Pr^0.37, the paper's eq. 10. The constants 0.132, 0.372, 0.72
      and 0.37 agree with the same reproduction, but it writes the geometric group as (p/e)^-0.372. With p/e the
      coil would fall below the smooth tube in fully turbulent flow (Nu about 0.5x Gnielinski at p/d 2.68,
      e/d 0.07, Re 9e4, Pr 2.8; about 1.0x for the tightest coil at Re 1e4), against the abstract's enhancement
      and against what a roughness of e/d 0.07-0.10 does; with p/d it gives 1.35x-2.4x at those points. Near
      Re 2000-3000 the comparison does not discriminate (the smooth-tube reference is itself transitional). We
      keep p/d, and ``check`` says the group is unconfirmed.
    - Re <= 700: the coil behaves as a smooth tube (abstract): plain-tube laminar Nu and 64/Re.
    - 700 < Re < 2000: linear blend of the two end values (our choice, no source).

    References
    ----------
    García, A., Vicente, P. G., Viedma, A. (2005). Experimental study of heat transfer enhancement with wire coil
    inserts in laminar-transition-turbulent regimes at different Prandtl numbers. Int. J. Heat Mass Transfer
    48, 4640-4651.
    """

    pitch_ratio: float
    wire_ratio: float
    label: str = "wire coil"

    RE_LOW = 700.0
    RE_HIGH = 2000.0

    def __post_init__(self):
        p = _number(self.pitch_ratio, "insert.pitch_ratio", 0.0, np.inf, "a pitch ratio p/d > 0")
        e = _number(self.wire_ratio, "insert.wire_ratio", 0.0, 0.5, "a wire ratio e/d with 0 < e/d < 0.5")
        object.__setattr__(self, "pitch_ratio", p)
        object.__setattr__(self, "wire_ratio", e)

    def _nu_turb(self, Re, Pr):
        return 0.132 * self.pitch_ratio**-0.372 * Re**0.72 * Pr**0.37

    def _f_turb(self, Re):
        return 4.0 * 9.35 * (self.pitch_ratio / self.wire_ratio) ** -1.16 * Re**-0.217

    def nu(self, Re, Pr, d_over_L):
        """Mean Nusselt number on d [-] (Re empty-tube [-], Pr [-], d/L [-])."""
        Re, Pr, dl = _arr(Re), _arr(Pr), _arr(d_over_L)
        lam = _arr(nu_laminar(np.minimum(Re, self.RE_LOW), Pr, dl))
        turb = self._nu_turb(np.maximum(Re, self.RE_HIGH), Pr)
        out = _blend(Re, self.RE_LOW, self.RE_HIGH, _arr(nu_laminar(self.RE_LOW, Pr, dl)),
                     self._nu_turb(self.RE_HIGH, Pr), lam, turb)
        return _out(out)

    def friction(self, Re):
        """Darcy friction factor on d and the empty-tube velocity [-] (Re empty-tube [-])."""
        Re = _arr(Re)
        lam = 64.0 / np.minimum(Re, self.RE_LOW)
        turb = self._f_turb(np.maximum(Re, self.RE_HIGH))
        out = _blend(Re, self.RE_LOW, self.RE_HIGH, 64.0 / self.RE_LOW, self._f_turb(self.RE_HIGH), lam, turb)
        return _out(out)

    def check(self, Re, Pr):
        """Validity warnings (list of str)."""
        src = "García, Vicente & Viedma (2005)"
        caution = ("wire coil (García et al. 2005): Nusselt correlation's geometric group (p/d, as used, or p/e) "
                   "not verified against the paper; the friction correlation was checked against a public "
                   "reproduction")
        w = [caution]
        w += range_warning("García wire coil", "p/d", self.pitch_ratio, 1.17, 2.68, src)
        w += range_warning("García wire coil", "e/d", self.wire_ratio, 0.07, 0.10, src)
        w += range_warning("García wire coil", "Re", Re, 80, 90000, src)
        w += range_warning("García wire coil", "Pr", Pr, 2.8, 150, src)
        return w


# ------------------------------------------------------------------------------------------------ user factors
@dataclass(frozen=True)
class FactorInsert:
    """User-supplied enhancement factors on the plain tube, e.g. from an insert vendor's test data.

    Nu = nu_factor(Re) * nu_tube(Re, Pr, d/L) and f = f_factor(Re) * friction_darcy(Re) (smooth tube), with the
    factors interpolated linearly in log Re and held constant (with a warning) outside the given Re range.

    Parameters
    ----------
    re : sequence of float
        Reynolds numbers [-], > 0, strictly increasing.
    nu_factor, f_factor : sequence of float
        Multipliers on the plain-tube Nu and Darcy friction factor at those Re [-], > 0.
    label : str
        Description for reports.

    Examples
    --------
    >>> ins = FactorInsert(re=[1e3, 1e5], nu_factor=[2.0, 1.5], f_factor=[3.0, 2.0])
    >>> round(ins.friction(1e4) / 0.0309, 1) > 2.4
    True
    """

    re: tuple
    nu_factor: tuple
    f_factor: tuple
    label: str = "user factors"

    def __post_init__(self):
        arrays = {}
        for name in ("re", "nu_factor", "f_factor"):
            try:
                a = np.asarray(getattr(self, name), dtype=float).ravel()
            except (TypeError, ValueError):
                raise InputError(f"insert.{name}", getattr(self, name), "a list of positive numbers") from None
            if a.size == 0 or not np.all(np.isfinite(a)) or np.any(a <= 0):
                raise InputError(f"insert.{name}", getattr(self, name), "a non-empty list of positive numbers")
            arrays[name] = a
        if not (arrays["re"].size == arrays["nu_factor"].size == arrays["f_factor"].size):
            raise InputError("insert.re", self.re, "the same length as nu_factor and f_factor")
        if np.any(np.diff(arrays["re"]) <= 0):
            raise InputError("insert.re", self.re, "strictly increasing")
        for name, a in arrays.items():
            object.__setattr__(self, name, tuple(float(x) for x in a))

    def _interp(self, Re, values):
        return np.interp(np.log(_arr(Re)), np.log(self.re), values)

    def nu(self, Re, Pr, d_over_L):
        """Mean Nusselt number on d [-] (Re empty-tube [-], Pr [-], d/L [-])."""
        return _out(self._interp(Re, self.nu_factor) * _arr(nu_tube(Re, Pr, d_over_L)))

    def friction(self, Re):
        """Darcy friction factor on d and the empty-tube velocity [-] (Re empty-tube [-])."""
        return _out(self._interp(Re, self.f_factor) * _arr(friction_darcy(Re)))

    def check(self, Re, Pr):
        """Warnings when Re lies outside the given factor table (factors are then held at the end values)."""
        return range_warning(f"insert factors '{self.label}'", "Re", Re, self.re[0], self.re[-1],
                             "the user-supplied factor table (factors held constant outside)")
