"""The flag-kind table: every kind documented, each settled by a known decision, unknown kinds handled.

The table is the project's own (common practice, no published source); these tests hold its shape:
every kind the decoder and the stock checks raise is documented, and the templates fill.
"""

from __future__ import annotations

import re

import pytest

from stock.store.flag_kinds import FLAG_KINDS, QUARANTINE_FIXES, FlagKind, flag_kind


# the kinds named in DEVELOPERS.md, the README table and the decoder's docstrings
@pytest.mark.parametrize("kind, settled_by", [
    pytest.param("ambiguous-code", "reading", id="ambiguous-code-takes-a-reading"),
    pytest.param("both-ends", "reading", id="both-ends-takes-a-reading"),
    pytest.param("tolerance-assumed", "reading", id="tolerance-assumed-takes-a-reading"),
    pytest.param("unknown-quantity", "count", id="unknown-quantity-takes-a-count"),
    pytest.param("duplicate", "note", id="duplicate-takes-a-note"),
    pytest.param("below-minimum", "note", id="below-minimum-takes-a-note"),
    pytest.param("shelf-life", "note", id="shelf-life-takes-a-note"),
    pytest.param("polarity-assumed", "note", id="polarity-assumed-takes-a-note"),
])
def test_each_known_kind_says_which_decision_settles_it(kind, settled_by):
    entry = flag_kind(kind)
    assert entry is FLAG_KINDS[kind]
    assert entry.kind == kind
    assert entry.settled_by == settled_by


def test_every_kind_has_a_meaning_a_settle_hint_and_a_valid_decision():
    for kind, entry in FLAG_KINDS.items():
        assert isinstance(entry, FlagKind) and entry.kind == kind
        assert entry.meaning and entry.settle, kind
        assert entry.settled_by in ("reading", "count", "note"), kind


ALLOWED_FIELDS = {"id", "choices", "claims", "marking", "label", "value", "unparsed", "bins", "bin",
                  "on_hand", "minimum", "date_code", "age"}


def test_every_settle_template_uses_only_the_documented_fields():
    for kind, entry in FLAG_KINDS.items():
        fields = set(re.findall(r"{(\w+)}", entry.settle))
        assert fields <= ALLOWED_FIELDS, (kind, fields - ALLOWED_FIELDS)


def test_a_settle_template_fills_from_a_flags_bin():
    hint = FLAG_KINDS["unknown-quantity"].settle.format(bin="A7")
    assert hint == "count the bin: `stock settle A7 --count N`"


def test_an_unknown_kind_gets_a_generic_entry_under_its_own_name_settled_by_a_note():
    entry = flag_kind("made-up-kind")
    assert entry.kind == "made-up-kind"
    assert entry.settled_by == "note"
    assert "does not document" in entry.meaning
    assert "made-up-kind" not in FLAG_KINDS


def test_the_polarity_and_shelf_life_hints_carry_their_safety_cautions():
    # RULES.md Safety: polarity and stored charge need the usual cautions
    assert "vent" in FLAG_KINDS["polarity-assumed"].settle
    assert "discharge" in FLAG_KINDS["shelf-life"].settle


@pytest.mark.parametrize("reason", ["bad-quantity", "no-capacitance", "duplicate-row"])
def test_each_quarantine_reason_says_how_to_fix_it_and_import_again(reason):
    assert QUARANTINE_FIXES[reason].endswith("then import again")
