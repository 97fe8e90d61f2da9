"""Flags a person settles: every kind raised, explained and settled; decisions kept and reversible.

Sources for the hand-built markings: the IEC 60062 three-digit and letter codes (104 = 100 nF,
K = ±10 %), from memory of EIA-198 and IEC 60062; the 47K reading as 47 nF is old US practice
(from memory of older US makers' catalogues, [old-us-letter-codes]), the reason a decoder flags
it; the letter C meaning ±0.25 pF below 10 pF (IEC 60062, from memory). The 2-year shelf-life rule for aluminium electrolytics is
common practice, no published source. ISO 8601 week numbering for YYWW date codes (the Python
standard library implements ISO 8601).
"""

from __future__ import annotations

import json
from datetime import date
from decimal import Decimal

import pytest

from stock.decoded import Alternative, Dielectric, Flag, Marking, Tolerance
from stock.errors import BadValue, NotFound, Refused
from stock.store.flag_kinds import FLAG_KINDS, flag_kind
from stock.inventory.flag_list import list_flags
from stock.inventory.readings import current_marking, part_columns, pick_reading, readings
from stock.inventory.settling import reopen, settle
from stock.inventory.stock_checks import parse_date_code, raise_stock_flags

TEN = Tolerance(Decimal(10), Decimal(10), "%", code="K")
X7R = Dielectric("X7R", "ceramic", 2, temp_min_c=Decimal(-55), temp_max_c=Decimal(125),
                 change_minus_pct=Decimal(15), change_plus_pct=Decimal(15), source="EIA-198 Class 2")
C0G = Dielectric("C0G", "ceramic", 1, tempco_ppm_per_k=Decimal(0), tempco_tol_ppm_per_k=Decimal(30),
                 source="EIA-198 Class 1")
ALU = Dielectric("aluminium-electrolytic", "aluminium-electrolytic")
TODAY = date(2026, 12, 1)


def add_bin(store, key, marking=None, *, on_hand=10, label=None, minimum=None, date_code=None):
    """A bin (and its part, when a marking is given) written straight into the tables."""
    with store.writing() as db:
        cur = db.conn.execute(
            "INSERT INTO bins (bin_key, label, location, minimum, date_code, on_hand, created_at,"
            " updated_at) VALUES (?, ?, ?, ?, ?, ?, 'now', 'now')",
            (key, label, key.split("/")[-1], minimum, date_code, None))
        bin_id = cur.lastrowid
        if on_hand is not None:
            store.move(bin_id, on_hand, "import", ref="test")
        if marking is not None:
            cols = part_columns(marking)
            names = ", ".join(f'"{c}"' for c in cols)
            db.conn.execute(
                f"INSERT INTO parts (bin_id, marking, {names}, decoded_json)"
                f" VALUES (?, ?, {', '.join('?' * len(cols))}, ?)",
                (bin_id, marking.text, *cols.values(), json.dumps(marking.to_json())))
    return bin_id


def add_flag(store, bin_id, marking, kind):
    """The flag the import raises for a decoder flag, with the import's fingerprint shape."""
    with store.writing():
        return store.raise_flag(kind=kind, message=f"{marking.text}: {kind}", bin_id=bin_id,
                                fingerprint=f"bin{bin_id}|{kind}|{marking.text}",
                                details={"marking": marking.text, "row": 2})


def flag_row(store, flag_id):
    return store.one("SELECT * FROM flags WHERE id = ?", (flag_id,))


