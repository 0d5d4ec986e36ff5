"""The `[uncertain]` section: one probability distribution per scenario key, and sampling them.

A scenario (or its base) may say how sure its inputs are::

    [uncertain]
    tub.ua = {normal = ["4 W/K", "0.8 W/K"]}                  # mean, standard deviation
    apparatus.leak_rate = {lognormal = ["0.01 mbar*L/s", 0.5]} # median, sigma of ln(value)
    tub.ice = {uniform = ["1 kg", "2 kg"]}                     # low, high
    hose.length = {triangular = ["0.5 m", "1.5 m", "3 m"]}     # low, mode, high

TOML reads the unquoted dotted key ``tub.ua`` as a nested table ({"tub": {"ua": ...}}); a
quoted ``"tub.ua"`` works too. Values carry units and are read with
:func:`vacsim.units.parse_quantity` using the kind of quantity the scenario key holds (taken
from the key's field in :mod:`vacsim.scenario`, e.g. tub.ua -> "thermal conductance"); the
standard deviation of a temperature is a temperature difference ("1 K"). Dimensionless keys
(ejector.entrainment_ratio) take plain numbers.

A calibrated scenario's ``[fitted]`` table, ``key = {value = ..., stderr = ...}`` in SI (what
`vacsim fit` writes), is read as normal distributions (value, stderr); a key also listed under
``[uncertain]`` keeps the ``[uncertain]`` entry.

Every distribution is truncated to the key's allowed range (e.g. UA > 0): draws are taken
through the inverse of the truncated CDF, so a wide normal on a positive quantity never gives a
negative UA, and Latin-hypercube strata stay intact.
"""

from __future__ import annotations

import difflib
import math
import types
import typing
from dataclasses import dataclass

import numpy as np
from pydantic import BaseModel

from ..errors import InputError
from ..units import KINDS, parse_quantity

#: Distribution names and the parameters each takes, in order.
DISTRIBUTIONS: dict[str, tuple[str, ...]] = {
    "normal": ("mean", "standard deviation"),
    "lognormal": ("median", "sigma of ln"),
    "uniform": ("low", "high"),
    "triangular": ("low", "mode", "high"),
}
#: Sampling designs for `sample`.
SAMPLING_METHODS = ("mc", "lhs")
#: Quantiles that bound an unbounded distribution when a finite range is needed (Morris).
RANGE_QUANTILES = (0.05, 0.95)


@dataclass(frozen=True)
class KeyInfo:
    """What a scenario key holds: its kind of quantity (None: a plain number) and allowed range."""

    key: str
    kind: str | None
    low: float  # -inf when unbounded
    high: float  # +inf when unbounded


@dataclass(frozen=True)
class Distribution:
    """One uncertain scenario key: a named distribution with SI parameters, truncated to the key's range.

    Attributes
    ----------
    key : str
        Dotted scenario key (tub.ua).
    name : str
        One of DISTRIBUTIONS.
    params : tuple of float
        The distribution's parameters in SI (lognormal: median in SI, sigma dimensionless).
    low, high : float
        The key's allowed range (the truncation), SI.
    kind : str or None
        Kind of quantity (vacsim.units.KINDS), None for dimensionless keys.
    """

    key: str
    name: str
    params: tuple[float, ...]
    low: float = -math.inf
    high: float = math.inf
    kind: str | None = None

    def _frozen(self):
        """scipy.stats frozen distribution, or None when there is no spread (a point)."""
        from scipy import stats

        p = self.params
        if self.name == "normal":
            return None if p[1] == 0 else stats.norm(loc=p[0], scale=p[1])
        if self.name == "lognormal":
            return None if p[1] == 0 else stats.lognorm(s=p[1], scale=p[0])
        if self.name == "uniform":
            return None if p[1] == p[0] else stats.uniform(loc=p[0], scale=p[1] - p[0])
        lo, mode, hi = p
        return None if hi == lo else stats.triang(c=(mode - lo) / (hi - lo), loc=lo, scale=hi - lo)

    def _point(self) -> float:
        return self.params[1] if self.name == "triangular" else self.params[0]

    def ppf(self, u) -> np.ndarray:
        """Values at probabilities `u` (0..1) of the distribution truncated to [low, high]."""
        u = np.asarray(u, dtype=float)
        dist = self._frozen()
        if dist is None:
            return np.full(u.shape, float(np.clip(self._point(), self.low, self.high)))
        c_lo = float(dist.cdf(self.low)) if np.isfinite(self.low) else 0.0
        c_hi = float(dist.cdf(self.high)) if np.isfinite(self.high) else 1.0
        if c_hi <= c_lo:
            raise InputError(f"uncertain.{self.key}: the distribution has no mass inside the key's allowed range")
        out = dist.ppf(c_lo + np.clip(u, 0.0, 1.0) * (c_hi - c_lo))
        # Open bounds (UA > 0): keep draws strictly inside.
        return np.clip(out, np.nextafter(self.low, math.inf), np.nextafter(self.high, -math.inf))

    def support(self) -> tuple[float, float]:
        """A finite range for screening designs: the support of a bounded distribution
        (uniform, triangular), the 5-95 % quantiles of an unbounded one (normal, lognormal)."""
        if self.name in ("uniform", "triangular"):
            lo, hi = self.params[0], self.params[-1]
            return float(max(lo, self.low)), float(min(hi, self.high))
        a, b = self.ppf(np.array(RANGE_QUANTILES))
        return float(a), float(b)

    def describe(self) -> str:
        """The distribution as one line of text, SI."""
        return f"{self.name}({', '.join(f'{v:.6g}' for v in self.params)})"


