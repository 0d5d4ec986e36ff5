"""Scenario files: the rig (intrinsic data) and the run (schedule), typed and validated.

A scenario is a TOML file with units written as strings ("25 mbar", "4 L/min"). Loading turns
every quantity into SI once, here; nothing below this module sees a unit. `base = "other.toml"`
inherits another file and overrides its keys; `overrides` (the CLI's --set) change single
dotted keys. Unknown keys are errors, never silent defaults.
"""

from __future__ import annotations

import copy
import difflib
import tomllib
from pathlib import Path
from typing import Annotated, Any, Literal

from pydantic import BaseModel, BeforeValidator, ConfigDict, Field, PrivateAttr, ValidationError, ValidationInfo, model_validator

from . import constants as c
from .errors import InputError
from .units import barometric_pressure_at_altitude, parse_quantity


def _quantity(kind: str):
    def convert(value: Any, info: ValidationInfo) -> float:
        baro = (info.context or {}).get("barometric_pressure")
        return parse_quantity(value, kind, where=None, barometric_pressure=baro)

    return BeforeValidator(convert)


def _pressure_rise(value: Any) -> float:
    """A pump's pressure rise: a gauge reading ('100 psig') is a rise, so 'g' is accepted."""
    if isinstance(value, str):
        text = value.strip()
        for unit in ("psig", "barg", "kPag", "MPag"):
            if text.endswith(unit):
                text = text[: -1]
                break
        value = text
    return parse_quantity(value, "pressure", where=None)


def _fraction(value: Any) -> float:
    """A mass fraction as 0.3 or '30 %' / '30 wt%'."""
    if isinstance(value, str):
        text = value.strip().replace("wt", "").strip()
        if text.endswith("%"):
            try:
                return float(text[:-1]) / 100.0
            except ValueError:
                pass
        raise ValueError(f"expected a mass fraction such as 0.3 or '30 %', got {value!r}")
    return value


Pressure = Annotated[float, _quantity("pressure")]
PressureRise = Annotated[float, BeforeValidator(_pressure_rise)]
Temperature = Annotated[float, _quantity("temperature")]
Volume = Annotated[float, _quantity("volume"), Field(gt=0)]
Length = Annotated[float, _quantity("length"), Field(gt=0)]
Area = Annotated[float, _quantity("area"), Field(gt=0)]
Mass = Annotated[float, _quantity("mass"), Field(ge=0)]
Time = Annotated[float, _quantity("time"), Field(ge=0)]
Duration = Annotated[float, _quantity("time"), Field(gt=0)]
Flow = Annotated[float, _quantity("volume flow"), Field(ge=0)]
Speed = Annotated[float, _quantity("speed"), Field(ge=0)]
Throughput = Annotated[float, _quantity("throughput"), Field(ge=0)]
Power = Annotated[float, _quantity("power"), Field(ge=0)]
Conductance = Annotated[float, _quantity("thermal conductance"), Field(gt=0)]
HeatTransfer = Annotated[float, _quantity("heat transfer coefficient"), Field(gt=0)]
RateConstant = Annotated[float, _quantity("rate constant"), Field(ge=0)]
MassFraction = Annotated[float, BeforeValidator(_fraction), Field(ge=0.0, le=0.6)]


class _Section(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True)


class Run(_Section):
    """How long, in what room, at what air pressure, and how finely to record."""

    duration: Duration
    ambient_temperature: Temperature = c.ZERO_CELSIUS + 22.0
    barometric_pressure: Pressure | None = None
    altitude: Annotated[float, _quantity("length")] | None = None
    output_interval: Duration = 10.0
    relative_tolerance: Annotated[float, Field(gt=0, le=1e-2)] = 1e-6


class Apparatus(_Section):
    """The evacuated glassware (flask, still head, condenser, receiver, trap) as one volume."""

    volume: Volume
    leak_rate: Throughput = 0.0
    initial_pressure: Pressure | None = None


