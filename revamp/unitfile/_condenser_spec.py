"""The ``kind: condenser`` unit-file entry's vocabulary: its known fields, standard plant-data columns, option
types, JSON schema (:data:`CONDENSER_SCHEMA`) and the frozen results it is built into (:class:`CondenserCase`,
:class:`CondenserPlantData`) (layer 8).

Moved here from :mod:`revamp.unitfile._condenser` (which checks and builds the entry and re-exports these names).
"""
from __future__ import annotations

from dataclasses import dataclass

from ._aircooler import _DIALECT_SCHEMA

CONDENSER_KIND = "condenser"
EXCHANGER_TYPES = ("shell and tube", "air cooler")
_ENTRY = {"tag", "kind", "description", "exchanger", "geometry", "condensing_side", "vapour", "coolant", "air_side",
          "revamp", "allowed", "options", "plant_data"}
_VAPOUR = {"fluid", "mixture", "curve", "curve_units", "condensate", "critical_pressure", "pressure", "quality",
           "superheat", "flow", "fouling", "dp_allowed"}
_COOLANT = {"fluid", "flow", "t_in", "fouling", "dp_allowed"}
_AIR = {"t_in", "flow", "face_velocity", "altitude", "fouling"}
_PLANT = {"file", "columns", "condensing_from", "uncertainty", "steady", "delimiter", "decimal", "timestamp_format",
          "dayfirst", "timezone"}
#: the keys of an air-cooled condenser's plant_data besides _PLANT
_PLANT_AIR = {"duty_from", "air_flow_from"}
_DIALECT = ("delimiter", "decimal", "timestamp_format", "dayfirst", "timezone")
#: plant-data column -> quantity kind (None: the timestamp)
CONDENSER_PLANT_COLUMNS = {"timestamp": None, "coolant_flow": "mass_flow", "coolant_t_in": "temperature",
                           "coolant_t_out": "temperature", "condensing_pressure": "pressure",
                           "condensing_t": "temperature", "condensate_t": "temperature"}
#: plant-data column of an air-cooled condenser -> quantity kind (None: the timestamp)
AIR_CONDENSER_PLANT_COLUMNS = {"timestamp": None, "air_t_in": "temperature", "condensing_pressure": "pressure",
                               "condensing_t": "temperature", "condensate_flow": "mass_flow",
                               "condensate_t": "temperature", "air_flow": "mass_flow", "fan_power": "power"}
#: an air-cooled condenser: where each row's duty comes from -> the column it needs (None: the stated vapour flow)
DUTY_FROM = {"condensate": "condensate_flow", "stated": None}
#: an air-cooled condenser: where each row's air flow comes from -> the column it needs (None: the stated one)
AIR_FLOW_FROM = {"stated": None, "measured": "air_flow", "fan_power": "fan_power"}
#: where the condensing temperature of each row comes from -> the column it needs
CONDENSING_FROM = {"pressure": "condensing_pressure", "temperature": "condensing_t"}
#: the columns of a condensing-curve table file and their quantity kinds (heat_released or enthalpy)
CURVE_COLUMNS = {"temperature": "temperature", "heat_released": "specific_energy", "enthalpy": "specific_energy",
                 "vapour_fraction": "dimensionless", "surface_tension": None,
                 **{f"{phase}_{prop}": prop for phase in ("liquid", "vapour")
                    for prop in ("density", "heat_capacity", "viscosity", "conductivity")}}
#: units a curve's heat released (or enthalpy) column may be given in -> J/kg (definitions; Btu/lb: IT Btu)
SPECIFIC_ENERGY = {"J/kg": 1.0, "kJ/kg": 1e3, "MJ/kg": 1e6, "Btu/lb": 2326.0}
#: the largest revamp throughput factor accepted (as for the other kinds)
MAX_THROUGHPUT = 10.0
#: shell-and-tube option types (``revamp.options``) and the coolant change (``revamp.options_condenser``)
_ST_OPTIONS = ("clean", "twisted_tape", "wire_coil", "add_shells", "new_bundle", "retube", "baffle_change")
_AIR_OPTIONS = {"add_bays": ("AddBays", {"n"}), "add_bundles": ("AddBundles", {"n"}),
                "more_rows": ("MoreRows", {"tube_rows", "tube_passes"}),
                "fan_upgrade": ("FanUpgrade", {"speed_ratio", "air_flow_ratio"}),
                "clean_fins": ("CleanFins", {"side", "residual"})}
_COOLANT_CHANGE = {"flow_ratio", "t_in"}

