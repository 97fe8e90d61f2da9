"""The application thresholds: what each job asks of a capacitor, in one readable table.

:data:`DEFAULT_TABLE` is the table; a shop may override any entry in a TOML file (``--rules
PATH``, or ``stock-grading.toml`` next to the database), read by :func:`load_rules`. Each row:

- ``drift_fit_pct`` / ``drift_marginal_pct``: the largest worst-case *drift* (temperature + ageing +
  DC bias, tolerance left out) for ``fit`` / ``marginal``. Larger is ``unfit``.
- ``total_fit_pct`` / ``total_marginal_pct``: the same for the whole budget (tolerance included).
- ``sides``: ``"both"`` (a change either way matters) or ``"loss"`` (only less capacitance hurts:
  bypass, bulk).
- ``kinds``: the best grade each kind of part may reach, ``"fit"``, ``"marginal"`` or ``"unfit"``;
  kinds are the family names of :data:`stock.decoded.FAMILIES` with ceramics split into
  ``ceramic-1`` and ``ceramic-2``. A kind not listed is ``unfit``.
- ``polarised``: the best grade a polarised part (electrolytic, tantalum, double-layer, any part
  with a polarity mark) may reach. Jobs with AC or reversal on the part are ``unfit``.
- ``value_critical``: running past the part's rated temperature range makes it ``unfit`` (the
  value is not characterised there); otherwise ``marginal``.
- ``min_capacitance_pf``: below it the part is ``unfit`` (a reservoir needs capacitance).
- ``safety``: ``None``, or ``"X/Y"``: only a part carrying an IEC 60384-14 class may be fit.
  ``position`` says which: ``"line-line"`` (X or Y), ``"line-earth"`` (Y only), ``"any"`` (the
  default: a safety part is graded for the positions it may take, and the reason names them; a
  ``--position`` given to ``grade`` or ``find`` overrides it).
- ``needs_marked_tolerance``: ``false`` (the default) grades a part whose tolerance is not marked
  on its stability and carries "tolerance not marked" as a doubt; ``true`` makes it ``unknown``
  until the tolerance is marked or the value measured (a shop that wants proof).

The numbers are common practice of the trade, no published source, unless a comment says so.
A Y part may take an X position: Y parts are tested to a higher impulse voltage and must fail
open (IEC 60384-14; [safety-impulse-calculator], [safety-parameters-page], [safety-classes-blog]); the reverse
never holds.

>>> rules = load_rules()
>>> rules["tuned"].drift_fit_pct, rules["bulk"].sides
(Decimal('0.5'), 'loss')
"""

from __future__ import annotations

import hashlib
import json
import tomllib
from dataclasses import dataclass
from collections.abc import Mapping
from decimal import Decimal, InvalidOperation
from functools import lru_cache
from pathlib import Path
from types import MappingProxyType
from typing import Any

from stock.decoded import FAMILIES
from stock.errors import BadValue

OVERRIDE_FILE_NAME = "stock-grading.toml"
WORDS = ("fit", "marginal", "unfit")
KINDS: tuple[str, ...] = ("ceramic-1", "ceramic-2") + tuple(f for f in FAMILIES if f != "ceramic")
POSITIONS = ("line-line", "line-earth")   # the mains positions a build may name
_TABLE_POSITIONS = ("any",) + POSITIONS

_FILMS = ("polystyrene", "polypropylene", "polyester", "polyethylene-naphthalate",
          "polyphenylene-sulfide", "polycarbonate", "ptfe")