# Decoder flags, one marking each (values from memory of IEC 60062 / EIA-198; see the docstring).
DECODER_CASES = [
    pytest.param("unit-assumed",
                 Marking("1.0", Decimal(1_000_000), flags=(Flag("unit-assumed", "µF assumed"),),
                         alternatives=(Alternative("read as pF", Decimal(1)),)),
                 {"reading": 1}, Decimal(1), id="unit-assumed-settled-by-picking-pF"),
    pytest.param("ambiguous-code",
                 Marking("47K", Decimal(47), TEN, flags=(Flag("ambiguous-code", "47K"),),
                         alternatives=(Alternative("old US practice: K is x1000 pF", Decimal(47000)),)),
                 {"reading": 1}, Decimal(47000), id="ambiguous-47K-settled-as-47nF"),
    pytest.param("tolerance-by-value",
                 Marking("5R6C", Decimal("5.6"), Tolerance(Decimal("0.25"), Decimal("0.25"), "pF", "C"),
                         flags=(Flag("tolerance-by-value", "C below 10 pF"),),
                         alternatives=(Alternative("C read as a percentage", Decimal("5.6"),
                                                   Tolerance(Decimal("0.25"), Decimal("0.25"), "%", "C")),)),
                 {"reading": 0}, Decimal("5.6"), id="tolerance-by-value-keeps-the-decoders-pF"),
    pytest.param("disputed-code",
                 Marking("10p M4G", Decimal(10), dielectric=C0G, flags=(Flag("disputed-code", "digit 4"),),
                         alternatives=(Alternative("digit 4 as x-10000", Decimal(10), dielectric=X7R),)),
                 {"reading": 1}, Decimal(10), id="disputed-code-settled-by-the-other-table"),
    pytest.param("spelling-corrected",
                 Marking("1O4K", Decimal(100000), TEN, flags=(Flag("spelling-corrected", "O read as 0"),)),
                 {"reading": 0}, Decimal(100000), id="spelling-corrected-confirmed"),
    pytest.param("unreadable",
                 Marking("??", flags=(Flag("unreadable", "nothing read"),)),
                 {"value": "100n"}, Decimal(100000), id="unreadable-settled-by-a-measured-value"),
    pytest.param("unparsed",
                 Marking("104K ZZ9", Decimal(100000), TEN, unparsed=("ZZ9",),
                         flags=(Flag("unparsed", "ZZ9 not understood"),)),
                 {"reading": 0}, Decimal(100000), id="unparsed-rest-accepted"),
    pytest.param("both-ends",
                 Marking("brown black yellow", Decimal(100000), flags=(Flag("both-ends", "either end"),),
                         alternatives=(Alternative("read from the other end", Decimal(400)),)),
                 {"reading": 1}, Decimal(400), id="both-ends-settled-from-the-other-end"),
    pytest.param("layout-ambiguous",
                 Marking("white red red brown", Decimal(220), flags=(Flag("layout-ambiguous", "mica"),),
                         alternatives=(Alternative("military layout", Decimal(2200)),)),
                 {"value": "2n2"}, Decimal(2200), id="layout-ambiguous-settled-by-measuring"),
    pytest.param("conflicting-readings",
                 Marking("104 0.01uF", Decimal(100000), flags=(Flag("conflicting-readings", "two values"),),
                         alternatives=(Alternative("0.01uF: another value on the same marking",
                                                   Decimal(10000)),)),
                 {"reading": 1}, Decimal(10000), id="conflicting-readings-settled-for-the-other-value"),
    pytest.param("tolerance-assumed",
                 Marking("brown black orange", Decimal(10000), Tolerance(Decimal(20), Decimal(20), "%"),
                         flags=(Flag("tolerance-assumed", "no band"),)),
                 {"reading": 0}, Decimal(10000), id="tolerance-assumed-accepted"),
    pytest.param("label-conflict",
                 Marking("104", Decimal(100000), flags=(Flag("label-conflict", "label 10nF"),),
                         alternatives=(Alternative("the label says 10nF", Decimal(10000)),)),
                 {"reading": 1}, Decimal(10000), id="label-conflict-settled-for-the-label"),
]


@pytest.mark.parametrize("kind, marking, decision, expected_pf", DECODER_CASES)
def test_each_decoder_flag_is_listed_with_its_readings_and_settled_by_a_decision(
        store, kind, marking, decision, expected_pf):
    bin_id = add_bin(store, f"cab1/{kind}", marking, label="10nF")
    fid = add_flag(store, bin_id, marking, kind)

    [view] = list_flags(store)
    assert (view.id, view.kind, view.bin_key, view.marking) == (fid, kind, f"cab1/{kind}", marking.text)
    assert view.meaning == FLAG_KINDS[kind].meaning
    assert "?" != view.hint and "{" not in view.hint
    assert [r.number for r in view.readings] == list(range(len(marking.alternatives) + 1))

    done = settle(store, f"cab1/{kind}", note="checked at the bench", by="ana", **decision)
    assert done.closed == (fid,)
    row = flag_row(store, fid)
    assert row["status"] == "settled" and json.loads(row["decision_json"])["by"] == "ana"
    part = store.one("SELECT * FROM parts WHERE bin_id = ?", (bin_id,))
    assert Decimal(str(part["capacitance_pf"])) == expected_pf
    assert current_marking(part).capacitance_pf == expected_pf
    assert list_flags(store) == []


