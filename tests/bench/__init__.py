"""Benchmarks (measurements, not tests): import, find, pair search and memory.

Run ``python -m tests.bench`` (full sizes, several minutes) or ``python -m tests.bench --quick``
(small sizes, seconds; CI runs it). Each benchmark prints one JSON object per line with at least
``name``, ``n``, ``seconds``, ``rate``, ``baseline_rate`` and ``ratio`` (rate over the baseline's
rate, measured in the same process and interleaved with it, because shared machines are noisy).
Targets are the README's benchmark figures; baselines follow the measurements in the shared library notes.
"""