class Hose(_Section):
    """The vacuum hose from the apparatus to the ejector's suction port."""

    inner_diameter: Length
    length: Length


class FeedPump(_Section):
    """The pump that drives the working fluid from the tub through the nozzle."""

    curve: Literal["linear", "quadratic", "table"] = "linear"
    shutoff_pressure: PressureRise | None = None
    free_flow: Annotated[Flow, Field(gt=0)] | None = None
    points: list[tuple[Annotated[float, _quantity("volume flow")], PressureRise]] | None = None
    motor_heat: Power = 0.0

    @model_validator(mode="after")
    def _curve_data(self):
        if self.curve == "table":
            if not self.points or len(self.points) < 2:
                raise ValueError("curve = 'table' needs points = [[flow, pressure rise], ...] (two or more)")
            flows = [q for q, _ in self.points]
            if any(b <= a for a, b in zip(flows, flows[1:])):
                raise ValueError("points: flows must increase")
        elif self.shutoff_pressure is None or self.free_flow is None:
            raise ValueError(f"curve = '{self.curve}' needs shutoff_pressure and free_flow")
        return self


class Ejector(_Section):
    """The liquid-jet gas pump. Either the momentum model (area_ratio, entrainment_ratio) or a
    measured dry-air speed curve (measured, measured_at)."""

    nozzle_diameter: Length
    area_ratio: Annotated[float, Field(gt=0.05, lt=0.8)] = 0.25
    entrainment_ratio: Annotated[float, Field(gt=0, le=5)] = 1.0
    measured: list[tuple[Pressure, Speed]] | None = None
    measured_at: Temperature | None = None
    nozzle_loss: Annotated[float, Field(ge=0, le=2)] = 0.05
    throat_loss: Annotated[float, Field(ge=0, le=2)] = 0.10
    diffuser_loss: Annotated[float, Field(ge=0, le=2)] = 0.10
    diffuser_area_ratio: Annotated[float, Field(gt=0, le=1)] = 0.20
    cutoff_width: Annotated[Pressure, Field(gt=0)] = 500.0
    motive_degassing: Annotated[float, Field(ge=0, le=1)] = 0.05

    @model_validator(mode="after")
    def _measured(self):
        if self.measured is not None:
            if self.measured_at is None:
                raise ValueError("measured needs measured_at (the water temperature of the measurement)")
            if len(self.measured) < 2:
                raise ValueError("measured needs two or more [pressure, speed] points")
            ps = [p for p, _ in self.measured]
            if any(b <= a for a, b in zip(ps, ps[1:])):
                raise ValueError("measured: pressures must increase")
        return self


class Tub(_Section):
    """The reservoir of working fluid, its heat exchange with the room, and its ice."""

    liquid_volume: Volume
    initial_temperature: Temperature | None = None
    glycol: Literal["none", "ethylene", "propylene"] = "none"
    glycol_mass_fraction: MassFraction = 0.0
    ua: Conductance | None = None
    wall_area: Area | None = None
    wall_u: HeatTransfer | None = None
    ice: Mass = 0.0
    ice_piece_size: Length = 0.025
    ice_temperature: Temperature = c.ZERO_CELSIUS
    ice_heat_transfer: HeatTransfer | None = None
    capacity: Volume | None = None

    @model_validator(mode="after")
    def _consistent(self):
        if self.ua is not None and self.wall_area is not None:
            raise ValueError("give either ua or wall_area (+ wall_u), not both")
        if self.wall_u is not None and self.wall_area is None:
            raise ValueError("wall_u needs wall_area")
        if self.glycol == "none" and self.glycol_mass_fraction > 0:
            raise ValueError("glycol_mass_fraction > 0 needs glycol = 'ethylene' or 'propylene'")
        if self.ice_temperature > c.ZERO_CELSIUS + 1e-9:
            raise ValueError("ice_temperature must be at or below 0 degC")
        return self


