"""Distillate absorbed by the tub: its partial pressure adds to the vacuum floor."""

from __future__ import annotations

import numpy as np

from ..constants import MOLAR_MASS_WATER
from .smooth import smooth_min


def solvent_partial_pressure(solvent_moles, water_mass, liquid_volume, henry_solubility, pure_vapor_pressure):
    """Partial pressure of a dissolved solvent over the tub liquid.

    Henry's law p = c / Hcp (Sander 2023, eq. 2) for a dilute solution; without a Henry
    constant, Raoult's law p = x p_sat. Neither can exceed the pure liquid's vapor pressure,
    which a second liquid phase (above the solubility limit) exerts in full; the cap is a smooth
    minimum (p_h^-8 + p_sat^-8)^(-1/8), within 0.05 % of the smaller one away from the corner.

    Parameters
    ----------
    solvent_moles : float or ndarray
        Solvent in the tub [mol].
    water_mass : float or ndarray
        Water in the tub [kg].
    liquid_volume : float or ndarray
        Tub liquid volume [m^3].
    henry_solubility : float or ndarray or None
        Hcp [mol/(m^3 Pa)] at the tub temperature; None or NaN for Raoult's law.
    pure_vapor_pressure : float or ndarray
        Pure solvent's vapor pressure at the tub temperature [Pa].

    Returns
    -------
    float or ndarray
        [Pa].
    """
    n = np.maximum(np.asarray(solvent_moles, dtype=float), 0.0)
    if henry_solubility is None or np.all(np.isnan(henry_solubility)):
        dilute = n / (np.asarray(water_mass) / MOLAR_MASS_WATER) * pure_vapor_pressure
    else:
        dilute = n / liquid_volume / henry_solubility
    return smooth_min(dilute, pure_vapor_pressure)
