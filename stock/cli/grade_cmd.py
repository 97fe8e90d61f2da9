"""`stock grade` (each part's fitness per application) and `stock drift` (a circuit's drift)."""

from __future__ import annotations

import json
from pathlib import Path
from typing import TYPE_CHECKING, Annotated, Optional

import typer

from stock.decoded import Marking
from stock.physics.drift import (
    TankDrift, TimerDrift, format_frequency, parse_frequency, parse_inductance, parse_kelvin, parse_period,
)
from stock.markings.description import brief
from stock.markings.safety_classes import MAINS_CAUTION, read_safety_class
from stock.physics.grading import APPLICATIONS, REFERENCE_C, Budget, conditions_from_text, pm
from stock.physics.applications import load_rules
from stock.units import format_capacitance, format_number

if TYPE_CHECKING:
    from stock.inventory.stored_grades import BinGrades


def _describe_part(m: Marking) -> str:
    return brief(m, ", ", missing_value="") or "nothing decoded"


def _budget_lines(budget: Budget) -> list[str]:
    lines = []
    for name, term in budget.terms():
        label = name.replace("dc_bias", "DC bias")
        if term is None:
            lines.append(f"  {label:<12} unknown")
        else:
            lines.append(f"  {label:<12} {pm(term.minus_pct, term.plus_pct):<14} {term.basis}")
    drift = ("temperature", "ageing", "dc_bias")
    lines.append(f"  {'drift':<12} {pm(budget.drift_minus_pct, budget.drift_plus_pct):<14}"
                 " temperature, ageing and DC bias compounded: (1 − a)(1 − b)… down, (1 + a)(1 + b)… up"
                 f" (linear sum {pm(budget.linear_sum(drift), budget.linear_sum(drift, 'plus_pct'))})")
    lines.append(f"  {'total':<12} {pm(budget.total_minus_pct, budget.total_plus_pct):<14}"
                 " tolerance included, compounded the same way"
                 f" (linear sum {pm(budget.linear_sum(), budget.linear_sum(side='plus_pct'))})")
    if budget.voltage is not None:
        lines.append(f"  {'voltage':<12} {budget.voltage.word:<14} {budget.voltage.reason}")
    if budget.out_of_range:
        lines.append(f"  {'range':<12} {'':<14} {budget.out_of_range}")
    if budget.over_temperature:
        lines.append(f"  {'rating':<12} {'':<14} {budget.over_temperature}")
    lines.append(f"  {'missing':<12} {', '.join(budget.missing) or 'nothing'}")
    for note in budget.notes:
        lines.append(f"  {'note':<12} {note}")
    return lines


def _explain(item: BinGrades) -> list[str]:
    first = next(iter(item.grades.values()))
    budget = first.budget
    lines = [f"bin {item.bin_key}: {item.marking.text} ({_describe_part(item.marking)})"]
    if item.package:
        lines.append(f"package: {item.package}")
    if budget is not None:
        lines.append(f"conditions: {budget.conditions.describe()} (reference +{format_number(REFERENCE_C)} °C)")
        lines.append("budget:")
        lines += _budget_lines(budget)
    lines.append("grades:")
    for name, g in item.grades.items():
        lines.append(f"  {name:<7} {g.word}")
        lines += [f"      {r}" for r in g.reasons]
    return lines


def _mains_word(item: BinGrades) -> str:
    """The mains column: the word, and where a safety part may go (L–L line–line, L–E line–earth)."""
    g = item.grades.get("mains")
    if g is None:
        return ""
    reading = read_safety_class(item.marking.safety_class) if item.marking.safety_class else None
    if g.word != "fit" or reading is None:
        return g.word
    part_ac = item.marking.voltage_v if item.marking.voltage_kind == "AC" else None
    mains = g.budget.conditions.working_v if g.budget is not None else None
    where = reading.positions(part_ac, mains)
    return g.word + " " + "/".join({"line-line": "L–L", "line-earth": "L–E"}[p] for p in where)