# Common practice, no published source (the trade's rules of thumb), unless noted.
DEFAULT_TABLE: dict[str, dict[str, Any]] = {
    "tuned": {
        "description": "LC tanks, oscillators, RF filters",
        "drift_fit_pct": "0.5", "drift_marginal_pct": "2.5",  # N750 over 0…50 °C ≈ 2.2 %: marginal
        "total_fit_pct": "10", "total_marginal_pct": "20",    # tolerance is trimmed out
        "sides": "both",
        "kinds": {"ceramic-1": "fit", "ceramic-2": "unfit", "polystyrene": "fit",
                  "polypropylene": "fit", "polycarbonate": "fit", "ptfe": "fit", "mica": "fit",
                  "glass": "fit", "polyphenylene-sulfide": "fit", "polyester": "marginal",
                  "polyethylene-naphthalate": "marginal"},
        "polarised": "unfit",      # RF across the part: AC
        "value_critical": True,
        "min_capacitance_pf": None,
        "safety": None, "position": "any",
    },
    "timing": {
        "description": "RC timers, integrators",
        "drift_fit_pct": "4", "drift_marginal_pct": "10",     # tantalum over 0…50 °C ≈ 3.1 %: fit
        "total_fit_pct": "15", "total_marginal_pct": "30",     # a ±10 % film part is fit
        "sides": "both",
        "kinds": {"ceramic-1": "fit", "ceramic-2": "marginal", "polystyrene": "fit",
                  "polypropylene": "fit", "polycarbonate": "fit", "ptfe": "fit", "mica": "fit",
                  "glass": "fit", "polyphenylene-sulfide": "fit", "polyester": "fit",
                  "polyethylene-naphthalate": "fit", "tantalum": "fit", "tantalum-polymer": "fit",
                  "paper": "marginal", "bipolar-electrolytic": "unfit",
                  # usable only where accuracy hardly matters (a slow visual flasher): marginal at
                  # best, never fit; its tolerance, leakage and wear-out drift mostly make it unfit.
                  # A tantalum is the trade's choice for larger-value timing.
                  "aluminium-electrolytic": "marginal"},
        "polarised": "fit",        # a timer's capacitor charges one way
        "value_critical": True,
        "min_capacitance_pf": None,
        "safety": None, "position": "any",
    },
    "signal": {
        "description": "coupling, tone and filter networks",
        "drift_fit_pct": "5", "drift_marginal_pct": "25",
        "total_fit_pct": "20", "total_marginal_pct": "50",
        "sides": "both",
        "kinds": {"ceramic-1": "fit", "ceramic-2": "marginal",  # voltage coefficient, microphony
                  **{f: "fit" for f in _FILMS}, "mica": "fit", "glass": "fit", "paper": "marginal",
                  "tantalum": "marginal", "tantalum-polymer": "marginal",
                  "aluminium-electrolytic": "marginal", "bipolar-electrolytic": "fit"},
        "polarised": "marginal",   # only where a steady DC bias keeps it one way round
        "value_critical": True,
        "min_capacitance_pf": None,
        "safety": None, "position": "any",
    },
    "bypass": {
        "description": "decoupling, RF bypass",
        "drift_fit_pct": "60", "drift_marginal_pct": "95",
        "total_fit_pct": "70", "total_marginal_pct": "95",
        "sides": "loss",
        "kinds": {"ceramic-1": "fit", "ceramic-2": "fit", **{f: "fit" for f in _FILMS},
                  "mica": "fit", "glass": "fit", "paper": "marginal", "tantalum": "fit",
                  "tantalum-polymer": "fit", "bipolar-electrolytic": "marginal",
                  "aluminium-electrolytic": "marginal"},  # low-frequency only: poor at RF
        "polarised": "fit",        # a DC rail: mind the polarity
        "value_critical": False,
        "min_capacitance_pf": None,
        "safety": None, "position": "any",
    },
    "bulk": {
        "description": "reservoir, energy storage",
        "drift_fit_pct": "60", "drift_marginal_pct": "95",
        "total_fit_pct": "70", "total_marginal_pct": "95",
        "sides": "loss",
        "kinds": {"ceramic-1": "fit", "ceramic-2": "fit", **{f: "fit" for f in _FILMS},
                  "paper": "marginal", "tantalum": "fit", "tantalum-polymer": "fit",
                  "aluminium-electrolytic": "fit", "bipolar-electrolytic": "marginal",
                  "double-layer": "fit"},
        "polarised": "fit",
        "value_critical": False,
        "min_capacitance_pf": "1000000",   # 1 µF
        "safety": None, "position": "any",
    },
    "mains": {
        "description": "across the line or line to earth (X/Y safety class required)",
        # the value hardly matters across the mains: the safety class and the AC rating decide
        "drift_fit_pct": "100", "drift_marginal_pct": "100",
        "total_fit_pct": "100", "total_marginal_pct": "100",
        "sides": "loss",
        "kinds": {"ceramic-1": "fit", "ceramic-2": "fit", **{f: "fit" for f in _FILMS},
                  "paper": "fit", "mica": "fit", "glass": "fit"},
        "polarised": "unfit",      # mains is AC
        "value_critical": False,
        "min_capacitance_pf": None,
        "safety": "X/Y", "position": "any",
    },
}


