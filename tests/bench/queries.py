"""Query benchmarks: single-part find on a large store, and pair search growth.

Baseline for find (as measured in the shared library notes, table B3): the same capacitance-window
SQL the search's pre-filter runs, bare, fetching the same columns, on the same indexed store.
Pair search has no bare equivalent; it is judged by its median per search (target < 0.2 s at
20 000 parts) and its growth from one size to the next (n log n: about 4.6× from 20 000 to
80 000; n² would be 16×).
"""

from __future__ import annotations

import math
import random
import statistics
import time
from decimal import Decimal
from pathlib import Path
from typing import Any

from tests.bench.data import fill_store
from tests.bench.timing import line

# The columns the search reads for each candidate row (stock.search._SELECT), by value window.
BARE_FIND_SQL = (
    "SELECT b.id, b.bin_key, b.location, b.on_hand, p.decoded_json, p.settled_json,"
    " p.capacitance_pf, p.tol_minus, p.tol_plus, p.tol_unit, p.tempco_ppm_per_k,"
    " p.tempco_tol_ppm_per_k, p.voltage_v FROM parts p JOIN bins b ON b.id = p.bin_id"
    " WHERE p.capacitance_pf IS NOT NULL AND p.capacitance_pf >= ? AND p.capacitance_pf <= ?"
    " AND COALESCE(b.on_hand, 0) >= ?")
FIND_LO_PF, FIND_HI_PF = 1.0, 1e10   # 1 pF … 10 mF: the span of capacitors a shop stocks


def _fresh_store(path: Path) -> Any:
    from stock.store.database import open_store

    for suffix in ("", "-wal", "-shm"):
        Path(f"{path}{suffix}").unlink(missing_ok=True)
    return open_store(path)


def find(n: int, work: Path, queries: int = 200) -> dict[str, Any]:
    """Median latency of ``queries`` value requirements through :func:`stock.search.candidates`
    against the bare window SQL, interleaved query by query (target ratio ≤ 3).

    Each requirement asks for one value with no tolerance, so the window is the search's
    "same value" ±1 %; at 1 000 000 log-uniform bins over 1 pF … 10 mF that is ~870 rows a query.
    """
    from stock.matching.search import Requirement, candidates

    store = _fresh_store(work / f"find-{n}.db")
    build = time.perf_counter()
    fill_store(store, n, lo_pf=FIND_LO_PF, hi_pf=FIND_HI_PF)
    build = time.perf_counter() - build
    rng = random.Random(7)
    conn = store.db.conn
    lib_times, bare_times, rows, found = [], [], [], []
    for _ in range(queries):
        target = Decimal(f"{10 ** rng.uniform(1, 9):.3g}")
        req = Requirement(capacitance_pf=target)
        lo, hi = req.value_window()
        start = time.perf_counter()
        bare = conn.execute(BARE_FIND_SQL, (float(lo), float(hi), req.qty)).fetchall()
        bare_times.append(time.perf_counter() - start)
        start = time.perf_counter()
        matches = candidates(store, req)
        lib_times.append(time.perf_counter() - start)
        rows.append(len(bare))
        found.append(len(matches))
    store.close()
    lib, base = statistics.median(lib_times), statistics.median(bare_times)
    # a rate of queries per second, so ratio = library rate / bare rate (≥ 1/3 meets "≤ 3× slower")
    result = line("find", n, lib, base, per=1.0, rows_mean=round(statistics.mean(rows), 1),
                  matches_mean=round(statistics.mean(found), 1), build_seconds=round(build, 2),
                  slowdown=round(lib / base, 2), target_slowdown=3)
    return result


def pair_requirements(count: int, seed: int = 2) -> list[Any]:
    """Pair searches like a repairer's: a value with a tolerance, a tempco window, or both and a
    working voltage (the mix of tests/bench/find_pairs.py)."""
    from stock.matching.search import build_requirement

    rng = random.Random(seed)
    out = []
    for _ in range(count):
        value = f"{round(10 ** rng.uniform(1, 5), 1)}p"
        kind = rng.randrange(3)
        if kind == 0:
            out.append(build_requirement(value=value, tol=rng.choice(["5%", "10%", "20%"])))
        elif kind == 1:
            out.append(build_requirement(value=value, tempco="-750±250"))
        else:
            out.append(build_requirement(value=value, tol="10%", volts="50", tempco="0±100"))
    return out


def pairs(sizes: tuple[int, ...], work: Path, searches: int = 100) -> list[dict[str, Any]]:
    """Median time of ``searches`` :func:`stock.search.find` calls with ``combine=True`` per store
    size, and the growth factor from the previous size (with the n log n expectation beside it)."""
    from stock.matching.search import find as search

    results = []
    previous: tuple[int, float] | None = None
    reqs = pair_requirements(searches)
    for n in sizes:
        store = _fresh_store(work / f"pairs-{n}.db")
        fill_store(store, n, seed=9, lo_pf=1.0, hi_pf=1e6)
        start = time.perf_counter()
        search(store, reqs[0], combine=True)  # the first search builds and caches the pair index
        first = time.perf_counter() - start
        times, combos = [], []
        for req in reqs:
            start = time.perf_counter()
            result = search(store, req, combine=True)
            times.append(time.perf_counter() - start)
            combos.append(len(result.combinations))
        store.close()
        median = statistics.median(times)
        extra: dict[str, Any] = {
            "searches": searches, "first_seconds": round(first, 4),
            "p90_seconds": round(sorted(times)[int(0.9 * len(times))], 4),
            "combinations_mean": round(statistics.mean(combos), 1), "target_seconds_at_20000": 0.2}
        if previous is not None:
            n0, t0 = previous
            extra["growth"] = round(median / t0, 2)
            extra["n_log_n_growth"] = round(n * math.log(n) / (n0 * math.log(n0)), 2)
            extra["n_squared_growth"] = round((n / n0) ** 2, 1)
        results.append(line("pairs", n, median, None, per=1.0, **extra))
        previous = (n, median)
    return results
