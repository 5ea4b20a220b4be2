"""revamp: heat-exchanger revamp studies.

Rate an existing shell-and-tube exchanger at any service, clean and fouled (:func:`rate`); find the fouling it really
has from plant data (:func:`monitor`); compare retrofit options on duty, limits and money (:func:`compare`).

>>> import revamp as rv
>>> sorted(n for n in ("rate", "ShellAndTube", "Service", "Stream", "compare", "monitor") if hasattr(rv, n))
['Service', 'ShellAndTube', 'Stream', 'compare', 'monitor', 'rate']
"""
from importlib import import_module

__version__ = "0.1.0"

# public name -> module that defines it (imported on first use, so `import revamp` stays light)
_EXPORTS = {
    "InputError": "revamp.errors",
    "ShellAndTube": "revamp.geometry",
    "Stream": "revamp.service",
    "Service": "revamp.service",
    "rate": "revamp.rating",
    "Rating": "revamp.rating",
    "monitor": "revamp.monitoring",
    "Monitoring": "revamp.monitoring",
    "compare": "revamp.study",
    "Study": "revamp.study",
    "Train": "revamp.train",
    "Match": "revamp.train",
    "Furnace": "revamp.train",
    "AirSide": "revamp.train",
    "compare_train": "revamp.train",
    "study_exchanger": "revamp.studies",
    "ExchangerStudy": "revamp.studies",
    "AirCooler": "revamp.aircooler",
    "Fin": "revamp.aircooler",
    "AirService": "revamp.service_air",
    "AirRating": "revamp.rating_air",
    "CondenserRating": "revamp.rating_condenser",
    "condensing_pressure_for": "revamp.rating_condenser",
    "hot_day": "revamp.hot_day",
}
_SUBMODULES = {"fluids", "materials", "fouling", "units", "options", "screening", "economics", "thermal",
               "resistance", "geometry", "correlations", "plots", "unitfile", "batch", "train", "studies"}

__all__ = sorted(_EXPORTS) + sorted(_SUBMODULES)


def __getattr__(name):
    if name in _EXPORTS:
        value = getattr(import_module(_EXPORTS[name]), name)
        globals()[name] = value
        return value
    if name in _SUBMODULES:
        module = import_module(f"revamp.{name}")
        globals()[name] = module
        return module
    raise AttributeError(f"module 'revamp' has no attribute {name!r}")


def __dir__():
    return __all__
