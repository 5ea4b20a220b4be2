"""What a rating returns: :class:`Rating` (shell-and-tube) and the frame methods every rating result shares
(:class:`ResultFrames`: shape, resistance breakdown, controlling resistance, one row per case)."""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from ._arrays import as_out
from .errors import InputError
from .resistance import TUBE_LAYERS

__all__ = ["Rating", "ResultFrames", "LazyResistances"]


class ResultFrames:
    """Frame methods of a frozen rating result. The result names its numeric fields (``_FRAME_FIELDS``), its area
    fields (``_FRAME_AREAS``) and its resistance layers (``layers``); ``resistances`` is a Series (one case) or a
    DataFrame (one row per case)."""

    _FRAME_FIELDS: tuple = ()
    _FRAME_AREAS: tuple = ("area",)

    @property
    def shape(self) -> tuple:
        """The broadcast shape of the cases (``()`` for a single case)."""
        return np.shape(self.duty)

    def breakdown(self) -> pd.DataFrame:
        """The resistances in series on the result's area basis: ``resistance`` [m²K/W] and ``share`` of the total.

        Scalar ratings only (for sweeps use :attr:`resistances`, one row per case).
        """
        if self.shape != ():
            raise InputError("rating", f"array of shape {self.shape}", "a single case for breakdown()")
        r = self.resistances
        return pd.DataFrame({"resistance": r, "share": r / r.sum()})

    def controlling_resistance(self):
        """Name of the largest resistance (scalar) or an array of names (sweeps)."""
        if self.shape == ():
            return str(self.resistances.idxmax())
        return self.resistances.idxmax(axis=1).to_numpy().reshape(self.shape)

    def to_frame(self) -> pd.DataFrame:
        """One row per case: every numeric field, the areas and the resistances (``"R <layer>"``) as columns (SI)."""
        n = int(np.prod(self.shape, dtype=int))
        cols = {name: np.broadcast_to(getattr(self, name), self.shape).ravel() for name in self._FRAME_FIELDS}
        for name in self._FRAME_AREAS:
            cols[name] = np.full(n, getattr(self, name))
        frame = pd.DataFrame(cols)
        res = self.resistances
        for name in self.layers:
            frame["R " + name] = res[name] if isinstance(res, pd.Series) else res[name].to_numpy()
        return frame

    def to_series(self) -> pd.Series:
        """A single case as a Series (SI)."""
        if self.shape != ():
            raise InputError("rating", f"array of shape {self.shape}", "a single case for to_series(); use to_frame()")
        return self.to_frame().iloc[0]


_SCALAR_FIELDS = {
    # name: (unit, description) -- used for to_frame() and the report tables
    "duty": ("W", "heat duty"),
    "t_out_shell": ("K", "shell-side outlet temperature"),
    "t_out_tube": ("K", "tube-side outlet temperature"),
    "effectiveness": ("-", "thermal effectiveness"),
    "NTU": ("-", "number of transfer units"),
    "F": ("-", "LMTD correction factor"),
    "lmtd": ("K", "log-mean temperature difference (counterflow terminals)"),
    "U_clean": ("W/m²K", "overall coefficient, clean, outside area"),
    "U_service": ("W/m²K", "overall coefficient in service, outside area"),
    "U_service_inside": ("W/m²K", "overall coefficient in service, inside area"),
    "h_shell": ("W/m²K", "shell-side film coefficient"),
    "h_tube": ("W/m²K", "tube-side film coefficient"),
    "dp_shell": ("Pa", "shell-side pressure drop"),
    "dp_tube": ("Pa", "tube-side pressure drop"),
    "velocity_tube": ("m/s", "tube-side velocity"),
    "velocity_shell": ("m/s", "shell-side crossflow velocity"),
    "Re_tube": ("-", "tube-side Reynolds number"),
    "Re_shell": ("-", "shell-side Reynolds number"),
    "Pr_tube": ("-", "tube-side Prandtl number"),
    "Pr_shell": ("-", "shell-side Prandtl number"),
    "t_wall_tube": ("K", "tube inner surface temperature"),
    "t_wall_shell": ("K", "tube outer surface temperature"),
    "shear_tube": ("Pa", "tube-side wall shear stress"),
    "rho_tube": ("kg/m³", "tube-side density at mean temperature"),
    "rho_shell": ("kg/m³", "shell-side density at mean temperature"),
    "C_shell": ("W/K", "shell-side heat-capacity rate"),
    "C_tube": ("W/K", "tube-side heat-capacity rate"),
}


def _case_shaped(fields, shape, n, invalid=None):
    """A rating's per-case numbers (name -> values of the ``n`` flattened cases, or one value for all) in the
    service's case shape: floats for a single case, NaN where ``invalid`` (a boolean ``(n,)`` mask) is set."""
    out = {}
    for key, value in fields.items():
        value = np.asarray(value, dtype=float)
        if shape == () and invalid is None:
            out[key] = float(value.reshape(-1)[0])
            continue
        if value.shape != (n,):
            value = np.broadcast_to(value, (n,))
        if invalid is not None:
            value = np.where(invalid, np.nan, value)
        out[key] = as_out(value.reshape(shape))
    return out


