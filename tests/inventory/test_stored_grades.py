"""Grades over the store: bins graded on the fly, and the stored default grades kept current cheaply.

Sources: C0G is Class 1, 0 ±30 ppm/K, and X7R Class 2, ±15 % over −55…+125 °C (EIA-198); a tuned
circuit needs a Class 1 dielectric while decoupling takes Class 2 (common practice, no published
source); a part with no safety class is never fit for a mains position (IEC 60384-14);
101 = 100 pF, 104 = 100 nF (IEC 60062).
"""

from __future__ import annotations

import csv

import pytest

from stock.errors import NotFound
from stock.inventory.intake import import_file
from stock.inventory.stored_grades import bin_marking, grade_bins, refresh_stored_grades


@pytest.fixture
def shop(store, tmp_path):
    path = tmp_path / "drawer.csv"
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(["Location", "Label", "Marking", "Qty"])
        w.writerows([["K1", "tank", "101J 50V C0G", "10"], ["K2", "decoupling", "104K 50V X7R", "50"],
                     ["K3", "decoupling", "104K 50V X7R", "20"]])
    import_file(store, path)
    return store


def _stored(store, location):
    return {r["application"]: r["grade"] for r in store.rows(
        "SELECT g.application, g.grade FROM grades g JOIN bins b ON b.id = g.bin_id WHERE b.location = ?",
        (location,))}


# EIA-198 classes and common practice for which job takes which class
@pytest.mark.parametrize("location, application, word", [
    pytest.param("K1", "tuned", "fit", id="c0g-is-fit-for-a-tuned-circuit"),
    pytest.param("K2", "tuned", "unfit", id="x7r-is-unfit-for-a-tuned-circuit"),
    pytest.param("K2", "bypass", "fit", id="x7r-is-fit-for-decoupling"),
    pytest.param("K1", "mains", "unfit", id="c0g-without-a-safety-class-is-unfit-for-mains"),
    pytest.param("K2", "mains", "unfit", id="x7r-without-a-safety-class-is-unfit-for-mains"),
])
def test_a_bin_is_graded_per_application(shop, location, application, word):
    (graded,) = grade_bins(shop, [location])
    assert graded.grades[application].word == word
    assert graded.grades[application].reasons          # every grade says why


def test_grading_all_bins_gives_one_entry_per_bin_with_a_json_view(shop):
    every = grade_bins(shop)
    assert sorted(b.location for b in every) == ["K1", "K2", "K3"]
    data = every[0].to_json()
    assert set(data) >= {"bin_id", "bin_key", "location", "marking", "grades", "reasons", "doubts", "package"}


def test_an_unknown_bin_is_refused_naming_it(shop):
    with pytest.raises(NotFound) as info:
        grade_bins(shop, ["Z99"])
    assert "'Z99'" in str(info.value)


def test_bin_marking_finds_a_bins_part_by_location(shop):
    row, marking = bin_marking(shop, "K1")
    assert row["location"] == "K1"
    assert marking.capacitance_pf == 100          # 101 = 10 x 10^1 pF
    assert marking.dielectric.code == "C0G"


def test_stored_grades_are_written_once_and_match_the_grades_on_the_fly(shop):
    refresh_stored_grades(shop)                   # the import may have graded already
    assert refresh_stored_grades(shop) == 0      # nothing changed: a no-op
    for b in grade_bins(shop):
        assert _stored(shop, b.location) == {n: g.word for n, g in b.grades.items()}


def test_naming_bins_grades_them_again(shop):
    refresh_stored_grades(shop)
    ids = [r["id"] for r in shop.rows("SELECT id FROM bins WHERE location IN ('K2', 'K3')")]
    assert refresh_stored_grades(shop, ids) == 2
    assert refresh_stored_grades(shop, []) == 0


def test_grades_missing_for_a_reading_are_filled_in_by_the_next_refresh(shop):
    # grades are stored per reading (not per bin): lose K1's reading's grades, and only that
    # reading is graded again
    refresh_stored_grades(shop)
    reading = shop.one("SELECT p.shown_id FROM bin_parts p JOIN bins b ON b.id = p.bin_id"
                       " WHERE b.location = 'K1'")["shown_id"]
    with shop.writing():
        shop.db.conn.execute("DELETE FROM marking_grades WHERE marking_id = ?", (reading,))
    assert _stored(shop, "K1") == {}
    assert _stored(shop, "K2")["bypass"] == "fit"
    assert refresh_stored_grades(shop) == 1
    assert _stored(shop, "K1")["tuned"] == "fit"