_Q = {"type": ["string", "number"]}
_COLUMN = {"$ref": "#/$defs/column"}
CONDENSER_SCHEMA = {
    "type": "object",
    "required": ["tag", "kind", "geometry", "vapour"],
    "additionalProperties": False,
    "description": "A condenser: a shell-and-tube exchanger or an air cooler condensing a vapour (a pure fluid, a "
                   "CoolProp mixture or a condensing-curve table) against a coolant.",
    "properties": {
        "tag": {"type": "string", "minLength": 1, "maxLength": 64},
        "kind": {"const": CONDENSER_KIND},
        "description": {"type": "string"},
        "exchanger": {"enum": list(EXCHANGER_TYPES)},
        "condensing_side": {"enum": ["shell", "tube"]},
        "geometry": {"type": "object", "description": "The geometry of a shell-and-tube entry, or of an air cooler "
                                                      "(exchanger: air cooler)."},
        "vapour": {"type": "object", "additionalProperties": False, "required": ["pressure", "flow"],
                   "properties": {"fluid": {"type": "string", "minLength": 1},
                                  "mixture": {"type": "string", "minLength": 1},
                                  "curve": {"type": "string", "minLength": 1},
                                  "curve_units": {"type": "object", "additionalProperties": False,
                                                  "properties": {k: {"type": "string"} for k in CURVE_COLUMNS
                                                                 if CURVE_COLUMNS[k] is not None}},
                                  "condensate": {"$ref": "#/$defs/fluid"},
                                  **{k: _Q for k in _VAPOUR - {"fluid", "mixture", "curve", "curve_units",
                                                               "condensate"}}}},
        "coolant": {"type": "object", "additionalProperties": False, "required": ["fluid", "flow", "t_in"],
                    "properties": {"fluid": {"$ref": "#/$defs/fluid"}, **{k: _Q for k in _COOLANT - {"fluid"}}}},
        "air_side": {"type": "object", "additionalProperties": False, "required": ["t_in"],
                     "properties": {k: _Q for k in _AIR}},
        "revamp": {"type": "object", "additionalProperties": False,
                   "properties": {"vapour_load": _Q, "throughput": _Q}},
        "allowed": {"type": "object", "additionalProperties": False,
                    "properties": {"pressure": _Q, "temperature": _Q}},
        "options": {"type": "array", "items": {"type": "object", "required": ["type"], "properties": {"type": {
            "enum": sorted(set(_ST_OPTIONS) | set(_AIR_OPTIONS) | {"coolant_change"})}}}},
        "plant_data": {
            "type": "object", "additionalProperties": False, "required": ["file"],
            "description": "Shell and tube: measured coolant flow and temperatures with the condensing pressure (or "
                           "temperature), the fouling from the coolant-side heat balance. Air cooler: the condensing "
                           "pressure (or temperature), the condensate flow (or the stated vapour flow), the ambient, "
                           "and the air flow stated, measured or from the fan power.",
            "properties": {
                "file": {"type": "string", "minLength": 1},
                "columns": {"type": "object", "additionalProperties": False,
                            "properties": {k: _COLUMN for k in {**CONDENSER_PLANT_COLUMNS,
                                                                 **AIR_CONDENSER_PLANT_COLUMNS}}},
                "condensing_from": {"enum": sorted(CONDENSING_FROM)},
                "duty_from": {"enum": sorted(DUTY_FROM), "description": "Air cooler only."},
                "air_flow_from": {"enum": sorted(AIR_FLOW_FROM), "description": "Air cooler only."},
                "uncertainty": {"type": "object", "additionalProperties": False,
                                "properties": {"flow": _Q, "temperature": _Q, "pressure": _Q, "air_flow": _Q}},
                "steady": {"type": ["object", "boolean"]},
                **_DIALECT_SCHEMA,
            },
        },
    },
}


@dataclass(frozen=True)
class CondenserPlantData:
    """Where a condenser's plant data is and how to read it
    (:func:`revamp.monitoring_condenser.monitor_condenser_data`)."""

    file: object                          #: Path of the CSV file
    columns: dict                         #: standard name -> (CSV column, unit or None)
    condensing_from: str = "pressure"     #: "pressure" or "temperature"
    uncertainty: dict = None              #: {"flow": [-], "temperature": [K], "pressure": [-]} as given
    steady: object = None                 #: steady-state settings as written, False for none, None: defaults
    dialect: dict = None                  #: CSV dialect settings given
    duty_from: str | None = None          #: air cooler: "condensate" or "stated" (None: shell and tube)
    air_flow_from: str | None = None      #: air cooler: "stated", "measured" or "fan_power"

    def monitor_options(self) -> dict:
        """Keyword arguments of :func:`revamp.monitoring_condenser.monitor_condenser_data` this section gives."""
        out = {"columns": dict(self.columns), "condensing_from": self.condensing_from,
               "uncertainty": dict(self.uncertainty or {}) or None, "steady": self.steady,
               "dialect": dict(self.dialect or {})}
        if self.duty_from is not None:
            out.update(duty_from=self.duty_from, air_flow_from=self.air_flow_from)
        return out


@dataclass(frozen=True)
class CondenserCase:
    """One condenser of a unit, ready to rate (:func:`revamp.rate`), compare
    (:func:`revamp.options_condenser.compare_condenser`) and question on its condensing pressure
    (:func:`revamp.rating_condenser.condensing_pressure_for`)."""

    tag: str
    description: str
    exchanger: object
    service: object                       #: today: Service (shell and tube) or AirService (air cooler)
    condensing_side: str                  #: "shell" or "tube"
    coolant_side: str                     #: "tube", "shell" or "air"
    options: tuple = ()
    revamp_service: object = None         #: the service at the revamp vapour load (None: no revamp section)
    vapour_load: float | None = None      #: the revamp vapour load [kg/s]
    throughput: float = 1.0               #: revamp vapour load over today's vapour flow
    allowed_pressure: float | None = None     #: the highest condensing pressure allowed [Pa]
    allowed_temperature: float | None = None  #: or the highest condensing (dew-point) temperature allowed [K]
    dp_allowed: dict = None               #: {"condensing": Pa, "coolant": Pa} as given
    plant_data: CondenserPlantData | None = None
    index: int = -1
    curve_file: object = None             #: Path of the condensing-curve table file (None: a fluid or mixture)
    kind: str = CONDENSER_KIND

    @property
    def vapour(self):
        """Today's condensing stream."""
        return getattr(self.service, self.condensing_side)
