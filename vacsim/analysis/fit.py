"""Calibrate a scenario to a logged run: weighted nonlinear least squares on whole simulations.

The rig model has a few numbers that differ from rig to rig and are hard to know beforehand:
the ejector's entrainment ratio, the apparatus leak rate and the tub's heat gain from the
room (UA). Given a logged run (pressure readings, or the head temperature of a known boiling
liquid, and the tub temperature), :func:`fit_scenario` finds the values of the chosen free
parameters that make a simulation of that same run agree with the log.

Method
------
Weighted nonlinear least squares (e.g. Bates & Watts, *Nonlinear Regression Analysis and Its
Applications*, Wiley 1988, ch. 2) with ``scipy.optimize.least_squares`` (trust-region
reflective, "trf", with bounds). Each residual evaluation is one whole simulation of the
logged run. The residuals are

* pressure, in log space: ``(ln p_sim - ln p_obs) / (sigma_p / p_obs)``,
  sigma_p = max(1 mbar, 2 % of p) by default (the issue's stated gauge uncertainty);
* boiling (head) temperature of a named compound: ``(T_b(p_sim) - T_obs) / sigma_T``, T_b the
  compound's boiling temperature at the simulated pressure (vacsim.properties.solvents);
* tub temperature: ``(T_sim - T_obs) / sigma_T``, sigma_T = 0.3 K by default.

Positive scale factors (entrainment ratio, leak rate, UA ...) are fitted as x = ln(value),
so a step in x is a relative change and the finite-difference step (1e-3 in x) is sensible
for every parameter at once. The Jacobian is a forward difference on whole simulations run
at a tight solver tolerance (rtol 1e-8), so the differences are not solver noise; each
Jacobian costs one simulation per free parameter.

Standard errors come from the linearised covariance at the solution,
``cov_x = s^2 (J^T J)^-1`` with s^2 = max(1, chi^2 / (m - n)) (the stated uncertainties are
trusted unless the fit is visibly worse than them; Bates & Watts 1988, sec. 2.3), carried
to the parameter by the delta method (se(value) = value * se(x) in log space).
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from .. import constants as c
from ..errors import InputError

#: the parameters fitted when the user names none
DEFAULT_FREE: tuple[str, ...] = ("ejector.entrainment_ratio", "apparatus.leak_rate", "tub.ua")

#: default pressure uncertainty: sigma = max(PRESSURE_SIGMA_FLOOR, PRESSURE_SIGMA_RELATIVE * p)
PRESSURE_SIGMA_FLOOR = 1.0 * c.MBAR  # Pa
PRESSURE_SIGMA_RELATIVE = 0.02
#: default temperature uncertainty (tub and head thermometers) [K]
TEMPERATURE_SIGMA = 0.3

#: solver tolerance of the fit's simulations: tight enough that 1e-3 differences are clean
FIT_RTOL = 1e-8
#: forward-difference step in the fitted coordinate (ln value for scale factors)
DIFF_STEP = 1e-3
#: output grid of the fit's simulations [s]; log times between grid points are interpolated
#: (pressure in ln p)
FIT_OUTPUT_INTERVAL = 5.0
#: the early part of a tub log whose straight line gives the run's initial tub temperature [s]
INITIAL_TEMPERATURE_WINDOW = 600.0

#: identifiability thresholds (issue 6): stderr above the value, or |correlation| above this
CORRELATION_LIMIT = 0.95
#: a weighted residual rms above this says the model does not describe the log
RESIDUAL_RMS_LIMIT = 2.0


@dataclass(frozen=True)
class FreeParameter:
    """A scenario key the fit may vary.

    Attributes
    ----------
    key : str
        Dotted scenario key.
    unit : str or None
        SI unit written after the value in a scenario file; None for a plain number.
    log_scale : bool
        Fitted as ln(value) (a positive scale factor) rather than value / scale.
    lower, upper : float
        Bounds [SI] (inside the scenario schema's limits).
    typical : float
        Start value [SI] when the scenario gives none (or zero, for a log-scale parameter).
    display_unit : str
        The trade's unit for tables.
    display_factor, display_offset : float
        display = SI * factor + offset.
    step : float
        Forward-difference step in the fitted coordinate (linear parameters) [SI].
    """

    key: str
    unit: str | None
    log_scale: bool
    lower: float
    upper: float
    typical: float
    display_unit: str
    display_factor: float = 1.0
    display_offset: float = 0.0
    step: float = DIFF_STEP

    def to_x(self, value: float) -> float:
        return math.log(value) if self.log_scale else value

    def from_x(self, x: float) -> float:
        return math.exp(x) if self.log_scale else x

    def display(self, value: float) -> float:
        return value * self.display_factor + self.display_offset

    def display_scale(self, units: str = "mbar") -> tuple[float, float, str]:
        """(factor, offset, label) of the display for a pressure display unit (--units).

        Pressures follow `units`, throughputs `units`·L/s; other quantities keep their own
        display unit (°C, W/K, L...).
        """
        from ..units import PRESSURE_LABELS, pressure_in, throughput_in, throughput_label

        if self.unit == "Pa*m^3/s":
            return throughput_in(1.0, units), 0.0, throughput_label(units)
        if self.unit == "Pa":
            return pressure_in(1.0, units), 0.0, PRESSURE_LABELS[units.lower()]
        return self.display_factor, self.display_offset, self.display_unit

    def display_text(self, value: float, units: str = "mbar", *, difference: bool = False) -> str:
        """A value [SI] (or, with `difference`, a standard error) as display text with its unit."""
        factor, offset, label = self.display_scale(units)
        if difference and label == "°C":
            label = "K"
        shown = value * factor + (0.0 if difference else offset)
        return f"{shown:.3g} {label}".rstrip()

    def text(self, value: float) -> Any:
        """The value as a scenario file holds it (a number, or a string with its SI unit)."""
        return float(value) if self.unit is None else f"{value:.12g} {self.unit}"


# 1 Pa m^3/s = 10 mbar L/s (DESIGN sec. 6)
_MBAR_L_PER_PA_M3 = 1.0 / (c.MBAR * 1e-3)

#: the keys `--free` accepts (an unknown key's error lists them)
FITTABLE: dict[str, FreeParameter] = {
    p.key: p
    for p in (
        FreeParameter("ejector.entrainment_ratio", None, True, 1e-3, 5.0, 1.0, ""),
        # typical whole-rig leak with greased joints 1e-4..1e-2 mbar L/s (DESIGN sec. 2, from memory)
        FreeParameter("apparatus.leak_rate", "Pa*m^3/s", True, 1e-9, 10.0, 1e-4, "mbar·L/s", _MBAR_L_PER_PA_M3),
        # a plastic tub of 10 L in still air: a few W/K (common practice)
        FreeParameter("tub.ua", "W/K", True, 1e-3, 1e3, 3.0, "W/K"),
        FreeParameter("ejector.motive_degassing", None, True, 1e-6, 1.0, 0.05, ""),
        FreeParameter("ejector.cutoff_width", "Pa", True, 1.0, 1e5, 500.0, "mbar", 1.0 / c.MBAR),
        FreeParameter("apparatus.volume", "m^3", True, 1e-6, 1.0, 2e-3, "L", 1e3),
        FreeParameter("feed_pump.motor_heat", "W", True, 1e-3, 1e4, 5.0, "W"),
        FreeParameter("pot.degassing_rate", "1/s", True, 1e-6, 10.0, 1.0 / 60.0, "1/s"),
        FreeParameter("tub.initial_temperature", "K", False, 200.0, 400.0, c.ZERO_CELSIUS + 20.0, "°C", 1.0, -c.ZERO_CELSIUS, 0.01),
        FreeParameter("run.ambient_temperature", "K", False, 200.0, 400.0, c.ZERO_CELSIUS + 22.0, "°C", 1.0, -c.ZERO_CELSIUS, 0.01),
    )
}


def free_parameter(key: str) -> FreeParameter:
    """The registry entry of a free key; an unknown key's error lists the valid ones."""
    try:
        return FITTABLE[key]
    except KeyError:
        raise InputError(f"--free: {key!r} cannot be fitted; valid keys: {', '.join(FITTABLE)}") from None


def pressure_sigma(pressure):
    """Default pressure uncertainty max(1 mbar, 2 % of p) [Pa] (issue 6's stated gauge uncertainty).

    Parameters
    ----------
    pressure : float or ndarray
        Absolute pressure [Pa].

    Returns
    -------
    float or ndarray
        Standard uncertainty [Pa].
    """
    p = np.asarray(pressure, dtype=float)
    return np.maximum(PRESSURE_SIGMA_FLOOR, PRESSURE_SIGMA_RELATIVE * np.abs(p))


# ---- the log as observations ------------------------------------------------------------


@dataclass(frozen=True)
class Observations:
    """The log's readings the fit compares with (SI), NaN where the log has none."""

    time_s: np.ndarray
    pressure_pa: np.ndarray | None
    boiling_temperature_k: np.ndarray | None
    tub_temperature_k: np.ndarray | None
    compound: str | None
    pressure_sigma_pa: np.ndarray | None
    temperature_sigma_k: float

    def masks(self) -> dict[str, np.ndarray]:
        """Finite readings per observable (the residual vector's blocks, in this order)."""
        out = {}
        for name in ("pressure_pa", "boiling_temperature_k", "tub_temperature_k"):
            arr = getattr(self, name)
            if arr is not None:
                ok = np.isfinite(arr)
                if name == "pressure_pa":
                    ok &= arr > 0
                if ok.any():
                    out[name] = ok
        return out


def observations_from_log(log, compound: str | None = None, *, temperature_sigma: float = TEMPERATURE_SIGMA, sigma=pressure_sigma) -> Observations:
    """Turn a RunLog (vacsim.logs.read_log) into the fit's observations.

    Parameters
    ----------
    log : RunLog
        The logged run.
    compound : str, optional
        The compound boiling at the still head, for a ``boiling_*`` column.
    temperature_sigma : float
        Thermometer uncertainty [K].
    sigma : callable
        Pressure uncertainty [Pa] as a function of pressure [Pa].

    Returns
    -------
    Observations
    """
    where = str(log.path)
    if log.boiling_temperature_k is not None and np.isfinite(log.boiling_temperature_k).any():
        if compound is None:
            raise InputError(f"{where}: the log has a boiling-temperature column ({log.columns.get('boiling')!r}); name the boiling liquid with --compound, e.g. --compound water")
        from ..properties import solvents

        compound = solvents.get_compound(compound).name
    else:
        compound = None
    p = None if log.pressure_pa is None else np.asarray(log.pressure_pa, dtype=float)
    obs = Observations(
        time_s=np.asarray(log.time_s, dtype=float),
        pressure_pa=p,
        boiling_temperature_k=None if compound is None else np.asarray(log.boiling_temperature_k, dtype=float),
        tub_temperature_k=None if log.tub_temperature_k is None else np.asarray(log.tub_temperature_k, dtype=float),
        compound=compound,
        pressure_sigma_pa=None if p is None else np.asarray(sigma(p), dtype=float),
        temperature_sigma_k=float(temperature_sigma),
    )
    if not obs.masks():
        raise InputError(f"{where}: no readings to fit (every pressure, boiling and tub cell is blank)")
    return obs


_MASS = re.compile(r"(?P<num>\d+(?:[.,]\d+)?)\s*(?P<unit>kg|g)\b", re.IGNORECASE)
_ADDING = re.compile(r"\b(add|added|adding|top|topped|more|put)\b|\+", re.IGNORECASE)


def schedule_from_events(events: list[tuple[float, str]]) -> tuple[list[dict], list[str]]:
    """Turn a log's event rows into raw schedule entries.

    Understood: ice with a mass ('ice added 1 kg', '+500 g ice'), venting ('vented',
    'vent opened'), the pump ('pump off' / 'pump stopped', 'pump on' / 'pump started').
    Anything else is a note and is returned in the second list.

    Parameters
    ----------
    events : list of (float, str)
        (time [s], text) as RunLog.events holds them.

    Returns
    -------
    (list of dict, list of str)
        Raw schedule entries (scenario-file form), and the texts that were not understood.

    Raises
    ------
    InputError
        An ice addition without its mass.
    """
    entries, ignored = [], []
    for t, text in events:
        low = text.lower()
        entry: dict[str, Any] = {}
        if re.search(r"\bice\b", low):
            m = _MASS.search(text)
            if m:
                entry["add_ice"] = f"{m['num'].replace(',', '.')} {m['unit'].lower()}"
            elif _ADDING.search(text):
                raise InputError(f"log event at {t / 60:.1f} min ({text!r}): an ice addition needs its mass, e.g. 'ice added 1 kg'")
        if re.search(r"\bvent(ed|ing)?\b", low) and not re.search(r"\b(close|closed|shut)\b", low):
            entry["vent"] = True
        if re.search(r"\bpump\s+(off|stopped)\b", low):
            entry["pump"] = "off"
        elif re.search(r"\bpump\s+(on|started)\b", low):
            entry["pump"] = "on"
        if entry:
            entries.append({"at": f"{t:.10g} s", **entry})
        else:
            ignored.append(text)
    return entries, ignored


def _initial_tub_temperature(obs: Observations) -> float | None:
    """The tub temperature at t = 0 [K]: intercept of a straight line through the early readings."""
    if obs.tub_temperature_k is None:
        return None
    ok = np.isfinite(obs.tub_temperature_k)
    t, temp = obs.time_s[ok], obs.tub_temperature_k[ok]
    if t.size == 0:
        return None
    early = t <= max(INITIAL_TEMPERATURE_WINDOW, t[min(2, t.size - 1)])
    if early.sum() < 2:
        return float(temp[0])
    slope, intercept = np.polyfit(t[early], temp[early], 1)
    return float(intercept)


def _get(scenario, key: str):
    node = scenario
    for part in key.split("."):
        node = getattr(node, part, None) if node is not None else None
    return node


def prepare_run(scenario, log_obs: Observations, events: list[tuple[float, str]], free: tuple[str, ...]) -> tuple[dict, list[str]]:
    """The raw scenario of the logged run: duration, schedule and start state from the log.

    Parameters
    ----------
    scenario : Scenario
        The rig.
    log_obs : Observations
        The log's readings (its last time is the run's duration).
    events : list of (float, str)
        The log's events (see schedule_from_events); when any is understood they replace the
        scenario's schedule, else the scenario's entries inside the log's span are kept.
    free : sequence of str
        The free keys (the initial tub temperature is only a start value when it is one).

    Returns
    -------
    (dict, list of str)
        The raw dictionary, and notes saying what was taken from the log.
    """
    from ..scenario import raw_of

    raw = raw_of(scenario)
    notes: list[str] = []
    duration = float(log_obs.time_s[-1])
    if duration <= 0:
        raise InputError("the log's last time must be after its start")
    run = dict(raw.get("run", {}))
    run["duration"] = f"{duration:.10g} s"
    run["output_interval"] = f"{min(FIT_OUTPUT_INTERVAL, duration / 4):.10g} s"
    raw["run"] = run
    entries, ignored = schedule_from_events(events)
    if entries:
        if raw.get("schedule"):
            notes.append("the log's events replace the scenario's schedule")
        raw["schedule"] = entries
        notes.append(f"{len(entries)} log event(s) became schedule entries")
    else:
        planned = raw.get("schedule", [])
        kept = [e for e, entry in zip(planned, scenario.schedule) if entry.at <= duration]
        if len(kept) < len(planned):
            notes.append(f"{len(planned) - len(kept)} schedule entries after the log's end dropped")
        if kept:
            raw["schedule"] = kept
        else:
            raw.pop("schedule", None)
    for text in ignored:
        notes.append(f"log note {text!r} not used (not an ice, vent or pump event)")
    t0 = _initial_tub_temperature(log_obs)
    if t0 is not None:
        if scenario.tub.ice > 0:
            notes.append("tub.initial_temperature kept from the scenario (ice in the tub at the start)")
        else:
            raw.setdefault("tub", {})["initial_temperature"] = f"{t0:.6f} K"
            if "tub.initial_temperature" not in free:
                notes.append(
                    f"tub.initial_temperature fitted alongside (a property of this run, not of the rig), "
                    f"from {t0 - c.ZERO_CELSIUS:.2f} °C (the log's first {INITIAL_TEMPERATURE_WINDOW / 60:.0f} min)"
                )
    return raw, notes


def nuisance_keys(scenario, obs: Observations, free) -> tuple[str, ...]:
    """Keys of this run (not of the rig) fitted alongside: the initial tub temperature when
    the log has tub readings and no ice pins it (its error would otherwise leak into UA).

    Parameters
    ----------
    scenario : Scenario
        The rig.
    obs : Observations
        The log's readings.
    free : sequence of str
        The user's free keys.

    Returns
    -------
    tuple of str
    """
    if obs.tub_temperature_k is not None and "tub_temperature_k" in obs.masks() and scenario.tub.ice == 0:
        if "tub.initial_temperature" not in free:
            return ("tub.initial_temperature",)
    return ()


# ---- the fit ----------------------------------------------------------------------------


@dataclass(frozen=True)
class Curves:
    """Simulated observables of one run at the model's own times (for plots) and at the log's."""

    time_s: np.ndarray
    pressure_pa: np.ndarray
    boiling_temperature_k: np.ndarray | None
    tub_temperature_k: np.ndarray


@dataclass(frozen=True)
class FitResult:
    """The outcome of a fit.

    Attributes
    ----------
    keys : tuple of str
        The free scenario keys, in order.
    values, stderr, start : dict of str -> float
        Fitted value, its standard error, and the start value [SI].
    correlation : ndarray
        Correlation matrix of the fitted values (keys order); NaN where not identifiable.
    nuisance : dict of str -> dict
        Properties of the logged run fitted alongside (the initial tub temperature):
        {key: {value, stderr, start}} [SI]; not part of the calibrated rig.
    residual_rms : float
        Root mean square of the weighted residuals (1 = the log scatters as much as its stated
        uncertainty).
    residual_rms_by : dict
        Unweighted rms per observable: "pressure_relative" (of ln p_sim - ln p_obs),
        "pressure_pa", "boiling_temperature_k", "tub_temperature_k" (present ones only).
    residuals : dict of str -> ndarray
        Weighted residuals per observable at the log's times (NaN where no reading).
    warnings : list of dict
        {code, message, time_s} for identifiability and fit-quality problems; those about one
        parameter also carry its "key".
    notes : list of str
        What was taken from the log (schedule, start temperature).
    n_simulations : int
        Whole simulations the fit ran.
    n_observations : int
        Residuals (readings) fitted.
    success : bool
        The optimiser met its tolerance.
    message : str
        The optimiser's message.
    stderr_scale : float
        s = sqrt(max(1, chi^2 / (m - n))), the factor applied to the standard errors.
    observations : Observations
        The log as fitted.
    fitted, initial : Curves
        Simulated observables with the fitted and the start values.
    run_scenario : Scenario
        The logged run with the fitted values (schedule and start state from the log).
    """

    keys: tuple[str, ...]
    values: dict[str, float]
    stderr: dict[str, float]
    start: dict[str, float]
    correlation: np.ndarray
    nuisance: dict[str, dict]
    residual_rms: float
    residual_rms_by: dict[str, float]
    residuals: dict[str, np.ndarray]
    warnings: list[dict]
    notes: list[str]
    n_simulations: int
    n_observations: int
    success: bool
    message: str
    stderr_scale: float
    observations: Observations
    fitted: Curves
    initial: Curves
    run_scenario: Any = field(repr=False, default=None)

    def to_dict(self) -> dict:
        """The `--json` / fit.json object (SI units)."""
        corr = {a: {b: float(self.correlation[i, j]) for j, b in enumerate(self.keys)} for i, a in enumerate(self.keys)}
        return {
            "parameters": {k: {"value": self.values[k], "stderr": self.stderr[k]} for k in self.keys},
            "correlation": corr,
            "residual_rms": self.residual_rms,
            "nuisance": {k: dict(v) for k, v in self.nuisance.items()},
            "warnings": self.warnings,
            "start": dict(self.start),
            "residual_rms_by": dict(self.residual_rms_by),
            "stderr_scale": self.stderr_scale,
            "n_simulations": self.n_simulations,
            "n_observations": self.n_observations,
            "success": self.success,
            "message": self.message,
            "notes": list(self.notes),
            "compound": self.observations.compound,
        }


class _Evaluator:
    """Residuals and a forward-difference Jacobian on whole simulations, cached by x."""

    def __init__(self, raw: dict, source: str, params: list[FreeParameter], obs: Observations, rtol: float, diff_step: float):
        self.raw, self.source, self.params, self.obs = raw, source, params, obs
        self.rtol, self.diff_step = rtol, diff_step
        self.masks = obs.masks()
        self.n_simulations = 0
        self._cache: dict[bytes, tuple[np.ndarray, Any]] = {}
        self._jac: dict[bytes, np.ndarray] = {}

    def scenario_at(self, x: np.ndarray):
        from ..scenario import build_scenario, set_key

        raw = self.raw
        for p, xi in zip(self.params, x):
            raw = set_key(raw, p.key, p.text(p.from_x(float(xi))))
        return build_scenario(raw, source=f"{self.source} (fit)")

    def _run(self, x: np.ndarray):
        key = np.asarray(x, dtype=float).tobytes()
        if key not in self._cache:
            from ..simulation import simulate

            s = self.scenario_at(x)
            result = simulate(s, rtol=self.rtol)
            self.n_simulations += 1
            self._cache[key] = (self._residuals(result), result)
        return self._cache[key]

    def curves(self, result, at=None) -> Curves:
        t = np.asarray(result.time_s, dtype=float)
        # a schedule entry appears twice (before, after): keep the state after it
        keep = np.append(t[1:] > t[:-1], True)
        t = t[keep]
        p = np.asarray(result.series["pressure_pa"], dtype=float)[keep]
        temp = np.asarray(result.series["tub_temperature_k"], dtype=float)[keep]
        if at is not None:
            p = np.exp(np.interp(at, t, np.log(np.maximum(p, 1e-300))))
            temp = np.interp(at, t, temp)
            t = np.asarray(at, dtype=float)
        boil = None
        if self.obs.compound is not None:
            from ..properties import solvents
            from ..properties._validity import quiet_ranges

            with quiet_ranges(), np.errstate(all="ignore"):
                boil = np.asarray(solvents.boiling_temperature(self.obs.compound, p), dtype=float)
        return Curves(time_s=t, pressure_pa=p, boiling_temperature_k=boil, tub_temperature_k=temp)

    def _residual_blocks(self, result) -> dict[str, np.ndarray]:
        """Weighted residuals per observable at every log time (NaN where no reading)."""
        obs = self.obs
        sim = self.curves(result, at=obs.time_s)
        out = {}
        for name, ok in self.masks.items():
            r = np.full(obs.time_s.shape, np.nan)
            if name == "pressure_pa":
                rel = obs.pressure_sigma_pa[ok] / obs.pressure_pa[ok]
                r[ok] = (np.log(sim.pressure_pa[ok]) - np.log(obs.pressure_pa[ok])) / rel
            elif name == "boiling_temperature_k":
                r[ok] = (sim.boiling_temperature_k[ok] - obs.boiling_temperature_k[ok]) / obs.temperature_sigma_k
            else:
                r[ok] = (sim.tub_temperature_k[ok] - obs.tub_temperature_k[ok]) / obs.temperature_sigma_k
            out[name] = r
        return out

    def _residuals(self, result) -> np.ndarray:
        blocks = self._residual_blocks(result)
        r = np.concatenate([blocks[name][ok] for name, ok in self.masks.items()])
        # a simulation outside a correlation's range can give NaN: a large finite residual
        return np.nan_to_num(r, nan=1e3, posinf=1e3, neginf=-1e3)

    def residuals(self, x: np.ndarray) -> np.ndarray:
        return self._run(x)[0]

    def result(self, x: np.ndarray):
        return self._run(x)[1]

    def jacobian(self, x: np.ndarray, *args) -> np.ndarray:
        key = np.asarray(x, dtype=float).tobytes()
        if key not in self._jac:
            f0 = self.residuals(x)
            jac = np.empty((f0.size, len(self.params)))
            for j, p in enumerate(self.params):
                h = self.diff_step if p.log_scale else p.step
                # step inward at an upper bound so the run stays inside the schema's limits
                if p.from_x(x[j] + h) > p.upper:
                    h = -h
                xh = np.array(x, dtype=float)
                xh[j] += h
                jac[:, j] = (self.residuals(xh) - f0) / h
            self._jac[key] = jac
        return self._jac[key]


def _covariance(jac: np.ndarray, scale2: float) -> tuple[np.ndarray, np.ndarray]:
    """Covariance of x and its correlation matrix; inf / NaN for directions the data do not fix."""
    n = jac.shape[1]
    jtj = jac.T @ jac
    d = np.sqrt(np.diag(jtj))
    cov = np.full((n, n), np.nan)
    corr = np.full((n, n), np.nan)
    live = d > 0
    if live.any():
        dl = d[live]
        scaled = jtj[np.ix_(live, live)] / np.outer(dl, dl)
        # a numerically singular matrix means some combination is not fixed at all
        if np.linalg.cond(scaled) < 1e12:
            inv = np.linalg.inv(scaled) / np.outer(dl, dl) * scale2
            cov[np.ix_(live, live)] = inv
            sd = np.sqrt(np.diag(inv))
            corr[np.ix_(live, live)] = inv / np.outer(sd, sd)
        else:
            cov[np.ix_(live, live)] = np.inf
    diag = np.diag(cov).copy()
    diag[~np.isfinite(diag)] = np.inf
    np.fill_diagonal(corr, 1.0)
    cov[np.diag_indices(n)] = diag
    return cov, corr


# a hint for pairs that correlate for a known reason
_PAIR_HINTS = {
    frozenset({"ejector.entrainment_ratio", "apparatus.leak_rate"}): (
        "the log hardly shows the pump-down, so it sees the leak only against the pump's speed at the floor "
        "(the leak-dominated range); log the first minutes every 10 s, or fix one of them"
    ),
    frozenset({"tub.ua", "feed_pump.motor_heat"}): "both only warm the tub; fix one of them",
}


_KEY_HINTS = {
    "tub.ua": "log the tub temperature for an hour or more (the room's heat shows only as the tub warms), or fix it",
    "apparatus.leak_rate": "the leak hardly lifts the floor above the fluid's vapor pressure at the gauge's resolution; measure it with a rate-of-rise test (vacsim leak) and fix it",
    "ejector.entrainment_ratio": "log the pump-down (the first minutes every 10 s), or fix it",
}


def _identifiability(keys, values, stderr, corr, units: str = "mbar") -> list[dict]:
    out = []
    for k in keys:
        se, v = stderr[k], values[k]
        p = FITTABLE[k]
        if not math.isfinite(se):
            out.append({"code": "not_identifiable", "message": f"{k}: the log does not determine it (no standard error); fix it or log more of the run", "time_s": None, "key": k})
        elif se > abs(v) and p.log_scale:
            hint = _KEY_HINTS.get(k, "fix it (leave it out of --free) or log more of the run")
            se_text, v_text = p.display_text(se, units, difference=True), p.display_text(v, units)
            out.append({"code": "not_identifiable", "message": f"{k}: standard error {se_text} is larger than the value {v_text}: the log does not determine it; {hint}", "time_s": None, "key": k})
    for i, a in enumerate(keys):
        for j in range(i + 1, len(keys)):
            b = keys[j]
            r = corr[i, j]
            if np.isfinite(r) and abs(r) > CORRELATION_LIMIT:
                hint = _PAIR_HINTS.get(frozenset({a, b}), "the log fixes only a combination of them; fix one of them")
                out.append({"code": "correlated", "message": f"{a} and {b} correlate at {r:+.3f}: {hint}", "time_s": None})
    return out


def fit_scenario(
    scenario,
    log,
    free: tuple[str, ...] | list[str] = DEFAULT_FREE,
    *,
    compound: str | None = None,
    rtol: float = FIT_RTOL,
    diff_step: float = DIFF_STEP,
    max_simulations: int = 120,
    temperature_sigma: float = TEMPERATURE_SIGMA,
    sigma=pressure_sigma,
    fit_initial_temperature: bool = True,
    units: str = "mbar",
) -> FitResult:
    """Fit free scenario parameters to a logged run.

    Parameters
    ----------
    scenario : Scenario
        The rig (vacsim.scenario.load_scenario); its values of the free keys are the start.
    log : RunLog
        The logged run (vacsim.logs.read_log); its events (ice added, vent, pump) become the
        run's schedule, its last time the run's duration, its early tub readings the initial
        tub temperature.
    free : sequence of str
        Scenario keys to fit (see FITTABLE); default DEFAULT_FREE.
    compound : str, optional
        The liquid boiling at the still head, for a ``boiling_*`` column.
    rtol : float
        Relative tolerance of every simulation.
    diff_step : float
        Forward-difference step in ln(value).
    max_simulations : int
        Budget of simulations (the optimiser stops after about this many).
    temperature_sigma : float
        Thermometer uncertainty [K].
    sigma : callable
        Pressure uncertainty [Pa] from pressure [Pa].
    fit_initial_temperature : bool
        Fit the run's initial tub temperature alongside when the log has tub readings (see
        nuisance_keys); its standard error then enters the others'.
    units : str
        Pressure display unit of the warning and note texts (mbar, torr, pa, inhg, psi):
        pressures in it, throughputs in it times L/s, temperatures in °C, as the table printed
        beside them. Values and standard errors stay SI.

    Returns
    -------
    FitResult
    """
    from scipy.optimize import least_squares

    from ..scenario import source_of

    keys = tuple(dict.fromkeys(free))
    if not keys:
        raise InputError("--free: name at least one key to fit")
    for k in keys:
        free_parameter(k)
    from ..units import PRESSURE_UNITS

    if units.lower() not in PRESSURE_UNITS:
        raise InputError(f"units: unknown pressure display unit {units!r}; expected one of {', '.join(PRESSURE_UNITS)}")
    units = units.lower()
    obs = observations_from_log(log, compound, temperature_sigma=temperature_sigma, sigma=sigma)
    raw, notes = prepare_run(scenario, obs, list(log.events), keys)
    extra = nuisance_keys(scenario, obs, keys) if fit_initial_temperature else ()
    all_keys = keys + extra
    params = [free_parameter(k) for k in all_keys]
    from ..scenario import build_scenario

    run_start = build_scenario(raw, source=source_of(scenario))

    start: dict[str, float] = {}
    for p in params:
        value = _get(run_start, p.key)
        if p.key == "tub.ua" and value is None:
            from ..model import build_rig

            value = float(build_rig(scenario).ua)
            tub = dict(raw.get("tub", {}))
            tub.pop("wall_area", None)
            tub.pop("wall_u", None)
            raw["tub"] = tub
        if p.key.startswith("pot.") and scenario.pot is None:
            raise InputError(f"--free {p.key}: the scenario has no [pot] section")
        if value is None or (p.log_scale and value <= 0):
            notes.append(f"{p.key}: the scenario gives none; start from {p.display_text(p.typical, units)}")
            value = p.typical
        start[p.key] = float(min(max(value, p.lower), p.upper))

    ev = _Evaluator(raw, source_of(scenario), params, obs, rtol, diff_step)
    x0 = np.array([p.to_x(start[p.key]) for p in params])
    lo = np.array([p.to_x(p.lower) for p in params])
    hi = np.array([p.to_x(p.upper) for p in params])
    n = len(params)
    res = least_squares(
        ev.residuals, x0, jac=ev.jacobian, bounds=(lo, hi), method="trf", x_scale=1.0,
        ftol=1e-6, xtol=1e-5, gtol=1e-8, max_nfev=max(3, max_simulations // (n + 1)),
    )
    x = res.x
    r = ev.residuals(x)
    jac = ev.jacobian(x)
    m = r.size
    chi2 = float(r @ r)
    scale2 = max(1.0, chi2 / (m - n)) if m > n else 1.0
    cov, corr = _covariance(jac, scale2)
    values = {p.key: p.from_x(float(xi)) for p, xi in zip(params, x)}
    n_free = len(keys)
    stderr = {}
    for j, p in enumerate(params):
        se_x = math.sqrt(cov[j, j]) if np.isfinite(cov[j, j]) else math.inf
        stderr[p.key] = values[p.key] * se_x if p.log_scale else se_x

    warnings = _identifiability(keys, values, stderr, corr[:n_free, :n_free], units)
    for j, p in enumerate(params):
        if x[j] <= lo[j] + 1e-4 or x[j] >= hi[j] - 1e-4:
            warnings.append({"code": "at_bound", "message": f"{p.key}: ended at its limit ({p.display_text(values[p.key], units)}); the log pushes it outside the model's range", "time_s": None, "key": p.key})
    if not res.success or res.status == 0:
        warnings.append({"code": "not_converged", "message": f"the fit stopped before converging ({res.message}); the values are the best found", "time_s": None})
    rms = math.sqrt(chi2 / m) if m else math.nan
    if rms > RESIDUAL_RMS_LIMIT:
        warnings.append({
            "code": "poor_fit",
            "message": f"the fitted run misses the log by {rms:.1f} times its stated uncertainty (rms): the model or the scenario's fixed data (volume, pump, nozzle, room) do not describe this run; see the residuals in fit.png",
            "time_s": None,
        })
    if m < 3 * n:
        warnings.append({"code": "few_readings", "message": f"{m} readings for {n} parameters: the standard errors are rough", "time_s": None})

    final = ev.result(x)
    blocks = ev._residual_blocks(final)
    sim_at = ev.curves(final, at=obs.time_s)
    by: dict[str, float] = {}
    for name, ok in ev.masks.items():
        if name == "pressure_pa":
            d = np.log(sim_at.pressure_pa[ok]) - np.log(obs.pressure_pa[ok])
            by["pressure_relative"] = float(np.sqrt(np.mean(d**2)))
            by["pressure_pa"] = float(np.sqrt(np.mean((sim_at.pressure_pa[ok] - obs.pressure_pa[ok]) ** 2)))
        else:
            d = getattr(sim_at, name)[ok] - getattr(obs, name)[ok]
            by[name] = float(np.sqrt(np.mean(d**2)))
    return FitResult(
        keys=keys,
        values={k: values[k] for k in keys},
        stderr={k: stderr[k] for k in keys},
        start={k: start[k] for k in keys},
        correlation=corr[:n_free, :n_free],
        nuisance={k: {"value": values[k], "stderr": stderr[k], "start": start[k]} for k in extra},
        residual_rms=rms,
        residual_rms_by=by,
        residuals=blocks,
        warnings=warnings,
        notes=notes,
        n_simulations=ev.n_simulations,
        n_observations=m,
        success=bool(res.success),
        message=str(res.message),
        stderr_scale=math.sqrt(scale2),
        observations=obs,
        fitted=ev.curves(final),
        initial=ev.curves(ev.result(x0)),
        run_scenario=final.scenario,
    )


# ---- the calibrated scenario file -------------------------------------------------------


def _toml_string(text: str) -> str:
    return '"' + text.replace("\\", "\\\\").replace('"', '\\"') + '"'


def _toml_value(value: Any) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, float):
        if math.isnan(value):
            return "nan"
        if math.isinf(value):
            return "inf" if value > 0 else "-inf"
        return repr(value)
    if isinstance(value, str):
        return _toml_string(value)
    return repr(value)


def undetermined_keys(fit: FitResult) -> list[str]:
    """Free keys the fit flagged as not identifiable or stuck at a limit (not written by --save)."""
    flagged = {w.get("key") for w in fit.warnings if w["code"] in ("not_identifiable", "at_bound")}
    return [k for k in fit.keys if k in flagged]


def calibrated_toml(fit: FitResult, scenario, base: str, log_name: str = "the log") -> str:
    """Text of the calibrated scenario: `base = ...`, the fitted keys with units, and `[fitted]`.

    Parameters
    ----------
    fit : FitResult
        The fit.
    scenario : Scenario
        The scenario that was fitted (the base).
    base : str
        Path of the base scenario relative to the calibrated file's folder.
    log_name : str
        The log's file name, for the header comment.

    Returns
    -------
    str
        TOML text. The `[fitted]` table maps each key to {value, stderr} in SI units. Keys the
        fit could not determine (see undetermined_keys) are left to the base and not listed.
    """
    from ..scenario import raw_of

    base_raw = raw_of(scenario)
    sections: dict[str, list[str]] = {}
    undetermined = undetermined_keys(fit)
    written = [k for k in fit.keys if k not in undetermined]
    for key in written:
        p = FITTABLE[key]
        value = fit.values[key]
        section, name = key.rsplit(".", 1)
        text = p.text(value)
        if key == "tub.ua" and "wall_area" in base_raw.get("tub", {}):
            # the base gives wall_area (+ wall_u); a file cannot unset it, so carry UA as wall_u
            area = float(scenario.tub.wall_area)
            name, text = "wall_u", f"{value / area:.10g} W/(m^2*K)"
        sections.setdefault(section, []).append(f"{name} = {_toml_value(text)}")
    lines = [
        f"# Calibrated by `vacsim fit` to {log_name}: {', '.join(written) or 'nothing'} fitted, everything else from the base.",
        f"# weighted residual rms {fit.residual_rms:.2f} over {fit.n_observations} readings, {fit.n_simulations} simulations.",
        *(f"# {k} left at the base's value: the log does not determine it (see fit.json's warnings)." for k in undetermined),
        f"base = {_toml_string(base)}",
        f"name = {_toml_string(scenario.name + '-calibrated')}",
        "",
    ]
    for section, entries in sections.items():
        lines.append(f"[{section}]")
        lines.extend(entries)
        lines.append("")
    lines.append("# value and standard error of each fitted key, SI units (read by the uncertainty analysis)")
    lines.append("[fitted]")
    for key in written:
        lines.append(f"{_toml_string(key)} = {{value = {_toml_value(float(fit.values[key]))}, stderr = {_toml_value(float(fit.stderr[key]))}}}")
    return "\n".join(lines) + "\n"


def write_calibrated(fit: FitResult, scenario, scenario_path, path, log_name: str = "the log"):
    """Write the calibrated scenario file atomically; `base` is relative to its folder.

    Parameters
    ----------
    fit : FitResult
        The fit.
    scenario : Scenario
        The scenario that was fitted.
    scenario_path : str or Path
        Its file (the calibrated file's base).
    path : str or Path
        Where to write the calibrated scenario.
    log_name : str
        The log's file name, for the header comment.

    Returns
    -------
    Path
    """
    import os
    from pathlib import Path

    from ..report.files import write_text_atomic

    path = Path(path)
    base = os.path.relpath(Path(scenario_path).resolve(), path.resolve().parent).replace(os.sep, "/")
    return write_text_atomic(path, calibrated_toml(fit, scenario, base, log_name))


# ---- synthetic logs (tests and the invented demo logs) -----------------------------------


def synthetic_log_text(
    result,
    times,
    *,
    seed: int,
    pressure: bool = True,
    tub: bool = True,
    boiling_compound: str | None = None,
    boiling_below: float | None = None,
    header_comment: str = "",
    events: dict[float, str] | None = None,
    temperature_sigma: float = TEMPERATURE_SIGMA,
) -> str:
    """An INVENTED log of a simulated run: readings at `times` with Gaussian noise.

    Noise: sigma = max(1 mbar, 2 % of p) on pressure, `temperature_sigma` on temperatures
    (fixed seed). Pressure is written in mbar, temperatures in degC.

    Parameters
    ----------
    result : RunResult
        The run that plays the truth.
    times : ndarray
        Reading times [s].
    seed : int
        numpy Generator seed.
    pressure, tub : bool
        Write a pressure_mbar / tub_degc column.
    boiling_compound : str, optional
        Write a boiling_degc column: the compound's boiling temperature at the true pressure.
    boiling_below : float, optional
        Leave the boiling cell blank while the pressure is above this [Pa] (the pot is not yet
        boiling).
    header_comment : str
        Comment lines (without '#') for the top of the file.
    events : dict of float -> str
        Event texts at times [s] (must be among `times`).

    Returns
    -------
    str
        CSV text.
    """
    from ..properties import solvents

    rng = np.random.default_rng(seed)
    t = np.asarray(times, dtype=float)
    rt = np.asarray(result.time_s, dtype=float)
    keep = np.append(rt[1:] > rt[:-1], True)
    rt = rt[keep]
    p_true = np.exp(np.interp(t, rt, np.log(result.series["pressure_pa"][keep])))
    tub_true = np.interp(t, rt, result.series["tub_temperature_k"][keep])
    noise = rng.normal(size=(3, t.size))
    cols, data = ["time_s"], [[f"{x:.0f}" if float(x).is_integer() else f"{x:.3f}" for x in t]]
    if pressure:
        p = p_true + noise[0] * pressure_sigma(p_true)
        cols.append("pressure_mbar")
        data.append([f"{v / c.MBAR:.2f}" for v in p])
    if boiling_compound is not None:
        tb = np.asarray(solvents.boiling_temperature(boiling_compound, p_true), dtype=float) + noise[1] * temperature_sigma
        cells = [f"{v - c.ZERO_CELSIUS:.2f}" for v in tb]
        if boiling_below is not None:
            cells = [cell if pt <= boiling_below else "" for cell, pt in zip(cells, p_true)]
        cols.append("boiling_degc")
        data.append(cells)
    if tub:
        cols.append("tub_degc")
        data.append([f"{v - c.ZERO_CELSIUS:.2f}" for v in tub_true + noise[2] * temperature_sigma])
    events = events or {}
    if events:
        cols.append("event")
        data.append([events.get(float(x), "") for x in t])
    lines = [f"# {line}" if line else "#" for line in header_comment.splitlines()]
    lines.append(",".join(cols))
    lines.extend(",".join(row) for row in zip(*data))
    return "\n".join(lines) + "\n"


def log_times(duration: float, pumpdown: float = 600.0, fine: float = 10.0, coarse: float = 120.0) -> np.ndarray:
    """Reading times [s]: every `fine` s through the pump-down, every `coarse` s after.

    Parameters
    ----------
    duration : float
        Length of the log [s].
    pumpdown : float
        End of the finely sampled start [s].
    fine, coarse : float
        Sampling intervals [s].

    Returns
    -------
    ndarray
    """
    a = np.arange(0.0, pumpdown, fine)
    b = np.arange(pumpdown, duration + 0.5 * coarse, coarse)
    return np.concatenate([a, b[b <= duration]])
