"""Write the invented demo wind inputs of the voyage page (run once; the CSV files are kept).

    python liftcore/data/voyage_demo_make.py

Everything here is invented: no measured data, no real ship, route or place. The numbers only
have to look like a plausible ocean trade so that the page has something to show.
"""

from pathlib import Path

import numpy as np
import pandas as pd
from scipy import stats

HERE = Path(__file__).parent
SEED = 2031

TABLE_HEAD = """\
# INVENTED demo data for liftcore (not measured; no real ship, route or sea area).
# Joint wind table: share of time at sea in each true wind condition.
# true_wind_angle_deg: relative bearing of the true wind from the bow (0 = head wind, 90 = from
#   starboard, 270 or -90 = from port, 180 = from astern); true_wind_speed_m_s at 10 m height;
# probability: share of time, summing to 1.
"""
WEIBULL_HEAD = """\
# INVENTED demo data for liftcore (not measured; no real sea area).
# Weibull wind-speed distribution per sector of true wind direction.
# sector_centre_deg: direction the wind comes FROM, degrees clockwise from north, sector centre
#   (12 sectors of 30 deg); frequency: share of time from that sector (sums to 1);
# scale_m_s, shape: Weibull c and k of the wind speed at 10 m height in that sector.
"""
SERIES_HEAD = """\
# INVENTED demo data for liftcore (not measured; no real ship, route or port).
# One invented year of hourly rows for an invented ship shuttling between invented Port A and Port B.
# time: ISO 8601 (UTC); ship_speed_kn: speed through the water (0 in port);
# ship_heading_deg: where the ship goes, clockwise from north;
# true_wind_speed_m_s at 10 m height; true_wind_direction_deg: where the wind comes FROM,
#   clockwise from north; leg: invented leg name.
"""


def table() -> pd.DataFrame:
    angles = np.arange(0, 360, 30)
    speeds = np.arange(2.0, 20.1, 2.0)
    # invented: Rayleigh-like speeds (c = 8 m/s, k = 2), more wind on the beam and quarters,
    # slightly more from starboard than from port
    edges = np.append(speeds - 1.0, np.inf)
    p_speed = np.diff(1.0 - np.exp(-(edges / 8.0) ** 2.0))
    rel = np.radians(angles)
    p_angle = 1.0 + 0.35 * np.sin(rel) ** 2 + 0.15 * np.sin(rel) - 0.1 * np.cos(rel)
    p = np.outer(p_angle, p_speed)
    p = np.round(p / p.sum(), 8)
    i = np.unravel_index(np.argmax(p), p.shape)
    p[i] += 1.0 - p.sum()
    a, v = np.meshgrid(angles, speeds, indexing="ij")
    return pd.DataFrame({"true_wind_angle_deg": a.ravel(), "true_wind_speed_m_s": v.ravel(),
                         "probability": np.round(p.ravel(), 10)})


def weibull() -> pd.DataFrame:
    centres = np.arange(0, 360, 30)
    freq = np.array([0.050, 0.045, 0.040, 0.045, 0.060, 0.075, 0.095, 0.120, 0.145, 0.135,
                     0.105, 0.085])
    freq[-1] += 1.0 - freq.sum()
    scale = np.array([7.0, 6.5, 6.0, 6.2, 6.8, 7.5, 8.4, 9.3, 10.2, 10.0, 8.8, 7.8])
    shape = np.array([1.9, 1.8, 1.8, 1.9, 2.0, 2.1, 2.2, 2.2, 2.3, 2.2, 2.1, 2.0])
    return pd.DataFrame({"sector_centre_deg": centres, "frequency": np.round(freq, 6),
                         "scale_m_s": scale, "shape": shape})


def series(year: int = 2031) -> pd.DataFrame:
    rng = np.random.default_rng(SEED)
    time = pd.date_range(f"{year}-01-01T00:00", f"{year}-12-31T23:00", freq="h")
    n = time.size
    # invented schedule: 9 days A -> B, 2 days in port, 9 days B -> A, 2 days in port
    hour = np.arange(n)
    cycle = hour % (22 * 24)
    out = cycle < 9 * 24
    back = (cycle >= 11 * 24) & (cycle < 20 * 24)
    at_sea = out | back
    heading = np.where(out, 235.0, 55.0) + 4.0 * np.sin(2 * np.pi * hour / 97.0) + rng.normal(0, 2.0, n)
    heading = np.where(at_sea, np.mod(heading, 360.0), np.where(cycle < 11 * 24, 235.0, 55.0))
    speed = np.where(at_sea, 12.0 + rng.normal(0, 0.35, n), 0.0)
    leg = np.where(out, "A to B", np.where(back, "B to A", np.where(cycle < 11 * 24, "in port B", "in port A")))
    # invented wind: AR(1) fields; speed through a Weibull quantile with a seasonal scale
    z = np.empty(n)
    d = np.empty(n)
    z[0], d[0] = 0.0, 0.0
    e1, e2 = rng.normal(size=n), rng.normal(size=n)
    for i in range(1, n):
        z[i] = 0.985 * z[i - 1] + np.sqrt(1 - 0.985 ** 2) * e1[i]
        d[i] = 0.99 * d[i - 1] + np.sqrt(1 - 0.99 ** 2) * e2[i]
    month = time.month.to_numpy()
    c = 8.5 + 2.0 * np.cos(2 * np.pi * (month - 1) / 12.0)
    u = np.clip(stats.norm.cdf(z), 1e-9, 1 - 1e-9)
    tws = c * (-np.log1p(-u)) ** (1.0 / 2.1)
    twd = np.mod(250.0 + 55.0 * d + 15.0 * np.sin(2 * np.pi * (month - 1) / 12.0), 360.0)
    return pd.DataFrame({"time": time.strftime("%Y-%m-%dT%H:%M"), "ship_speed_kn": np.round(speed, 2),
                         "ship_heading_deg": np.round(heading, 1), "true_wind_speed_m_s": np.round(tws, 2),
                         "true_wind_direction_deg": np.round(twd, 1), "leg": leg})


def write(df: pd.DataFrame, name: str, head: str) -> None:
    path = HERE / name
    with open(path, "w", newline="") as fh:
        fh.write(head)
        df.to_csv(fh, index=False, lineterminator="\n")


if __name__ == "__main__":
    write(table(), "wind_table_invented.csv", TABLE_HEAD)
    write(weibull(), "wind_weibull_invented.csv", WEIBULL_HEAD)
    write(series(), "wind_series_invented.csv", SERIES_HEAD)
