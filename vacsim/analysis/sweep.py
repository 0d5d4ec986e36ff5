"""Parameter sweeps: run one scenario across one parameter (a line) or two (a grid).

Any numeric scenario key can be varied (`numeric_keys()` lists them: the float fields of the
scenario's sections). Values are written in the user's unit ("tub.ice=0..4 kg"), set into the
raw scenario as text, and validated by the scenario loader, so a sweep value is exactly what
the same text in a scenario file would give. Every point is validated before any simulation
runs; the runs go out through `vacsim.analysis.executor.run_many` (processes by default, any
concurrent.futures executor, e.g. a dask.distributed client's, on request; see that module).
"""

from __future__ import annotations

import csv
import difflib
import io
import itertools
import re
import types
import typing
from dataclasses import dataclass, field

import numpy as np
from pydantic import BaseModel

from ..errors import InputError, SolverError
from ..scenario import Scenario, build_scenario, read_raw, set_key

MAX_PARAMETERS = 2
DEFAULT_STEPS = 9

# Summary keys that go into sweep.csv (scalars; warnings are joined into one column).
CSV_SUMMARY_KEYS = (
    "usable_duration_s",
    "time_to_target_s",
    "usable_end_s",
    "min_pressure_pa",
    "final_pressure_pa",
    "ultimate_pressure_start_pa",
    "target_pressure_pa",
    "ice_gone_s",
    "min_tub_temperature_k",
    "max_tub_temperature_k",
    "final_tub_temperature_k",
    "motive_flow_m3_s",
    "ejector_speed_m3_s",
    "pump_heat_w",
)


# ---- which keys can vary -----------------------------------------------------------------------


def _model_of(annotation):
    """The pydantic section model behind an annotation (`Tub`, `Target | None`), else None."""
    if isinstance(annotation, type) and issubclass(annotation, BaseModel):
        return annotation
    if typing.get_origin(annotation) in (typing.Union, types.UnionType):
        models = [a for a in typing.get_args(annotation) if isinstance(a, type) and issubclass(a, BaseModel)]
        return models[0] if len(models) == 1 else None
    return None


def _is_float(annotation) -> bool:
    if typing.get_origin(annotation) is typing.Annotated:
        return _is_float(typing.get_args(annotation)[0])
    if annotation is float:
        return True
    if typing.get_origin(annotation) in (typing.Union, types.UnionType):
        args = [a for a in typing.get_args(annotation) if a is not type(None)]
        return len(args) == 1 and _is_float(args[0])
    return False


def numeric_keys() -> list[str]:
    """Every dotted scenario key a sweep can vary: the float fields of the scenario's sections."""
    keys = []
    for section, info in Scenario.model_fields.items():
        model = _model_of(info.annotation)
        if model is None:
            continue
        keys += [f"{section}.{name}" for name, f in model.model_fields.items() if _is_float(f.annotation)]
    return keys


def _field_of(key: str):
    """The pydantic field behind a dotted key 'section.name', or None."""
    section, _, name = key.partition(".")
    info = Scenario.model_fields.get(section)
    model = _model_of(info.annotation) if info is not None else None
    return model.model_fields.get(name) if model is not None else None


def _what_it_is(annotation) -> str:
    """A few words on a non-numeric field's type ('a choice (none/ethylene/propylene)')."""
    if typing.get_origin(annotation) in (typing.Union, types.UnionType):
        args = [a for a in typing.get_args(annotation) if a is not type(None)]
        if len(args) == 1:
            return _what_it_is(args[0])
    if typing.get_origin(annotation) is typing.Literal:
        choices = [str(a) for a in typing.get_args(annotation)]
        return f"a choice ({'/'.join(choices)})"
    if annotation is bool:
        return "a yes/no switch (true/false)"
    if annotation is str:
        return "a name (text)"
    if typing.get_origin(annotation) in (list, tuple) or annotation in (list, tuple):
        return "a list"
    return "not a single number"


