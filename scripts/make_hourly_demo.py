"""Generate the INVENTED hourly series of the demo project demo_projects/hybrid_hourly_hydrogen.toml.

Every series is invented for the demo (seeded, reproducible); none is a measurement or a forecast:

- solar: clear-sky irradiance from pvlib (Haurwitz model, solar position at an invented latitude
  on the invented coastal site), a seeded cloud cover (daily clearness with hourly noise),
  transposed to a 30-degree south-facing plane (Erbs decomposition, isotropic sky) and turned into
  output with a flat 86 % performance ratio;
- wind: a seeded autocorrelated (AR(1), hourly) wind speed with a winter-windy season, mapped to a
  Weibull distribution (shape 2) and through a generic power curve (cut-in 3 m/s, rated 12 m/s,
  cut-out 25 m/s, cubic in between);
- grid intensity: an invented profile with a seasonal shape (higher in winter), a daily shape
  (lower at midday, an evening peak) and its own seeded wind lowering it;
- price: invented, rising with the grid intensity, with seeded noise;
- electrolyser: 20 MW at full load, except an invented two-week maintenance stop in September.

Timestamps are local time with the offset in force (+01:00 in winter, +02:00 in summer, changing on
the last Sundays of March and October at 01:00 UTC).

Run: python scripts/make_hourly_demo.py [OUT.csv]   (needs pvlib: pip install pvlib)
"""

from __future__ import annotations

import sys
from pathlib import Path

import numpy as np
import pandas as pd

SEED = 20261202
YEAR = 2026
LATITUDE, LONGITUDE = 46.2, -2.4  # INVENTED site coordinates for the demo (open sea-facing coast)
SOLAR_MWP, WIND_MW, ELECTROLYSER_MW = 40.0, 50.0, 20.0
OUT = Path(__file__).resolve().parent.parent / "demo_projects" / "hybrid_hourly_hydrogen_2026.csv"


def last_sunday_utc(year: int, month: int) -> pd.Timestamp:
    day = pd.Timestamp(year=year, month=month, day=31 if month in (3, 10) else 30, hour=1, tz="UTC")
    return day - pd.Timedelta(days=(day.day_of_week + 1) % 7)


def offsets_hours(times: pd.DatetimeIndex) -> np.ndarray:
    start, end = last_sunday_utc(YEAR, 3), last_sunday_utc(YEAR, 10)
    return np.where((times >= start) & (times < end), 2, 1)


def solar_kwh(times: pd.DatetimeIndex, rng: np.random.Generator) -> np.ndarray:
    import pvlib

    position = pvlib.solarposition.get_solarposition(times, LATITUDE, LONGITUDE)
    clear = pvlib.clearsky.haurwitz(position["apparent_zenith"])["ghi"].to_numpy()
    days = len(times) // 24
    daily = np.clip(rng.beta(3.0, 1.6, size=days), 0.15, 1.0)  # seeded cloud cover: clearness per day
    hourly = np.clip(np.repeat(daily, 24) + rng.normal(0, 0.08, size=days * 24), 0.05, 1.0)
    ghi = clear * hourly
    parts = pvlib.irradiance.erbs(ghi, position["zenith"], times)
    plane = pvlib.irradiance.get_total_irradiance(
        30, 180, position["apparent_zenith"], position["azimuth"], parts["dni"], ghi, parts["dhi"]
    )
    poa = np.nan_to_num(plane["poa_global"].to_numpy(), nan=0.0).clip(min=0)
    return SOLAR_MWP * 1000.0 * poa / 1000.0 * 0.86


def power_curve_fraction(speed: np.ndarray) -> np.ndarray:
    """Generic power curve: 0 below 3 m/s, cubic to rated at 12 m/s, rated to cut-out at 25 m/s."""
    rising = (speed**3 - 3.0**3) / (12.0**3 - 3.0**3)
    return np.where(speed < 3.0, 0.0, np.where(speed < 12.0, rising, np.where(speed < 25.0, 1.0, 0.0)))


def autocorrelated(rng: np.random.Generator, n: int, phi: float) -> np.ndarray:
    noise = rng.normal(0, np.sqrt(1 - phi**2), size=n)
    z = np.empty(n)
    z[0] = rng.normal()
    for i in range(1, n):
        z[i] = phi * z[i - 1] + noise[i]
    return z


def wind_speed(times: pd.DatetimeIndex, z: np.ndarray) -> np.ndarray:
    from scipy.stats import norm

    season = 1.0 + 0.18 * np.cos(2 * np.pi * (times.day_of_year.to_numpy() - 15) / 365.0)
    uniform = norm.cdf(z)
    return 8.0 * season * (-np.log1p(-uniform)) ** (1 / 2.0)


def main(out: Path = OUT) -> None:
    rng = np.random.default_rng(SEED)
    times = pd.date_range(f"{YEAR}-01-01", periods=8760, freq="h", tz="UTC") - pd.Timedelta(
        hours=1
    )  # local midnight +01:00
    solar = solar_kwh(times, rng)
    wind = WIND_MW * 1000.0 * 0.9 * power_curve_fraction(wind_speed(times, autocorrelated(rng, len(times), 0.975)))
    offsets = offsets_hours(times)
    local_hour = (times.hour.to_numpy() + offsets) % 24
    day = times.day_of_year.to_numpy()
    grid_wind = power_curve_fraction(wind_speed(times, autocorrelated(rng, len(times), 0.98)))
    grid = (
        300.0
        + 70.0 * np.cos(2 * np.pi * (day - 15) / 365.0)
        - 90.0
        * np.clip(np.sin(np.pi * (local_hour - 7) / 12.0), 0, None)
        * (1 + 0.5 * np.sin(2 * np.pi * (day - 80) / 365.0))
        + 45.0 * np.exp(-0.5 * ((local_hour - 19) / 1.5) ** 2)
        - 120.0 * grid_wind
        + rng.normal(0, 12, size=len(times))
    ).clip(60, 520)
    price = (35.0 + 0.22 * grid + rng.normal(0, 6, size=len(times))).clip(-5, None)
    load = np.full(len(times), ELECTROLYSER_MW * 1000.0)
    local = times + pd.to_timedelta(offsets, unit="h")
    load[(local >= pd.Timestamp("2026-09-07", tz="UTC")) & (local < pd.Timestamp("2026-09-21", tz="UTC"))] = 0.0
    stamps = [f"{t:%Y-%m-%dT%H:%M}+{o:02d}:00" for t, o in zip(local.tz_localize(None), offsets, strict=False)]
    frame = pd.DataFrame(
        {
            "timestamp": stamps,
            "electrolyser [kWh]": load.round(1),
            "generation.solar [kWh]": solar.round(1),
            "generation.wind [kWh]": wind.round(1),
            "grid_intensity [g CO2e/kWh]": grid.round(1),
            "price [EUR/MWh]": price.round(2),
        }
    )
    header = (
        f"# INVENTED demo data (scripts/make_hourly_demo.py, seed {SEED}): solar, wind, grid intensity, price and load "
        "are invented, not measured.\n"
    )
    out.write_text(header + frame.to_csv(index=False, lineterminator="\n"), encoding="utf-8")
    print(
        f"wrote {out}: {len(frame)} hours; solar {solar.sum() / 1e6:.1f} GWh, wind {wind.sum() / 1e6:.1f} GWh, load "
        f"{load.sum() / 1e6:.1f} GWh, grid mean {grid.mean():.0f} g/kWh"
    )


if __name__ == "__main__":
    main(Path(sys.argv[1]) if len(sys.argv) > 1 else OUT)
