"""Which part may go on which BOM line: mains and tuned rules first, then polarity, voltage, dielectric, value.

Sources (docs/sources.md): X/Y classes and "a part without a class never goes on a mains position"
([IEC 60384-14]); C0G Class 1 (0 ±30 ppm/K), U2J −750 ±120 ppm/K, X7R −55…+125 °C ±15 % and X5R
−55…+85 °C ±15 % ([EIA-198]); NP0 the old name of C0G ([parameters-page]); J = ±5 %, K = ±10 %
([IEC 60062]); that a Class 2 part never goes in a tuned circuit, that a higher voltage rating is
allowed, and the 1 µF threshold for electrolytics at an unnamed position are common practice, no
published source. Tolerance bands are hand arithmetic (105 nF ±5 % is 99.75…110.25 nF).
"""

from __future__ import annotations

from decimal import Decimal

import pytest

from stock.kitting.bom import read_bom
from stock.kitting.line_rules import ALLOWANCES, check_part
from stock.markings.decoder import decode

BOM = """Designator,Qty,Value,Tolerance,Voltage,Dielectric,Use,Tempco
C1,1,100n,10%,50V,X7R,,
C2,1,100p,5%,50V,C0G,tuned,
CX1,1,100n,,275VAC X2,,,
C3,1,10u,,25V,,,
C4,1,100n,5%,50V,,,
C5,1,100n,,,,,
C6,1,100n,10%,,,,
C7,1,47p,5%,50V,,tuned,-750±120
C8,1,100p,5%,50V,C0G,,
C9,1,100n,,230VAC,,,
C10,1,10u,,25V,tantalum,,
C11,1,47p,5%,50V,,tuned,-750±60
"""


@pytest.fixture(scope="module")
def lines(tmp_path_factory):
    path = tmp_path_factory.mktemp("bom") / "board.csv"
    path.write_text(BOM, encoding="utf-8")
    return {line.refs[0]: line for line in read_bom(path).lines}


def verdict(lines, ref, marking, allow=()):
    m = decode(marking)
    return check_part(lines[ref], m, m.capacitance_pf, frozenset(allow))


def test_the_allowances_are_the_two_that_relax_tolerance_and_class():
    assert set(ALLOWANCES) == {"looser-tolerance", "lower-class"}


# refusals: IEC 60384-14 for mains, EIA-198 classes, IEC 60062 letters, common practice for the rest
@pytest.mark.parametrize("ref, marking, allow, refused", [
    pytest.param("CX1", "104K 275VAC X7R", (), "not safety-rated; the mains line needs X2",
                 id="no-class-never-on-mains"),
    pytest.param("CX1", "104K 275VAC X7R", ALLOWANCES, "not safety-rated; the mains line needs X2",
                 id="no-allowance-relaxes-mains"),
    pytest.param("C2", "101J 50V X7R", ALLOWANCES, "X7R is a Class 2 ceramic; never in a tuned circuit",
                 id="class-2-never-tuned"),
    pytest.param("C2", "101J 50V", (), "dielectric unknown; a tuned circuit needs a known stable dielectric",
                 id="unknown-dielectric-never-tuned"),
    pytest.param("C1", "104K 25V X7R", (), "rated 25 V DC, below the 50 V DC asked", id="voltage-too-low"),
    pytest.param("C1", "104K X7R", (), "voltage rating unknown; the line needs 50 V DC", id="voltage-unknown"),
    pytest.param("C1", "104K 50V X5R", (), "X5R does not cover X7R (narrower range or wider change)",
                 id="x5r-does-not-cover-x7r"),
    pytest.param("C4", "104K 50V X7R", (), "±10 % is looser than the ±5 % asked", id="looser-tolerance"),
    pytest.param("C5", "474K 50V X7R", (), "nominal 470 nF, not 100 nF (the line gives no tolerance)",
                 id="another-value"),
    pytest.param("C5", "0.1uF 50V electrolytic", (), "polarised (aluminium electrolytic); the BOM line does not say the"
                 " position is polarised", id="electrolytic-below-1uF-position"),
])
def test_a_part_that_may_not_go_on_a_line_is_refused_with_the_reason(lines, ref, marking, allow, refused):
    assert verdict(lines, ref, marking, allow).refused == refused


@pytest.mark.parametrize("ref, marking, allow, note", [
    pytest.param("CX1", "X1 104K 440VAC", (), "X1 for X2: a class that covers it (IEC 60384-14)",
                 id="x1-covers-x2"),
    pytest.param("C1", "104K 100V X7R", (), "100 V DC part for a 50 V DC line: a higher voltage rating is allowed",
                 id="higher-voltage"),
    pytest.param("C1", "104K 50V C0G", (), "C0G in place of X7R: a Class 1 part is more stable",
                 id="class-1-for-class-2"),
    pytest.param("C1", "104K 50V X5R", ("lower-class",),
                 "X5R in place of X7R: a lower class, allowed by --allow lower-class", id="lower-class-allowed"),
    pytest.param("C4", "104K 50V", ("looser-tolerance",),
                 "±10 % where ±5 % was asked: a looser tolerance, allowed by --allow looser-tolerance",
                 id="looser-tolerance-allowed"),
    pytest.param("C1", "104J 50V X7R", (), "±5 % part for ±10 %: a tighter tolerance is allowed",
                 id="tighter-tolerance"),
])
def test_a_part_that_may_go_says_what_it_gives_up_or_gains(lines, ref, marking, allow, note):
    v = verdict(lines, ref, marking, allow)
    assert v.refused is None
    assert note in v.notes