STOCK_CASES = ["unknown-quantity", "below-minimum", "shelf-life"]


# Decoder flags about safety-relevant facts are acknowledged one by one with a note, never
# closed as a side effect of settling the value. Polarity conventions: from memory of maker
# markings (a stripe marks the negative lead of an aluminium electrolytic); AC for X/Y safety
# capacitors: IEC 60384-14 (from memory).
NOTE_CASES = [
    pytest.param("polarity-assumed", id="polarity-assumed"),
    pytest.param("voltage-assumed", id="voltage-assumed"),
    pytest.param("voltage-kind-assumed", id="voltage-kind-assumed"),
]


@pytest.mark.parametrize("kind", NOTE_CASES)
def test_safety_relevant_assumptions_survive_a_value_decision_and_close_with_their_own_note(store, kind):
    m = Marking("47K 100uF", Decimal(47), TEN, dielectric=ALU, polarity="negative-marked",
                flags=(Flag("ambiguous-code", "47K"), Flag(kind, "assumed")),
                alternatives=(Alternative("K as x1000", Decimal(47000)),))
    bin_id = add_bin(store, "cab1/e1", m)
    value_flag, safety_flag = add_flag(store, bin_id, m, "ambiguous-code"), add_flag(store, bin_id, m, kind)
    assert settle(store, "cab1/e1", reading=1).closed == (value_flag,)
    assert flag_row(store, safety_flag)["status"] == "open"
    assert settle(store, "cab1/e1", flag_id=safety_flag, note="checked on the part").closed == (safety_flag,)


def test_one_note_for_several_different_questions_is_refused(store):
    m = Marking("100u", Decimal(10) ** 8, dielectric=ALU, flags=(Flag("polarity-assumed", "x"),))
    bin_id = add_bin(store, "cab1/e1", m, on_hand=5, minimum=20)
    add_flag(store, bin_id, m, "polarity-assumed")
    raise_stock_flags(store, today=TODAY)
    with pytest.raises(Refused, match=r"it has several open flags \(1 polarity-assumed, 2 below-minimum\);"
                                      " give --flag ID for each"):
        settle(store, "cab1/e1", note="reordered")


def test_every_documented_kind_has_a_raise_and_settle_case_here_or_in_test_duplicates():
    covered = ({p.values[0] for p in DECODER_CASES + NOTE_CASES} | set(STOCK_CASES)
               | {"duplicate"})
    assert covered == set(FLAG_KINDS)


# The hints say what one look or measurement would settle (the project's wording).
def test_ambiguous_code_hint_asks_which_value_to_measure(store):
    m = DECODER_CASES[1].values[1]
    add_flag(store, add_bin(store, "cab1/a1", m), m, "ambiguous-code")
    assert list_flags(store)[0].hint == "measure it: 47 pF ±10 % or 47 nF ±10 %?"


def test_label_conflict_hint_names_the_label_and_the_code(store):
    m = DECODER_CASES[-1].values[1]
    add_flag(store, add_bin(store, "cab1/a1", m, label="10nF"), m, "label-conflict")
    assert list_flags(store)[0].hint.startswith(
        "the label says 10nF (10 nF), the code 104 says 100 nF: measure it")


def test_both_ends_hint_asks_which_end_the_bands_start_from(store):
    m = DECODER_CASES[7].values[1]
    add_flag(store, add_bin(store, "cab1/a1", m), m, "both-ends")
    assert list_flags(store)[0].hint == "check which end the bands start from: 100 nF or 400 pF?"


def test_an_unknown_flag_kind_is_listed_with_a_generic_meaning_and_settled_by_a_note(store):
    bin_id = add_bin(store, "cab1/a1", Marking("104", Decimal(100000)))
    with store.writing():
        fid = store.raise_flag(kind="odd-smell", message="smells burnt", fingerprint="x", bin_id=bin_id)
    [view] = list_flags(store, kind="odd-smell")
    assert view.meaning.startswith("a flag kind this version does not document")
    assert flag_kind("odd-smell").kind == "odd-smell"
    settle(store, "cab1/a1", note="aired out")
    assert flag_row(store, fid)["status"] == "settled"


