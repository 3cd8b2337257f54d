"""Every benchmark module imports and exposes main() (the timings themselves run with `make bench`)."""

import importlib
from pathlib import Path

import pytest

BENCH = sorted(p.stem for p in (Path(__file__).resolve().parents[1] / "benchmarks").glob("bench_*.py"))


def test_there_are_benchmarks_for_each_speed_target():
    assert {"bench_flow", "bench_rotor", "bench_voyage", "bench_flight"} <= set(BENCH)


@pytest.mark.parametrize("name", BENCH)
def test_benchmark_module_has_main(name):
    mod = importlib.import_module(f"benchmarks.{name}")
    assert callable(mod.main)
