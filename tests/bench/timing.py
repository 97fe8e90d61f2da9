"""Interleaved medians and the one-line JSON shape every benchmark prints."""

from __future__ import annotations

import json
import statistics
import time
from collections.abc import Callable
from typing import Any


def interleaved(runs: dict[str, Callable[[], Any]], repeats: int) -> dict[str, float]:
    """Median seconds of each callable, run round-robin ``repeats`` times (noise spreads evenly)."""
    times: dict[str, list[float]] = {name: [] for name in runs}
    for _ in range(repeats):
        for name, run in runs.items():
            start = time.perf_counter()
            run()
            times[name].append(time.perf_counter() - start)
    return {name: statistics.median(t) for name, t in times.items()}


def line(name: str, n: int, seconds: float, baseline_seconds: float | None, *,
         per: float | None = None, **extra: Any) -> dict[str, Any]:
    """One result: ``rate`` is ``per`` (default ``n``) units per second, ``ratio`` the rate over the
    baseline's rate (1.0 = as fast as the baseline; above 1 faster)."""
    units = n if per is None else per
    rate = units / seconds if seconds > 0 else None
    base = units / baseline_seconds if baseline_seconds else None
    out = {"name": name, "n": n, "seconds": round(seconds, 4),
           "rate": round(rate, 1) if rate is not None else None,
           "baseline_rate": round(base, 1) if base is not None else None,
           "ratio": round(rate / base, 4) if rate is not None and base else None}
    out.update(extra)
    return out


def emit(result: dict[str, Any]) -> None:
    print(json.dumps(result, ensure_ascii=False), flush=True)
