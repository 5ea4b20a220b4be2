"""Retrofit options: small immutable transforms ``apply(exchanger, service) -> (exchanger, service)``.

Every option returns changed copies (``exchanger.replace(...)``, ``service.replace(...)``) and never mutates its
inputs. Each has a human ``label`` (given, or built from its parameters) used as its row in a study.

>>> Combined(Clean(), AddShells(1)).label
'clean both sides + add 1 shell in series'

References
----------
Manglik, R. M., & Bergles, A. E. (1993). Heat transfer and pressure drop correlations for twisted-tape inserts in
isothermal tubes, parts I and II. *J. Heat Transfer* 115, 881-896 (used through
:class:`revamp.correlations.inserts.TwistedTapeInsert`).
García, A., Vicente, P. G., & Viedma, A. (2005). Experimental study of heat transfer enhancement with wire coil
inserts in laminar-transition-turbulent regimes at different Prandtl numbers. *Int. J. Heat Mass Transfer* 48,
4640-4651 (used through :class:`revamp.correlations.inserts.WireCoilInsert`).
"""
from __future__ import annotations

import dataclasses
from dataclasses import dataclass

import numpy as np

from .errors import InputError
from .units import require, to_si

__all__ = [
    "AddShells",
    "BaffleChange",
    "Clean",
    "Combined",
    "InsertFactors",
    "NewBundle",
    "Retube",
    "TwistedTape",
    "WireCoil",
    "option_label",
]

_SIDES = ("both", "shell", "tube")


def _set_label(obj, text):
    if obj.label is None:
        object.__setattr__(obj, "label", text)
    elif not isinstance(obj.label, str) or not obj.label.strip():
        raise InputError("label", obj.label, "a non-empty string or None")


def _mm(x):
    return f"{x * 1e3:.3g} mm"


def option_label(option) -> str:
    """The label of an option (its ``label`` attribute), checking that it is an option."""
    if not (hasattr(option, "apply") and isinstance(getattr(option, "label", None), str)):
        raise InputError("options", option, "an option with a label and apply(exchanger, service)")
    return option.label


@dataclass(frozen=True)
class Clean:
    """Clean one side or both, to no fouling or to a stated residual fouling.

    Parameters
    ----------
    side : {"both", "shell", "tube"}
        Side(s) cleaned.
    residual : float or str
        Fouling resistance left after cleaning [m²K/W] (0: as new).
    label : str, optional
    """

    side: str = "both"
    residual: object = 0.0
    label: str | None = None

    def __post_init__(self):
        if self.side not in _SIDES:
            raise InputError("Clean.side", self.side, f"one of {_SIDES}")
        r = to_si(self.residual, "fouling", "Clean.residual")
        if np.ndim(r) != 0:
            raise InputError("Clean.residual", self.residual, "one fouling resistance (m²K/W), not an array")
        object.__setattr__(self, "residual", float(require(r, "Clean.residual", ge=0)))
        where = "both sides" if self.side == "both" else f"{self.side} side"
        extra = f" to {self.residual:.3g} m²K/W" if self.residual else ""
        _set_label(self, f"clean {where}{extra}")

    def apply(self, exchanger, service):
        """The exchanger unchanged; the service with the side(s) fouled to at most ``residual``.

        Cleaning never raises fouling: a side already below the residual keeps its fouling.
        """
        changes = {}
        for side in ("shell", "tube"):
            if self.side in ("both", side):
                changes[f"fouling_{side}"] = np.minimum(getattr(service, f"fouling_{side}"), self.residual)
        return exchanger, service.replace(**changes)


@dataclass(frozen=True)
class TwistedTape:
    """Full-length twisted-tape inserts (Manglik & Bergles 1993).

    Parameters
    ----------
    twist_ratio : float
        Length of a 180° twist over tube inside diameter, y = H/d [-].
    thickness : float or str
        Tape thickness [m] (ratio to the tube inside diameter formed when applied).
    label : str, optional
    """

    twist_ratio: float
    thickness: object = 0.0
    label: str | None = None

    def __post_init__(self):
        object.__setattr__(self, "twist_ratio", float(require(self.twist_ratio, "TwistedTape.twist_ratio", gt=1)))
        t = to_si(self.thickness, "length", "TwistedTape.thickness")
        object.__setattr__(self, "thickness", float(require(t, "TwistedTape.thickness", ge=0)))
        _set_label(self, f"twisted tape y={self.twist_ratio:g}" + (f", {_mm(self.thickness)}" if self.thickness else ""))

    def apply(self, exchanger, service):
        from .correlations.inserts import TwistedTapeInsert

        insert = TwistedTapeInsert(self.twist_ratio, self.thickness / exchanger.tube_id, self.label)
        return exchanger.replace(insert=insert), service


