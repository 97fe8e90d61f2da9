"""Stored grades follow what decides them: the reading shown, whether a person settled
(measured) it, and the bin's package. Two bins holding the same marking share a stored grade only
when all three agree; every bin's stored grade is the one grading that bin on the spot gives.
Values are IEC 60062 three-digit codes ("104" is 10 × 10⁴ pF = 100 nF); X7R is EIA-198."""

from __future__ import annotations

import csv
import json

from stock.inventory.intake import import_file
from stock.inventory.settling import settle
from stock.inventory.stored_grades import grade_bins


def _sheet(path, rows):
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.writer(fh)
        w.writerow(("Location", "Marking", "Package", "Qty"))
        w.writerows(rows)
    return path


def _stored(store) -> dict[int, dict[str, tuple[str, list[str]]]]:
    out: dict[int, dict[str, tuple[str, list[str]]]] = {}
    for r in store.rows("SELECT bin_id, application, grade, reasons_json FROM grades"):
        out.setdefault(r["bin_id"], {})[r["application"]] = (r["grade"], json.loads(r["reasons_json"]))
    return out


def _assert_stored_match_on_the_spot(store):
    stored = _stored(store)
    graded = grade_bins(store)
    assert graded and {b.bin_id for b in graded} == set(stored)
    for b in graded:
        for name, g in b.grades.items():
            word, reasons = stored[b.bin_id][name]
            assert word == g.word, (b.bin_key, name)
            assert reasons == list(g.reasons[:g.deciding]) + [f"doubt: {d}" for d in g.doubts]


def test_the_same_marking_in_two_packages_is_graded_per_package(store, tmp_path):
    import_file(store, _sheet(tmp_path / "drawer.csv", [
        ["D1", "104 X7R 50V", "0402", "100"], ["D2", "104 X7R 50V", "1206", "40"],
        ["D3", "104 X7R 50V", "0402", "10"]]))
    shown = {r["location"]: (r["shown_id"], r["package"]) for r in store.rows(
        "SELECT b.location, p.shown_id, p.package FROM bins b JOIN bin_parts p ON p.bin_id = b.id")}
    assert shown["D1"][0] == shown["D2"][0] == shown["D3"][0]     # one reading ...
    keys = store.rows("SELECT DISTINCT marking_id, measured, case_size FROM marking_grades")
    assert {k["case_size"] for k in keys} == {"0402", "1206"}    # ... graded once per package
    _assert_stored_match_on_the_spot(store)


def test_a_settled_reading_is_graded_apart_from_the_same_reading_unsettled(store, tmp_path):
    import_file(store, _sheet(tmp_path / "tray.csv", [["T1", "104 X7R", "", "5"],
                                                     ["T2", "104 X7R", "", "5"]]))
    before = _stored(store)
    settle(store, "tray/t1", value="100nF", note="measured on the bridge")
    after = _stored(store)
    ids = {r["location"]: r["id"] for r in store.rows("SELECT id, location FROM bins")}
    assert after[ids["T2"]] == before[ids["T2"]]
    # the unsettled bin keeps the unmarked-tolerance doubt, the measured one has lost it
    assert any(r.startswith("doubt:") for _, rs in after[ids["T2"]].values() for r in rs)
    assert after[ids["T1"]] != after[ids["T2"]]
    assert store.one("SELECT COUNT(*) AS n FROM (SELECT DISTINCT measured FROM marking_grades)")["n"] == 2
    _assert_stored_match_on_the_spot(store)


def test_grades_follow_a_package_given_later(store, tmp_path):
    path = _sheet(tmp_path / "shelf.csv", [["S1", "222 X7R 100V", "", "5"]])
    import_file(store, path)
    _sheet(path, [["S1", "222 X7R 100V 0805", "", "5"]])
    import_file(store, path)
    assert store.one("SELECT package FROM parts")["package"] == "0805"
    _assert_stored_match_on_the_spot(store)
