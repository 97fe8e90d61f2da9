"""The benchmarks of tests/bench run end to end on tiny sizes and print the agreed JSON line shape.

Targets: the README's benchmark section (the line shape ``name, n, seconds, rate, baseline_rate, ratio``);
baselines:
the shared library notes' measurements (csv + sqlite3 executemany, openpyxl read-only, bare indexed
SQL). No timing is asserted here: speed targets live in the benchmark output, never in unit tests.
Marking values checked below follow IEC 60062 (three-digit and letter-and-digit codes) and
IEC 60063 (E12/E24 significands).
"""

from __future__ import annotations

import csv
import json
import sqlite3
from decimal import Decimal

import pytest

from stock.markings.decoder import decode
from stock.markings.preferred_values import in_series
from stock.store.database import open_store
from tests.bench import data, imports, queries
from tests.bench.__main__ import QUICK, main
from tests.bench.timing import interleaved, line

SHAPE = {"name", "n", "seconds", "rate", "baseline_rate", "ratio"}


def assert_shape(result, name, n):
    assert SHAPE <= set(result)
    assert (result["name"], result["n"]) == (name, n)
    assert result["seconds"] > 0 and result["rate"] > 0
    json.dumps(result)  # one JSON object per line: everything in it serialises


# The generated sheet: markings decode as the codes say (IEC 60062), values are on E12/E24 (IEC 60063).
def test_the_generated_sheet_repeats_markings_and_holds_a_few_bad_rows():
    rows = list(data.sheet_rows(4000, seed=3))
    texts = [r[2] for r in rows]
    assert len(rows) == 4000
    assert len(set(texts)) < len(texts) / 2  # repeats, as a shop's sheet does
    assert len({r[1] for r in rows}) == len(rows)  # every bin has its own location
    bad = [r for r in rows if r[3] in ("lots", "-3") or r[2] in data._BAD]
    assert 0 < len(bad) < 0.02 * len(rows)


@pytest.mark.parametrize("maker", [
    pytest.param(data._three_digit, id="three-digit-code"),
    pytest.param(data._letter_digit, id="letter-and-digit-code"),
    pytest.param(data._with_unit, id="value-with-unit"),
    pytest.param(data._electrolytic, id="electrolytic"),
    pytest.param(data._film, id="film"),
])
def test_each_kind_of_generated_marking_decodes_to_an_e24_value(maker):
    import random

    rng = random.Random(5)
    for _ in range(40):
        m = decode(maker(rng))
        assert m.capacitance_pf is not None and m.capacitance_pf > 0, m.text
        significand = m.capacitance_pf.scaleb(-m.capacitance_pf.adjusted())
        assert in_series(significand.quantize(Decimal("0.1")), "E24"), m.text


# Hand-computed: "104" is 10 × 10⁴ pF = 100 nF (IEC 60062 three-digit code).
def test_a_filled_store_holds_valid_decoded_parts_at_log_uniform_values(tmp_path):
    store = open_store(tmp_path / "filled.db")
    data.fill_store(store, 500, distinct=20, lo_pf=10.0, hi_pf=1e5)
    rows = store.rows("SELECT capacitance_pf, decoded_json FROM parts")
    assert len(rows) == 500
    assert all(10.0 <= r["capacitance_pf"] <= 1e5 for r in rows)
    assert all(json.loads(r["decoded_json"])["capacitance_pf"] == r["capacitance_pf"] for r in rows)
    assert store.one("SELECT COUNT(*) AS n FROM bins WHERE on_hand > 0")["n"] == 500
    store.close()


def test_interleaved_runs_each_callable_the_given_number_of_times():
    calls = {"a": 0, "b": 0}

    def bump(k):
        calls[k] += 1

    medians = interleaved({"a": lambda: bump("a"), "b": lambda: bump("b")}, 3)
    assert calls == {"a": 3, "b": 3} and set(medians) == {"a", "b"}


def test_a_result_line_states_the_ratio_of_the_rates():
    result = line("x", 100, 2.0, 0.5)
    assert result == {"name": "x", "n": 100, "seconds": 2.0, "rate": 50.0, "baseline_rate": 200.0,
                      "ratio": 0.25}
    assert line("y", 10, 1.0, None)["ratio"] is None


def test_the_csv_baseline_stores_every_row_of_the_sheet(tmp_path):
    sheet = data.write_csv(tmp_path / "s.csv", 300)
    imports.csv_baseline_once(sheet, tmp_path / "b.db")
    with open(sheet, newline="", encoding="utf-8") as fh:
        expected = list(csv.reader(fh))[1:]
    conn = sqlite3.connect(tmp_path / "b.db")
    assert conn.execute("SELECT * FROM sheet").fetchall() == [tuple(r) for r in expected]
    conn.close()


def test_the_csv_import_benchmark_accounts_for_every_row(tmp_path):
    result = imports.csv_import(300, tmp_path, repeats=1)
    assert_shape(result, "csv_import", 300)
    assert result["stored"] + result["quarantined"] == 300
    assert result["storage_floor_seconds"] > 0 and result["read_seconds"] > 0


def test_the_xlsx_import_benchmark_reads_the_same_sheet(tmp_path):
    assert_shape(imports.xlsx_import(120, tmp_path, repeats=1), "xlsx_import", 120)
    assert imports.openpyxl_once(tmp_path / "sheet-120.xlsx") == 121  # header + rows


def test_the_wide_sheet_benchmark_stores_every_row_of_a_wide_sheet(tmp_path):
    result = imports.wide_import(200, tmp_path, repeats=1, rows=3)
    assert (result["name"], result["n"], result["rows"], result["stored"]) == ("wide_import", 200, 3, 3)
    assert result["seconds"] > 0 and result["baseline_rate"] > 0


def test_the_find_benchmark_compares_with_the_bare_window_query(tmp_path):
    result = queries.find(2000, tmp_path, queries=10)
    assert_shape(result, "find", 2000)
    assert result["matches_mean"] <= result["rows_mean"]  # the library only removes rows


def test_the_pairs_benchmark_reports_growth_between_sizes(tmp_path):
    first, second = queries.pairs((200, 400), tmp_path, searches=5)
    assert_shape(first, "pairs", 200)
    assert_shape(second, "pairs", 400)
    assert "growth" not in first and second["growth"] > 0
    assert second["n_squared_growth"] == 4.0


def test_the_memory_benchmark_measures_a_child_process(tmp_path):
    result = imports.memory(200, tmp_path)
    assert_shape(result, "memory", 200)
    assert result["peak_rss_mb"] >= result["baseline_peak_rss_mb"] > 0


def test_the_command_prints_one_json_object_per_line(tmp_path, capsys):
    assert main(["--quick", "--only", "pairs", "--work", str(tmp_path)]) == 0
    lines = capsys.readouterr().out.strip().splitlines()
    assert [json.loads(s)["n"] for s in lines] == list(QUICK["pairs"])


def test_the_command_refuses_an_unknown_benchmark(capsys):
    with pytest.raises(SystemExit) as exc:
        main(["--only", "speed"])
    assert exc.value.code == 2
    assert "unknown benchmark 'speed'" in capsys.readouterr().err