def check_key(key: str) -> str:
    """`key` if it is a numeric scenario key; else an InputError: for a scenario key that is not
    a number (tub.glycol) what it is instead, for an unknown key close matches and the valid ones."""
    valid = numeric_keys()
    if key in valid:
        return key
    known = _field_of(key)
    if known is not None:
        raise InputError(
            f"--vary: {key!r} is not numeric, it is {_what_it_is(known.annotation)}: a sweep varies numbers; "
            f"run each setting with --set {key}=... (or vacsim compare). Numeric keys: {', '.join(valid)}"
        )
    close = difflib.get_close_matches(key, valid, n=3)
    hint = f"; did you mean {', '.join(close)}?" if close else ""
    raise InputError(f"--vary: {key!r} is not a numeric scenario key{hint} Valid keys: {', '.join(valid)}")


# ---- display units -------------------------------------------------------------------------------

#: The trade's display unit of each kind of quantity (vacsim.units.KINDS): (pint unit, label).
#: Pressures and throughputs follow the command's --units instead (see display_unit).
DISPLAY_UNITS: dict[str, tuple[str, str]] = {
    "temperature": ("degC", "°C"),
    "temperature difference": ("K", "K"),
    "volume": ("L", "L"),
    "length": ("m", "m"),
    "area": ("m^2", "m²"),
    "mass": ("kg", "kg"),
    "time": ("min", "min"),
    "volume flow": ("L/min", "L/min"),
    "speed": ("L/s", "L/s"),
    "power": ("W", "W"),
    "heat transfer coefficient": ("W/(m^2*K)", "W/(m²·K)"),
    "thermal conductance": ("W/K", "W/K"),
    "mass flow": ("g/min", "g/min"),
    "rate constant": ("1/min", "1/min"),
}
#: Lengths whose field name ends so are shown in mm (bores, nozzles, ice pieces).
MM_FIELDS = ("diameter", "piece_size")


def key_kind(key: str) -> str | None:
    """The kind of quantity a dotted scenario key holds (None: a plain number or not a key)."""
    from .uncertain import key_info

    try:
        return key_info(key).kind
    except InputError:
        return None


def display_unit(key: str, pressure_unit: str = "mbar") -> str | None:
    """The label of the unit a key's values are shown in ('°C', 'L', 'mm', 'mbar·L/s'); None
    for plain numbers."""
    from ..units import PRESSURE_LABELS

    kind = key_kind(key)
    if kind is None:
        return None
    if kind == "pressure":
        return PRESSURE_LABELS[pressure_unit.lower()]
    if kind == "throughput":
        return f"{PRESSURE_LABELS[pressure_unit.lower()]}·L/s"
    if kind == "length" and key.endswith(MM_FIELDS):
        return "mm"
    return DISPLAY_UNITS[kind][1] if kind in DISPLAY_UNITS else None


def to_display(key: str, values, pressure_unit: str = "mbar") -> np.ndarray:
    """A key's SI values [SI unit of its kind] in its display unit (display_unit)."""
    from ..units import KINDS, pressure_in, registry, throughput_in

    v = np.asarray(values, dtype=float)
    kind = key_kind(key)
    if kind is None:
        return v
    if kind == "pressure":
        return np.asarray(pressure_in(v, pressure_unit))
    if kind == "throughput":
        return np.asarray(throughput_in(v, pressure_unit))
    if kind == "length" and key.endswith(MM_FIELDS):
        return registry().Quantity(v, "m").to("mm").magnitude
    if kind not in DISPLAY_UNITS:
        return v
    return np.asarray(registry().Quantity(v, KINDS[kind][1]).to(DISPLAY_UNITS[kind][0]).magnitude, dtype=float)


def display_label(key: str, pressure_unit: str = "mbar") -> str:
    """An axis label for a key: 'tub.liquid_volume [L]', 'run.ambient_temperature [°C]'."""
    unit = display_unit(key, pressure_unit)
    return f"{key} [{unit}]" if unit else key


def format_value(value: float) -> str:
    """A grid value as a tick or table label: four significant figures, no trailing zeros."""
    return f"{value:.4g}"


# ---- parsing --vary ------------------------------------------------------------------------------

_NUMBER = re.compile(r"^\s*(?P<num>[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(?P<unit>.*?)\s*$")


