"""Air side of air-cooled exchangers: air properties, finned-tube-bank heat transfer and pressure drop, fin
efficiency, fan power and the fan laws.

Pure numpy functions: floats, lists or arrays in (broadcast together), floats or arrays out. Every function states the
range its source covers; :func:`air_side_warnings` turns a use outside it into warning strings.

Choices made here (each cited at its function):

- heat transfer on high-finned staggered tube banks: Briggs & Young (1963), default; ESDU 86022 as a choice;
- pressure drop: Robinson & Briggs (1966), default; ESDU 86022 as a choice;
- fin efficiency of annular fins of constant thickness: Kern & Kraus (1972), exact (Bessel functions); Schmidt (1949)
  approximation as a choice;
- air: ideal gas at the pressure of the standard atmosphere at the site's altitude; viscosity and conductivity by
  Sutherland's law;
- fan: air power = volume flow x (bundle pressure drop + velocity pressure through the fan ring), shaft power = air
  power / efficiency; the fan laws for a change of speed.

References
----------
Briggs, D. E., Young, E. H. (1963). Convection heat transfer and pressure drop of air flowing across triangular
pitch banks of finned tubes. *Chem. Eng. Prog. Symp. Ser.* 59(41), 1-10.
Robinson, K. K., Briggs, D. E. (1966). Pressure drop of air flowing across triangular pitch banks of finned tubes.
*Chem. Eng. Prog. Symp. Ser.* 62(64), 177-184.
ESDU 86022 (1986). High-fin staggered tube banks: heat transfer and pressure drop for turbulent single phase gas flow.
Kern, D. Q., Kraus, A. D. (1972). *Extended Surface Heat Transfer*. McGraw-Hill.
Schmidt, T. E. (1949). Heat transfer calculations for extended surfaces. *Refrigerating Engineering* 57, 351-357.
Kröger, D. G. (2004). *Air-Cooled Heat Exchangers and Cooling Towers*, Vol. 1. PennWell.
Thulukkanam, K. (2013). *Heat Exchanger Design Handbook*, 2nd ed. CRC Press.
ISO 2533 (1975). Standard atmosphere.
White, F. M. (2006). *Viscous Fluid Flow*, 3rd ed. McGraw-Hill (Sutherland's law, Table 1-2 and 1-3).
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .._arrays import as_array as _arr
from .._arrays import as_out as _out
from ._validity import range_warning

__all__ = [
    "AirProps",
    "AIR_DP_METHODS",
    "AIR_H_METHODS",
    "FIN_EFFICIENCY_METHODS",
    "R_AIR",
    "air_properties",
    "air_flow_from_fan_power",
    "air_side_warnings",
    "dp_esdu_high_fin",
    "dp_robinson_briggs",
    "fan_laws",
    "fan_power",
    "fin_efficiency_kern_kraus",
    "fin_efficiency_schmidt",
    "nu_briggs_young",
    "nu_esdu_high_fin",
    "pressure_at_altitude",
]

R_AIR = 287.05  #: specific gas constant of dry air [J/kg/K] (ISO 2533)
_P0, _T0, _LAPSE, _G0 = 101325.0, 288.15, 0.0065, 9.80665  # ISO 2533 sea level and troposphere lapse rate


# ------------------------------------------------------------------------------------------------------ the air
@dataclass(frozen=True)
class AirProps:
    """Dry-air properties [SI]: density [kg/m³], heat_capacity [J/kg/K], viscosity [Pa·s], conductivity [W/m/K],
    pressure [Pa]."""

    density: object
    heat_capacity: object
    viscosity: object
    conductivity: object
    pressure: object


def pressure_at_altitude(altitude):
    """Static pressure of the standard atmosphere at an altitude (troposphere, up to 11 km).

    p = p0 (1 - L z / T0)^(g0 / (R L)), p0 = 101325 Pa, T0 = 288.15 K, L = 0.0065 K/m.

    Parameters
    ----------
    altitude : float or array_like
        Height above sea level [m], -500 to 11000.

    Returns
    -------
    float or numpy.ndarray
        Pressure [Pa].

    References
    ----------
    ISO 2533 (1975). Standard atmosphere.

    Examples
    --------
    >>> round(pressure_at_altitude(0.0)), round(pressure_at_altitude(1000.0))
    (101325, 89874)
    """
    z = _arr(altitude)
    return _out(_P0 * (1.0 - _LAPSE * z / _T0) ** (_G0 / (R_AIR * _LAPSE)))


def air_properties(T, altitude=0.0, pressure=None) -> AirProps:
    """Dry air at temperature ``T`` and the pressure of the site (ideal gas).

    Density from the ideal-gas law at ``pressure`` (default: the standard atmosphere at ``altitude``); viscosity and
    conductivity by Sutherland's law (White 2006: mu0 = 1.716e-5 Pa·s, S = 110.4 K; k0 = 0.0241 W/m/K, S = 194 K,
    both at 273.15 K; within 2 % from 170 to 1900 K and 160 to 1000 K); heat capacity
    cp = 1002.5 + 275e-6 (T - 200)² J/kg/K (a fit to ideal-gas air tables, within 0.5 % from 250 to 600 K, common
    practice, no source). Humidity is neglected (it lowers the density by well under 2 % at 40 °C).

    Parameters
    ----------
    T : float or array_like
        Temperature [K], stated range 250-600 K.
    altitude : float or array_like
        Site altitude [m] (used when ``pressure`` is None).
    pressure : float or array_like, optional
        Absolute pressure [Pa].

    Returns
    -------
    AirProps

    References
    ----------
    White, F. M. (2006). *Viscous Fluid Flow*, 3rd ed., McGraw-Hill, §1.3 (Sutherland's law).
    ISO 2533 (1975). Standard atmosphere.

    Examples
    --------
    >>> a = air_properties(300.0)
    >>> round(a.density, 3), round(a.viscosity * 1e5, 3)
    (1.177, 1.846)
    """
    T = _arr(T)
    p = pressure_at_altitude(altitude) if pressure is None else _arr(pressure)
    rho = _arr(p) / (R_AIR * T)
    mu = 1.716e-5 * (T / 273.15) ** 1.5 * (273.15 + 110.4) / (T + 110.4)
    k = 0.0241 * (T / 273.15) ** 1.5 * (273.15 + 194.0) / (T + 194.0)
    cp = 1002.5 + 275e-6 * (T - 200.0) ** 2
    return AirProps(_out(rho), _out(cp), _out(mu), _out(k), _out(p))


# ------------------------------------------------------------------------------------------------ fin efficiency
def fin_efficiency_kern_kraus(d_root, d_tip, thickness, k_fin, h):
    """Efficiency of an annular fin of constant thickness with an insulated tip, exact (Kern & Kraus 1972).

    eta = 2 r_o / (m (r_e² - r_o²)) [I1(m r_e) K1(m r_o) - K1(m r_e) I1(m r_o)] / [I0(m r_o) K1(m r_e)
    + I1(m r_e) K0(m r_o)], m = sqrt(2 h / (k t)), evaluated with exponentially scaled Bessel functions (no overflow
    at large m r).

    Parameters
    ----------
    d_root, d_tip : float or array_like
        Fin root (tube outside) and fin tip diameters [m].
    thickness : float or array_like
        Fin thickness [m].
    k_fin : float or array_like
        Fin conductivity [W/m/K].
    h : float or array_like
        Film coefficient on the fin [W/m²K].

    Returns
    -------
    float or numpy.ndarray
        Fin efficiency [-], 1 at h = 0.

    References
    ----------
    Kern, D. Q., Kraus, A. D. (1972). *Extended Surface Heat Transfer*. McGraw-Hill.
    """
    from scipy.special import i0e, i1e, k0e, k1e  # on use: `revamp check` builds air coolers, never rates

    ro, re = 0.5 * _arr(d_root), 0.5 * _arr(d_tip)
    m = np.sqrt(2.0 * np.maximum(_arr(h), 1e-300) / (_arr(k_fin) * _arr(thickness)))
    a, b = m * re, m * ro
    damp = np.exp(-2.0 * (a - b))  # the scaled terms carry e^{±(a - b)}; divide through by e^{a - b}
    num = i1e(a) * k1e(b) - k1e(a) * i1e(b) * damp
    den = i0e(b) * k1e(a) * damp + i1e(a) * k0e(b)
    eta = 2.0 * ro / (m * (re * re - ro * ro)) * num / den
    return _out(np.where(_arr(h) > 0, eta, 1.0))


def fin_efficiency_schmidt(d_root, d_tip, thickness, k_fin, h):
    """Efficiency of an annular fin, Schmidt's (1949) approximation: eta = tanh(m r_o phi)/(m r_o phi),
    phi = (r_e/r_o - 1)(1 + 0.35 ln(r_e/r_o)), m = sqrt(2 h / (k t)).

    Within a few per cent of the exact solution for the usual air-cooler fins (Kröger 2004, §5.2).

    Parameters and returns as :func:`fin_efficiency_kern_kraus`.

    References
    ----------
    Schmidt, T. E. (1949). Heat transfer calculations for extended surfaces. *Refrigerating Engineering* 57, 351-357.
    """
    ro, re = 0.5 * _arr(d_root), 0.5 * _arr(d_tip)
    m = np.sqrt(2.0 * np.maximum(_arr(h), 1e-300) / (_arr(k_fin) * _arr(thickness)))
    ratio = re / ro
    x = m * ro * (ratio - 1.0) * (1.0 + 0.35 * np.log(ratio))
    return _out(np.where(x > 0, np.tanh(x) / np.where(x > 0, x, 1.0), 1.0))


FIN_EFFICIENCY_METHODS = {"kern-kraus": fin_efficiency_kern_kraus, "schmidt": fin_efficiency_schmidt}


# ------------------------------------------------------------------------------------------ heat transfer, air side
def nu_briggs_young(Re, Pr, fin_gap, fin_height, fin_thickness):
    """Nusselt number of air across a staggered bank of high-finned tubes, Briggs & Young (1963).

    Nu = h d_o / k = 0.134 Re^0.681 Pr^(1/3) (s/l)^0.2 (s/t)^0.1134, with Re = G_max d_o / mu on the tube (fin root)
    diameter and the mass velocity in the minimum flow area, s the gap between fins, l the fin height, t the fin
    thickness. h is on the whole air-side surface (fins at their root temperature). Range: Re 1000-8000, tube OD
    11.1-40.9 mm, fin height 1.4-16.6 mm, fin thickness 0.33-2.02 mm, fin pitch 1.3-4.1 mm, transverse pitch
    24.5-111 mm; banks of six tube rows (from memory).

    Parameters
    ----------
    Re, Pr : float or array_like
        Reynolds [-] (root diameter, maximum velocity) and Prandtl [-] numbers.
    fin_gap, fin_height, fin_thickness : float or array_like
        s, l, t [m].

    Returns
    -------
    float or numpy.ndarray
        Nu on the root diameter [-].

    References
    ----------
    Briggs, D. E., Young, E. H. (1963). *Chem. Eng. Prog. Symp. Ser.* 59(41), 1-10.
    """
    Re, Pr = _arr(Re), _arr(Pr)
    s, l, t = _arr(fin_gap), _arr(fin_height), _arr(fin_thickness)
    return _out(0.134 * Re ** 0.681 * Pr ** (1.0 / 3.0) * (s / l) ** 0.2 * (s / t) ** 0.1134)


def nu_esdu_high_fin(Re, Pr, fin_gap, fin_height, transverse_pitch, row_pitch, tube_rows):
    """Nusselt number of gas across a staggered bank of high-finned tubes, ESDU 86022 (as given by Hewitt, Shires &
    Bott 1994): Nu = 0.242 Re^0.658 (s/l)^0.297 (St/Sl)^-0.091 Pr^(1/3) F2, with the row factor F2 = 0.76, 0.84,
    0.92 and 1 for 1, 2, 3 and 4 or more rows. Re on the root diameter and the maximum velocity, 5000-50000.

    References
    ----------
    ESDU 86022 (1986). Hewitt, G. F., Shires, G. L., Bott, T. R. (1994). *Process Heat Transfer*. CRC Press.
    """
    Re, Pr = _arr(Re), _arr(Pr)
    rows = _arr(tube_rows)
    f2 = np.where(rows < 2, 0.76, np.where(rows < 3, 0.84, np.where(rows < 4, 0.92, 1.0)))
    nu = (0.242 * Re ** 0.658 * (_arr(fin_gap) / _arr(fin_height)) ** 0.297
          * (_arr(transverse_pitch) / _arr(row_pitch)) ** -0.091 * Pr ** (1.0 / 3.0))
    return _out(nu * f2)


AIR_H_METHODS = {"briggs-young": nu_briggs_young, "esdu": nu_esdu_high_fin}


# ------------------------------------------------------------------------------------------ pressure drop, air side
def dp_robinson_briggs(G_max, rho, Re, d_root, transverse_pitch, diagonal_pitch, tube_rows):
    """Air-side pressure drop across a staggered bank of high-finned tubes, Robinson & Briggs (1966).

    f = 9.465 Re^-0.316 (St/d_o)^-0.927 (St/Sd)^0.515 and dp = 2 f N G_max² / rho (the form given by Thulukkanam
    2013; Sd the diagonal pitch). Range: Re 2000-50000, tube OD 18.6-40.9 mm, transverse pitch 42.9-114 mm.

    Parameters
    ----------
    G_max : float or array_like
        Mass velocity in the minimum flow area [kg/m²s].
    rho : float or array_like
        Mean air density [kg/m³].
    Re : float or array_like
        G_max d_o / mu [-].
    d_root, transverse_pitch, diagonal_pitch : float
        [m].
    tube_rows : int
        Rows crossed by the air [-].

    Returns
    -------
    float or numpy.ndarray
        Pressure drop over the bundle [Pa].

    References
    ----------
    Robinson, K. K., Briggs, D. E. (1966). *Chem. Eng. Prog. Symp. Ser.* 62(64), 177-184.
    Thulukkanam, K. (2013). *Heat Exchanger Design Handbook*, 2nd ed., CRC Press, §4.5.
    """
    G, rho, Re = _arr(G_max), _arr(rho), _arr(Re)
    f = 9.465 * Re ** -0.316 * (transverse_pitch / d_root) ** -0.927 * (transverse_pitch / diagonal_pitch) ** 0.515
    return _out(2.0 * f * tube_rows * G * G / rho)


def dp_esdu_high_fin(G_max, rho, Re, area_ratio, contraction, d_root, transverse_pitch, row_pitch, tube_rows):
    """Pressure drop across a staggered bank of high-finned tubes, ESDU 86022 (as given by Hewitt, Shires & Bott
    1994): dp = (K_acc + N K_f) rho v_max² / 2, K_f = 4.567 Re^-0.242 (A/A_bare)^0.504 (St/d)^-0.376 (Sl/d)^-0.546,
    K_acc = 1 + (A_min/A_face)². Re 5000-50000.

    Parameters
    ----------
    area_ratio : float
        Air-side surface over bare-tube surface [-].
    contraction : float
        Minimum flow area over face area [-].

    References
    ----------
    ESDU 86022 (1986). Hewitt, G. F., Shires, G. L., Bott, T. R. (1994). *Process Heat Transfer*. CRC Press.
    """
    G, rho, Re = _arr(G_max), _arr(rho), _arr(Re)
    kf = (4.567 * Re ** -0.242 * area_ratio ** 0.504 * (transverse_pitch / d_root) ** -0.376
          * (row_pitch / d_root) ** -0.546)
    return _out((1.0 + contraction ** 2 + tube_rows * kf) * G * G / (2.0 * rho))


AIR_DP_METHODS = {"robinson-briggs": dp_robinson_briggs, "esdu": dp_esdu_high_fin}


def air_side_warnings(h_method, dp_method, Re, geometry) -> list[str]:
    """Validity-range warnings of the air-side methods at the Reynolds numbers used and the bundle's geometry."""
    g = geometry
    w: list[str] = []
    if h_method == "briggs-young":
        name, src = "Briggs-Young (1963)", "Briggs & Young (1963)"
        w += range_warning(name, "Re", Re, 1000, 8000, src)
        w += range_warning(name, "tube OD [mm]", g.tube_od * 1e3, 11.1, 40.9, src)
        w += range_warning(name, "fin height [mm]", g.fin.height * 1e3, 1.4, 16.6, src)
        w += range_warning(name, "fin thickness [mm]", g.fin.thickness * 1e3, 0.33, 2.02, src)
        w += range_warning(name, "fin pitch [mm]", 1e3 / g.fin.per_length, 1.3, 4.1, src)
        w += range_warning(name, "transverse pitch [mm]", g.transverse_pitch * 1e3, 24.5, 111.0, src)
        if g.tube_rows < 6:
            w.append(f"{name}: fitted on banks of six rows (from memory); this bundle has {g.tube_rows} (a shallower bank "
                     "transfers somewhat less per row)")
    else:
        w += range_warning("ESDU 86022", "Re", Re, 5000, 50000, "ESDU 86022")
    if dp_method == "robinson-briggs":
        name, src = "Robinson-Briggs (1966)", "Robinson & Briggs (1966)"
        w += range_warning(name, "Re", Re, 2000, 50000, src)
        w += range_warning(name, "tube OD [mm]", g.tube_od * 1e3, 18.6, 40.9, src)
        w += range_warning(name, "transverse pitch [mm]", g.transverse_pitch * 1e3, 42.9, 114.0, src)
    elif h_method != "esdu":
        w += range_warning("ESDU 86022", "Re", Re, 5000, 50000, "ESDU 86022")
    return w


# ------------------------------------------------------------------------------------------------------------ fans
def fan_power(volume_flow, dp_static, efficiency, fan_area=None, rho=None):
    """Shaft power of the fans: (volume flow x fan total pressure) / efficiency.

    The fan total pressure is the bundle's static pressure drop plus, when ``fan_area`` and ``rho`` are given, one
    velocity pressure through the fan ring (the kinetic energy leaving with the air; Kröger 2004, ch. 8, common
    practice). Plenum, hail-guard and recirculation losses are not included.

    Parameters
    ----------
    volume_flow : float or array_like
        Air volume flow through the fans at the fan's air density [m³/s].
    dp_static : float or array_like
        Static pressure the fans overcome [Pa].
    efficiency : float
        Fan total efficiency [-], (0, 1].
    fan_area : float, optional
        Total swept area of the fans [m²].
    rho : float or array_like, optional
        Air density at the fans [kg/m³].

    Returns
    -------
    float or numpy.ndarray
        Shaft power [W].

    References
    ----------
    Kröger, D. G. (2004). *Air-Cooled Heat Exchangers and Cooling Towers*, Vol. 1, ch. 8 (fan performance).
    """
    V = _arr(volume_flow)
    dp = _arr(dp_static)
    if fan_area is not None and rho is not None:
        v = V / fan_area
        dp = dp + 0.5 * _arr(rho) * v * v
    return _out(V * dp / efficiency)


def fan_laws(speed_ratio, density_ratio=1.0):
    """The fan laws for one fan at a new speed (and air density): ratios of volume flow, pressure and power.

    Q2/Q1 = N2/N1; p2/p1 = (N2/N1)² rho2/rho1; P2/P1 = (N2/N1)³ rho2/rho1 (geometrically the same fan, the same
    system resistance curve).

    Parameters
    ----------
    speed_ratio : float or array_like
        N2/N1 [-], > 0.
    density_ratio : float or array_like
        rho2/rho1 [-].

    Returns
    -------
    tuple of (flow ratio, pressure ratio, power ratio)

    References
    ----------
    Kröger, D. G. (2004). *Air-Cooled Heat Exchangers and Cooling Towers*, Vol. 1, ch. 8 (fan laws).

    Examples
    --------
    >>> fan_laws(1.1)
    (1.1, 1.2100000000000002, 1.3310000000000004)
    """
    n, r = _arr(speed_ratio), _arr(density_ratio)
    return _out(n), _out(n * n * r), _out(n ** 3 * r)


def air_flow_from_fan_power(power, design_power, design_air_flow, density_ratio=1.0):
    """Air mass flow from a measured fan power and the fan's design point, by the fan laws (same fan, same system,
    another speed): Q2/Q1 = (P2/P1 x rho1/rho2)^(1/3), so m2/m1 = (rho2/rho1)^(2/3) (P2/P1)^(1/3).

    Parameters
    ----------
    power : float or array_like
        Measured shaft power [W].
    design_power : float
        Shaft power at the design point [W].
    design_air_flow : float
        Air mass flow at the design point [kg/s].
    density_ratio : float or array_like
        rho2/rho1, air density at the fans now over at the design point [-].

    Returns
    -------
    float or numpy.ndarray
        Air mass flow [kg/s].

    References
    ----------
    Kröger, D. G. (2004). *Air-Cooled Heat Exchangers and Cooling Towers*, Vol. 1, ch. 8 (fan laws).

    Examples
    --------
    >>> round(air_flow_from_fan_power(80e3, 100e3, 400.0), 2)
    371.33
    """
    ratio = _arr(power) / design_power
    r = _arr(density_ratio)
    return _out(design_air_flow * ratio ** (1.0 / 3.0) * r ** (2.0 / 3.0))