class Target(_Section):
    """The pressure the distillation needs: given directly, from the compound's boiling (head)
    temperature, or from a limit on the pot temperature (the pot boils at the compound's
    boiling point at the apparatus pressure)."""

    pressure: Pressure | None = None
    compound: str | None = None
    boiling_temperature: Temperature | None = None
    pot_temperature: Temperature | None = None

    @model_validator(mode="after")
    def _one_way(self):
        by_compound = self.boiling_temperature is not None or self.pot_temperature is not None
        if self.pressure is not None and by_compound:
            raise ValueError("give either pressure or compound + boiling_temperature (or pot_temperature)")
        if self.boiling_temperature is not None and self.pot_temperature is not None:
            raise ValueError("give boiling_temperature or pot_temperature, not both")
        if self.pressure is None and (self.compound is None or not by_compound):
            raise ValueError("needs pressure, or compound and boiling_temperature (or pot_temperature)")
        return self


class Pot(_Section):
    """The distillation pot: what boils, how fast, and the air dissolved in its charge."""

    compound: str | None = None
    liquid_volume: Volume | None = None
    temperature: Temperature | None = None
    heat_input: Power | None = None
    boil_up_rate: Annotated[float, _quantity("mass flow"), Field(ge=0)] | None = None
    charge: Annotated[Mass, Field(gt=0)] | None = None
    degassing_rate: RateConstant | None = None
    air_saturated: bool = True

    @model_validator(mode="after")
    def _boil(self):
        if self.heat_input is not None and self.boil_up_rate is not None:
            raise ValueError("give boil_up_rate or heat_input, not both")
        return self


class Condenser(_Section):
    """The condenser over the pot: its coolant and what it is meant to condense."""

    coolant_temperature: Temperature
    distillate: str | None = None


class Trap(_Section):
    """A cold trap between condenser and pump."""

    temperature: Temperature


class ScheduleEntry(_Section):
    """Something that happens at a time during the run."""

    at: Time
    add_ice: Mass | None = None
    ambient_temperature: Temperature | None = None
    pump: Literal["on", "off"] | None = None
    vent: bool | None = None
    coolant_temperature: Temperature | None = None

    @model_validator(mode="after")
    def _does_something(self):
        if all(getattr(self, k) is None for k in ("add_ice", "ambient_temperature", "pump", "vent", "coolant_temperature")):
            raise ValueError("a schedule entry needs add_ice, ambient_temperature, pump, vent or coolant_temperature")
        return self


class Scenario(_Section):
    """A rig and a run. All quantities SI."""

    name: Annotated[str, Field(min_length=1, pattern=r"^[A-Za-z0-9._-]+$")]
    description: str = ""
    run: Run
    apparatus: Apparatus
    hose: Hose
    feed_pump: FeedPump
    ejector: Ejector
    tub: Tub
    target: Target | None = None
    pot: Pot | None = None
    condenser: Condenser | None = None
    trap: Trap | None = None
    schedule: list[ScheduleEntry] = []
    uncertain: dict[str, Any] | None = None  # raw; validated by vacsim.analysis.uncertain
    fitted: dict[str, Any] | None = None  # written by `vacsim fit --save`: {key: {value, stderr}} in SI
    _raw: dict = PrivateAttr(default_factory=dict)
    _source: str = PrivateAttr(default="scenario")

    @model_validator(mode="after")
    def _run_checks(self):
        if self.run.barometric_pressure is not None and self.run.altitude is not None:
            raise ValueError("run: give either barometric_pressure or altitude")
        for i, entry in enumerate(self.schedule):
            if entry.at > self.run.duration:
                raise ValueError(f"schedule[{i}].at is after the end of the run")
            if entry.coolant_temperature is not None and self.condenser is None:
                raise ValueError(f"schedule[{i}].coolant_temperature needs a [condenser] section")
        if self.pot is not None and (self.pot.boil_up_rate or self.pot.heat_input) and self.distillate is None:
            raise ValueError("pot: boil-up needs a compound (pot.compound, condenser.distillate or target.compound)")
        return self

    @property
    def distillate(self) -> str | None:
        """The compound that boils up and should condense: condenser.distillate, else the
        pot's compound, else the target compound."""
        for name in (
            self.condenser.distillate if self.condenser else None,
            self.pot.compound if self.pot else None,
            self.target.compound if self.target else None,
        ):
            if name:
                return name
        return None

    @property
    def barometric_pressure(self) -> float:
        """Local barometric pressure [Pa]."""
        return _barometric(self.run.barometric_pressure, self.run.altitude)

    @property
    def initial_pressure(self) -> float:
        """Apparatus pressure at the start [Pa]."""
        p0 = self.apparatus.initial_pressure
        return self.barometric_pressure if p0 is None else p0

    @property
    def initial_tub_temperature(self) -> float:
        """Tub temperature at the start [K] (ambient unless given)."""
        t0 = self.tub.initial_temperature
        return self.run.ambient_temperature if t0 is None else t0