@dataclass(frozen=True)
class Rule:
    """One application's thresholds (see the module docstring for each field)."""

    name: str
    description: str
    drift_fit_pct: Decimal
    drift_marginal_pct: Decimal
    total_fit_pct: Decimal
    total_marginal_pct: Decimal
    sides: str
    kinds: Mapping[str, str]   # read-only: the built-in rules are shared
    polarised: str
    value_critical: bool
    min_capacitance_pf: Decimal | None
    safety: str | None
    position: str
    needs_marked_tolerance: bool = False

    def kind_word(self, kind: str) -> str:
        return self.kinds.get(kind, "unfit")


@dataclass(frozen=True)
class Rules:
    """The whole table in force: the rows, where overrides came from, and a version hash."""

    rows: Mapping[str, Rule]
    source: str
    version: str

    def __getitem__(self, name: str) -> Rule:
        return self.rows[name]

    def __iter__(self):
        return iter(self.rows)


_NUMBER_KEYS = ("drift_fit_pct", "drift_marginal_pct", "total_fit_pct", "total_marginal_pct")
_KEYS = (("description", "sides", "kinds", "polarised", "value_critical", "min_capacitance_pf",
          "safety", "position", "needs_marked_tolerance") + _NUMBER_KEYS)


def _decimal(value: Any, what: str) -> Decimal:
    if isinstance(value, bool):
        raise BadValue(what, str(value), "a number")
    try:
        number = Decimal(str(value))
    except InvalidOperation:
        raise BadValue(what, str(value), "a number") from None
    if not number.is_finite() or number < 0:
        raise BadValue(what, str(value), "a number ≥ 0")
    return number


def _choice(value: Any, allowed: tuple[str, ...], what: str) -> str:
    if value not in allowed:
        raise BadValue(what, str(value), "one of " + ", ".join(allowed))
    return value


def _build(name: str, row: dict[str, Any], where: str) -> Rule:
    at = f"{where} [{name}]"
    kinds = {}
    for kind, word in row["kinds"].items():
        _choice(kind, KINDS, f"{at} kinds")
        kinds[kind] = _choice(word, WORDS, f"{at} kinds.{kind}")
    for flag in ("value_critical", "needs_marked_tolerance"):
        if not isinstance(row.get(flag, False), bool):
            raise BadValue(f"{at} {flag}", str(row[flag]), "true or false")
    minimum = row["min_capacitance_pf"]
    numbers = {k: _decimal(row[k], f"{at} {k}") for k in _NUMBER_KEYS}
    for stem in ("drift", "total"):
        if numbers[f"{stem}_fit_pct"] > numbers[f"{stem}_marginal_pct"]:
            raise BadValue(f"{at} {stem}_fit_pct", str(numbers[f"{stem}_fit_pct"]),
                           f"a number no larger than {stem}_marginal_pct")
    return Rule(
        name=name, description=str(row["description"]), **numbers,
        sides=_choice(row["sides"], ("both", "loss"), f"{at} sides"),
        kinds=MappingProxyType(kinds),
        polarised=_choice(row["polarised"], WORDS, f"{at} polarised"),
        value_critical=row["value_critical"],
        min_capacitance_pf=None if minimum in (None, "", 0) else _decimal(minimum, f"{at} min_capacitance_pf"),
        safety=None if row["safety"] in (None, "", "none") else _choice(row["safety"], ("X/Y",), f"{at} safety"),
        position=_choice(row["position"], _TABLE_POSITIONS, f"{at} position"),
        needs_marked_tolerance=row.get("needs_marked_tolerance", False),
    )


