"""Voyage at scale: 20 years of hourly rows (175,200) with 4 rotors, in memory and on Dask.

Builds the series by repeating the invented demo year with the years shifted, writes it to a
temporary CSV and runs the same tally three ways, side by side in one run:

* streamed from the file in blocks in this process (bounded memory),
* on a local Dask cluster (2 worker processes on 127.0.0.1, started and closed here; the
  cluster start is timed separately),
and checks that both give the same mean net power gain. Prints seconds and rows per second.

    python -m benchmarks            # every benchmark
    python benchmarks/bench_voyage.py
"""

from __future__ import annotations

import os
import resource
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

YEARS = 20
ROTORS = 4


def build_series(path: Path, years: int = YEARS) -> int:
    """Write ``years`` copies of the invented demo year (times shifted) to ``path``; return rows."""
    import pandas as pd

    from liftcore.studies.voyage import DEMO_FILES

    year = pd.read_csv(DEMO_FILES["series"], comment="#")
    t0 = pd.to_datetime(year["time"])
    rows = 0
    with open(path, "w", newline="") as fh:
        fh.write("# INVENTED benchmark series: the invented demo year repeated\n")
        for y in range(years):
            part = year.copy()
            part["time"] = (t0 + pd.DateOffset(years=y)).dt.strftime("%Y-%m-%dT%H:%M")
            part.to_csv(fh, index=False, header=(y == 0), lineterminator="\n")
            rows += len(part)
    return rows


def main() -> None:
    from dask.distributed import Client

    from liftcore import rotor, voyage as vy

    from liftcore import rotor_inputs
    from liftcore.studies.voyage import operate_for

    operate = operate_for(rotor_inputs.setup_from_inputs({"rotor_count": ROTORS, "rotor_spacing_m": 30.0}))
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "twenty_years.csv"
        rows = build_series(path)
        size_mb = path.stat().st_size / 1e6
        print(f"voyage: {rows:,} hourly rows ({YEARS} invented years, {size_mb:.1f} MB), {ROTORS} rotors; "
              f"{os.cpu_count()} CPUs, load average {os.getloadavg()[0]:.1f} at the start")

        t = time.perf_counter()
        memory = vy.tally_series(operate, path)
        t_mem = time.perf_counter() - t
        peak_mb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
        print(f"  in memory, streamed in blocks of {vy.windstats.DEFAULT_CHUNK_ROWS:,} rows: "
              f"{t_mem:7.2f} s  {rows / t_mem:10,.0f} rows/s  (peak memory of this process "
              f"{peak_mb:,.0f} MB)")

        t = time.perf_counter()
        cluster = vy.local_cluster(2)
        client = Client(cluster)
        client.run(lambda: __import__("liftcore.rotor"))  # warm the workers' imports
        t_start = time.perf_counter() - t
        try:
            t = time.perf_counter()
            dask = vy.tally_series_dask(operate, path, scheduler=cluster.scheduler_address)
            t_dask = time.perf_counter() - t
        finally:
            client.close()
            cluster.close()
        print(f"  local Dask cluster, 2 worker processes:          {t_dask:7.2f} s  "
              f"{rows / t_dask:10,.0f} rows/s  (cluster start {t_start:.1f} s not included)")
        print(f"  ratio in memory / Dask: {t_mem / t_dask:.2f}")
        a, b = memory.mean("net_power_w"), dask.mean("net_power_w")
        print(f"  mean net power gain: {a / 1000:.6f} kW in memory, {b / 1000:.6f} kW on Dask "
              f"(relative difference {abs(a - b) / abs(a):.1e})")
        _spread_side_by_side(path, rows)
        ship = vy.ShipEconomics(hours_at_sea_per_year=vy.series_hours_at_sea_per_year(memory))
        s = vy.summarise(memory, ship)
        print(f"  fuel saved per year {s.annual_fuel_saved_kg / 1000:,.0f} t over "
              f"{s.hours_at_sea_per_year:,.0f} h at sea per year")


def _spread_side_by_side(path: Path, rows: int) -> None:
    """The whole voyage study on the series, with and without the spread across the published
    coefficient sets (target: the range costs at most 2x the central run)."""
    from liftcore.studies import voyage as study

    values = study.INPUTS.validate({**study.INPUTS.defaults(), "wind_kind": "series", "sweep": False,
                                    "rotor_count": ROTORS, "rotor_spacing_m": 30.0})
    times = {}
    with study.computing_on("off"):
        for on in (False, True):
            t = time.perf_counter()
            res = study.run({**values, "published_spread": on}, extra=path)
            times[on] = time.perf_counter() - t
    ratio = times[True] / times[False]
    j = res.json
    lo, hi = j["annual_fuel_saved_t_range"]
    print(f"  voyage study, {rows:,} rows in this process: central {times[False]:.2f} s, with the "
          f"range over {len(res.detail.spread)} set and spin-power runs {times[True]:.2f} s: "
          f"ratio {ratio:.2f} (target <= 2: {'met' if ratio <= 2 else 'NOT met'})")
    print(f"  fuel saved per year {j['annual_fuel_saved_t']:,.0f} t, {lo:,.0f} to {hi:,.0f} t across "
          "the published data")


if __name__ == "__main__":
    main()