def _barometric(barometric_pressure: float | None, altitude: float | None) -> float:
    if barometric_pressure is not None:
        return barometric_pressure
    if altitude is not None:
        return barometric_pressure_at_altitude(altitude)
    return c.STANDARD_ATMOSPHERE


# ---- loading -------------------------------------------------------------------------------


# Sections whose keys are alternatives (pressure | compound + temperature): a file that gives
# the section replaces its base's section whole instead of merging into it.
_REPLACED_WHOLE = {"target"}


def _deep_merge(base: dict, over: dict) -> dict:
    out = copy.deepcopy(base)
    for key, value in over.items():
        if isinstance(value, dict) and isinstance(out.get(key), dict) and key not in _REPLACED_WHOLE:
            out[key] = _deep_merge(out[key], value)
        else:
            out[key] = copy.deepcopy(value)
    return out


def read_raw(path: str | Path, _seen: tuple[Path, ...] = ()) -> dict:
    """The scenario's merged raw dictionary (base files resolved), quantities still as text."""
    path = Path(path)
    if not path.is_file():
        raise InputError(f"{path}: no such scenario file")
    resolved = path.resolve()
    if resolved in _seen:
        raise InputError(f"{path}: base files include each other")
    try:
        data = tomllib.loads(path.read_text(encoding="utf-8"))
    except tomllib.TOMLDecodeError as exc:
        raise InputError(f"{path}: not valid TOML: {exc}") from None
    except UnicodeDecodeError:
        raise InputError(f"{path}: not a UTF-8 text file") from None
    base = data.pop("base", None)
    if base is not None:
        if not isinstance(base, str):
            raise InputError(f"{path}: base: expected a file name, got {base!r}")
        parent = read_raw(path.parent / base, _seen + (resolved,))
        data = _deep_merge(parent, data)
    return data


def parse_override(text: str) -> tuple[str, Any]:
    """'tub.ice=3 kg' -> ('tub.ice', '3 kg'); the value is read as TOML when it can be."""
    if "=" not in text:
        raise InputError(f"--set: expected KEY=VALUE, got {text!r}")
    key, value = (part.strip() for part in text.split("=", 1))
    if not key:
        raise InputError(f"--set: expected KEY=VALUE, got {text!r}")
    try:
        parsed = tomllib.loads(f"v = {value}")["v"]
    except tomllib.TOMLDecodeError:
        parsed = value.strip("'\"")
    return key, parsed


def set_key(raw: dict, dotted: str, value: Any) -> dict:
    """A copy of `raw` with one dotted key set (sections are created as needed)."""
    out = copy.deepcopy(raw)
    node = out
    parts = dotted.split(".")
    for part in parts[:-1]:
        nxt = node.setdefault(part, {})
        if not isinstance(nxt, dict):
            raise InputError(f"--set {dotted}: {part} is not a section")
        node = nxt
    node[parts[-1]] = value
    return out


