"""Bell-Delaware geometry of a shell-and-tube bundle (:class:`BellGeometry`, :func:`bell_geometry`) and tube counts
(Taborek's estimate, and the exact count of lattice positions inside a circle); used by :class:`revamp.ShellAndTube`.

References
----------
Taborek, J. (1983). Shell-and-tube heat exchangers: single-phase flow. Heat Exchanger Design Handbook §3.3,
Hemisphere.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

__all__ = ["BellGeometry", "bell_geometry", "tube_count_estimate", "tube_count_max"]

# tube-count constant C1 of the HEDH estimate N = 0.78 Dctl^2 / (C1 Pt^2) (Taborek 1983)
_C1 = {30: 0.866, 60: 0.866, 45: 1.0, 90: 1.0}
# pitch parallel and normal to the flow, as fractions of the tube pitch (Taborek 1983, HEDH §3.3)
_PITCH_PARALLEL = {30: math.sqrt(3) / 2, 45: math.sqrt(0.5), 60: 0.5, 90: 1.0}
_PITCH_NORMAL = {30: 0.5, 45: math.sqrt(0.5), 60: math.sqrt(3) / 2, 90: 1.0}
# effective pitch for the crossflow area: Pt for 30° and 90°, 0.707 Pt for 45° (Taborek 1983); 0.866 Pt for 60°
# (Shah & Sekulić 2003: the two diagonal gaps 2(Pt - do) per transverse pitch sqrt(3) Pt control)
_PITCH_EFFECTIVE = {30: 1.0, 45: math.sqrt(0.5), 60: math.sqrt(3) / 2, 90: 1.0}


@dataclass(frozen=True)
class BellGeometry:
    """The geometric quantities of the Bell-Delaware method for one shell (SI; notation of Taborek 1983).

    Built by :meth:`ShellAndTube.bell`; may also be built by hand for a check against a published example.

    Attributes
    ----------
    Ds, Dotl, Dctl : float
        Shell inside diameter, outer tube limit diameter, diameter of the circle through the outermost tube
        centres (Dotl - do) [m].
    tube_od : float
        Tube outside diameter do [m].
    pitch, pitch_parallel, pitch_normal : float
        Tube pitch Pt, row pitch parallel to the flow Pp and normal to it Pn [m].
    layout : int
        Layout angle, 30, 45, 60 or 90 [deg].
    tubes : int
        Tubes in one shell (holes in the tubesheet; U-tubes count once per leg).
    length : float
        Effective tube length, tubesheet to tubesheet [m].
    Lbc, Lbi, Lbo : float
        Central, inlet and outlet baffle spacing [m].
    Nb : int
        Number of baffles.
    Bc : float
        Baffle cut as a fraction of Ds [-].
    theta_ds, theta_ctl : float
        Baffle-cut angles on Ds and on Dctl [rad].
    Fw, Fc : float
        Fraction of tubes in one window, and in pure crossflow (1 - 2 Fw) [-].
    Sm : float
        Crossflow area at the shell centreline within one central baffle spacing [m²].
    Swg, Swt, Sw : float
        Gross window area, area taken by tubes in the window, net window flow area [m²].
    Sb, Ssb, Stb : float
        Bypass area (shell-bundle, pass lanes not counted), shell-to-baffle and tube-to-baffle-hole leakage areas
        for one baffle [m²].
    Dw : float
        Hydraulic diameter of the window [m].
    Nc, Ncw : float
        Tube rows crossed between baffle tips, and effective rows crossed in one window [-].
    Fsbp : float
        Bypass area fraction Sb/Sm [-].
    Nss : int
        Sealing-strip pairs.
    unsupported_span_max : float
        Longest unsupported tube span [m] (window tubes: 2 Lbc, or Lbi + Lbc / Lbo + Lbc at the ends).
    """

    Ds: float
    Dotl: float
    Dctl: float
    tube_od: float
    pitch: float
    pitch_parallel: float
    pitch_normal: float
    layout: int
    tubes: int
    length: float
    Lbc: float
    Lbi: float
    Lbo: float
    Nb: int
    Bc: float
    theta_ds: float
    theta_ctl: float
    Fw: float
    Fc: float
    Sm: float
    Swg: float
    Swt: float
    Sw: float
    Sb: float
    Ssb: float
    Stb: float
    Dw: float
    Nc: float
    Ncw: float
    Fsbp: float
    Nss: int
    unsupported_span_max: float

    @property
    def Pt(self) -> float:
        """Tube pitch [m]."""
        return self.pitch

    @property
    def Pp(self) -> float:
        """Row pitch parallel to the flow [m]."""
        return self.pitch_parallel

    @property
    def Pn(self) -> float:
        """Pitch normal to the flow [m]."""
        return self.pitch_normal

    @property
    def rss(self) -> float:
        """Sealing-strip pairs per row crossed, Nss/Nc [-]."""
        return self.Nss / self.Nc


def bell_geometry(*, Ds, tube_od, pitch, layout, tubes, length, Lbc, Lbi, Lbo, Nb, Bc, Lbb, Lsb, Ltb, Nss=0,
                  unsupported_span_max=float("nan")) -> BellGeometry:
    """Compute the Bell-Delaware geometry from the primary dimensions (all SI).

    Parameters
    ----------
    Ds : float
        Shell inside diameter [m].
    tube_od, pitch : float
        Tube outside diameter and pitch [m].
    layout : int
        30, 45, 60 or 90 [deg].
    tubes : int
        Tubes per shell.
    length : float
        Effective tube length [m].
    Lbc, Lbi, Lbo : float
        Central, inlet and outlet baffle spacing [m].
    Nb : int
        Number of baffles.
    Bc : float
        Baffle cut, fraction of Ds [-].
    Lbb, Lsb, Ltb : float
        Diametral clearances: shell to outer tube limit, shell to baffle, tube to baffle hole [m].
    Nss : int
        Sealing-strip pairs.

    Returns
    -------
    BellGeometry

    Notes
    -----
    Written from the HEDH equations as recalled (checked in the tests against closed-form geometry, an explicit
    tube lattice and the `ht` library where it codes the same quantity): Sm = Lbc [Lbb + Dctl/Ptef (Pt - do)];
    Ssb = π Ds (Lsb/2)(1 - θds/2π); Stb = (π/4)((do + Ltb)² - do²) N (1 - Fw);
    Ncw = 0.8/Pp [Ds Bc - (Ds - Dctl)/2];
    Dw = 4 Sw / (π do N Fw + Ds θds/2) (tubes plus shell arc in the window). Pass-partition lanes are not added
    to the bypass area Sb.

    References
    ----------
    Taborek (1983), HEDH §3.3, the equations of the geometry; Shah & Sekulić (2003) for the 60° Sm.
    """
    Dotl = Ds - Lbb
    Dctl = Dotl - tube_od
    theta_ds = 2.0 * math.acos(1.0 - 2.0 * Bc)
    arg = Ds * (1.0 - 2.0 * Bc) / Dctl
    theta_ctl = 2.0 * math.acos(min(1.0, max(-1.0, arg)))
    Fw = (theta_ctl - math.sin(theta_ctl)) / (2.0 * math.pi)
    Fc = 1.0 - 2.0 * Fw
    Swg = Ds ** 2 / 8.0 * (theta_ds - math.sin(theta_ds))
    Swt = tubes * Fw * math.pi * tube_od ** 2 / 4.0
    Sw = Swg - Swt
    Ptef = _PITCH_EFFECTIVE[layout] * pitch
    Sm = Lbc * (Lbb + Dctl / Ptef * (pitch - tube_od))
    Sb = Lbc * Lbb
    Ssb = math.pi * Ds * Lsb / 2.0 * (1.0 - theta_ds / (2.0 * math.pi))
    Stb = math.pi / 4.0 * ((tube_od + Ltb) ** 2 - tube_od ** 2) * tubes * (1.0 - Fw)
    Dw = 4.0 * Sw / (math.pi * tube_od * tubes * Fw + Ds * theta_ds / 2.0)
    Pp = _PITCH_PARALLEL[layout] * pitch
    Pn = _PITCH_NORMAL[layout] * pitch
    Nc = Ds * (1.0 - 2.0 * Bc) / Pp
    Ncw = max(0.0, 0.8 / Pp * (Ds * Bc - (Ds - Dctl) / 2.0))
    return BellGeometry(
        Ds=Ds, Dotl=Dotl, Dctl=Dctl, tube_od=tube_od, pitch=pitch, pitch_parallel=Pp, pitch_normal=Pn,
        layout=int(layout), tubes=int(tubes), length=length, Lbc=Lbc, Lbi=Lbi, Lbo=Lbo, Nb=int(Nb), Bc=Bc,
        theta_ds=theta_ds, theta_ctl=theta_ctl, Fw=Fw, Fc=Fc, Sm=Sm, Swg=Swg, Swt=Swt, Sw=Sw, Sb=Sb, Ssb=Ssb,
        Stb=Stb, Dw=Dw, Nc=Nc, Ncw=Ncw, Fsbp=Sb / Sm, Nss=int(Nss), unsupported_span_max=unsupported_span_max)


def tube_count_estimate(Dctl: float, pitch: float, layout: int) -> float:
    """Tubes that fit in a one-pass bundle, Taborek's estimate ``0.78 Dctl² / (C1 Pt²)`` [-].

    C1 = 0.866 for 30° and 60° layouts, 1.0 for 45° and 90° (Taborek 1983, HEDH §3.3).

    Examples
    --------
    >>> round(tube_count_estimate(0.4715, 0.03175, 90), 1)
    172.0
    """
    return 0.78 * Dctl ** 2 / (_C1[layout] * pitch ** 2)


def _lattice_radii(bundle_diameter: float, tube_od: float, pitch: float, layout: int):
    """Sorted centre distances [in pitches] of the lattice tubes from the bundle centre, for each of the standard
    placements of the centre (on a tube; between two tubes; at the centre of a lattice cell), out to the radius
    that keeps a whole tube inside ``bundle_diameter``."""
    r = 0.5 * (bundle_diameter - tube_od) / pitch
    if r < 0:
        return []
    import numpy as np  # local: the rest of this module is plain Python

    n = int(math.ceil(1.2 * r)) + 2  # rows: a triangular lattice's rows are 0.866 Pt apart
    i, j = np.meshgrid(np.arange(-2 * n, 2 * n + 1), np.arange(-n, n + 1), indexing="ij")
    if layout in (30, 60):  # triangular lattice (60° is the same lattice turned 90°: the same count in a circle)
        x, y = (i + 0.5 * j).ravel(), (j * math.sqrt(3) / 2).ravel()
        centres = ((0.0, 0.0), (0.5, 0.0), (0.5, math.sqrt(3) / 6))
    else:  # square lattice (45° is the same lattice turned 45°)
        x, y = i.ravel().astype(float), j.ravel().astype(float)
        centres = ((0.0, 0.0), (0.5, 0.0), (0.5, 0.5))
    lim = r * r * (1 + 1e-12)
    out = []
    for cx, cy in centres:
        d2 = (x - cx) ** 2 + (y - cy) ** 2
        out.append(np.sqrt(np.sort(d2[d2 <= lim])).tolist())
    return out


def tube_count_max(bundle_diameter: float, tube_od: float, pitch: float, layout: int) -> int:
    """The most tubes of a regular layout whose full section lies inside a circle (exact lattice count) [-].

    Counts the lattice positions whose centre lies within ``(bundle_diameter - tube_od)/2`` of the circle's centre,
    for the centre on a tube, midway between two tubes and at the centre of a lattice cell, and returns the largest
    count. One tube pass (no pass-partition lanes), so it bounds what any layout of this pitch can hold.

    Parameters
    ----------
    bundle_diameter : float
        Diameter of the circle the tubes must lie in (outer tube limit, or the shell id) [m].
    tube_od : float
        Tube outside diameter [m].
    pitch : float
        Tube pitch [m].
    layout : int
        30, 45, 60 or 90 [deg].

    Returns
    -------
    int
        Tubes that fit.

    References
    ----------
    Phadke, P. S. (1984). Determining tube counts for shell and tube exchangers. *Chem. Eng.* 91(18), 65-68 (the same
    lattice-in-circle count, tabulated for a tube at the centre; ``ht.Ntubes_Phadkeb`` codes it and is the
    independent check in the tests).

    Examples
    --------
    1 in tubes on a 1.25 in square pitch in a 183 mm circle (tube-centred count 21, Phadke 1984 as coded in ht):

    >>> tube_count_max(0.183, 0.0254, 0.03175, 90)
    21
    """
    radii = _lattice_radii(bundle_diameter, tube_od, pitch, layout)
    return max((len(r) for r in radii), default=0)


def _bundle_diameter_for(tubes: int, tube_od: float, pitch: float, layout: int, shell_id: float) -> float:
    """The smallest outer-tube-limit diameter [m] holding ``tubes`` tubes (exact lattice count, best placement)."""
    best = math.inf
    for radii in _lattice_radii(shell_id, tube_od, pitch, layout):
        if len(radii) >= tubes:
            best = min(best, radii[tubes - 1])
    return 2.0 * best * pitch + tube_od
