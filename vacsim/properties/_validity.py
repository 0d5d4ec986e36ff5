"""Validity ranges live as data beside each correlation; going outside warns once."""

from __future__ import annotations

import warnings
from contextlib import contextmanager

import numpy as np


class OutOfRangeWarning(UserWarning):
    """A correlation was evaluated outside the range its source states."""


_warned: set[str] = set()


def check_range(name: str, value, low: float, high: float, unit: str = "") -> None:
    """Warn once per correlation `name` if any of `value` lies outside [low, high]."""
    if name in _warned:
        return
    v = np.asarray(value, dtype=float)
    if v.size and (np.nanmin(v) < low or np.nanmax(v) > high):
        _warned.add(name)
        warnings.warn(
            f"{name}: evaluated outside its stated range {low:g}..{high:g} {unit}".rstrip(),
            OutOfRangeWarning,
            stacklevel=3,
        )


def reset_warnings() -> None:
    """Forget which correlations have warned (for tests)."""
    _warned.clear()


@contextmanager
def quiet_ranges():
    """Silence OutOfRangeWarning inside the block, for deliberate extrapolation (tables that
    reach past a correlation's range on purpose, derived series)."""
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", OutOfRangeWarning)
        yield
