"""Pair-search timing for `stock find --combine` (a measurement, not a test).

Builds stores of N distinct available parts (values log-uniform over 1 pF … 1 µF, mixed Class 1 and
Class 2 dielectrics, tolerances and ratings), then times 100 searches per size through
:func:`stock.search.find` with ``combine=True`` (singles and both pair kinds), each for a random
target and a mix of tolerance and tempco windows. Prints one JSON object per line: name, n, seconds
(median per search, pair index warm), p90, cold_seconds (the first search, which reads every part
into the pair index), rate, and the growth of the median from the previous size (n log n would be
about 4.6× per 4× parts; n² would be 16×).

    python tests/bench/find_pairs.py            # 5 000, 20 000, 80 000 parts
    python tests/bench/find_pairs.py --quick    # 2 000 parts, 10 searches
"""

from __future__ import annotations

import json
import random
import statistics
import sys
import time
from decimal import Decimal
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[2]))

from tests.test_search import add_bins, part  # noqa: E402

from stock.search import build_requirement, find  # noqa: E402
from stock.store import open_store  # noqa: E402

CODES = ("C0G", "NP0", "U2J", "N750", "S2H", "X7R")
TOLS = ("1", "2", "5", "10", "20")
VOLTS = ("25", "50", "100", "250", "500")


def build(n: int, seed: int = 1):
    rng = random.Random(seed)
    store = open_store(":memory:")
    values = set()
    while len(values) < n:
        values.add(round(10 ** rng.uniform(0, 6), 3))
    rows = []
    for i, v in enumerate(sorted(values)):
        m = part(f"P{i}", str(v), tol=rng.choice(TOLS), volts=rng.choice(VOLTS), code=rng.choice(CODES))
        rows.append((f"K{i}", m, rng.randint(1, 50)))
    add_bins(store, rows)
    return store


def requirements(count: int, seed: int = 2):
    rng = random.Random(seed)
    for _ in range(count):
        value = f"{round(10 ** rng.uniform(1, 5), 1)}p"
        kind = rng.randrange(3)
        if kind == 0:
            yield build_requirement(value=value, tol=rng.choice(["5%", "10%", "20%"]))
        elif kind == 1:
            yield build_requirement(value=value, tempco="-300±60")
        else:
            yield build_requirement(value=value, tol="10%", volts="50", tempco="0±100")


def main() -> None:
    quick = "--quick" in sys.argv
    sizes = (2000,) if quick else (5000, 20000, 80000)
    searches = 10 if quick else 100
    previous = None
    for n in sizes:
        store = build(n)
        reqs = list(requirements(searches))
        start = time.perf_counter()
        find(store, reqs[0], combine=True, limit=10)  # cold: reads every part into the pair index
        cold = time.perf_counter() - start
        times = []
        for req in reqs:
            start = time.perf_counter()
            find(store, req, combine=True, limit=10)
            times.append(time.perf_counter() - start)
        median = statistics.median(times)
        line = {"name": "pairs", "n": n, "seconds": round(median, 4), "rate": round(1 / median, 1),
                "p90": round(sorted(times)[int(0.9 * len(times))], 4), "cold_seconds": round(cold, 4),
                "growth": round(median / previous, 2) if previous else None}
        print(json.dumps(line), flush=True)
        previous = median
        store.close()


if __name__ == "__main__":
    main()
