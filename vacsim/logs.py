"""Reading logged runs: a bench chemist's table of time, pressure and temperatures.

A log is a delimited text file (comma, semicolon or tab) whose header names carry the unit,
``time_s, pressure_mbar, tub_degc, event``. Everything is turned into SI on reading (s, Pa,
K), so the analyses never see a unit. The reader is tolerant of what hand-kept logs look
like (``#`` comments, blank lines and cells, decimal commas after a semicolon or tab
separator, clock times) and strict about what would silently corrupt a fit (an unknown unit,
a non-numeric cell, times that run backwards): those raise :class:`vacsim.errors.InputError`
with one line naming the file, the line number in the file (1-based) and the problem.

Unit definitions are those of :mod:`vacsim.constants` (CGPM 1954; NIST SP 811, 2008).
Gauge vacuum readings ("inches of mercury vacuum") are relative to the local barometric
pressure (NIST SP 811 sec. 7.4), so they need it given.
"""

from __future__ import annotations

import csv
import math
import re
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from . import constants as c
from .errors import InputError

# ---- the accepted headers: data, not code ----------------------------------------------

#: time columns holding numbers: unit -> seconds per unit
TIME_UNITS: dict[str, float] = {"s": 1.0, "min": 60.0, "h": 3600.0}
#: time columns holding clock times (hh:mm or hh:mm:ss)
CLOCK_HEADERS: tuple[str, ...] = ("time", "clock")
#: absolute pressure columns: unit -> pascal per unit
PRESSURE_UNITS: dict[str, float] = {
    "mbar": c.MBAR,
    "pa": 1.0,
    "kpa": 1000.0,
    "torr": c.TORR,
    "mmhg": c.MMHG,
    "inhg": c.INHG,
    "psi": c.PSI,
}
#: gauge vacuum columns (barometric minus reading): unit -> pascal per unit
VACUUM_UNITS: dict[str, float] = {"inhg": c.INHG, "mmhg": c.MMHG, "kpa": 1000.0}
#: temperature units accepted for the boiling and tub columns
TEMPERATURE_UNITS: tuple[str, ...] = ("degc", "k", "degf")
#: the temperature quantities a log may carry: header prefix -> RunLog field
TEMPERATURE_QUANTITIES: dict[str, str] = {"boiling": "boiling_temperature_k", "tub": "tub_temperature_k"}
#: free-text columns whose non-blank cells become events
EVENT_HEADERS: tuple[str, ...] = ("event", "note", "events", "notes")

_SECONDS_PER_DAY = 86400.0
_CLOCK = re.compile(r"^(?P<h>\d{1,2}):(?P<m>\d{2})(?::(?P<s>\d{2}(?:\.\d*)?))?$")


def _accepted(prefix: str, units) -> str:
    return ", ".join(f"{prefix}_{u}" for u in units)


def accepted_headers() -> str:
    """One line listing every header the reader understands (for error messages and docs)."""
    parts = [
        _accepted("time", TIME_UNITS) + ", " + " or ".join(CLOCK_HEADERS) + " (hh:mm[:ss])",
        _accepted("pressure", PRESSURE_UNITS),
        _accepted("vacuum", VACUUM_UNITS),
        _accepted("boiling", TEMPERATURE_UNITS),
        _accepted("tub", TEMPERATURE_UNITS),
        "event or note",
    ]
    return "; ".join(parts)


@dataclass(frozen=True, eq=False)
class RunLog:
    """A logged run in SI units.

    Attributes
    ----------
    time_s : ndarray
        Time since the first data row [s], strictly increasing.
    pressure_pa : ndarray or None
        Absolute pressure [Pa]; NaN where the cell was blank; None without a pressure column.
    boiling_temperature_k : ndarray or None
        Vapor (boiling) temperature at the still head [K]; NaN for blank cells.
    tub_temperature_k : ndarray or None
        Temperature of the tub fluid [K]; NaN for blank cells.
    events : list of (float, str)
        (time [s], text) for every non-blank cell of an event/note column.
    columns : dict
        Quantity name ("time", "pressure", "boiling", "tub", "event") -> the header as written
        in the file; unrecognised columns are listed under "ignored" (comma-separated).
    path : Path
        The file read.
    clock_start : str or None
        The first row's clock time as written, when the time column held clock times.
    """

    time_s: np.ndarray
    pressure_pa: np.ndarray | None = None
    boiling_temperature_k: np.ndarray | None = None
    tub_temperature_k: np.ndarray | None = None
    events: list[tuple[float, str]] = field(default_factory=list)
    columns: dict[str, str] = field(default_factory=dict)
    path: Path = Path()
    clock_start: str | None = None

    def __len__(self) -> int:
        return int(self.time_s.size)