@dataclass(frozen=True)
class Vary:
    """One varied key: its values as magnitudes in the user's unit (None: plain numbers)."""

    key: str
    values: tuple[float, ...]
    unit: str | None
    is_range: bool = False

    def text(self, i: int):
        """The i-th value as the raw scenario takes it ('0.5 kg', or a plain float)."""
        v = self.values[i]
        return float(v) if self.unit is None else f"{v:.12g} {self.unit}"

    @property
    def label(self) -> str:
        return f"{self.key} [{self.unit}]" if self.unit else self.key


def _split_number(text: str, where: str) -> tuple[float, str | None]:
    m = _NUMBER.match(text)
    if not m:
        raise InputError(f"{where}: expected a number with an optional unit, got {text.strip()!r}")
    unit = m["unit"].strip() or None
    return float(m["num"]), unit


def _shared_unit(units: list[str | None], where: str) -> str | None:
    given = sorted({u for u in units if u is not None})
    if len(given) > 1:
        raise InputError(f"{where}: give every value in one unit (got {', '.join(given)})")
    return given[0] if given else None


def parse_vary(text: str, steps: int | None = None, values: str | None = None) -> Vary:
    """Read one --vary: 'KEY=FROM..TO' (with `steps`), 'KEY=a,b,c', or 'KEY' with `values`.

    A unit written on one end (or value) applies to all: 'tub.ice=0..4kg', 'tub.ice=0 kg..4 kg'.

    Parameters
    ----------
    text : str
        The option's text.
    steps : int, optional
        Number of evenly spaced values across FROM..TO, ends included (default 9).
    values : str, optional
        'a,b,c': explicit values (then `text` is the key alone, or the key with a range it replaces).

    Returns
    -------
    Vary
    """
    cleaned = text.replace('"', "").replace("'", "")
    key, _, spec = cleaned.partition("=")
    key = key.strip()
    where = f"--vary {key}" if key else "--vary"
    if not key:
        raise InputError(f"--vary: expected KEY=FROM..TO, got {text!r}")
    check_key(key)
    spec = spec.strip()
    if values is not None:
        if steps is not None:
            raise InputError(f"{where}: give --steps or --values, not both")
        spec = values.replace('"', "").replace("'", "").strip()
        if not spec:
            raise InputError(f"{where}: --values is empty")
    if not spec:
        raise InputError(f"{where}: expected {key}=FROM..TO (e.g. {key}=0..4 kg) or --values a,b,c")
    if ".." in spec:
        if steps is None:
            steps = DEFAULT_STEPS
        if isinstance(steps, bool) or not isinstance(steps, int) or steps < 2:
            raise InputError(f"{where}: --steps must be at least 2 for a range, got {steps!r}")
        parts = spec.split("..")
        if len(parts) != 2 or not parts[0].strip() or not parts[1].strip():
            raise InputError(f"{where}: expected FROM..TO with both ends, got {spec!r}")
        (a, ua), (b, ub) = (_split_number(p, where) for p in parts)
        unit = _shared_unit([ua, ub], where)
        if a == b:
            raise InputError(f"{where}: empty range {spec!r} (FROM equals TO)")
        mags = tuple(float(v) for v in np.linspace(a, b, steps))
    else:
        if steps is not None:
            raise InputError(f"{where}: --steps needs a range FROM..TO")
        items = [p for p in spec.split(",")]
        if any(not p.strip() for p in items):
            raise InputError(f"{where}: empty value in {spec!r}")
        parsed = [_split_number(p, where) for p in items]
        unit = _shared_unit([u for _, u in parsed], where)
        mags = tuple(v for v, _ in parsed)
    return Vary(key=key, values=mags, unit=unit, is_range=".." in spec)


# ---- running ---------------------------------------------------------------------------------------


def _get_raw(raw: dict, dotted: str):
    node = raw
    for part in dotted.split("."):
        node = node.get(part) if isinstance(node, dict) else None
    return node


def _get(scenario: Scenario, dotted: str) -> float | None:
    node = scenario
    for part in dotted.split("."):
        node = getattr(node, part, None)
        if node is None:
            return None
    return float(node)


