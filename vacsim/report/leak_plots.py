"""Figure of a rate-of-rise leak test."""

from __future__ import annotations


def plot_leak(log_time_s, pressure_pa, result, unit: str = "mbar", title: str = ""):
    """Figure of a rate-of-rise fit: the readings, the fitted curve and the leak's linear part.

    Parameters
    ----------
    log_time_s, pressure_pa : ndarray
        The log's times [s] and pressures [Pa].
    result : LeakTestResult
        The fit.
    unit : str
        Display unit for pressures.

    Returns
    -------
    matplotlib.figure.Figure
    """
    import numpy as np
    from matplotlib.figure import Figure

    from ..units import PRESSURE_LABELS, pressure_in, throughput_in

    t = np.asarray(log_time_s, float)
    p = np.asarray(pressure_pa, float)
    fine = np.linspace(result.time_origin_s, result.time_origin_s + result.duration_s, 400)
    minutes = 60.0
    fig = Figure(figsize=(7.0, 4.2), layout="constrained")
    ax = fig.add_subplot()
    ax.plot(t / minutes, pressure_in(p, unit), "o", ms=3.5, color="0.35", label="readings")
    fit_label = "fit: leak + levelling vapor" if result.model == "levelling" else "fit: straight line (leak only)"
    ax.plot(fine / minutes, pressure_in(result.pressure(fine), unit), "-", color="C0", lw=1.8, label=fit_label)
    ax.plot(
        fine / minutes,
        pressure_in(result.leak_part(fine), unit),
        "--",
        color="C3",
        lw=1.4,
        label=f"leak alone ({throughput_in(result.leak_rate_pa_m3_s, unit):.3g} {PRESSURE_LABELS[unit]} L/s)",
    )
    ax.set_xlabel("time since start [min]")
    ax.set_ylabel(f"pressure [{PRESSURE_LABELS[unit]}]")
    ax.set_title(title or "rate-of-rise test")
    ax.grid(True, alpha=0.3)
    ax.legend(loc="upper left")
    return fig