@dataclass(frozen=True)
class WireCoil:
    """Wire-coil inserts (García, Vicente & Viedma 2005; tested p/d 1.17-2.68, e/d 0.07-0.10).

    Parameters
    ----------
    pitch : float or str
        Helical pitch of the coil [m].
    wire_diameter : float or str
        Wire diameter [m].
    label : str, optional
    """

    pitch: object
    wire_diameter: object
    label: str | None = None

    def __post_init__(self):
        for name in ("pitch", "wire_diameter"):
            v = to_si(getattr(self, name), "length", f"WireCoil.{name}")
            object.__setattr__(self, name, float(require(v, f"WireCoil.{name}", gt=0)))
        _set_label(self, f"wire coil p={_mm(self.pitch)}, e={_mm(self.wire_diameter)}")

    def apply(self, exchanger, service):
        from .correlations.inserts import WireCoilInsert

        d = exchanger.tube_id
        insert = WireCoilInsert(self.pitch / d, self.wire_diameter / d, self.label)
        return exchanger.replace(insert=insert), service


@dataclass(frozen=True)
class InsertFactors:
    """A proprietary insert given as Nu and Darcy friction multipliers on the plain tube versus Re.

    Parameters
    ----------
    re : sequence of float
        Reynolds numbers, increasing [-].
    nu_factor, f_factor : sequence of float
        Multipliers at those Re [-].
    label : str
    """

    re: tuple
    nu_factor: tuple
    f_factor: tuple
    label: str | None = "user insert"

    def __post_init__(self):
        from .correlations.inserts import FactorInsert

        ins = FactorInsert(self.re, self.nu_factor, self.f_factor)  # validates
        for name in ("re", "nu_factor", "f_factor"):
            object.__setattr__(self, name, getattr(ins, name))
        _set_label(self, "user insert")

    def apply(self, exchanger, service):
        from .correlations.inserts import FactorInsert

        insert = FactorInsert(self.re, self.nu_factor, self.f_factor, self.label)
        return exchanger.replace(insert=insert), service


@dataclass(frozen=True)
class AddShells:
    """Add identical shells, in series (more area, closer to counterflow) or in parallel (lower velocities).

    Parameters
    ----------
    n : int
        In series: shells added to each train (``shells += n``). In parallel: trains added
        (``shells_parallel += n``; each train has ``shells`` shells in series).
    arrangement : {"series", "parallel"}
    label : str, optional
    """

    n: int = 1
    arrangement: str = "series"
    label: str | None = None

    def __post_init__(self):
        if isinstance(self.n, bool) or not isinstance(self.n, int) or self.n < 1:
            raise InputError("AddShells.n", self.n, "an integer >= 1")
        if self.arrangement not in ("series", "parallel"):
            raise InputError("AddShells.arrangement", self.arrangement, "'series' or 'parallel'")
        if self.arrangement == "series":
            text = f"add {self.n} shell{'s' if self.n > 1 else ''} in series"
        else:
            text = f"add {self.n} parallel train{'s' if self.n > 1 else ''}"
        _set_label(self, text)

    def apply(self, exchanger, service):
        if self.arrangement == "series":
            return exchanger.replace(shells=exchanger.shells + self.n), service
        return exchanger.replace(shells_parallel=exchanger.shells_parallel + self.n), service


def _geometry_fields():
    from .geometry import ShellAndTube

    return {f.name for f in dataclasses.fields(ShellAndTube) if f.init} - {"tag"}


@dataclass(frozen=True, init=False)
class NewBundle:
    """A new bundle in the existing shell: any geometry fields changed (tube count, length, od, wall, pitch,
    passes, layout, material, baffles ...).

    Parameters
    ----------
    label : str, optional
    **changes
        ShellAndTube fields and their new values (SI numbers or strings with units).

    Examples
    --------
    >>> NewBundle(tube_count=600, tube_length="20 ft").label
    "new bundle (tube_count=600, tube_length='20 ft')"
    """

    changes: tuple
    label: str | None

    def __init__(self, label=None, **changes):
        if not changes:
            raise InputError("NewBundle", changes, "at least one geometry change, e.g. tube_count=600")
        known = _geometry_fields()
        for name, value in changes.items():
            if name not in known:
                raise InputError(f"NewBundle.{name}", value, f"a ShellAndTube field among {sorted(known)}")
        object.__setattr__(self, "changes", tuple(sorted(changes.items())))
        object.__setattr__(self, "label", label)
        _set_label(self, "new bundle (" + ", ".join(f"{k}={v!r}" for k, v in self.changes) + ")")

    def apply(self, exchanger, service):
        return exchanger.replace(**dict(self.changes)), service