def _table(items: list[BinGrades]) -> list[str]:
    key_w = max([3] + [len(i.bin_key) for i in items])
    mark_w = min(24, max([7] + [len(i.marking.text) for i in items]))
    widths = {a: (11 if a == "mains" else 9) for a in APPLICATIONS}
    head = f"{'bin':<{key_w}}  {'marking':<{mark_w}}  " + "  ".join(f"{a:<{widths[a]}}" for a in APPLICATIONS)
    lines = [head.rstrip()]
    doubts: list[str] = []
    for i in items:
        cells = []
        for a in APPLICATIONS:
            if a not in i.grades:
                continue
            word = _mains_word(i) if a == "mains" else i.grades[a].word
            cells.append(f"{word + ('*' if i.grades[a].doubts else ''):<{widths[a]}}")
        lines.append(f"{i.bin_key:<{key_w}}  {i.marking.text[:mark_w]:<{mark_w}}  {'  '.join(cells)}".rstrip())
        said: dict[str, list[str]] = {}
        for a, g in i.grades.items():
            for d in g.doubts:
                said.setdefault(d, []).append(a)
        doubts += [f"  {i.bin_key}: {d} ({', '.join(apps)})" for d, apps in said.items()]
    if doubts:
        lines.append("* doubts (graded on what is known; settle or measure to clear them):")
        lines += doubts
    if any("mains" in i.grades for i in items):
        lines.append("mains: L–L line–line (X), L–E line–earth (Y); --position line-line|line-earth grades one")
    return lines


def _drift_lines(result: TankDrift | TimerDrift) -> list[str]:
    p = result.part
    lines = [f"part: {result.marking} ({p.basis})"]
    if isinstance(result, TimerDrift):
        lines.append(f"timer period: {pm(-result.low_pct if result.low_pct < 0 else 0, max(result.high_pct, 0))}"
                     f" for {format_number(result.delta_t_k)} K (Δt/t = ΔC/C):"
                     f" {format_number(round(result.low_pct, 4))} … {format_number(round(result.high_pct, 4))} %")
        if result.period_s is not None:
            lo = result.period_s * result.low_pct / 100
            hi = result.period_s * result.high_pct / 100
            lines.append(f"on {format_number(result.period_s)} s: {format_number(round(lo, 6))} …"
                         f" {format_number(round(hi, 6))} s")
    else:
        lines.append(f"tank: {format_frequency(result.f0_hz)}, {format_capacitance(result.tank_pf)} in all,"
                     f" this part {format_capacitance(result.part_pf)}"
                     f" ({format_number(round(result.share * 100, 1))} % of it)")
        lines.append(f"frequency shift for {format_number(result.delta_t_k)} K (Δf/f = −½·share·ΔC/C):"
                     f" {format_frequency(result.shift_low_hz)} … {format_frequency(result.shift_high_hz)}"
                     f" ({format_number(round(result.shift_low_ppm, 2))} … {format_number(round(result.shift_high_ppm, 2))} ppm)")
    if not p.linear:
        lines.append("note: this part's change is a window, not a slope; the figures hold for any change")
    return lines


def _opt(*names: str, text: str):
    return typer.Option(*names, help=text)