def _run_point(task: tuple[dict, str, tuple[str, ...]]) -> dict:
    """Worker task: build and simulate one point from its raw scenario. Returns the varied
    keys' SI values (as the loader read them) and the run summary, or the solver's (or the
    loader's) complaint."""
    from ..simulation import simulate

    raw, source, keys = task
    try:
        scenario = build_scenario(raw, source)
    except InputError as exc:
        return {"input_error": str(exc).splitlines()[0]}
    point = {k: _get(scenario, k) for k in keys}
    try:
        point.update(simulate(scenario).summary)
    except SolverError as exc:
        point["error"] = str(exc)
    return point


@dataclass
class SweepResult:
    """A finished sweep. `points` are dicts of the varied values (SI, under their dotted keys)
    and the run summary keys; `shape` is (n,) for one parameter, (n1, n2) for a grid with the
    first parameter varying slowest."""

    scenario: str
    varies: list[Vary]
    points: list[dict]
    shape: tuple[int, ...]
    si_values: list[list[float]] = field(default_factory=list)  # per parameter, SI, in order
    target_pressure_pa: float | None = None
    notes: list[str] = field(default_factory=list)  # what the sweep holds fixed that the user may not expect

    @property
    def parameters(self) -> list[str]:
        return [v.key for v in self.varies]

    def display_values(self, j: int, pressure_unit: str = "mbar") -> np.ndarray:
        """The j-th parameter's grid values in its display unit (display_unit)."""
        return to_display(self.varies[j].key, self.si_values[j], pressure_unit)

    def column(self, name: str) -> np.ndarray:
        """A summary figure over the points as floats (NaN where missing), in `shape`."""
        data = [p.get(name) for p in self.points]
        return np.array([np.nan if v is None else float(v) for v in data]).reshape(self.shape)

    def to_json(self) -> dict:
        out = {
            "scenario": self.scenario,
            "parameters": self.parameters,
            "units": {v.key: v.unit for v in self.varies},
            "values": {v.key: list(si) for v, si in zip(self.varies, self.si_values)},
            "shape": list(self.shape),
            "target_pressure_pa": self.target_pressure_pa,
            "points": self.points,
            "notes": list(self.notes),
        }
        if len(self.varies) == 1:
            out["parameter"] = self.varies[0].key
        return out

    def csv_text(self) -> str:
        """sweep.csv: the varied values (SI) and the summary scalars, one row per point."""
        buf = io.StringIO()
        writer = csv.writer(buf, lineterminator="\n")
        header = self.parameters + list(CSV_SUMMARY_KEYS) + ["warnings", "error"]
        writer.writerow(header)
        for p in self.points:
            row = []
            for k in header[: len(self.parameters) + len(CSV_SUMMARY_KEYS)]:
                v = p.get(k)
                row.append("" if v is None else f"{v:.10g}")
            row.append(" ".join(w["code"] for w in p.get("warnings", []) or []))
            row.append(p.get("error", ""))
            writer.writerow(row)
        return buf.getvalue()


_ICE_KEYS = ("tub.ice_piece_size", "tub.ice_temperature", "tub.ice_heat_transfer")


def sweep_notes(base: Scenario, keys) -> list[str]:
    """Notes on what a sweep of `keys` holds fixed that changes its meaning: a tub that grows
    while its heat-exchange (UA or wall area) stays as written, ice properties without ice."""
    keys = list(keys)
    tb = base.tub
    notes = []
    if "tub.liquid_volume" in keys and "tub.ua" not in keys and "tub.wall_area" not in keys:
        if tb.ua is not None:
            notes.append(
                f"tub.ua is held at {tb.ua:.3g} W/K while tub.liquid_volume varies: a bigger tub gets no more wall "
                "to take up room heat, so its benefit is overstated. Leave tub.ua out (the wall area is then "
                "estimated from the liquid volume) or vary tub.ua with it."
            )
        elif tb.wall_area is not None:
            notes.append(
                f"tub.wall_area is held at {tb.wall_area:.3g} m² while tub.liquid_volume varies: a bigger tub gets no "
                "more wall, so its benefit is overstated. Leave tub.wall_area out (it is then estimated from the "
                "liquid volume) or vary it with the volume."
            )
    has_ice = tb.ice > 0 or "tub.ice" in keys or any(e.add_ice for e in base.schedule)
    for key in keys:
        if key in _ICE_KEYS and not has_ice:
            notes.append(f"{key} has no effect: the scenario has no ice (tub.ice is 0 and no add_ice in the schedule).")
    return notes


