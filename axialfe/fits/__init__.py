"""Press and shrink fits: ISO 286 limits, Lamé's thick-walled cylinders, states and checks.

- ``iso286``: IT grades and fundamental deviations as data, fit designations to limits;
- ``lame``: the pure formulas (pressure, hoop and equivalent stresses, holding capacity);
- ``fit``: the fit (:class:`PressFit`), its states under temperature and its checks;
- ``reader``: the fit file (TOML) with located one-line errors.

Above ``checks`` (its entries) and ``io`` (the model reader's unit and material
helpers); below ``output`` and ``cli``.
"""

from .fit import FitResult, FitState, FitUnits, PressFit, ServiceState, solve_fit, state_at
from .iso286 import IsoFit, fit_limits
from .reader import parse_fit, read_fit

__all__ = ["PressFit", "ServiceState", "FitUnits", "FitState", "FitResult", "solve_fit",
           "state_at", "IsoFit", "fit_limits", "parse_fit", "read_fit"]