# ---- scenario keys: kind and range from the pydantic schema ---------------------------------


def _walk_metadata(annotation, metadata) -> tuple[list, object]:
    """Flatten a field's metadata (through Optional[...] and Annotated[...]) and find its base type."""
    items = list(metadata)
    base = annotation
    origin = typing.get_origin(annotation)
    if origin in (typing.Union, types.UnionType):
        for arg in typing.get_args(annotation):
            if arg is type(None):
                continue
            sub_items, base = _walk_metadata(arg, ())
            items.extend(sub_items)
    elif origin is typing.Annotated:
        args = typing.get_args(annotation)
        base = args[0]
        for extra in args[1:]:
            items.append(extra)
            items.extend(getattr(extra, "metadata", ()) or ())
    return items, base


def _kind_of_validator(validator) -> str | None:
    func = getattr(validator, "func", None)
    if func is None:
        return None
    if func.__name__ == "_pressure_rise":
        return "pressure"
    for cell in func.__closure__ or ():
        value = cell.cell_contents
        if isinstance(value, str) and value in KINDS:
            return value
    return None


def key_info(key: str) -> KeyInfo:
    """Kind of quantity and allowed range of a dotted scenario key (section.field).

    Raises InputError for keys that are not a numeric field of a scenario section.
    """
    from ..scenario import Scenario

    parts = key.split(".")
    if len(parts) != 2:
        raise InputError(f"uncertain: {key!r}: expected a key of the form section.field, such as tub.ua")
    section, name = parts
    sections = {n: f for n, f in Scenario.model_fields.items() if n != "schedule"}
    if section not in sections:
        close = difflib.get_close_matches(section, list(sections), n=3)
        hint = f"; did you mean {', '.join(close)}?" if close else ""
        raise InputError(f"uncertain.{key}: unknown section {section!r}{hint}")
    _, model = _walk_metadata(sections[section].annotation, ())
    if not (isinstance(model, type) and issubclass(model, BaseModel)):
        raise InputError(f"uncertain.{key}: {section} is not a section of numbers")
    if name not in model.model_fields:
        close = difflib.get_close_matches(name, list(model.model_fields), n=3)
        hint = f"; did you mean {', '.join(close)}?" if close else ""
        raise InputError(f"uncertain.{key}: unknown key{hint}")
    field = model.model_fields[name]
    items, base = _walk_metadata(field.annotation, field.metadata)
    if base is not float and base is not int:
        raise InputError(f"uncertain.{key}: not a single number (cannot be given a distribution)")
    kind = None
    low, high = -math.inf, math.inf
    for item in items:
        kind = kind or _kind_of_validator(item)
        for attr in ("gt", "ge"):
            if getattr(item, attr, None) is not None:
                low = max(low, float(getattr(item, attr)))
        for attr in ("lt", "le"):
            if getattr(item, attr, None) is not None:
                high = min(high, float(getattr(item, attr)))
    if kind == "temperature":
        low = max(low, 0.0)
    return KeyInfo(key, kind, low, high)