def _merge(table: dict[str, dict[str, Any]], override: dict[str, Any], where: str) -> None:
    for name, section in override.items():
        if name not in table:
            raise BadValue(f"{where}: [{name}]", name, "an application: " + ", ".join(table))
        if not isinstance(section, dict):
            raise BadValue(f"{where}: {name}", str(section), f"a table [{name}] of thresholds")
        for key, value in section.items():
            if key not in _KEYS:
                raise BadValue(f"{where}: [{name}] key", key, "one of " + ", ".join(_KEYS))
            if key == "kinds":
                if not isinstance(value, dict):
                    raise BadValue(f"{where}: [{name}] kinds", str(value),
                                   f"a table [{name}.kinds] of kind = word")
                table[name]["kinds"] = {**table[name]["kinds"], **value}
            else:
                table[name][key] = value


def table_version(table: dict[str, dict[str, Any]], model_version: str) -> str:
    """A short hash of a table and the grading model's version: stored grades carry it."""
    text = json.dumps(table, sort_keys=True, default=str) + "|" + model_version
    return hashlib.sha256(text.encode()).hexdigest()[:16]


MODEL_VERSION = "grading-2"  # bump when the budget arithmetic changes


def load_rules(path: str | Path | None = None, *, db_path: str | Path | None = None) -> Rules:
    """The application table in force: the defaults, with a shop's TOML overrides on top.

    Args:
        path: a TOML file given explicitly; it must exist.
        db_path: the database; ``stock-grading.toml`` beside it is read when present.

    Raises:
        BadValue: the file is missing, not TOML, or names an unknown application, key, kind or word.
    """
    file: Path | None = None
    if path is not None:
        file = Path(path)
        if not file.is_file():
            raise BadValue("--rules", str(file), f"an existing TOML file such as {OVERRIDE_FILE_NAME}")
    elif db_path is not None and str(db_path) != ":memory:":
        candidate = Path(db_path).parent / OVERRIDE_FILE_NAME
        if candidate.is_file():
            file = candidate
    if file is None:
        return _built_in()
    table = json.loads(json.dumps(DEFAULT_TABLE))  # a deep copy that cannot share inner dicts
    try:
        override = tomllib.loads(file.read_text(encoding="utf-8"))
    except (tomllib.TOMLDecodeError, UnicodeDecodeError) as exc:
        raise BadValue(str(file), "its contents", f"valid TOML ({exc})") from None
    _merge(table, override, str(file))
    return _rules(table, str(file), f"built-in table with overrides from {file}")


def _rules(table: dict[str, dict[str, Any]], where: str, source: str) -> Rules:
    rows = {name: _build(name, row, where) for name, row in table.items()}
    return Rules(rows=MappingProxyType(rows), source=source, version=table_version(table, MODEL_VERSION))


@lru_cache(maxsize=1)
def _built_in() -> Rules:
    # built once: grading calls this for every part when no shop file is in force
    return _rules(json.loads(json.dumps(DEFAULT_TABLE)), "built-in table", "built-in table")


__all__ = ["DEFAULT_TABLE", "KINDS", "MODEL_VERSION", "OVERRIDE_FILE_NAME", "Rule", "Rules",
           "load_rules", "table_version"]
