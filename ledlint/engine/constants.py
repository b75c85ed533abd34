"""Physical constants and the thermal voltage, shared by the engine's modules."""

from __future__ import annotations

import numpy as np
from numpy.typing import ArrayLike, NDArray

# CODATA 2018 values, exact since the 2019 SI redefinition.
BOLTZMANN = 1.380649e-23  # J/K
ELEMENTARY_CHARGE = 1.602176634e-19  # C
ZERO_CELSIUS = 273.15  # K

# SPICE puts this conductance across every junction (ngspice default GMIN = 1e-12 S). The
# engine does the same: it makes reverse bias well posed (a reversed string divides the
# voltage between its LEDs instead of leaving the split undetermined) and it lets the
# results be compared with ngspice in reverse as well as forward.
GMIN = 1e-12  # S


def thermal_voltage(celsius: ArrayLike) -> NDArray[np.float64]:
    """kT/q in volts at a temperature given in °C."""
    return BOLTZMANN * (np.asarray(celsius, dtype=float) + ZERO_CELSIUS) / ELEMENTARY_CHARGE