# ---- parsing ------------------------------------------------------------------------------


def _flatten(section: dict, prefix: str = "") -> dict[str, dict]:
    """{"tub": {"ua": {"normal": [...]}}} and {"tub.ua": {...}} alike -> {"tub.ua": {...}}."""
    out: dict[str, dict] = {}
    for name, value in section.items():
        key = f"{prefix}.{name}" if prefix else str(name)
        if not isinstance(value, dict):
            raise InputError(f"uncertain.{key}: expected a table such as {{normal = [\"4 W/K\", \"0.8 W/K\"]}}, got {value!r}")
        if any(n in DISTRIBUTIONS for n in value):
            if key in out:
                raise InputError(f"uncertain.{key}: given twice")
            out[key] = value
        else:
            for sub, entry in _flatten(value, key).items():
                if sub in out:
                    raise InputError(f"uncertain.{sub}: given twice")
                out[sub] = entry
    return out


def _value(text, kind: str | None, where: str) -> float:
    if kind is None:
        if isinstance(text, bool) or not isinstance(text, (int, float)):
            raise InputError(f"{where}: expected a plain number, got {text!r}")
        return float(text)
    return parse_quantity(text, kind, where=where)


def parse_distribution(key: str, entry: dict) -> Distribution:
    """One `[uncertain]` entry ({normal = [...]}, ...) for a key, into a Distribution (SI)."""
    info = key_info(key)
    where = f"uncertain.{key}"
    if not isinstance(entry, dict) or len(entry) != 1 or next(iter(entry)) not in DISTRIBUTIONS:
        raise InputError(f"{where}: expected exactly one of {', '.join(DISTRIBUTIONS)}, got {entry!r}")
    name, args = next(iter(entry.items()))
    wanted = DISTRIBUTIONS[name]
    if not isinstance(args, list) or len(args) != len(wanted):
        raise InputError(f"{where}: {name} takes [{', '.join(wanted)}], got {args!r}")
    kind = info.kind
    spread_kind = "temperature difference" if kind == "temperature" else kind
    if name == "normal":
        params = (_value(args[0], kind, f"{where}.normal[0]"), _value(args[1], spread_kind, f"{where}.normal[1]"))
        if params[1] < 0:
            raise InputError(f"{where}: the standard deviation must not be negative")
    elif name == "lognormal":
        median = _value(args[0], kind, f"{where}.lognormal[0]")
        sigma = _value(args[1], None, f"{where}.lognormal[1] (sigma of ln, a plain number)")
        if median <= 0 or sigma < 0:
            raise InputError(f"{where}: lognormal needs a positive median and sigma >= 0")
        params = (median, sigma)
    else:
        params = tuple(_value(a, kind, f"{where}.{name}[{i}]") for i, a in enumerate(args))
        if any(b < a for a, b in zip(params, params[1:])):
            raise InputError(f"{where}: {name} needs [{', '.join(wanted)}] in increasing order")
    dist = Distribution(key, name, tuple(float(v) for v in params), info.low, info.high, kind)
    lo, hi = (params[0], params[-1]) if name in ("uniform", "triangular") else (None, None)
    if lo is not None and (hi < info.low or lo > info.high or (hi == info.low and info.low > -math.inf)):
        raise InputError(f"{where}: the range lies outside the key's allowed values")
    return dist


def distributions_from_fit(table: dict, source: str = "fitted") -> list[Distribution]:
    """A fit's `[fitted]` table, {key: {value, stderr}} in SI, as normal distributions."""
    out = []
    for key, entry in _flatten_fit(table).items():
        where = f"{source}.{key}"
        try:
            value, stderr = float(entry["value"]), float(entry["stderr"])
        except (KeyError, TypeError, ValueError):
            raise InputError(f"{where}: expected {{value = ..., stderr = ...}} in SI, got {entry!r}") from None
        if not (math.isfinite(value) and math.isfinite(stderr)) or stderr < 0:
            raise InputError(f"{where}: value and stderr must be finite, stderr >= 0")
        info = key_info(key)
        out.append(Distribution(key, "normal", (value, stderr), info.low, info.high, info.kind))
    return out