def test_settling_keeps_the_original_marking_and_writes_the_chosen_reading(store):
    m = DECODER_CASES[1].values[1]
    bin_id = add_bin(store, "cab1/a1", m)
    add_flag(store, bin_id, m, "ambiguous-code")
    before = store.one("SELECT marking, decoded_json FROM parts WHERE bin_id = ?", (bin_id,))
    settle(store, "cab1/a1", reading=1)
    after = store.one("SELECT * FROM parts WHERE bin_id = ?", (bin_id,))
    assert (after["marking"], after["decoded_json"]) == (before["marking"], before["decoded_json"])
    assert json.loads(after["settled_json"]) == pick_reading(m, 1).to_json()
    assert json.loads(after["settled_json"])["alternatives"] == []
    assert after["capacitance_pf"] == 47000.0 and after["tol_code"] == "K"


def test_the_decision_goes_into_the_ledger_as_a_settle_movement_of_zero(store):
    m = DECODER_CASES[1].values[1]
    bin_id = add_bin(store, "cab1/a1", m, on_hand=None)
    fid = add_flag(store, bin_id, m, "ambiguous-code")
    done = settle(store, "cab1/a1", reading=1, note="measured 46.5 nF", by="ana")
    row = store.one("SELECT * FROM ledger WHERE id = ?", (done.ledger_id,))
    note = json.loads(row["note"])
    assert (row["kind"], row["delta"], row["actor"]) == ("settle", 0, "ana")
    assert note["note"] == "measured 46.5 nF" and note["flags"] == [fid]
    assert (note["old"]["capacitance_pf"], note["new"]["capacitance_pf"]) == (47.0, 47000.0)
    assert store.one("SELECT on_hand FROM bins WHERE id = ?", (bin_id,))["on_hand"] is None


def test_who_defaults_to_the_login_name(store, monkeypatch):
    monkeypatch.setenv("USER", "benchperson")
    m = DECODER_CASES[1].values[1]
    add_flag(store, add_bin(store, "cab1/a1", m), m, "ambiguous-code")
    done = settle(store, "cab1/a1", reading=0)
    assert store.one("SELECT actor FROM ledger WHERE id = ?", (done.ledger_id,))["actor"] == "benchperson"


def test_a_settled_flag_does_not_return_when_the_same_row_is_imported_again(store):
    m = DECODER_CASES[1].values[1]
    bin_id = add_bin(store, "cab1/a1", m)
    fid = add_flag(store, bin_id, m, "ambiguous-code")
    settle(store, "cab1/a1", reading=1)
    assert add_flag(store, bin_id, m, "ambiguous-code") is None
    assert flag_row(store, fid)["status"] == "settled"
    assert list_flags(store) == []


def test_the_settled_reading_is_what_part_marking_returns(store):
    from stock.inventory.bins import part_marking

    m = DECODER_CASES[1].values[1]
    bin_id = add_bin(store, "cab1/a1", m)
    settle(store, "cab1/a1", reading=1)
    row = store.one("SELECT * FROM parts WHERE bin_id = ?", (bin_id,))
    assert part_marking(row).capacitance_pf == Decimal(47000)


def test_settling_refreshes_the_stored_grades(store):
    from stock.inventory.stored_grades import refresh_stored_grades
    from stock.physics.grading import grade_all

    m = Marking("100J X7R", Decimal(100), Tolerance(Decimal(5), Decimal(5), "%", "J"), dielectric=X7R,
                flags=(Flag("disputed-code", "x"),),
                alternatives=(Alternative("C0G after all", dielectric=C0G),))
    bin_id = add_bin(store, "cab1/a1", m)
    refresh_stored_grades(store, [bin_id])

    def stored():
        return {r["application"]: r["grade"] for r in store.rows(
            "SELECT application, grade FROM grades WHERE bin_id = ?", (bin_id,))}

    before = stored()
    settle(store, "cab1/a1", reading=1)
    expected = {app: g.word for app, g in grade_all(pick_reading(m, 1)).items()}
    assert stored() == expected and stored() != before


def test_reopen_restores_the_decoded_reading_and_reopens_the_flags(store):
    m = DECODER_CASES[1].values[1]
    bin_id = add_bin(store, "cab1/a1", m)
    fid = add_flag(store, bin_id, m, "ambiguous-code")
    settle(store, "cab1/a1", reading=1)
    done = reopen(store, "cab1/a1", note="measured again", by="ana")
    part = store.one("SELECT * FROM parts WHERE bin_id = ?", (bin_id,))
    assert part["settled_json"] is None and part["capacitance_pf"] == 47.0
    assert done.reopened == (fid,) and flag_row(store, fid)["status"] == "open"
    note = json.loads(store.one("SELECT note FROM ledger WHERE id = ?", (done.ledger_id,))["note"])
    assert note["via"] == "reopen" and note["note"] == "measured again"