@dataclass(frozen=True, slots=True)
class LazyResistances:
    """The series resistances of a rating as arrays, turned into the pandas object :attr:`Rating.resistances`
    (a Series for one case, a DataFrame with one row per case) only when it is first asked for: building pandas
    objects costs more than a small rating itself.

    ``values``: one flat array per layer of ``layers`` [m²K/W]; ``invalid``: cases reported as NaN (None: none);
    ``scalar``: one case (a Series)."""

    layers: tuple
    values: tuple
    invalid: object = None
    scalar: bool = False

    def build(self):
        if self.scalar:
            return pd.Series(np.array([float(np.ravel(v)[0]) for v in self.values]), index=pd.Index(self.layers),
                             name="resistance [m²K/W]")
        cols = [np.array(v, dtype=float) if self.invalid is None else np.where(self.invalid, np.nan, v)
                for v in self.values]
        return pd.DataFrame(dict(zip(self.layers, cols)))


@dataclass(frozen=True)
class Rating(ResultFrames):
    """The result of :func:`rate`. SI units; arrays of the service's broadcast shape for sweeps.

    Attributes
    ----------
    duty : heat duty [W]
    t_out_shell, t_out_tube : outlet temperatures [K]
    effectiveness, NTU, F : [-]
    lmtd : counterflow log-mean temperature difference of the terminals [K]
    U_clean, U_service : overall coefficients on the outside area [W/m²K]
    U_service_inside : in service, on the inside area [W/m²K]
    area, area_inside : outside and inside heat-transfer areas, all shells [m²]
    h_shell, h_tube : film coefficients, each on its own surface [W/m²K]
    dp_shell, dp_tube : pressure drops over all shells in series [Pa]
    velocity_tube : tube-side velocity [m/s]; velocity_shell : crossflow velocity at the bundle centreline [m/s]
    Re_tube, Re_shell, Pr_tube, Pr_shell : [-]
    t_wall_tube, t_wall_shell : tube inner and outer surface temperatures [K]
    shear_tube : tube-side wall shear stress [Pa]
    rho_tube, rho_shell : densities at the mean temperatures [kg/m³]
    C_shell, C_tube : heat-capacity rates of the whole streams [W/K]
    resistances : pandas Series (scalar) or DataFrame (one row per case) of the five series resistances on the
        outside area [m²K/W], summing to ``1/U_service``, named as :attr:`layers`
    layers : the names of the resistances, from the exchanger's kind (:data:`revamp.resistance.TUBE_LAYERS`)
    tube_side, shell_side : the correlation results (details)
    warnings : tuple of str
    defaults : tuple of str, the geometry defaults applied (TEMA clearances ...)
    exchanger, service : the inputs
    """

    duty: object
    t_out_shell: object
    t_out_tube: object
    effectiveness: object
    NTU: object
    F: object
    lmtd: object
    U_clean: object
    U_service: object
    U_service_inside: object
    area: float
    area_inside: float
    h_shell: object
    h_tube: object
    dp_shell: object
    dp_tube: object
    velocity_tube: object
    velocity_shell: object
    Re_tube: object
    Re_shell: object
    Pr_tube: object
    Pr_shell: object
    t_wall_tube: object
    t_wall_shell: object
    shear_tube: object
    rho_tube: object
    rho_shell: object
    C_shell: object
    C_tube: object
    resistances: object
    tube_side: object = field(repr=False)
    shell_side: object = field(repr=False)
    warnings: tuple = ()
    defaults: tuple = ()
    exchanger: object = field(default=None, repr=False)
    service: object = field(default=None, repr=False)
    shell_method: str = "bell-delaware"

    _FRAME_FIELDS = tuple(_SCALAR_FIELDS)

    @property
    def layers(self) -> tuple:
        """The names of the resistances in series, from the exchanger's kind (:data:`revamp.exchanger.MODELS`);
        those of the resistances themselves when the result carries no exchanger of a registered kind."""
        from .exchanger import MODELS  # same layer, imported on use (exchanger.py builds on rating's helpers)

        kind = getattr(type(self.exchanger), "kind", None)
        model = MODELS.get(kind) if isinstance(kind, str) else None
        if model is not None:
            return model.layers
        r = self.resistances
        return tuple(r.index if isinstance(r, pd.Series) else r.columns) if r is not None else TUBE_LAYERS

    def __post_init__(self):
        # resistances given as their values (LazyResistances): the pandas object is built on first access
        if isinstance(self.__dict__.get("resistances"), LazyResistances):
            self.__dict__["_resistance_values"] = self.__dict__.pop("resistances")

    def __getattr__(self, name):  # called only for attributes not found: the resistances not yet built
        if name == "resistances":
            values = self.__dict__.get("_resistance_values")
            if values is not None:
                frame = values.build()
                self.__dict__["resistances"] = frame
                return frame
        raise AttributeError(f"{type(self).__name__!r} object has no attribute {name!r}")