def _flatten_fit(table: dict, prefix: str = "") -> dict[str, dict]:
    out = {}
    for name, value in table.items():
        key = f"{prefix}.{name}" if prefix else str(name)
        if isinstance(value, dict) and "value" in value:
            out[key] = value
        elif isinstance(value, dict):
            out.update(_flatten_fit(value, key))
        else:
            raise InputError(f"fitted.{key}: expected {{value = ..., stderr = ...}}, got {value!r}")
    return out


def parse_uncertain(section: dict | None, fitted: dict | None = None) -> list[Distribution]:
    """All uncertain keys of a scenario: its `[uncertain]` entries, then fitted keys not listed there.

    Parameters
    ----------
    section : dict or None
        The raw `[uncertain]` table.
    fitted : dict or None
        A raw `[fitted]` table ({key: {value, stderr}}, SI).

    Returns
    -------
    list of Distribution
        In the order given (uncertain first), one per key.
    """
    out = [parse_distribution(key, entry) for key, entry in _flatten(section or {}).items()]
    have = {d.key for d in out}
    out += [d for d in distributions_from_fit(fitted or {}) if d.key not in have]
    return out


def scenario_distributions(raw: dict, fit_file=None) -> list[Distribution]:
    """The distributions of a scenario's raw dictionary (and of a fit file's `[fitted]` table).

    Parameters
    ----------
    raw : dict
        The merged raw scenario (vacsim.scenario.read_raw / raw_of).
    fit_file : path, optional
        A TOML file with a `[fitted]` table (a calibrated scenario); its keys come after the
        scenario's own `[uncertain]` and `[fitted]` entries.
    """
    fitted = dict(raw.get("fitted") or {})
    if fit_file is not None:
        import tomllib
        from pathlib import Path

        path = Path(fit_file)
        try:
            data = tomllib.loads(path.read_text(encoding="utf-8"))
        except (OSError, tomllib.TOMLDecodeError) as exc:
            raise InputError(f"{path}: cannot read a fit file: {exc}") from None
        if "fitted" not in data:
            raise InputError(f"{path}: no [fitted] table (write one with `vacsim fit ... --save`)")
        for key, value in _flatten_fit(data["fitted"]).items():
            fitted.setdefault(key, value)
    dists = parse_uncertain(raw.get("uncertain"), fitted)
    if not dists:
        raise InputError("the scenario has no [uncertain] section (and no fitted standard errors): nothing to vary")
    return dists


# ---- sampling -----------------------------------------------------------------------------


def unit_samples(n: int, dimensions: int, seed: int | None, method: str = "mc") -> np.ndarray:
    """Points in the unit hypercube, shape (n, dimensions): plain Monte Carlo or a Latin hypercube
    (McKay, Beckman & Conover 1979, Technometrics 21, 239), reproducible with `seed`."""
    if method not in SAMPLING_METHODS:
        raise InputError(f"--method: expected one of {', '.join(SAMPLING_METHODS)}, got {method!r}")
    if n < 1:
        raise InputError(f"--samples: expected at least 1, got {n}")
    rng = np.random.default_rng(seed)
    if method == "mc":
        return rng.random((n, dimensions))
    from scipy.stats import qmc

    return qmc.LatinHypercube(d=dimensions, seed=rng).random(n)


def sample(distributions: list[Distribution], n: int, seed: int | None = 0, method: str = "mc") -> np.ndarray:
    """Draw `n` joint samples (independent keys), shape (n, len(distributions)), SI values."""
    u = unit_samples(n, len(distributions), seed, method)
    return np.column_stack([d.ppf(u[:, j]) for j, d in enumerate(distributions)]) if distributions else np.empty((n, 0))


def value_text(value: float, info_kind: str | None):
    """A sampled SI value written back into a raw scenario (a string with the SI unit, or a number)."""
    if info_kind is None:
        return float(value)
    return f"{float(value)!r} {KINDS[info_kind][1]}"