def test_an_electrolytic_at_an_unnamed_1uF_position_goes_with_a_polarity_note(lines):
    v = verdict(lines, "C3", "10uF 25V electrolytic")
    assert v.refused is None
    assert any("fit it by the board's polarity mark" in n for n in v.notes)


def test_a_matching_part_goes_without_notes(lines):
    assert verdict(lines, "C1", "104K 50V X7R").refused is None
    assert verdict(lines, "C2", "101J 50V C0G").notes == ()


def test_in_a_pair_the_value_is_left_to_the_pair(lines):
    m = decode("474K 50V X7R")
    assert check_part(lines["C5"], m, m.capacitance_pf, in_pair=True).refused is None
    assert check_part(lines["C5"], m, Decimal(100_000)).refused is None   # the pair's value is 100 nF


# 100 nF ±10 % allows 90…110 nF; each part's band by hand from its J (±5 %) letter
@pytest.mark.parametrize("marking, refused", [
    pytest.param("95n J 50V", None, id="95nF-J-is-90.25-to-99.75-inside"),
    pytest.param("0.0948uF J 50V", None, id="94.8nF-J-is-90.06-to-99.54-inside"),
    pytest.param("0.0947uF J 50V", "nominal 94.7 nF ±5 % can stray outside 100 nF ±10 %",
                 id="94.7nF-J-reaches-down-to-89.965"),
    pytest.param("105n J 50V", "nominal 105 nF ±5 % can stray outside 100 nF ±10 %",
                 id="105nF-J-reaches-up-to-110.25"),
])
def test_a_part_off_the_lines_value_goes_only_if_its_whole_band_stays_inside(lines, marking, refused):
    v = verdict(lines, "C6", marking)
    assert v.refused == refused
    if refused is None:
        assert any(n.endswith("stays within 100 nF ±10 %") for n in v.notes)


# tempco window −750 ±120 = −870…−630 ppm/K (hand arithmetic); U2J, C0G and P100 from [EIA-198]
@pytest.mark.parametrize("marking, refused", [
    pytest.param("47J 50V U2J", None, id="u2j-fills-the-window"),
    pytest.param("47J 50V C0G", "C0G tempco 0±30 ppm/K lies outside −870…−630 ppm/K", id="c0g-outside"),
    pytest.param("47J 50V P100", "P100 tempco 100±30 ppm/K (as M7G, the EIA-198 code P100 is sold as;"
                 " no tolerance is marked) lies outside −870…−630 ppm/K", id="p100-outside"),
])
def test_a_tempco_window_takes_only_parts_whose_tempco_lies_in_it(lines, marking, refused):
    assert verdict(lines, "C7", marking).refused == refused


# An old name carries no tolerance on α; a tempco window judges it at the tolerance of the EIA-198
# code it is sold as (N750 as U2J, J = ±120 ppm/K [EIA-198]), as the search does, never at zero.
def test_an_old_name_in_a_tempco_window_is_judged_at_its_usual_tolerance_and_says_so(lines):
    v = verdict(lines, "C7", "47J 50V N750")          # −750 ± 120 = −870…−630: just inside
    assert v.refused is None
    assert v.notes == ("N750: judged at −750±120 ppm/K (as U2J, the EIA-198 code N750 is sold as;"
                       " no tolerance is marked)",)


def test_an_old_name_is_refused_by_a_window_narrower_than_its_usual_tolerance(lines):
    # −750 ± 60 = −810…−690 (hand arithmetic): U2G (±30) fits, N750 at ±120 does not
    assert verdict(lines, "C11", "47J 50V U2G").refused is None
    assert verdict(lines, "C11", "47J 50V N750").refused == (
        "N750 tempco −750±120 ppm/K (as U2J, the EIA-198 code N750 is sold as; no tolerance is marked)"
        " lies outside −810…−690 ppm/K")


def test_np0_for_c0g_is_the_same_characteristic(lines):
    # [parameters-page]: NP0 is the old name of C0G, 0 ±30 ppm/K
    assert verdict(lines, "C8", "101J 50V NP0").notes == (
        "NP0 for C0G: the same characteristic (0±30 ppm/K, EIA-198 Class 1)",)


@pytest.mark.parametrize("marking, refused", [
    pytest.param("104K 250V X7R", "rated for DC only; the line needs an AC rating", id="dc-only"),
    pytest.param("104K 250VAC X7R", None, id="an-ac-rating-above-230"),
])
def test_an_ac_line_needs_an_ac_rating(lines, marking, refused):
    assert verdict(lines, "C9", marking).refused == refused


@pytest.mark.parametrize("marking, refused", [
    pytest.param("10uF 25V tantalum", None, id="tantalum"),
    pytest.param("10uF 25V X7R", "not a polarised part; the BOM names tantalum", id="unpolarised-ceramic"),
    pytest.param("10uF 25V electrolytic", "aluminium electrolytic; the line names tantalum",
                 id="another-polarised-family"),
])
def test_a_line_naming_a_polarised_family_takes_only_that_family(lines, marking, refused):
    assert verdict(lines, "C10", marking).refused == refused