def register(app: typer.Typer) -> None:
    @app.command("grade")
    def grade(
        ctx: typer.Context,
        bins: Annotated[Optional[list[str]], typer.Argument(
            help="Bins to grade (id, key, location or label); all when none.")] = None,
        temp: Annotated[Optional[str], _opt("--temp", text="Operating range in °C, LOW..HIGH (default 0..50).")] = None,
        volts: Annotated[Optional[str], _opt("--volts", text="DC working voltage (counts DC bias, derating).")] = None,
        years: Annotated[Optional[str], _opt("--years", text="Service life in years (default 10).")] = None,
        position: Annotated[Optional[str], _opt("--position", text=(
            "Mains position: line-line (X) or line-earth (Y); default: the positions each part may take."))] = None,
        explain: Annotated[Optional[str], _opt("--explain", text="Print one bin's whole budget, term by term.")] = None,
        rules: Annotated[Optional[Path], _opt("--rules", text=(
            "A TOML file overriding the application table (default: stock-grading.toml beside the database)."))] = None,
        as_json: Annotated[bool, _opt("--json", text="Print one JSON object.")] = False,
    ) -> None:
        """Grade parts for each application: fit, marginal, unfit or unknown, from their worst-case budget.

        Example: stock grade --temp -10..60 --volts 12;  stock grade --explain A3;
        stock grade --position line-earth
        """
        from stock.cli.context import state

        conditions = conditions_from_text(temp, volts, years, position)
        db_path = state(ctx).db_path
        table = load_rules(rules, db_path=db_path)
        refs = [explain] if explain else (bins or None)
        # the store and the stored grades load only when the command runs (start-up time)
        from stock.inventory.stored_grades import grade_bins
        from stock.store.database import open_store

        with open_store(db_path, create=False) as store:
            items = grade_bins(store, refs, conditions, rules=table)
        if as_json:
            out = {"conditions": conditions.to_json(), "table": {"source": table.source, "version": table.version},
                   "parts": [i.to_json() for i in items]}
            if explain:
                out["budget"] = items[0].grades[APPLICATIONS[0]].budget.to_json()
            typer.echo(json.dumps(out, ensure_ascii=False))
            return
        if explain:
            lines = _explain(items[0])
        else:
            lines = _table(items) if items else ["no parts stored yet: import a sheet first"]
            lines.append(f"conditions: {conditions.describe()}; table: {table.source}")
            lines.append("reasons and numbers: stock grade --explain BIN")
        lines.append(f"caution (mains): {MAINS_CAUTION}")
        typer.echo("\n".join(lines))

    @app.command("drift")
    def drift(
        ctx: typer.Context,
        part: Annotated[str, _opt("--part", text="A bin (id, key, location, label) or a marking such as '101J C0G'.")],
        delta_t: Annotated[str, _opt("--delta-t", text="Temperature change in K (negative: cooler).")] = "10",
        f0: Annotated[Optional[str], _opt("--f0", text="The tank's frequency, e.g. 10MHz.")] = None,
        tank: Annotated[Optional[str], _opt("--tank", text="Total tank capacitance, e.g. 150p.")] = None,
        coil: Annotated[Optional[str], _opt("--coil", text="The coil instead of --tank, e.g. 10uH.")] = None,
        part_c: Annotated[Optional[str], _opt("--part-c", text="This part's capacitance if not its marked value.")] = None,
        timer: Annotated[bool, _opt("--timer", text="An RC timer instead of a tank: Δt/t = ΔC/C.")] = False,
        period: Annotated[Optional[str], _opt("--period", text="The timer's period, e.g. 1.5s (with --timer).")] = None,
        as_json: Annotated[bool, _opt("--json", text="Print one JSON object.")] = False,
    ) -> None:
        """How far one part's temperature drift moves a tank's frequency or a timer's period.

        Example: stock drift --part '47p N750' --f0 10MHz --tank 150p --delta-t 10
        """
        from stock.cli.context import state
        from stock.markings.typed_values import parse_capacitance

        from stock.inventory.circuit_drift import circuit_drift   # loads the store: only when run

        result = circuit_drift(
            state(ctx).db_path, part, parse_kelvin(delta_t),
            f0_hz=parse_frequency(f0) if f0 else None,
            tank_pf=parse_capacitance(tank, "--tank") if tank else None,
            coil_h=parse_inductance(coil) if coil else None,
            part_pf=parse_capacitance(part_c, "--part-c") if part_c else None,
            timer=timer, period_s=parse_period(period) if period else None)
        if as_json:
            typer.echo(json.dumps(result.to_json(), ensure_ascii=False))
        else:
            typer.echo("\n".join(_drift_lines(result)))
