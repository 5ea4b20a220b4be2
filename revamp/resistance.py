"""Thermal resistances in series, each referred to one area basis.

Heat crossing a tube wall meets, in series, the shell-side film, the shell-side deposit, the metal wall, the
tube-side deposit and the tube-side film. Each resistance lives on its own surface; to add them they must be referred
to one area. Per unit of *basis* area (diameter :math:`d_b`), a resistance :math:`R_s` that lives on a surface of
diameter :math:`d_s` counts as :math:`R_s \\, d_b / d_s` (the same heat flows through a smaller or larger area), and a
cylindrical layer from :math:`d_1` to :math:`d_2` of conductivity :math:`k` counts as
:math:`d_b \\ln(d_2/d_1) / (2k)`. On the outside basis this gives the familiar

.. math::

    \\frac{1}{U_o} = \\frac{1}{h_o} + R_{fo} + \\frac{d_o \\ln(d_o/d_i)}{2 k_w}
                   + R_{fi}\\frac{d_o}{d_i} + \\frac{d_o}{d_i h_i},
    \\qquad U_o A_o = U_i A_i .

Everything here is array-native: any resistance may be an ndarray and the results broadcast.

References
----------
Incropera, F. P., DeWitt, D. P., Bergman, T. L., Lavine, A. S. (2007). *Fundamentals of Heat and Mass Transfer*,
6th ed., Wiley, §3.3 (the cylindrical wall) and §11.2 (the overall coefficient).
Kern, D. Q. (1950). *Process Heat Transfer*, McGraw-Hill, ch. 6 (resistances referred to the outside surface).

Examples
--------
A 25.4 mm x 2.11 mm carbon-steel tube, ho = 1000, hi = 2000 W/m²K, no fouling (by hand: 1/ho = 1.0e-3,
wall 0.0254·ln(0.0254/0.02118)/100 = 4.61e-5, tube film 0.0254/(0.02118·2000) = 6.00e-4 m²K/W):

>>> net = tube_network(h_shell=1000.0, h_tube=2000.0, fouling_shell=0.0, fouling_tube=0.0,
...                    d_out=0.0254, d_in=0.02118, k_wall=50.0)
>>> round(float(net.U), 1)
607.6
>>> net.breakdown().round(3)["share"].to_dict()
{'shell film': 0.608, 'shell fouling': 0.0, 'wall': 0.028, 'tube fouling': 0.0, 'tube film': 0.364}
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np
import pandas as pd

from ._arrays import as_out as _out
from .errors import InputError
from .units import require

__all__ = [
    "Layer",
    "Network",
    "plane",
    "film",
    "fouling",
    "cylinder",
    "deposit",
    "tube_network",
    "tube_resistances",
    "TUBE_LAYERS",
]

#: The names of the five resistances of a bare tube, outside to inside, as used everywhere in results.
TUBE_LAYERS = ("shell film", "shell fouling", "wall", "tube fouling", "tube film")


def plane(thickness, k):
    """Resistance of a plane layer per unit area, ``thickness / k``.

    Parameters
    ----------
    thickness : float or ndarray
        Layer thickness [m], >= 0.
    k : float or ndarray
        Thermal conductivity [W/m/K], > 0.

    Returns
    -------
    float or ndarray
        Resistance per unit area [m²K/W].

    >>> plane(0.01, 50.0)
    0.0002
    """
    require(thickness, "thickness", ge=0)
    require(k, "k", gt=0)
    return _out(np.asarray(thickness) / np.asarray(k))


def film(h, d_surface=1.0, d_basis=None):
    """Film resistance ``1/h`` on a surface of diameter ``d_surface``, referred to ``d_basis``.

    Parameters
    ----------
    h : float or ndarray
        Film coefficient on its own surface [W/m²K], > 0.
    d_surface : float
        Diameter of the surface the film lives on [m].
    d_basis : float, optional
        Basis diameter [m]; defaults to ``d_surface`` (no referral).

    Returns
    -------
    float or ndarray
        Resistance per unit basis area [m²K/W].

    >>> round(film(2000.0, d_surface=0.02, d_basis=0.025), 6)
    0.000625
    """
    require(h, "h", gt=0)
    ratio = 1.0 if d_basis is None else d_basis / d_surface
    return ratio / h


def fouling(Rf, d_surface=1.0, d_basis=None):
    """Fouling resistance ``Rf`` on a surface of diameter ``d_surface``, referred to ``d_basis``.

    Parameters
    ----------
    Rf : float or ndarray
        Fouling resistance on its own surface [m²K/W], >= 0.
    d_surface, d_basis : float
        Diameters [m] as in :func:`film`.

    >>> round(fouling(0.0002, d_surface=0.02, d_basis=0.025), 7)
    0.00025
    """
    require(Rf, "fouling resistance", ge=0)
    ratio = 1.0 if d_basis is None else d_basis / d_surface
    return Rf * ratio


def cylinder(d_in, d_out, k, d_basis=None):
    """Conduction resistance of a cylindrical layer from ``d_in`` to ``d_out``, per unit basis area.

    ``R = d_basis · ln(d_out/d_in) / (2 k)``; the basis defaults to the outer diameter.

    Parameters
    ----------
    d_in, d_out : float or ndarray
        Inner and outer diameter of the layer [m], 0 < d_in <= d_out.
    k : float or ndarray
        Thermal conductivity [W/m/K], > 0.
    d_basis : float or ndarray, optional
        Basis diameter [m].

    >>> round(cylinder(0.02118, 0.0254, 50.0), 8)
    4.61e-05
    """
    require(d_in, "d_in", gt=0)
    require(k, "k", gt=0)
    if np.any(np.asarray(d_out) < np.asarray(d_in)):
        raise InputError("d_out", d_out, f"a diameter >= d_in ({d_in})")
    basis = d_out if d_basis is None else d_basis
    return _out(np.asarray(basis) * np.log(np.asarray(d_out) / np.asarray(d_in)) / (2.0 * np.asarray(k)))


def deposit(d_surface, thickness, k, side="inside", d_basis=None):
    """A deposit layer of known thickness and conductivity on a tube surface, as a cylindrical layer.

    Parameters
    ----------
    d_surface : float
        Diameter of the clean surface the deposit grows on [m].
    thickness : float or ndarray
        Deposit thickness [m], >= 0; on the inside it must be less than the radius.
    k : float or ndarray
        Deposit conductivity [W/m/K], > 0.
    side : {"inside", "outside"}
        Inside the tube the deposit spans ``d_surface - 2t .. d_surface``; outside ``d_surface .. d_surface + 2t``.
    d_basis : float, optional
        Basis diameter [m], default ``d_surface``.

    Returns
    -------
    float or ndarray
        Resistance per unit basis area [m²K/W].

    Notes
    -----
    A thin deposit tends to ``thickness / k`` (a plane layer), which is how fouling resistances are usually
    interpreted.

    >>> round(deposit(0.02, 0.0005, 0.2, side="inside") * 1e3, 4)
    2.5647
    """
    if side not in ("inside", "outside"):
        raise InputError("side", side, "'inside' or 'outside'")
    require(thickness, "thickness", ge=0)
    basis = d_surface if d_basis is None else d_basis
    if side == "inside":
        if np.any(2 * np.asarray(thickness) >= d_surface):
            raise InputError("thickness", thickness, f"less than the tube radius {d_surface / 2:g} m")
        return cylinder(d_surface - 2 * np.asarray(thickness), d_surface, k, basis)
    return cylinder(d_surface, d_surface + 2 * np.asarray(thickness), k, basis)


@dataclass(frozen=True)
class Layer:
    """One named resistance, already referred to the network's basis.

    Attributes
    ----------
    name : str
        What it is (``"shell film"``, ``"wall"``, ...).
    resistance : float or ndarray
        Resistance per unit basis area [m²K/W].
    """

    name: str
    resistance: object


@dataclass(frozen=True)
class Network:
    """Resistances in series, all per unit area of one basis surface.

    Attributes
    ----------
    layers : tuple of Layer
        The resistances in order from one fluid to the other.
    basis_diameter : float or None
        Diameter of the basis surface [m]; ``None`` for a plane network.
    """

    layers: tuple
    basis_diameter: float | None = None

    @classmethod
    def of(cls, pairs, basis_diameter=None) -> "Network":
        """Build from ``(name, resistance)`` pairs."""
        return cls(tuple(Layer(n, r) for n, r in pairs), basis_diameter)

    @property
    def names(self) -> tuple[str, ...]:
        return tuple(layer.name for layer in self.layers)

    @property
    def total(self):
        """Total resistance per unit basis area [m²K/W]."""
        tot = 0.0
        for layer in self.layers:
            tot = tot + layer.resistance
        return tot

    @property
    def U(self):
        """Overall coefficient on the basis area [W/m²K]."""
        return 1.0 / self.total

    def __getitem__(self, name: str):
        for layer in self.layers:
            if layer.name == name:
                return layer.resistance
        raise KeyError(name)

    def refer_to(self, d_basis: float) -> "Network":
        """The same network per unit area of another diameter: every resistance scales by ``d_new / d_old``.

        >>> net = Network.of([("a", 1e-3), ("b", 2e-3)], basis_diameter=0.025)
        >>> round(net.refer_to(0.02).total, 6)
        0.0024
        """
        if self.basis_diameter is None:
            raise InputError("basis_diameter", None, "set (a plane network has no diameter to refer from)")
        ratio = d_basis / self.basis_diameter
        return Network(tuple(Layer(l.name, l.resistance * ratio) for l in self.layers), d_basis)

    def shares(self) -> dict:
        """Each resistance's share of the total (fractions summing to 1)."""
        tot = self.total
        return {l.name: l.resistance / tot for l in self.layers}

    def breakdown(self) -> pd.DataFrame:
        """A table of the resistances: ``resistance`` [m²K/W on the basis] and ``share`` of the total.

        For array-valued networks the table has one row per (case, resistance) with a ``case`` level.
        """
        tot = self.total
        if np.ndim(tot) == 0:
            return pd.DataFrame(
                {
                    "resistance": [float(l.resistance) for l in self.layers],
                    "share": [float(l.resistance / tot) for l in self.layers],
                },
                index=pd.Index(self.names, name="resistance_name"),
            )
        shape = np.shape(tot)
        frames = {l.name: np.broadcast_to(l.resistance, shape).ravel() for l in self.layers}
        wide = pd.DataFrame(frames)
        wide.index.name = "case"
        return wide

    def as_series(self) -> pd.Series:
        """Scalar networks: the resistances as a Series indexed by name [m²K/W]."""
        if np.ndim(self.total) != 0:
            raise InputError("network", "array-valued", "scalar for as_series(); use breakdown()")
        return pd.Series({l.name: float(l.resistance) for l in self.layers}, name="resistance")


