"""The trade's substitution rules: which kind of part may stand in for which, and on what terms.

A repairer replacing a part keeps its job working: the stand-in must hold the value, the voltage
and the stability the original had. Most of that is physics (:mod:`stock.matching.replacement`
compares the worst-case drift of both parts at the same conditions); these tables add what the
trade has learnt, each rule as one line of data:

- **kind rules** (:data:`SUBSTITUTIONS`): from which original kind to which stand-in kind, where
  (never across the mains, only across the mains, in any position), in which job (timing ...),
  and what admits the stand-in: ``"original"`` (it drifts no more than the original did),
  ``"fit:<job>"`` (it grades fit for that job: mica and C0G/NP0 are the trade's equals in tuned
  work though their tempcos differ), ``"class"`` (across the mains only the safety class and
  the rating count), ``"job"`` (the original's stability is not known, and the stand-in is fit
  for the job the user named) or ``"asked"`` (only when the user asks for less stability). The first rule that matches wins; a stand-in no rule admits is not offered.
- **mounting changes** (:data:`MOUNTING_CHANGES`): an axial can may become a radial part, with the
  note the repairer needs; a leaded position never takes a chip.
- **never** (:data:`NEVER_STAND_INS`): kinds the trade does not put back into equipment.

Kinds are the grading table's (:func:`stock.physics.grading.kind_of`: ``ceramic-1``,
``ceramic-2`` or a family name); a rule may also name dielectric codes (``Z5U``) or ``C0G``,
which any Class 1 part of 0 ± 30 ppm/K answers (NP0 is the same characteristic: [parameters-page], [latvian-codes] of docs/sources.md).

>>> rule_for("mica", {"ceramic-1", "C0G"}, mains=False, use="tuned").name
'mica-to-c0g'
>>> rule_for("paper", {"polypropylene"}, mains=True, use=None) is None
True
"""

from __future__ import annotations

from collections.abc import Iterable, Iterator
from dataclasses import dataclass

ANY = "*"          # any kind
SAME = "same"      # the original's own kind
SAFETY = "safety"  # any part carrying an IEC 60384-14 class

FILMS = frozenset({"polypropylene", "polyester", "polyethylene-naphthalate", "polyphenylene-sulfide",
                   "polycarbonate", "polystyrene", "ptfe"})
# EIA-198 Class 2 codes whose change letter is R (±15 %): "X7R or better" ([parameters-page], [app-report-class2], [tolerance-blog]).
FIFTEEN_PCT_CLASS2 = frozenset({"X7R", "X5R", "X8R", "X6R"})
WIDE_CLASS2 = frozenset({"Z5U", "Y5V"})   # +22/−56 % and +22/−82 % (EIA-198, [latvian-codes], [tolerance-blog])


@dataclass(frozen=True)
class Substitution:
    """One rule of the trade: an original kind, the stand-ins it allows, where, and what admits them."""

    name: str
    originals: frozenset[str]      # kinds or codes; ANY for every kind
    stand_ins: frozenset[str]      # kinds or codes; SAME, SAFETY or ANY
    mains: bool | None             # True: only across the mains; False: never there; None: either
    uses: frozenset[str] | None    # the jobs (--use) the rule holds for; None: any job, or none named
    admits: str                    # "original", "fit:<job>" or "class" (see the module docstring)
    text: str                      # the rule in the trade's words
    source: str

    def to_json(self) -> dict[str, str]:
        return {"name": self.name, "text": self.text, "source": self.source}


def _rule(name: str, originals: Iterable[str], stand_ins: Iterable[str], mains: bool | None,
          uses: Iterable[str] | None, admits: str, text: str, source: str) -> Substitution:
    return Substitution(name, frozenset(originals), frozenset(stand_ins), mains,
                        None if uses is None else frozenset(uses), admits, text, source)


_COMMON = "common practice, no published source"

