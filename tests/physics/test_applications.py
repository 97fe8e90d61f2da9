"""The application thresholds table and a shop's TOML override.

Outside sources: the table's thresholds are common practice of the trade (no published source);
the mains row follows IEC 60384-14 (X line–line, Y line–earth; docs/sources.md: [IEC 60384-14]); TOML parsing
is Python's tomllib (TOML 1.0). The checks here are that the table is complete, readable and that an
override behaves: changes what it names, changes the version, and refuses a bad key clearly.
"""

from __future__ import annotations

from decimal import Decimal as D

import pytest

from stock.physics.applications import DEFAULT_TABLE, KINDS, OVERRIDE_FILE_NAME, load_rules
from stock.decoded import FAMILIES
from stock.errors import BadValue
from stock.physics.grading import APPLICATIONS


def test_the_table_has_one_row_per_application_in_order():
    assert tuple(DEFAULT_TABLE) == APPLICATIONS
    assert tuple(load_rules().rows) == APPLICATIONS


def test_every_kind_in_the_table_is_a_family_or_a_ceramic_class():
    assert set(KINDS) == {"ceramic-1", "ceramic-2"} | (set(FAMILIES) - {"ceramic"})
    for row in DEFAULT_TABLE.values():
        assert set(row["kinds"]) <= set(KINDS)


def test_fit_thresholds_never_exceed_marginal_ones():
    for rule in load_rules().rows.values():
        assert rule.drift_fit_pct <= rule.drift_marginal_pct
        assert rule.total_fit_pct <= rule.total_marginal_pct


def test_only_the_mains_row_demands_a_safety_class():
    # IEC 60384-14: X/Y classes are for parts across the line or to earth
    rules = load_rules()
    assert [r.name for r in rules.rows.values() if r.safety] == ["mains"]
    assert rules["mains"].polarised == "unfit"


def test_ac_jobs_refuse_polarised_parts_and_dc_jobs_accept_them():
    rules = load_rules()
    assert rules["tuned"].polarised == "unfit"
    assert rules["signal"].polarised == "marginal"
    assert rules["bulk"].polarised == rules["bypass"].polarised == "fit"


def test_class2_ceramics_are_shut_out_of_tuned_circuits():
    # the trade's rule of thumb (common practice, no published source): Class 2 in a tuned circuit is a design failure
    rules = load_rules()
    assert rules["tuned"].kind_word("ceramic-2") == "unfit"
    assert rules["tuned"].kind_word("double-layer") == "unfit"   # not listed: unfit


def test_an_aluminium_timing_part_is_marginal_at_best_and_tantalum_is_the_choice():
    # common practice, no published source: an aluminium electrolytic times only where accuracy
    # hardly matters (a slow visual flasher), so marginal at best, never fit; a tantalum is the
    # trade's part for larger-value timing (more stable, lower leakage)
    rules = load_rules()
    assert rules["timing"].kind_word("aluminium-electrolytic") == "marginal"
    assert rules["timing"].kind_word("tantalum") == "fit"


def test_the_built_in_table_is_not_changed_by_loading_an_override(tmp_path):
    path = tmp_path / "shop.toml"
    path.write_text('[timing.kinds]\n"aluminium-electrolytic" = "unfit"\n')
    load_rules(path)
    assert DEFAULT_TABLE["timing"]["kinds"]["aluminium-electrolytic"] == "marginal"


def test_an_explicit_override_changes_what_it_names_and_the_version(tmp_path):
    path = tmp_path / "shop.toml"
    path.write_text('[tuned]\ndrift_fit_pct = 1.5\n\n[mains]\nposition = "line-line"\n'
                    '[timing.kinds]\n"aluminium-electrolytic" = "unfit"\n')
    rules = load_rules(path)
    assert rules["tuned"].drift_fit_pct == D("1.5")
    assert rules["tuned"].drift_marginal_pct == D("2.5")        # untouched
    assert rules["mains"].position == "line-line"
    assert rules["timing"].kind_word("aluminium-electrolytic") == "unfit"
    assert rules["timing"].kind_word("polyester") == "fit"        # merged, not replaced
    assert rules.version != load_rules().version
    assert str(path) in rules.source


def test_the_file_beside_the_database_is_read_when_present(tmp_path):
    db = tmp_path / "stock.db"
    assert load_rules(db_path=db).version == load_rules().version
    (tmp_path / OVERRIDE_FILE_NAME).write_text("[bulk]\nmin_capacitance_pf = 100000\n")
    assert load_rules(db_path=db)["bulk"].min_capacitance_pf == D(100000)


# Bad overrides: a clear BadValue naming the file, the section and what is allowed
@pytest.mark.parametrize("text, message", [
    pytest.param("[tunned]\ndrift_fit_pct = 1\n", r"\[tunned\]: cannot read 'tunned' \(expected an application: tuned, timing",
                 id="unknown-application"),
    pytest.param("[tuned]\ndrift_fit = 1\n", r"\[tuned\] key: cannot read 'drift_fit' \(expected one of description",
                 id="unknown-key"),
    pytest.param("[tuned]\ndrift_fit_pct = \"lots\"\n", r"\[tuned\] drift_fit_pct: cannot read 'lots' \(expected a number\)",
                 id="not-a-number"),
    pytest.param("[tuned]\ndrift_fit_pct = -1\n", r"expected a number ≥ 0", id="negative"),
    pytest.param("[tuned]\ndrift_fit_pct = 9\n", r"expected a number no larger than drift_marginal_pct",
                 id="fit-above-marginal"),
    pytest.param("[tuned.kinds]\nceramic = \"fit\"\n", r"\[tuned\] kinds: cannot read 'ceramic' \(expected one of ceramic-1",
                 id="unknown-kind"),
    pytest.param("[tuned.kinds]\nmica = \"great\"\n", r"kinds.mica: cannot read 'great' \(expected one of fit, marginal, unfit\)",
                 id="unknown-word"),
    pytest.param("[mains]\nposition = \"earth\"\n", r"position: cannot read 'earth' \(expected one of any, line-line, line-earth\)",
                 id="unknown-position"),
    pytest.param("[tuned]\nvalue_critical = \"yes\"\n", r"value_critical: cannot read 'yes' \(expected true or false\)",
                 id="not-a-boolean"),
    pytest.param("tuned = 3\n", r"tuned: cannot read '3' \(expected a table \[tuned\]", id="not-a-table"),
    pytest.param("[tuned\n", r"expected valid TOML", id="broken-toml"),
])
def test_a_bad_override_is_refused_naming_file_key_and_what_is_allowed(tmp_path, text, message):
    path = tmp_path / "shop.toml"
    path.write_text(text)
    with pytest.raises(BadValue, match=message) as caught:
        load_rules(path)
    assert str(path) in str(caught.value)


def test_a_missing_explicit_override_is_refused():
    with pytest.raises(BadValue, match=r"--rules: cannot read 'nowhere.toml' \(expected an existing TOML file"):
        load_rules("nowhere.toml")
