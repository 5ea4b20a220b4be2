"""Shell-side correlations: Bell-Delaware (:mod:`.shell_bell`) and Kern (:mod:`.shell_kern`), one import path.

``SHELL_METHODS`` maps the method names the rating accepts to their functions.
"""
from __future__ import annotations

from .shell_bell import TABOREK_FITS, ShellSideResult, bell_delaware, correction_factors, ideal_f, ideal_j
from .shell_kern import kern, kern_equivalent_diameter

__all__ = ["ShellSideResult", "bell_delaware", "kern", "ideal_j", "ideal_f", "correction_factors",
           "kern_equivalent_diameter", "TABOREK_FITS", "SHELL_METHODS"]

SHELL_METHODS = {"bell-delaware": bell_delaware, "kern": kern}