def _format_loc(loc: tuple) -> str:
    out = ""
    for part in loc:
        if isinstance(part, int):
            out += f"[{part}]"
        elif part in ("function-after", "function-before") or str(part).startswith(("function-", "tagged-union")):
            continue
        else:
            out += ("." if out else "") + str(part)
    return out or "(top level)"


def _format_error(source: str, err: dict) -> str:
    loc = _format_loc(tuple(p for p in err["loc"] if not (isinstance(p, str) and p.startswith(("function-", "lax-", "nullable", "list[", "tuple[")) )))
    msg = err["msg"].removeprefix("Value error, ")
    if err["type"] == "extra_forbidden":
        return f"{source}: {loc}: unknown key{_close_key_hint(err['loc'])}"
    if err["type"] == "missing":
        return f"{source}: {loc}: missing (required)"
    if err["type"].startswith(("greater_than", "less_than")):
        return f"{source}: {loc}: {msg.lower()} (got {err.get('input')!r})"
    if err["type"] in ("float_parsing", "float_type"):
        return f"{source}: {loc}: expected a plain number (dimensionless, no unit), got {err.get('input')!r}"
    if err["type"] == "string_pattern_mismatch" and loc == "name":
        return f"{source}: name: use letters, digits, '.', '_' or '-' only (it names the results folder), got {err.get('input')!r}"
    return f"{source}: {loc}: {msg}"


def _close_key_hint(loc: tuple) -> str:
    section_models = {
        "run": Run, "apparatus": Apparatus, "hose": Hose, "feed_pump": FeedPump, "ejector": Ejector,
        "tub": Tub, "target": Target, "schedule": ScheduleEntry, "pot": Pot, "condenser": Condenser, "trap": Trap,
    }
    names = [p for p in loc if isinstance(p, str)]
    model = section_models.get(names[0]) if len(names) > 1 else Scenario
    if model is None:
        return ""
    close = difflib.get_close_matches(names[-1], list(model.model_fields), n=3)
    return f"; did you mean {', '.join(close)}?" if close else f" (valid: {', '.join(model.model_fields)})"


def build_scenario(raw: dict, source: str = "scenario") -> Scenario:
    """Validate a raw dictionary into a Scenario; errors name the source, key and problem."""
    run = raw.get("run", {}) if isinstance(raw.get("run"), dict) else {}
    try:
        baro = _barometric(
            parse_quantity(run["barometric_pressure"], "pressure", where="run.barometric_pressure") if "barometric_pressure" in run else None,
            parse_quantity(run["altitude"], "length", where="run.altitude") if "altitude" in run else None,
        )
    except InputError as exc:
        raise InputError(f"{source}: {exc}") from None
    try:
        scenario = Scenario.model_validate(raw, context={"barometric_pressure": baro})
    except ValidationError as exc:
        lines = [_format_error(source, e) for e in exc.errors()]
        raise InputError("\n".join(dict.fromkeys(lines))) from None
    _check_physics(scenario, source)
    scenario._raw = copy.deepcopy(raw)
    scenario._source = source
    return scenario