def test_reopening_a_bin_with_nothing_settled_is_refused(store):
    add_bin(store, "cab1/a1", Marking("104", Decimal(100000)))
    with pytest.raises(Refused, match="cannot reopen bin cab1/a1: nothing on it was settled"):
        reopen(store, "cab1/a1")


# Bad decisions: each refusal names what would have been accepted.
@pytest.mark.parametrize("kwargs, error, message", [
    pytest.param({"reading": 1, "value": "1n"}, BadValue, "--reading and --value: cannot read 'both'",
                 id="two-decisions"),
    pytest.param({"reading": 5}, BadValue, "a reading number 0 to 1 as listed by `stock flags`",
                 id="reading-out-of-range"),
    pytest.param({"value": "15x"}, BadValue, "--value: cannot read '15x'", id="bad-value"),
    pytest.param({"note": "looks fine"}, Refused, "nothing to settle with a note alone", id="note-alone"),
    pytest.param({"count": -3}, BadValue, "--count: cannot read '-3'", id="negative-count"),
    pytest.param({"flag_id": 999, "reading": 1}, NotFound, "no open flag on bin cab1/a1 numbered '999'",
                 id="no-such-flag"),
])
def test_a_decision_that_cannot_be_taken_is_refused_with_the_reason(store, kwargs, error, message):
    m = DECODER_CASES[1].values[1]
    add_flag(store, add_bin(store, "cab1/a1", m), m, "ambiguous-code")
    with pytest.raises(error, match=message.replace("(", r"\(").replace(")", r"\)")):
        settle(store, "cab1/a1", **kwargs)
    assert list_flags(store)[0].status == "open"


def test_keeping_the_decoders_reading_of_an_unreadable_marking_is_refused(store):
    m = DECODER_CASES[5].values[1]
    add_flag(store, add_bin(store, "cab1/a1", m), m, "unreadable")
    with pytest.raises(Refused, match="it found no value; give --value or --marking"):
        settle(store, "cab1/a1", reading=0)


def test_settling_a_reading_flag_by_id_with_only_a_note_is_refused(store):
    m = DECODER_CASES[1].values[1]
    fid = add_flag(store, add_bin(store, "cab1/a1", m), m, "ambiguous-code")
    with pytest.raises(Refused, match=f"cannot settle flag {fid} \\(ambiguous-code\\): it is settled by a reading"):
        settle(store, "cab1/a1", flag_id=fid, note="fine")


def test_a_corrected_marking_is_decoded_again(store):
    pytest.importorskip("stock.markings.decoder")
    m = DECODER_CASES[6].values[1]
    fid = add_flag(store, add_bin(store, "cab1/a1", m), m, "unparsed")
    done = settle(store, "cab1/a1", marking="473J")
    assert done.new["capacitance_pf"] == 47000.0 and done.closed == (fid,)
    assert done.new["text"] == "473J"


def test_readings_fill_an_alternatives_missing_facts_from_the_chosen_reading():
    m = DECODER_CASES[1].values[1]
    found = readings(m)
    assert [(r.number, r.capacitance_pf, r.tolerance) for r in found] == [
        (0, Decimal(47), TEN), (1, Decimal(47000), TEN)]


# Stock checks. The shelf-life rule (2 years) is common practice, no published source.
def test_an_unknown_quantity_is_flagged_and_settled_by_a_count(store):
    bin_id = add_bin(store, "cab1/a1", Marking("104", Decimal(100000)), on_hand=None)
    assert raise_stock_flags(store, today=TODAY).raised == 1
    [view] = list_flags(store)
    assert view.kind == "unknown-quantity" and "stock settle cab1/a1 --count N" in view.hint
    done = settle(store, "cab1/a1", count=40, by="ana")
    assert done.closed == (view.id,)
    assert store.one("SELECT on_hand FROM bins WHERE id = ?", (bin_id,))["on_hand"] == 40
    row = store.one("SELECT * FROM ledger WHERE id = ?", (done.ledger_id,))
    assert (row["kind"], row["delta"], json.loads(row["note"])["by"]) == ("count", 40, "ana")
    assert raise_stock_flags(store, today=TODAY).raised == 0