# ---- header interpretation ----------------------------------------------------------------


def _normalise_header(text: str) -> str:
    """'Pressure (mbar)', 'pressure [mbar]', 'Tub °C' -> 'pressure_mbar', 'tub_degc'."""
    h = text.strip().lower().replace("°", "deg")
    h = re.sub(r"[\s\-\[\]\(\)/]+", "_", h)
    h = re.sub(r"_+", "_", h).strip("_")
    h = re.sub(r"_?deg_?(c|f)$", r"_deg\1", h)  # 'tub_deg_c' / 'tubdegc' -> 'tub_degc'
    return h


@dataclass(frozen=True)
class _Column:
    index: int
    header: str
    quantity: str  # time, clock, pressure, vacuum, boiling, tub, event
    unit: str


def _classify(header: str, index: int, where: str) -> _Column | None:
    """Interpret one header; None for a column the reader ignores."""
    h = _normalise_header(header)
    if h in CLOCK_HEADERS:
        return _Column(index, header, "clock", "")
    if h in EVENT_HEADERS:
        return _Column(index, header, "event", "")
    prefix, _, unit = h.partition("_")
    table = {
        "time": (TIME_UNITS, "time"),
        "pressure": (PRESSURE_UNITS, "pressure"),
        "vacuum": (VACUUM_UNITS, "vacuum"),
        "boiling": (TEMPERATURE_UNITS, "boiling"),
        "tub": (TEMPERATURE_UNITS, "tub"),
    }
    if prefix not in table:
        return None
    units, quantity = table[prefix]
    if unit not in units:
        raise InputError(
            f"{where}: column {header.strip()!r} has an unknown unit {unit or '(none)'!r}; "
            f"accepted: {_accepted(prefix, units)}"
            + (" or " + " / ".join(CLOCK_HEADERS) + " for clock times" if prefix == "time" else "")
        )
    return _Column(index, header, quantity, unit)


# ---- cells -----------------------------------------------------------------------------


def _strip_comment(line: str) -> str:
    """Drop a trailing '#' comment (a '#' inside double quotes is kept)."""
    if "#" not in line:
        return line
    quoted = False
    for i, ch in enumerate(line):
        if ch == '"':
            quoted = not quoted
        elif ch == "#" and not quoted:
            return line[:i]
    return line


def _sniff_separator(header_line: str) -> str:
    """Tab if the header has one, else semicolon, else comma."""
    for sep in ("\t", ";"):
        if sep in header_line:
            return sep
    return ","


def _number(cell: str, decimal_comma: bool, where: str, header: str) -> float:
    text = cell.strip().replace(" ", "")
    if decimal_comma:
        text = text.replace(",", ".")
    try:
        value = float(text)
    except ValueError:
        raise InputError(f"{where}: column {header.strip()!r}: {cell.strip()!r} is not a number") from None
    if not math.isfinite(value):
        raise InputError(f"{where}: column {header.strip()!r}: {cell.strip()!r} is not a finite number")
    return value


def _clock_seconds(cell: str, where: str, header: str) -> float:
    m = _CLOCK.match(cell.strip())
    if not m:
        raise InputError(
            f"{where}: column {header.strip()!r}: {cell.strip()!r} is not a clock time hh:mm or hh:mm:ss "
            "(for elapsed time name the column time_s, time_min or time_h)"
        )
    h, mnt, s = int(m["h"]), int(m["m"]), float(m["s"] or 0.0)
    if h > 23 or mnt > 59 or s >= 60.0:
        raise InputError(f"{where}: column {header.strip()!r}: {cell.strip()!r} is not a valid clock time")
    return 3600.0 * h + 60.0 * mnt + s