# The first rule that matches an (original, stand-in) pair decides. Sources beside each line.
SUBSTITUTIONS: tuple[Substitution, ...] = (
    _rule("mains-paper-by-class", {"paper"}, {SAFETY}, True, None, "class", "an old paper part across the mains is a known fire hazard: only an X/Y safety part of the position's class replaces it", _COMMON),  # common practice, no published source
    _rule("mains-by-class", {ANY}, {SAFETY}, True, None, "class", "across the mains only an X/Y safety part whose IEC 60384-14 class covers the position", "IEC 60384-14 (S29, S30, S66)"),  # IEC 60384-14
    _rule("mica-to-c0g", {"mica"}, {"C0G"}, False, None, "fit:tuned", "mica and C0G/NP0 ceramics are the trade's equals in tuned work: near-zero tempco, no ageing", _COMMON),  # common practice, no published source
    _rule("c0g-to-mica", {"C0G"}, {"mica"}, False, None, "fit:tuned", "C0G/NP0 and mica are the trade's equals in tuned work: near-zero tempco, no ageing", _COMMON),  # common practice, no published source
    _rule("polystyrene-to-mica", {"polystyrene"}, {"mica"}, False, None, "original", "polystyrene gives way to mica: as stable, and it takes soldering heat", _COMMON),  # common practice, no published source
    _rule("polystyrene-to-c0g", {"polystyrene"}, {"C0G"}, False, None, "original", "polystyrene gives way to a C0G/NP0 ceramic: as stable, smaller, and it takes soldering heat", _COMMON),  # common practice, no published source
    _rule("wide-class2-to-x7r", WIDE_CLASS2, FIFTEEN_PCT_CLASS2, False, None, "original", "a Z5U or Y5V part may always be upgraded to X7R or better", "EIA-198 windows (S1, S3, S6); the upgrade is common practice"),  # EIA-198 + common practice
    _rule("paper-to-film", {"paper"}, FILMS, False, None, "original", "paper and wax-paper parts are replaced by film of at least the same voltage", _COMMON),  # common practice, no published source
    _rule("timing-aluminium-to-tantalum", {"aluminium-electrolytic"}, {"tantalum", "tantalum-polymer"}, False, {"timing"}, "original", "an aluminium electrolytic in a timing position gives way to a tantalum: more stable, lower leakage", _COMMON),  # common practice, no published source
    _rule("like-for-like", {ANY}, {SAME}, False, None, "original", "the same kind of part as the original", _COMMON),  # common practice, no published source
    _rule("upgrade", {ANY}, {ANY}, False, None, "original", "a part that drifts no more than the original is always allowed (an upgrade)", _COMMON),  # common practice, no published source
    _rule("fit-for-the-job", {ANY}, {ANY}, False, None, "job", "the original's stability is not known: a part fit for the job named (--use) stands in", _COMMON),  # common practice, no published source
    _rule("less-stable-on-request", {ANY}, {ANY}, False, None, "asked", "a part that drifts more than the original, offered only because less stability was asked for", _COMMON),  # common practice, no published source
)

# (original mounting, stand-in mounting) -> the note a repairer needs; None = not offered.
MOUNTING_CHANGES: dict[tuple[str, str], str | None] = {
    ("axial", "radial"): "radial leads in an axial position: stand it upright or lay it down with one lead bent back and sleeved, and fix the body against vibration",  # common practice, no published source
    ("radial", "axial"): "axial leads in a radial position: bend one lead back along the body and sleeve it, and fix the body against vibration",  # common practice, no published source
    ("axial", "smd"): None,   # a chip does not take a leaded position: common practice, no published source
    ("radial", "smd"): None,  # common practice, no published source
}

# Kinds never offered as stand-ins, with why. Common practice, no published source.
NEVER_STAND_INS: dict[str, str] = {
    "paper": "old paper parts take up moisture and leak: the trade replaces them, it does not fit them",
}


def matches(tokens: frozenset[str], names: set[str]) -> bool:
    """Whether a rule's token set names a part (its kind, code and the C0G/safety markers)."""
    return ANY in tokens or bool(tokens & names)


def candidate_rules(original: set[str], original_kind: str | None, stand_in: set[str], *, mains: bool,
                    use: str | None) -> Iterator[Substitution]:
    """Every rule whose original, stand-in, position and job fit, in table order.

    ``original`` and ``stand_in`` are the names each part answers to (kind, family, code, ``C0G``,
    ``safety``: :func:`stock.matching.stand_ins.part_names`); the caller checks what each admits.
    """
    for rule in SUBSTITUTIONS:
        if rule.mains is not None and rule.mains != mains:
            continue
        if rule.uses is not None and use not in rule.uses:
            continue
        if not matches(rule.originals, original):
            continue
        if SAME in rule.stand_ins:
            if original_kind is None or original_kind not in stand_in:
                continue
        elif not matches(rule.stand_ins, stand_in):
            continue
        yield rule


def rule_for(original: str | set[str], stand_in: set[str], *, mains: bool, use: str | None,
             original_kind: str | None = None) -> Substitution | None:
    """The first rule that fits (before its admission test); None when none does.

    >>> rule_for({"Z5U", "ceramic-2"}, {"X7R", "ceramic-2"}, mains=False, use="bypass").name
    'wide-class2-to-x7r'
    >>> rule_for("aluminium-electrolytic", {"aluminium-electrolytic"}, mains=False, use=None).name
    'like-for-like'
    """
    names = {original} if isinstance(original, str) else set(original)
    kind = original_kind or (original if isinstance(original, str) else None)
    return next(candidate_rules(names, kind, stand_in, mains=mains, use=use), None)


def rules_from(original: set[str], *, mains: bool, use: str | None) -> tuple[Substitution, ...]:
    """The named rules (not the generic ones for any kind) that could apply to an original, in order."""
    return tuple(r for r in SUBSTITUTIONS
                 if r.name not in ("like-for-like", "upgrade", "fit-for-the-job", "less-stable-on-request")
                 and (r.mains is None or r.mains == mains)
                 and (r.uses is None or use in r.uses)
                 and ANY not in r.originals and matches(r.originals, original))


__all__ = ["ANY", "FIFTEEN_PCT_CLASS2", "FILMS", "MOUNTING_CHANGES", "NEVER_STAND_INS", "SAFETY", "SAME",
           "SUBSTITUTIONS", "Substitution", "WIDE_CLASS2", "candidate_rules", "matches", "rule_for",
           "rules_from"]