def test_an_unknown_quantity_flag_from_the_import_is_not_raised_twice(store):
    bin_id = add_bin(store, "cab1/a1", Marking("104", Decimal(100000)), on_hand=None)
    with store.writing():
        store.raise_flag(kind="unknown-quantity", message="no count", bin_id=bin_id,
                         fingerprint="cab1/a1|unknown-quantity|other-shape")
    assert raise_stock_flags(store, today=TODAY).raised == 0
    assert len(list_flags(store)) == 1


def test_a_bin_below_its_minimum_is_flagged_and_settled_by_a_note(store):
    add_bin(store, "cab1/a1", Marking("104", Decimal(100000)), on_hand=5, minimum=20)
    raise_stock_flags(store, today=TODAY)
    [view] = list_flags(store)
    assert view.kind == "below-minimum" and view.hint.startswith("holds 5, minimum 20: reorder")
    settle(store, "cab1/a1", note="reordered 100")
    assert raise_stock_flags(store, today=TODAY).raised == 0
    assert list_flags(store) == []


def test_a_refilled_bin_closes_its_shortage_and_a_new_shortage_is_flagged_again(store):
    bin_id = add_bin(store, "cab1/a1", Marking("104", Decimal(100000)), on_hand=5, minimum=20)
    raise_stock_flags(store, today=TODAY)
    settle(store, "cab1/a1", note="reordered")
    with store.writing():
        store.move(bin_id, 95, "count")
    raise_stock_flags(store, today=TODAY)
    with store.writing():
        store.move(bin_id, -90, "pull")
    assert raise_stock_flags(store, today=TODAY).raised == 1
    assert list_flags(store)[0].kind == "below-minimum"


def test_a_shortage_that_ends_is_closed_by_the_check(store):
    bin_id = add_bin(store, "cab1/a1", Marking("104", Decimal(100000)), on_hand=5, minimum=20)
    raise_stock_flags(store, today=TODAY)
    with store.writing():
        store.move(bin_id, 50, "count")
    assert raise_stock_flags(store, today=TODAY).closed == 1
    assert list_flags(store) == []


def test_an_old_electrolytic_is_flagged_for_its_shelf_life_and_settled_by_a_note(store):
    add_bin(store, "cab1/e1", Marking("100u 25V", Decimal(10) ** 8, dielectric=ALU),
            date_code="1832")
    add_bin(store, "cab1/e2", Marking("100u 25V", Decimal(10) ** 8, dielectric=ALU),
            date_code="2025-06")
    add_bin(store, "cab1/c1", Marking("104", Decimal(100000), dielectric=X7R), date_code="1832")
    raise_stock_flags(store, today=TODAY)
    [view] = list_flags(store)
    assert (view.kind, view.bin_key) == ("shelf-life", "cab1/e1")
    assert "2018 week 32" in view.message and "about 8 years 4 months old" in view.message
    assert "discharge it before handling" in view.hint
    settle(store, "cab1/e1", note="reformed at 25 V through 10 kΩ")
    assert raise_stock_flags(store, today=TODAY).raised == 0


def test_an_electrolytic_with_an_unreadable_date_code_is_flagged_as_age_unknown(store):
    add_bin(store, "cab1/e1", Marking("100u", Decimal(10) ** 8, dielectric=ALU), date_code="Q3")
    raise_stock_flags(store, today=TODAY)
    [view] = list_flags(store)
    assert view.kind == "shelf-life" and "its age is unknown" in view.message


# Date codes: YYWW as ISO 8601 weeks (Python's date.fromisocalendar implements ISO 8601).
@pytest.mark.parametrize("raw, expected", [
    pytest.param("1832", date(2018, 8, 6), id="yyww"),
    pytest.param("0701", date(2007, 1, 1), id="yyww-first-week"),
    pytest.param("2019-04", date(2019, 4, 1), id="yyyy-mm"),
    pytest.param("2019/4", date(2019, 4, 1), id="yyyy-slash-m"),
    pytest.param("1998", date(1998, 1, 1), id="yyyy-when-week-98-cannot-be"),
    pytest.param("2012", date(2012, 1, 1), id="both-readings-take-the-older"),
    pytest.param("1860", None, id="neither-reading"),
    pytest.param("Q3", None, id="words"),
])
def test_date_codes_are_read_as_dates(raw, expected):
    assert parse_date_code(raw, today=TODAY).date == expected
