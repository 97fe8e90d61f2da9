"""`stock replace`: what on the shelf can stand in for the part in the repairer's hand."""

from __future__ import annotations

import json
from typing import Annotated

import typer

from stock.cli.context import state

REPLACE_HELP = """What on the shelf can stand in for a part: give its marking as read off the body (colour codes too) or a bin.

The stand-in must hold the original's value within its tolerance, a rating at least the original's (of the same AC/DC kind), drift no more than the original over --temp (or be fit for --use), keep the polarity rule, and across the mains carry an X/Y class covering the original's. The trade's substitution rules (mica and C0G for tuned work, film for paper, X7R for Z5U, tantalum for an aluminium timing part ...) are applied and named for each stand-in, with what differs. When nothing will do, the answer says why and what to buy.

Examples:

    stock replace "white yellow violet red gold brown" --use tuned

    stock replace ".047 MFD 400V paper" --position line-line --volts 230

    stock replace "47uF 25V electrolytic axial" --use timing --combine --json
"""


def _format_stand_in(number: int, s) -> list[str]:  # noqa: ANN001  (a stock.matching.stand_ins.StandIn)
    from stock.units import format_capacitance

    if s.arrangement == "single":
        p = s.parts[0]
        where = f" at {p.location}" if p.location and p.location != p.bin_key else ""
        grade = f", {s.grade}" if s.grade else ""
        head = f"  {number}. bin {p.bin_key}{where}: {p.marking.text} = {format_capacitance(s.capacitance_pf)}, " \
               f"{p.available} available{grade}"
    else:
        joint = " ∥ " if s.arrangement == "parallel" else " in series with "
        head = f"  {number}. {s.arrangement}: " + joint.join(
            f"{p.count} × {p.marking.text} from bin {p.bin_key}" for p in s.parts) + \
            f" → {format_capacitance(s.capacitance_pf)}"
    lines = [head, f"      rule: {s.rule.name} — {s.rule.text}"]
    lines.extend(f"      also: {r}" for r in s.extra_rules)
    lines.extend(f"      differs: {d}" for d in s.differences)
    lines.extend(f"      checks: {c}" for c in s.checks)
    return lines


def format_result(result) -> str:  # noqa: ANN001  (a stock.matching.replacement.ReplaceResult)
    """The answer in words: the original, what it implies, the stand-ins, then the cautions."""
    from stock.markings.description import summary

    o = result.original
    source = f"bin {o.bin_key}: {o.marking.text}" if o.bin_key else o.text
    lines = [f"original: {source} → {summary(o.marking)}" + (f", {o.mounting}" if o.mounting else ""),
             f"a stand-in needs: {result.need.describe()}"]
    lines.extend(f"  note: {n}" for n in result.need.notes)
    if result.need.bar_pct is not None:
        lines.append(f"  stability bar: {result.need.bar_basis}")
    if result.stand_ins:
        lines.append("stand-ins:")
    for number, s in enumerate(result.stand_ins, start=1):
        lines.extend(_format_stand_in(number, s))
    if result.pairs:
        lines.append("pairs:")
    for number, s in enumerate(result.pairs, start=1):
        lines.extend(_format_stand_in(number, s))
    if not result.stand_ins and not result.pairs:
        lines.append("nothing on the shelf will do:")
        lines.extend(f"  {e}" for e in result.explanation)
    if result.suggestion:
        lines.append(result.suggestion)
    lines.extend(f"caution: {c}" for c in result.cautions)
    return "\n".join(lines)


def register(app: typer.Typer) -> None:
    """Add the ``replace`` command to the app."""
    @app.command("replace", help=REPLACE_HELP)
    def replace_command(
        ctx: typer.Context,
        part: Annotated[str, typer.Argument(metavar="MARKING|BIN",
                                            help="The part's marking as read (quote it), or a bin key or location.")],
        use: Annotated[str | None, typer.Option("--use", help="The job, if it asks more than the original gave: tuned, timing, signal, bypass, bulk, mains.")] = None,
        temp: Annotated[str | None, typer.Option("--temp", help="Temperature range LOW..HIGH in °C (default 0..50).")] = None,
        volts: Annotated[str | None, typer.Option("--volts", help="The circuit's working voltage (across the mains: the mains voltage, AC).")] = None,
        position: Annotated[str | None, typer.Option("--position", help="Across the mains: line-line or line-earth.")] = None,
        combine: Annotated[bool, typer.Option("--combine", help="Also offer parallel and series pairs (never across the mains).")] = False,
        allow_less_stable: Annotated[bool, typer.Option("--allow-less-stable", help="Offer parts that drift more than the original (the job's grade still applies).")] = False,
        limit: Annotated[int, typer.Option("--limit", help="At most this many stand-ins and pairs.")] = 10,
        as_json: Annotated[bool, typer.Option("--json", help="Print the answer as JSON.")] = False,
    ) -> None:
        from stock.matching.replacement import replace_part
        from stock.store.database import open_store

        with open_store(state(ctx).db_path, create=False) as store:
            result = replace_part(store, part, use=use.strip().lower() if use else None, temp=temp, volts=volts,
                                  position=position.strip().lower() if position else None, combine=combine,
                                  allow_less_stable=allow_less_stable, limit=limit)
        if as_json:
            typer.echo(json.dumps(result.to_json(), ensure_ascii=False, indent=2))
        else:
            typer.echo(format_result(result))