def _check_physics(s: Scenario, source: str) -> None:
    """Cross-field checks that need the property library."""
    from .properties import fluid, solvents

    t_freeze = float(fluid.freezing_point(s.tub.glycol, s.tub.glycol_mass_fraction))
    t0 = s.initial_tub_temperature
    if t0 < t_freeze - 0.05 and s.tub.ice == 0:
        raise InputError(
            f"{source}: tub.initial_temperature: {t0 - c.ZERO_CELSIUS:.1f} degC is below the fluid's freezing point "
            f"({t_freeze - c.ZERO_CELSIUS:.1f} degC) and there is no ice: it would be frozen"
        )
    if s.tub.ice > 0 and t0 < t_freeze - 0.05:
        raise InputError(
            f"{source}: tub.initial_temperature: {t0 - c.ZERO_CELSIUS:.1f} degC is below the freezing point "
            f"({t_freeze - c.ZERO_CELSIUS:.1f} degC) of the fluid: ice and liquid would not both be there"
        )
    if s.ejector.measured is not None:
        from .components.ejector import MEASURED_MARGIN

        pv_meas = float(fluid.vapor_pressure("none", 0.0, s.ejector.measured_at))
        lowest = s.ejector.measured[0][0]
        if lowest <= MEASURED_MARGIN * pv_meas:
            raise InputError(
                f"{source}: ejector.measured: the lowest point ({lowest / 100:.1f} mbar) is too close to the vapor pressure of "
                f"water at measured_at ({pv_meas / 100:.1f} mbar) to give the jet's total speed; use points above "
                f"{MEASURED_MARGIN * pv_meas / 100:.1f} mbar"
            )
    if s.initial_pressure > s.barometric_pressure * 1.2:
        raise InputError(f"{source}: apparatus.initial_pressure: above barometric; vacsim models evacuation only")
    for where, name in (
        ("target.compound", s.target.compound if s.target else None),
        ("pot.compound", s.pot.compound if s.pot else None),
        ("condenser.distillate", s.condenser.distillate if s.condenser else None),
    ):
        if name is not None:
            try:
                solvents.get_compound(name)
            except InputError as exc:
                raise InputError(f"{source}: {where}: {exc}") from None
    distillate = s.distillate
    if distillate is not None:
        comp = solvents.get_compound(distillate)
        corr = comp.vapor_pressure
        for where, temp in (
            ("pot.temperature", s.pot.temperature if s.pot else None),
            ("condenser.coolant_temperature", s.condenser.coolant_temperature if s.condenser else None),
            ("trap.temperature", s.trap.temperature if s.trap else None),
        ):
            if temp is not None and not corr.t_min - 60.0 <= temp < corr.t_max:
                raise InputError(
                    f"{source}: {where}: {temp - c.ZERO_CELSIUS:.1f} degC is outside what the vapor-pressure data of {comp.name} "
                    f"cover ({corr.t_min - c.ZERO_CELSIUS:.0f} to {corr.t_max - c.ZERO_CELSIUS:.0f} degC, the top is its critical point)"
                )


def load_scenario(path: str | Path, overrides: list[str] | tuple[str, ...] = ()) -> Scenario:
    """Read, merge (base =) and validate a scenario file; apply --set style overrides.

    Parameters
    ----------
    path : str or Path
        The TOML file.
    overrides : list of str
        'dotted.key=value' strings, applied after the file and its bases.

    Returns
    -------
    Scenario
    """
    raw = apply_overrides(read_raw(path), overrides)
    try:
        return build_scenario(raw, source=str(path))
    except InputError as exc:
        # blame --set, not the file, for a key the command line set
        keys = {parse_override(text)[0] for text in overrides}
        lines = [
            line.replace(f"{path}: ", f"{path} (--set): ", 1) if any(f": {k}:" in line for k in keys) else line
            for line in str(exc).splitlines()
        ]
        raise InputError("\n".join(lines)) from None


def apply_overrides(raw: dict, overrides) -> dict:
    """A copy of `raw` with each 'dotted.key=value' override (the CLI's --set) applied in order."""
    for text in overrides:
        key, value = parse_override(text)
        raw = set_key(raw, key, value)
    return raw


def raw_of(scenario: Scenario) -> dict:
    """The raw dictionary a scenario was built from (for sweeps, fits, saved variants)."""
    return copy.deepcopy(scenario._raw)


def source_of(scenario: Scenario) -> str:
    """The file (or label) a scenario came from."""
    return scenario._source
