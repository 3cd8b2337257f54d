"""Speed and scale benchmarks: each ``bench_*.py`` module has a ``main()`` that prints times and
ratios measured side by side in one run (``python -m benchmarks`` or ``make bench``)."""
