"""The objects a loaded unit file is made of, and the problems a bad one has."""
from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from ..errors import InputError, printable

SCHEMA_PATH = Path(__file__).resolve().parent.parent / "unit_schema.json"
#: the plant-data columns :func:`revamp.monitor` reads, and the quantity kind of each
STANDARD_COLUMNS = {"timestamp": None, "shell_flow": "mass_flow", "shell_t_in": "temperature",
                    "shell_t_out": "temperature", "tube_flow": "mass_flow", "tube_t_in": "temperature",
                    "tube_t_out": "temperature"}


# ------------------------------------------------------------------------------------------------------------ results
@dataclass(frozen=True)
class Problem:
    """One thing wrong with a unit file: where (``path``), what was given (``value``) and what is allowed.

    >>> str(Problem("exchangers[2].tube_side.flow", "-5 kg/s", "must be > 0"))
    'exchangers[2].tube_side.flow: -5 kg/s: must be > 0'
    """

    path: str
    value: str
    message: str

    def __post_init__(self):  # a path or value from the file may hold terminal escapes, NUL or lone surrogates
        for name, limit in (("path", 400), ("value", 400), ("message", 4000)):
            object.__setattr__(self, name, printable(getattr(self, name), limit=limit))

    def __str__(self) -> str:
        return f"{self.path}: {self.value}: {self.message}"


class UnitFileError(InputError):
    """A unit file with problems; ``problems`` lists them all, ``str()`` shows them one per line."""

    def __init__(self, path, problems):
        self.problems = list(problems)
        text = "\n".join(str(p) for p in self.problems)
        ValueError.__init__(self, f"{path}: {len(self.problems)} problem(s)\n{text}")
        self.field, self.value, self.allowed = str(path), None, "a valid unit file"


@dataclass(frozen=True)
class UnitEconomics:
    """The unit's economic inputs in plain numbers (money in ``currency``)."""

    currency: str = "USD"
    energy_price: float | None = None      #: [currency/J] fired-heater fuel
    heater_efficiency: float | None = None  #: [-]
    hours_per_year: float | None = None     #: [h/yr]
    discount_rate: float | None = None      #: [-/yr]
    horizon_years: float | None = None      #: [yr]
    capacity_margin: float | None = None    #: [currency/kg]
    cleaning_cost: float | None = None      #: [currency]
    run_length: float | None = None         #: [s] between cleanings, for the cycle-averaged duty
    cleaning_downtime: float | None = None  #: [s] out of service per cleaning
    value_basis: str | None = None          #: the unit's default value basis (revamp.economics.VALUE_BASES)
    utility_price: float | None = None      #: [currency/J] cooling utility, for the "cooling" value basis
    rank_by: str | None = None              #: ranking criterion (revamp.study.RANK_CRITERIA)
    judge_on: str | None = None             #: judging basis (revamp.study.JUDGE_BASES)


@dataclass(frozen=True)
class PlantData:
    """Where an exchanger's plant data is and how its columns map onto the standard names."""

    file: Path
    columns: dict           #: standard name -> (CSV column, unit or None)
    uncertainty: dict       #: {"flow": relative [-], "temperature": absolute [K]} (keys present if given)
    fouling_side: str | None = None        #: "shell" or "tube" as the file says; None: not given (inferred)
    run_length: float | None = None        #: [s] this exchanger's own, overriding the unit's economics
    cleaning_downtime: float | None = None  #: [s] this exchanger's own, overriding the unit's economics
    dialect: dict = field(default_factory=dict)  #: CSV dialect settings given (delimiter, decimal, timestamp_format, ...)
    steady: dict | bool | None = None      #: steady-state filter settings in SI, False for none, None: defaults
    cleanings: tuple | None = None         #: cleaning dates as written; None: found in the data
    drift_tolerance: float | None = None   #: [-] smallest closure change flagged as a drift; None: default

    def monitor_options(self) -> dict:
        """Keyword arguments of :func:`revamp.monitor` that this section gives (the run length is the case's)."""
        out = {"columns": self.columns, "uncertainty": self.uncertainty or None, "dialect": dict(self.dialect)}
        if self.steady is not None:
            out["steady"] = False if self.steady is False else ({} if self.steady is True else dict(self.steady))
        if self.cleanings is not None:
            out["cleanings"] = list(self.cleanings)
        if self.drift_tolerance is not None:
            out["drift_tolerance"] = self.drift_tolerance
        return out


@dataclass(frozen=True)
class ExchangerCase:
    """One exchanger of a unit file, with its model objects built.

    ``service`` is today's service; ``revamp_service`` the service at the revamp conditions (today's if the file gives
    none); ``target`` a dict with one of ``duty`` [W], ``t_out_shell``/``t_out_tube`` [K], ``UA`` [W/K] (empty if
    none); ``limits`` the screening limits given in the file (``dp_shell``, ``dp_tube`` [Pa] from each side's
    ``dp_allowed``, and the ``limits`` section's fields, as :class:`revamp.screening.Limits` takes them); ``options``
    the option objects in file order, ``capex`` a dict option label -> capex [currency]; ``economics`` the
    :class:`revamp.economics.Economics` of its study (None when the file gives no energy price).

    ``fouling_side`` (``"shell"``/``"tube"``), ``run_length`` and ``cleaning_downtime`` [s] are what the file says
    for this exchanger's fouling cycle (the exchanger's ``plant_data`` first, then the unit's ``economics``), None
    where it says nothing; ``cycle_from`` names the file path each given value came from.

    ``refused_options`` lists the :class:`Problem` of each option that is wrong (a repeated label, a pitch below the
    tube od...): :func:`load_partial` still builds the exchanger without those options, so that a batch can show
    each as a failed row and compare the others (:func:`load` and :func:`check` report them as problems).
    """

    index: int
    tag: str
    description: str
    exchanger: Any
    service: Any
    revamp_service: Any
    throughput: float
    target: dict
    limits: dict
    options: tuple
    capex: dict
    plant_data: PlantData | None
    economics: Any = None
    fouling_side: str | None = None
    run_length: float | None = None
    cleaning_downtime: float | None = None
    cycle_from: dict = field(default_factory=dict)
    raw: dict = field(repr=False, default_factory=dict)
    rank_by: str | None = None   #: the unit's ranking criterion, None: the study's default
    judge_on: str | None = None  #: the unit's judging basis, None: the study's default
    refused_options: tuple = ()  #: Problems of the options left out (each under ``exchangers[i].options[j]``)


@dataclass(frozen=True)
class Unit:
    """A loaded unit file: name, economics and exchangers; ``sha256`` is the hash of the file's bytes.

    ``network`` is the :class:`revamp.train.Train` of the file's ``network`` section (None without one);
    ``network_throughput`` its revamp factor on every stream's flow (1 when not given).
    """

    name: str
    description: str
    path: Path
    sha256: str
    economics: UnitEconomics
    exchangers: tuple
    raw: dict = field(repr=False, default_factory=dict)
    network: Any = field(default=None, repr=False)
    network_throughput: float = 1.0
    cleaning: dict | None = field(default=None, repr=False)  #: the ``cleaning`` section in SI (None without one)

    @property
    def tags(self) -> list[str]:
        return [x.tag for x in self.exchangers]

    def exchanger(self, tag: str) -> ExchangerCase:
        """The exchanger with this tag (InputError listing the tags otherwise)."""
        for x in self.exchangers:
            if x.tag == tag:
                return x
        raise InputError("tag", tag, f"one of the unit's tags: {', '.join(self.tags)}")