def _checked_indices(v: Vary, is_range: bool) -> list[int]:
    # a range is an interval: its ends stand for it (the schema's limits are intervals too)
    n = len(v.values)
    return [0, n - 1] if is_range else list(range(n))


def prepare(raw: dict, source: str, varies: list[Vary], ranges: list[bool] | None = None) -> tuple[list[dict], tuple[int, ...]]:
    """Check the varied values before anything runs; the raw scenario of every point.

    Each parameter's values are validated alone through the scenario loader (for a range, its
    two ends), so an error names one value; the points themselves are built by the workers.
    """
    if not varies:
        raise InputError("--vary: give at least one KEY=FROM..TO")
    if len(varies) > MAX_PARAMETERS:
        raise InputError(f"--vary: at most {MAX_PARAMETERS} parameters (a grid), got {len(varies)}")
    if len({v.key for v in varies}) != len(varies):
        raise InputError("--vary: the same key twice")
    ranges = ranges if ranges is not None else [False] * len(varies)
    for v, is_range in zip(varies, ranges):
        for i in _checked_indices(v, is_range):
            try:
                build_scenario(set_key(raw, v.key, v.text(i)), source)
            except InputError as exc:
                first = str(exc).splitlines()[0]
                raise InputError(f"--vary {v.key}={v.text(i)}: {first}") from None
    raws = []
    for combo in itertools.product(*(range(len(v.values)) for v in varies)):
        r = raw
        for v, i in zip(varies, combo):
            r = set_key(r, v.key, v.text(i))
        raws.append(r)
    shape = tuple(len(v.values) for v in varies)
    return raws, shape


def run_sweep(
    scenario_path,
    varies: list[Vary],
    overrides: list[str] | tuple[str, ...] = (),
    executor=None,
    jobs: int | None = None,
    progress: bool | None = False,
) -> SweepResult:
    """Run a scenario file across one or two varied keys.

    Parameters
    ----------
    scenario_path : str or Path
        The scenario file.
    varies : list of Vary
        One (a line) or two (a grid) parameters, from parse_vary.
    overrides : list of str
        --set style 'key=value' overrides applied first.
    executor : concurrent.futures.Executor, optional
        Runs the points (e.g. a dask.distributed ``client.get_executor()``); default: a process
        pool (see vacsim.analysis.executor.run_many).
    jobs : int, optional
        Worker processes for the default pool (default: all cores; 1: in this process).
    progress : bool or None
        Progress bar on stderr (None: when stderr is a terminal).

    Returns
    -------
    SweepResult
    """
    from ..scenario import apply_overrides
    from ..simulation import target_pressure
    from .executor import run_many

    raw = apply_overrides(read_raw(scenario_path), overrides)
    source = str(scenario_path)
    base = build_scenario(raw, source)
    raws, shape = prepare(raw, source, varies, [v.is_range for v in varies])
    keys = tuple(v.key for v in varies)
    tasks = [(r, source, keys) for r in raws]
    points = list(run_many(_run_point, tasks, executor=executor, jobs=jobs, progress=progress, label=f"sweep {base.name}"))
    for point, r in zip(points, raws):
        if "input_error" in point:
            what = ", ".join(f"{k}={_get_raw(r, k)}" for k in keys)
            raise InputError(f"--vary {what}: {point['input_error']}")
    # each parameter's SI values, read off the points (first index of each axis)
    grid = np.arange(len(points)).reshape(shape)
    si_values = []
    for j, k in enumerate(keys):
        line = np.moveaxis(grid, j, 0).reshape(shape[j], -1)[:, 0]
        si_values.append([points[int(i)][k] for i in line])
    targets = {p.get("target_pressure_pa") for p in points if "error" not in p}
    target = targets.pop() if len(targets) == 1 else None
    if target is None and len(targets) == 0:
        target = target_pressure(base)
    return SweepResult(
        scenario=base.name, varies=list(varies), points=points, shape=shape, si_values=si_values,
        target_pressure_pa=target, notes=sweep_notes(base, keys),
    )
