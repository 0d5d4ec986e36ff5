"""Tub-fluid properties tabulated once per run, for the ODE's hot path.

The correlations in fluid.py, water.py, ice.py and air.py are exact but cost tens of
microseconds per call; the right-hand side is called hundreds of times per run. This module
samples them on a fine grid of temperature (0.1 K) and, for glycol mixes, of mass fraction
(meltwater only dilutes, so the grid runs from 0 to the initial fraction), and interpolates
with cubic Hermite rows in temperature (C1-smooth, so the stiff solver sees no kinks) and
linearly in mass fraction.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .. import constants as c
from . import air, fluid, ice
from ._validity import quiet_ranges

TEMPERATURE_STEP = 0.1  # K
FRACTION_STEPS = 24


def hermite(x, grid, values, slopes):
    """Cubic Hermite interpolation on a uniform grid: C1-smooth, so stiff solvers see no kinks.

    Parameters
    ----------
    x : float or ndarray
        Where to interpolate (clipped to the grid).
    grid : ndarray
        Uniform, increasing nodes.
    values, slopes : ndarray
        Function values and derivatives at the nodes.
    """
    h = grid[1] - grid[0]
    if np.ndim(x) == 0 and math.isfinite(x):  # the ODE's hot path: plain floats are ~5x faster
        pos = min(max((float(x) - grid[0]) / h, 0.0), grid.size - 1.000001)
        i = int(pos)
    else:
        pos = np.clip((np.asarray(x, dtype=float) - grid[0]) / h, 0.0, grid.size - 1.000001)
        pos = np.where(np.isfinite(pos), pos, 0.0)  # NaN in, a finite (edge) value out: callers validate inputs
        i = pos.astype(int)
    u = pos - i
    u2 = u * u
    u3 = u2 * u
    return (
        (2 * u3 - 3 * u2 + 1) * values[i]
        + (u3 - 2 * u2 + u) * h * slopes[i]
        + (-2 * u3 + 3 * u2) * values[i + 1]
        + (u3 - u2) * h * slopes[i + 1]
    )


@dataclass(frozen=True)
class _Row:
    values: np.ndarray
    slopes: np.ndarray


def _row(grid, values) -> _Row:
    return _Row(np.asarray(values, dtype=float), np.gradient(np.asarray(values, dtype=float), grid, edge_order=2))


@dataclass(frozen=True)
class FluidTable:
    """Interpolating tables of one tub fluid (one glycol kind, fractions 0..w_max)."""

    glycol: str
    temperatures: np.ndarray  # K
    fractions: np.ndarray  # -, increasing
    vapor_pressure_table: tuple  # of _Row over temperatures, one per fraction [Pa]
    heat_capacity_table: tuple  # of _Row [J/(kg K)]
    water_heat_capacity_row: _Row  # [J/(kg K)]
    air_pv_row: _Row  # [Pa m^3 per m^3 of water]
    freezing_points: np.ndarray  # K over fractions
    latent_heats: np.ndarray  # J/kg over fractions (fusion at the freezing point)
    ice_heat_capacities: np.ndarray  # J/(kg K) over fractions (at the freezing point)

    def _blend(self, rows, w, temperature):
        if len(rows) == 1:
            return hermite(temperature, self.temperatures, rows[0].values, rows[0].slopes)
        pos = np.interp(w, self.fractions, np.arange(self.fractions.size))
        i = np.minimum(np.floor(pos).astype(int), self.fractions.size - 2)
        frac = pos - i
        if np.ndim(w) == 0:
            k = int(i)
            lo = hermite(temperature, self.temperatures, rows[k].values, rows[k].slopes)
            hi = hermite(temperature, self.temperatures, rows[k + 1].values, rows[k + 1].slopes)
            return lo + (hi - lo) * frac
        t_b, i_b, f_b = np.broadcast_arrays(temperature, i, frac)
        out = np.empty(t_b.shape)
        for k in np.unique(i_b):
            sel = i_b == k
            lo = hermite(t_b[sel], self.temperatures, rows[k].values, rows[k].slopes)
            hi = hermite(t_b[sel], self.temperatures, rows[k + 1].values, rows[k + 1].slopes)
            out[sel] = lo + (hi - lo) * f_b[sel]
        return out

    def vapor_pressure(self, w, temperature):
        """Total vapor pressure [Pa] at glycol mass fraction w [-] and temperature [K]."""
        return self._blend(self.vapor_pressure_table, w, temperature)

    def heat_capacity(self, w, temperature):
        """Liquid heat capacity [J/(kg K)]."""
        return self._blend(self.heat_capacity_table, w, temperature)

    def water_heat_capacity(self, temperature):
        """Pure liquid water heat capacity [J/(kg K)] (meltwater)."""
        return hermite(temperature, self.temperatures, self.water_heat_capacity_row.values, self.water_heat_capacity_row.slopes)

    def dissolved_air_pv(self, temperature):
        """Air dissolved in water saturated at 1 atm, as gas [Pa m^3 per m^3 of water]."""
        return hermite(temperature, self.temperatures, self.air_pv_row.values, self.air_pv_row.slopes)

    def freezing_point(self, w):
        """Freezing point [K]."""
        return np.interp(w, self.fractions, self.freezing_points)

    def latent_heat(self, w):
        """Latent heat of fusion of ice melting into the solution at its freezing point [J/kg]."""
        return np.interp(w, self.fractions, self.latent_heats)

    def ice_heat_capacity(self, w):
        """Ice heat capacity at the solution's freezing point [J/(kg K)]."""
        return np.interp(w, self.fractions, self.ice_heat_capacities)