@dataclass(frozen=True)
class Retube:
    """Retube with another metallurgy and/or wall thickness (conductivity, wall resistance, erosion limit).

    Parameters
    ----------
    material : str, float or Material, optional
        New tube material (a name known to :mod:`revamp.materials` or a conductivity [W/m/K]).
    tube_wall : float or str, optional
        New wall thickness [m].
    label : str, optional
    """

    material: object = None
    tube_wall: object = None
    label: str | None = None

    def __post_init__(self):
        if self.material is None and self.tube_wall is None:
            raise InputError("Retube", None, "a material and/or a tube_wall")
        if self.tube_wall is not None:
            w = to_si(self.tube_wall, "length", "Retube.tube_wall")
            object.__setattr__(self, "tube_wall", float(require(w, "Retube.tube_wall", gt=0)))
        parts = []
        if self.material is not None:
            parts.append(getattr(self.material, "name", str(self.material)))
        if self.tube_wall is not None:
            parts.append(f"wall {_mm(self.tube_wall)}")
        _set_label(self, "retube " + ", ".join(parts))

    def apply(self, exchanger, service):
        changes = {}
        if self.material is not None:
            changes["tube_material"] = self.material
        if self.tube_wall is not None:
            changes["tube_wall"] = self.tube_wall
        return exchanger.replace(**changes), service


@dataclass(frozen=True)
class BaffleChange:
    """New baffle spacing and/or cut (shell-side h, ΔP and the vibration spans change).

    Parameters
    ----------
    spacing : float or str, optional
        Central baffle spacing [m]. End spacings given here are used; end spacings the exchanger states keep their
        values; only end spacings that were defaulted follow the new central spacing.
    cut : float or str, optional
        Baffle cut, fraction of shell inside diameter [-] (or a string such as ``"25 %"``).
    spacing_in, spacing_out : float or str, optional
        Inlet and outlet spacings [m].
    label : str, optional
    """

    spacing: object = None
    cut: object = None
    spacing_in: object = None
    spacing_out: object = None
    label: str | None = None

    def __post_init__(self):
        if all(v is None for v in (self.spacing, self.cut, self.spacing_in, self.spacing_out)):
            raise InputError("BaffleChange", None, "a spacing and/or a cut")
        for name in ("spacing", "spacing_in", "spacing_out"):
            if getattr(self, name) is not None:
                v = to_si(getattr(self, name), "length", f"BaffleChange.{name}")
                object.__setattr__(self, name, float(require(v, f"BaffleChange.{name}", gt=0)))
        if self.cut is not None:
            cut = self.cut
            if isinstance(cut, bool) or not isinstance(cut, (int, float, str)):
                raise InputError("BaffleChange.cut", cut, "a fraction of the shell id, e.g. 0.25 or '25 %'")
            cut = to_si(cut, "dimensionless", "BaffleChange.cut")  # "25 %" -> 0.25
            object.__setattr__(self, "cut", float(require(cut, "BaffleChange.cut", gt=0, lt=0.5)))
        parts = []
        if self.spacing is not None:
            parts.append(f"spacing {_mm(self.spacing)}")
        if self.cut is not None:
            parts.append(f"cut {self.cut:.0%}")
        if self.spacing_in is not None or self.spacing_out is not None:
            parts.append("end spacings")
        _set_label(self, "baffles: " + ", ".join(parts))

    def apply(self, exchanger, service):
        changes = {}
        if self.spacing is not None:
            from .geometry import _is_default

            changes["baffle_spacing"] = self.spacing
            # end spacings given here win; the exchanger's own stated end spacings stay; defaulted ones (None)
            # are recomputed for the new central spacing
            for end in ("in", "out"):
                given = getattr(self, f"spacing_{end}")
                current = getattr(exchanger, f"baffle_spacing_{end}")
                changes[f"baffle_spacing_{end}"] = given if given is not None else (
                    None if _is_default(current) else current)
        else:
            if self.spacing_in is not None:
                changes["baffle_spacing_in"] = self.spacing_in
            if self.spacing_out is not None:
                changes["baffle_spacing_out"] = self.spacing_out
        if self.cut is not None:
            changes["baffle_cut"] = self.cut
        return exchanger.replace(**changes), service


@dataclass(frozen=True, init=False)
class Combined:
    """Several options applied in order; the label joins theirs with " + ".

    Parameters
    ----------
    *options
        The options, or one list (or tuple) of them, as the unit file writes them.
    label : str, optional
    """

    options: tuple
    label: str | None

    def __init__(self, *options, label=None):
        if len(options) == 1 and isinstance(options[0], (list, tuple)):
            options = tuple(options[0])
        if not options:
            raise InputError("Combined", options, "at least one option")
        for opt in options:
            option_label(opt)
        object.__setattr__(self, "options", tuple(options))
        object.__setattr__(self, "label", label)
        _set_label(self, " + ".join(o.label for o in options))

    def apply(self, exchanger, service):
        for opt in self.options:
            exchanger, service = opt.apply(exchanger, service)
        return exchanger, service
