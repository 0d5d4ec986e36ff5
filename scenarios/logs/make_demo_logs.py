"""Regenerate the invented demo logs in this folder (run: python scenarios/logs/make_demo_logs.py).

Every file written here is INVENTED demo data, produced from the stated model with a fixed
random seed; none of it is a measurement. The parameters are written into each file's
comment header so the round trip (fit the log, get the stated values back) can be quoted.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

from vacsim import constants as c
from vacsim.analysis.leak import default_sigma, rate_of_rise_model

HERE = Path(__file__).resolve().parent


def p_sat_water(temperature_k):
    """IAPWS 1992 saturation pressure (Wagner & Pruss 1993, JPCRD 22, 783, Eq. 2.5) [Pa]."""
    a = (-7.85951783, 1.84408259, -11.7866497, 22.6807411, -15.9618719, 1.80122502)
    tc, pc = c.WATER_CRITICAL_TEMPERATURE, c.WATER_CRITICAL_PRESSURE
    th = 1.0 - np.asarray(temperature_k, float) / tc
    s = a[0] * th + a[1] * th**1.5 + a[2] * th**3 + a[3] * th**3.5 + a[4] * th**4 + a[5] * th**7.5
    return pc * np.exp(tc / np.asarray(temperature_k, float) * s)


def leak_test_demo() -> None:
    # stated truth: V = 2.5 L, Q = 0.030 mbar L/s, p0 = 22 mbar, vapor dp = 6 mbar, tau = 4 min
    volume, q = 2.5e-3, 0.030 * c.MBAR * 1e-3  # m^3, Pa m^3/s
    t = np.arange(0.0, 45 * 60 + 1, 30.0)
    truth = rate_of_rise_model(t, 22.0 * c.MBAR, q / volume, 6.0 * c.MBAR, 240.0)
    rng = np.random.default_rng(20240611)
    p = truth + rng.normal(0.0, 1.0, t.size) * default_sigma(truth)
    lines = [
        "# INVENTED demo data, not a measurement: rate-of-rise log made by make_demo_logs.py",
        "# model p = p0 + (Q/V) t + dp (1 - exp(-t/tau)); known leak Q = 0.030 mbar L/s in V = 2.5 L,",
        "# p0 = 22 mbar, vapor rise dp = 6 mbar, tau = 4 min; noise sigma = max(1 mbar, 2 %), seed 20240611",
        "# try: vacsim leak scenarios/logs/leak-test-demo.csv --volume '2.5 L'",
        "time_s,pressure_mbar,event",
    ]
    for i, (ti, pi) in enumerate(zip(t, p)):
        event = "valve to pump closed" if i == 0 else ("vented" if i == t.size - 1 else "")
        lines.append(f"{ti:.0f},{pi / c.MBAR:.1f},{event}")
    (HERE / "leak-test-demo.csv").write_text("\n".join(lines) + "\n")


def _pump_down(t, tub_k, volume, speed, offset, p_start):
    """V dp/dt = -S (p - p_u(t)), p_u = p_sat(T_tub) + offset, stepped exactly per interval."""
    p = np.empty_like(t)
    p[0] = p_start
    for i in range(1, t.size):
        pu = p_sat_water(0.5 * (tub_k[i] + tub_k[i - 1])) + offset
        p[i] = pu + (p[i - 1] - pu) * np.exp(-speed * (t[i] - t[i - 1]) / volume)
    return p


def warmup_demo() -> None:
    # stated truth: V = 2.0 L, S = 0.15 L/s, floor = p_sat(T_tub) + 4 mbar, tub 12 degC + 4.0 K/h
    t = np.concatenate([np.arange(0, 600, 30.0), np.arange(600, 2 * 3600 + 1, 300.0)])
    fine = np.arange(0.0, t[-1] + 1, 5.0)
    tub_fine = 12.0 + c.ZERO_CELSIUS + 4.0 * fine / 3600.0
    p_fine = _pump_down(fine, tub_fine, 2.0e-3, 0.15e-3, 4.0 * c.MBAR, c.STANDARD_ATMOSPHERE)
    idx = np.searchsorted(fine, t)
    rng = np.random.default_rng(7)
    p = p_fine[idx] * (1 + 0.01 * rng.normal(size=t.size))
    tub = tub_fine[idx] + 0.1 * rng.normal(size=t.size)
    start = 14 * 3600 + 5 * 60
    lines = [
        "# INVENTED demo data, not a measurement: pump-down and tub warm-up made by make_demo_logs.py",
        "# model V dp/dt = -S (p - p_floor), V = 2.0 L, S = 0.15 L/s, p_floor = p_sat,water(T_tub) + 4 mbar,",
        "# tub 12.0 degC rising 4.0 K/h; noise 1 % on pressure, 0.1 K on tub; seed 7",
        "# semicolon separated with decimal commas, clock times",
        "clock;pressure_mbar;tub_degc;note",
    ]
    for i, ti in enumerate(t):
        s = int(start + ti)
        clock = f"{s // 3600:02d}:{s % 3600 // 60:02d}:{s % 60:02d}"
        note = "pump on" if i == 0 else ""
        pv = f"{p[i] / c.MBAR:.1f}".replace(".", ",")
        tv = f"{tub[i] - c.ZERO_CELSIUS:.1f}".replace(".", ",")
        lines.append(f"{clock};{pv};{tv};{note}")
    (HERE / "warmup-demo.csv").write_text("\n".join(lines) + "\n")


def warmup_gauge_demo() -> None:
    # stated truth: V = 3.0 L, S = 0.12 L/s, floor = p_sat(T_tub) + 5 mbar, ice water 2 degC + 3.0 K/h,
    # gauge reads vacuum relative to a barometer of 29.92 inHg
    baro = 29.92 * c.INHG
    t = np.arange(0.0, 90 * 60 + 1, 120.0)
    fine = np.arange(0.0, t[-1] + 1, 5.0)
    tub_fine = 2.0 + c.ZERO_CELSIUS + 3.0 * fine / 3600.0
    p_fine = _pump_down(fine, tub_fine, 3.0e-3, 0.12e-3, 5.0 * c.MBAR, baro)
    idx = np.searchsorted(fine, t)
    rng = np.random.default_rng(11)
    vac = np.maximum((baro - p_fine[idx]) / c.INHG + 0.02 * rng.normal(size=t.size), 0.0)
    tub_f = (tub_fine[idx] - c.ZERO_CELSIUS) * 9 / 5 + 32 + 0.2 * rng.normal(size=t.size)
    lines = [
        "# INVENTED demo data, not a measurement: US-gauge pump-down log made by make_demo_logs.py",
        "# model V dp/dt = -S (p - p_floor), V = 3.0 L, S = 0.12 L/s, p_floor = p_sat,water(T_tub) + 5 mbar,",
        "# ice-water tub 2.0 degC rising 3.0 K/h; vacuum gauge against a barometer of 29.92 inHg; seed 11",
        "# try: vacsim ... --barometric '29.92 inHg'",
        "time_min,vacuum_inhg,tub_degf,event",
    ]
    for i, ti in enumerate(t):
        event = "pump on with ice in the tub" if i == 0 else ""
        lines.append(f"{ti / 60:.0f},{vac[i]:.2f},{tub_f[i]:.1f},{event}")
    (HERE / "warmup-gauge-demo.csv").write_text("\n".join(lines) + "\n")


if __name__ == "__main__":
    leak_test_demo()
    warmup_demo()
    warmup_gauge_demo()