def build_table(glycol: str, max_fraction: float, t_max: float = c.ZERO_CELSIUS + 90.0) -> FluidTable:
    """Sample the tub fluid's properties for fractions 0..max_fraction and T_f(max)-2 K..t_max."""
    if glycol == "none" or max_fraction == 0.0:
        fractions = np.array([0.0])
    else:
        fractions = np.linspace(0.0, max_fraction, FRACTION_STEPS + 1)
    t_f = np.array([float(fluid.freezing_point(glycol, w)) for w in fractions])
    t_min = float(t_f.min()) - 2.0
    temperatures = np.arange(t_min, t_max + TEMPERATURE_STEP, TEMPERATURE_STEP)
    with quiet_ranges():  # the table reaches a little past the correlations' ranges on purpose (below T_f)
        w_col = fractions[:, None]
        vp = np.asarray(fluid.vapor_pressure(glycol if fractions.size > 1 else "none", w_col if fractions.size > 1 else 0.0, temperatures[None, :]), dtype=float)
        cp = np.asarray(fluid.heat_capacity(glycol if fractions.size > 1 else "none", w_col if fractions.size > 1 else 0.0, temperatures[None, :]), dtype=float)
        cp_w = np.asarray(fluid.heat_capacity("none", 0.0, np.maximum(temperatures, c.ZERO_CELSIUS - 30.0)), dtype=float)
        air_pv = np.asarray(air.dissolved_air_pv(np.maximum(temperatures, c.ZERO_CELSIUS)), dtype=float)
        latent = np.asarray(ice.latent_heat_fusion(t_f), dtype=float)
        cp_ice = np.asarray(ice.heat_capacity(t_f), dtype=float)
    return FluidTable(
        glycol=glycol,
        temperatures=temperatures,
        fractions=fractions,
        vapor_pressure_table=tuple(_row(temperatures, r) for r in np.atleast_2d(vp) * np.ones((fractions.size, 1))),
        heat_capacity_table=tuple(_row(temperatures, r) for r in np.atleast_2d(cp) * np.ones((fractions.size, 1))),
        water_heat_capacity_row=_row(temperatures, cp_w),
        air_pv_row=_row(temperatures, air_pv),
        freezing_points=t_f,
        latent_heats=latent,
        ice_heat_capacities=cp_ice,
    )