def _temperature_k(value: float, unit: str) -> float:
    if unit == "k":
        return value
    if unit == "degc":
        return value + c.ZERO_CELSIUS
    return (value - 32.0) * 5.0 / 9.0 + c.ZERO_CELSIUS  # degF, NIST SP 811 B.8


# ---- the reader ------------------------------------------------------------------------


def _read_lines(path: Path) -> list[str]:
    try:
        raw = path.read_bytes()
    except FileNotFoundError:
        raise InputError(f"{path}: no such log file") from None
    except OSError as exc:
        raise InputError(f"{path}: cannot read the log ({exc.strerror})") from None
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError:
        text = raw.decode("latin-1")
    return text.splitlines()


def read_log(path: str | Path, barometric_pressure: float | None = None) -> RunLog:
    """Read a logged run into SI arrays.

    Parameters
    ----------
    path : str or Path
        The log file: a header row whose names carry the unit (see :func:`accepted_headers`),
        then one row per reading. ``#`` starts a comment anywhere on a line.
    barometric_pressure : float, optional
        Local barometric pressure [Pa], needed only for gauge vacuum columns
        (``vacuum_inhg`` ...), which read barometric minus absolute pressure.

    Returns
    -------
    RunLog
        Time [s] from the first row, pressure [Pa], temperatures [K], events.

    Raises
    ------
    InputError
        One line naming the file, the line number and the problem.
    """
    path = Path(path)
    lines = _read_lines(path)

    # header: the first line that is not blank once comments are stripped
    header_no, header_line = None, ""
    for no, line in enumerate(lines, start=1):
        stripped = _strip_comment(line)
        if stripped.strip():
            header_no, header_line = no, stripped
            break
    if header_no is None:
        raise InputError(f"{path}: the log is empty (no header row)")
    sep = _sniff_separator(header_line)
    decimal_comma = sep in (";", "\t")
    headers = next(csv.reader([header_line], delimiter=sep, skipinitialspace=True))
    while headers and not headers[-1].strip():  # trailing separator
        headers.pop()
    where = f"{path}: line {header_no}"

    cols = [col for i, h in enumerate(headers) if (col := _classify(h, i, where)) is not None]
    ignored = [h.strip() for i, h in enumerate(headers) if h.strip() and all(col.index != i for col in cols)]
    by_quantity: dict[str, list[_Column]] = {}
    for col in cols:
        by_quantity.setdefault(col.quantity, []).append(col)

    time_cols = by_quantity.get("time", []) + by_quantity.get("clock", [])
    if not time_cols:
        raise InputError(
            f"{where}: no time column (expected one of {_accepted('time', TIME_UNITS)}, "
            f"or {' / '.join(CLOCK_HEADERS)} with hh:mm[:ss]); header is {header_line.strip()!r}"
        )
    for group in (("time", "clock"), ("pressure", "vacuum"), ("boiling",), ("tub",)):
        found = [col for q in group for col in by_quantity.get(q, [])]
        if len(found) > 1:
            names = ", ".join(repr(col.header.strip()) for col in found)
            raise InputError(f"{where}: more than one {group[0]} column ({names}); keep one")
    measurements = [col for q in ("pressure", "vacuum", "boiling", "tub") for col in by_quantity.get(q, [])]
    if not measurements:
        raise InputError(
            f"{where}: no measurement column (expected a pressure_*, vacuum_*, boiling_* or tub_* column; "
            f"accepted: {accepted_headers()})"
        )
    time_col = time_cols[0]
    pressure_col = (by_quantity.get("pressure") or by_quantity.get("vacuum") or [None])[0]
    if pressure_col is not None and pressure_col.quantity == "vacuum" and barometric_pressure is None:
        raise InputError(
            f"{where}: column {pressure_col.header.strip()!r} is a gauge vacuum reading (barometric minus "
            "absolute); give the barometric pressure (--barometric) to turn it into absolute pressure"
        )
    event_cols = by_quantity.get("event", [])

    times: list[float] = []
    rows: list[int] = []
    values: dict[str, list[float]] = {col.quantity: [] for col in measurements}
    events: list[tuple[float, str]] = []
    clock_start: str | None = None
    clock_first = clock_prev = None
    day_offset = 0.0
    n_cols = len(headers)

    for no in range(header_no + 1, len(lines) + 1):
        content = _strip_comment(lines[no - 1])
        if not content.strip():
            continue
        here = f"{path}: line {no}"
        cells = next(csv.reader([content], delimiter=sep, skipinitialspace=True))
        if len(cells) > n_cols:
            extra = [x for x in cells[n_cols:] if x.strip()]
            if extra:
                hint = " (a decimal comma needs ';' or tab as the separator)" if sep == "," else ""
                raise InputError(f"{here}: {len(cells)} cells but the header has {n_cols} columns{hint}")
            cells = cells[:n_cols]
        cells += [""] * (n_cols - len(cells))

        tcell = cells[time_col.index].strip()
        if not tcell:
            raise InputError(f"{here}: the time cell ({time_col.header.strip()!r}) is blank")
        if time_col.quantity == "clock":
            sec = _clock_seconds(tcell, here, time_col.header)
            if clock_first is None:
                clock_first, clock_start = sec, tcell
            elif sec + day_offset < clock_prev and clock_prev - (sec + day_offset) > _SECONDS_PER_DAY / 2:
                day_offset += _SECONDS_PER_DAY  # the log ran past midnight
            clock_prev = sec + day_offset
            t = clock_prev - clock_first
        else:
            t = _number(tcell, decimal_comma, here, time_col.header) * TIME_UNITS[time_col.unit]
        if times and t <= times[-1]:
            what = "repeats" if t == times[-1] else "goes back from"
            raise InputError(
                f"{here}: time {tcell!r} {what} the previous row (line {rows[-1]}); times must increase"
            )
        times.append(t)
        rows.append(no)

        for col in measurements:
            cell = cells[col.index].strip()
            values[col.quantity].append(
                math.nan if not cell else _number(cell, decimal_comma, here, col.header)
            )
        for col in event_cols:
            text = cells[col.index].strip()
            if text:
                events.append((t, text))

    if len(times) < 2:
        at = f"line {rows[0]}" if rows else f"line {header_no}"
        raise InputError(f"{path}: {at}: {len(times)} data row(s); a log needs at least two")

    time_s = np.asarray(times, dtype=float)
    out: dict[str, np.ndarray | None] = {}
    columns = {"time": time_col.header.strip()}
    for col in measurements:
        arr = np.asarray(values[col.quantity], dtype=float)
        columns[col.quantity if col.quantity != "vacuum" else "pressure"] = col.header.strip()
        if col.quantity == "pressure":
            out["pressure_pa"] = arr * PRESSURE_UNITS[col.unit]
        elif col.quantity == "vacuum":
            out["pressure_pa"] = barometric_pressure - arr * VACUUM_UNITS[col.unit]
        else:
            out[TEMPERATURE_QUANTITIES[col.quantity]] = _temperature_k(arr, col.unit)
    p = out.get("pressure_pa")
    if p is not None and np.any(p < 0):
        i = int(np.argmax(p < 0))
        raise InputError(
            f"{path}: line {rows[i]}: column {columns['pressure']!r} gives a negative absolute pressure"
            + (" (the vacuum reading exceeds the barometric pressure)" if pressure_col.quantity == "vacuum" else "")
        )
    if event_cols:
        columns["event"] = ", ".join(col.header.strip() for col in event_cols)
    if ignored:
        columns["ignored"] = ", ".join(ignored)
    for arr in [time_s, *out.values()]:
        arr.setflags(write=False)
    return RunLog(
        time_s=time_s,
        events=events,
        columns=columns,
        path=path,
        clock_start=clock_start,
        **out,
    )
