"""The voyage computation on Dask (dask.distributed) equals the in-memory computation.

One LocalCluster on loopback with two worker processes serves every test of this module and is
closed at the end.
"""

import numpy as np
import pandas as pd
import pytest
from numpy.testing import assert_allclose

from liftcore import rotor, voyage as vy
from liftcore import rotor_inputs
from liftcore.errors import InputError
from liftcore.studies import run_study
from liftcore.studies import voyage as study

SERIES = study.DEMO_FILES["series"]
ARRAYS = ("sums", "state", "flags", "peak", "heat_weight", "heat_net", "rose", "months", "grid")


@pytest.fixture(scope="module")
def scheduler():
    cluster = vy.local_cluster(2)  # two worker processes on 127.0.0.1
    try:
        yield cluster.scheduler_address
    finally:
        cluster.close()


@pytest.fixture(scope="module")
def operate():
    return study.operate_for(rotor_inputs.setup_from_inputs({"rotor_count": 4}))


def _same(a: vy.Tally, b: vy.Tally):
    assert a.rows == b.rows
    assert_allclose(a.weight, b.weight, rtol=1e-12)
    for name in ARRAYS:
        assert_allclose(getattr(a, name), getattr(b, name), rtol=1e-9, atol=1e-9 * np.max(np.abs(getattr(b, name))))
    assert list(a.legs) == list(b.legs)
    for k in a.legs:
        assert_allclose(a.legs[k], b.legs[k], rtol=1e-9)
    assert a.time_span_ns == b.time_span_ns
    assert {w.code for w in a.warnings} == {w.code for w in b.warnings}


def test_file_on_dask_equals_in_memory(scheduler, operate, tmp_path):
    path = tmp_path / "route.csv"
    path.write_text("".join(SERIES.read_text().splitlines(keepends=True)[:4000]))  # comments, header, rows
    memory = vy.tally_series(operate, path, chunk_rows=1000)
    # 30 kB blocks: the file is cut into several tasks on whole lines
    dask = vy.tally_series_dask(operate, path, scheduler=scheduler, block_bytes=30_000)
    _same(dask, memory)
    ship = vy.ShipEconomics(fuel_price_per_t=600.0, installed_cost=1e6)
    a, b = vy.summarise(dask, ship), vy.summarise(memory, ship)
    for key in ("mean_net_power_w", "annual_fuel_saved_kg", "annual_cost_saved", "running_share"):
        assert_allclose(getattr(a, key), getattr(b, key), rtol=1e-9)


def test_dataframe_on_dask_equals_in_memory(scheduler, operate):
    df = pd.read_csv(SERIES, comment="#").iloc[:3000]
    memory = vy.tally_series(operate, df, "part")
    dask = vy.tally_series_dask(operate, df, "part", scheduler=scheduler, block_bytes=64 * 700)
    _same(dask, memory)


def test_bad_row_on_dask_names_the_row_of_the_whole_file(scheduler, operate, tmp_path):
    df = pd.read_csv(SERIES, comment="#").iloc[:2500]
    df["true_wind_speed_m_s"] = df["true_wind_speed_m_s"].astype(object)
    df.loc[2345, "true_wind_speed_m_s"] = "-4"
    path = tmp_path / "bad_route.csv"
    df.to_csv(path, index=False)
    with pytest.raises(InputError) as in_memory:
        vy.tally_series(operate, path, chunk_rows=1000)
    with pytest.raises(InputError) as on_dask:
        vy.tally_series_dask(operate, path, scheduler=scheduler, block_bytes=20_000)
    assert str(on_dask.value) == str(in_memory.value) == (
        "bad_route.csv, row 2346: true_wind_speed_m_s must be between 0 and 80 m/s (got -4 m/s)")


def test_study_on_a_scheduler_equals_the_study_in_process(scheduler):
    upload = pd.read_csv(SERIES, comment="#").iloc[1000:3000]
    base = {"wind_kind": "series", "sweep": False, "rotor_count": 3}
    with study.computing_on("off"):
        here = run_study("voyage", base, extra=upload)
    with study.computing_on(scheduler):
        there = run_study("voyage", base, extra=upload)
    assert there.detail.engine.startswith("Dask") and here.detail.engine == "in memory"
    for h in here.headlines:
        assert_allclose(there.headline(h.key).value, h.value, rtol=1e-9, equal_nan=True)


def test_scheduler_is_not_an_input_of_files_or_links():
    # A scenario file or a share link must never make the server connect to an address.
    assert not any("dask" in k or "scheduler" in k for k in study.INPUTS.keys)


def test_unreachable_scheduler_is_one_clear_line(operate):
    with pytest.raises(InputError, match=r"^cannot reach the Dask scheduler at 'tcp://127.0.0.1:9'"):
        vy.tally_series_dask(operate, SERIES, scheduler="tcp://127.0.0.1:9", connect_timeout_s=1.0)