def tube_network(h_shell, h_tube, fouling_shell, fouling_tube, d_out, d_in, k_wall, basis="outside") -> Network:
    """The five series resistances of a bare tube, referred to one basis.

    Parameters
    ----------
    h_shell : float or ndarray
        Shell-side film coefficient on the outside surface [W/m²K].
    h_tube : float or ndarray
        Tube-side film coefficient on the inside surface [W/m²K].
    fouling_shell, fouling_tube : float or ndarray
        Fouling resistances on the outside and inside surfaces [m²K/W].
    d_out, d_in : float
        Tube outside and inside diameters [m].
    k_wall : float or ndarray
        Wall conductivity [W/m/K].
    basis : {"outside", "inside"} or float
        The area basis: the outside surface (trade custom), the inside surface, or any diameter [m].

    Returns
    -------
    Network
        Layers named as :data:`TUBE_LAYERS`, on the chosen basis.

    Notes
    -----
    ``1/Uo = 1/ho + Rfo + do·ln(do/di)/(2 kw) + Rfi·do/di + do/(di·hi)``; the inside basis scales each term by
    ``di/do`` so that ``Uo·Ao = Ui·Ai``.
    """
    if d_in <= 0 or d_out <= d_in:
        raise InputError("d_in", d_in, f"a diameter > 0 and < d_out ({d_out})")
    if basis == "outside":
        d_b = d_out
    elif basis == "inside":
        d_b = d_in
    else:
        try:
            d_b = float(basis)
        except (TypeError, ValueError):
            raise InputError("basis", basis, "'outside', 'inside' or a diameter in m") from None
        require(d_b, "basis", gt=0)
    return Network.of(
        [
            ("shell film", film(h_shell, d_out, d_b)),
            ("shell fouling", fouling(fouling_shell, d_out, d_b)),
            ("wall", cylinder(d_in, d_out, k_wall, d_b)),
            ("tube fouling", fouling(fouling_tube, d_in, d_b)),
            ("tube film", film(h_tube, d_in, d_b)),
        ],
        basis_diameter=d_b,
    )


def tube_resistances(h_shell, h_tube, fouling_shell, fouling_tube, d_out, d_in, k_wall):
    """The five resistances of :func:`tube_network` on the outside basis, without input checks.

    The rating loop's kernel (inputs checked once at the edge): SI floats or arrays in, a tuple of five arrays
    in the order of :data:`TUBE_LAYERS` [m²K/W] out.
    """
    ratio = d_out / d_in
    return (1.0 / h_shell, fouling_shell, d_out * np.log(ratio) / (2.0 * k_wall), fouling_tube * ratio,
            ratio / h_tube)
