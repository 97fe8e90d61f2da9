"""`stock find`: what on hand will do for a requirement, single parts first, then pairs."""

from __future__ import annotations

import json
from typing import Annotated

import typer

from stock.cli.context import state

FIND_HELP = """Find parts on hand for a requirement: single parts, and with --combine parallel or series pairs.

A part qualifies when its whole marked tolerance stays inside --tol, its tempco band inside the --tempco window, its rating (derated) covers --volts, its grade is fit for --use, and enough are available (on hand less reserved). With --tol, parts whose tolerance is not marked are no proven match: they are listed after the matches as parts to measure. A mains requirement (--use mains, --safety, --position) takes only X/Y parts whose class covers the position, never a pair. When nothing does, the answer says what ruled out the nearest parts and which preferred value to buy.

Examples:

    stock find --value 150p --tol 5% --tempco C0G --use tuned

    stock find --value 100p --tempco -300±30 --combine --json
"""


def _format_result(result) -> str:  # noqa: ANN001  (a stock.search.FindResult)
    from stock.matching.requirement import fmt
    from stock.units import format_capacitance

    req = result.requirement
    lines = [f"for {req.describe()}:"]
    if result.matches:
        lines.append("single parts:")
    for m in result.matches:
        where = f" at {m.location}" if m.location else ""
        grade = f", {m.grade}" if m.grade else ""
        lines.append(f"  bin {m.bin_key}{where}: {m.marking} = {format_capacitance(m.capacitance_pf)},"
                     f" {m.available} available{grade}")
        lines.extend(f"      {r}" for r in m.reasons)
    if result.combinations:
        lines.append("pairs:")
    for c in result.combinations:
        parts = (" ∥ " if c.kind == "parallel" else " in series with ").join(
            f"{p.count} × {format_capacitance(p.capacitance_pf)} from bin {p.bin_key}" for p in c.parts)
        facts = [format_capacitance(c.capacitance_pf)]
        if c.tempco_ppm_per_k is not None:
            facts.append(f"{fmt(c.tempco_ppm_per_k, 0)} ppm/K")
        if c.worst_case_pct is not None:
            facts.append(f"worst case ±{fmt(c.worst_case_pct)} %")
        if c.voltage_v is not None:
            facts.append(f"stands {fmt(c.voltage_v, 1)} V")
        lines.append(f"  {c.kind}: {parts} → {', '.join(facts)}")
        lines.extend(f"      {r}" for r in c.reasons)
    if result.to_measure:
        lines.append("to measure (tolerance not marked, so no proven match; measure before fitting):")
    for m in result.to_measure:
        where = f" at {m.location}" if m.location else ""
        grade = f", {m.grade}" if m.grade else ""
        lines.append(f"  bin {m.bin_key}{where}: {m.marking} = {format_capacitance(m.capacitance_pf)},"
                     f" {m.available} available{grade}")
        lines.extend(f"      {r}" for r in m.reasons)
    if not result.matches and not result.combinations:
        lines.append("no proven match:" if result.to_measure else "nothing on hand will do:")
        lines.extend(f"  {e}" for e in result.explanation)
    if result.suggestion:
        lines.append(result.suggestion)
    lines.extend(f"caution: {c}" for c in result.cautions)
    return "\n".join(lines)


def register(app: typer.Typer) -> None:
    @app.command("find", help=FIND_HELP)
    def find_command(
        ctx: typer.Context,
        value: Annotated[str, typer.Option("--value", help="Capacitance: 150p, 4n7, 0.1u, 104 ...")],
        tol: Annotated[str | None, typer.Option("--tol", help="Allowed deviation of the delivered value, e.g. 5%.")] = None,
        tempco: Annotated[str | None, typer.Option("--tempco", help="Tempco window 0±30, -750±120, or a code: C0G, N750.")] = None,
        max_tempco: Annotated[str | None, typer.Option("--max-tempco", help="Largest |tempco| in ppm/K.")] = None,
        volts: Annotated[str | None, typer.Option("--volts", help="Working voltage; derating is applied.")] = None,
        use: Annotated[str | None, typer.Option("--use", help="tuned, timing, signal, bypass, bulk or mains.")] = None,
        allow_marginal: Annotated[bool, typer.Option("--allow-marginal", help="Accept marginal grades too.")] = False,
        temp: Annotated[str | None, typer.Option("--temp", help="Temperature range LOW..HIGH in °C.")] = None,
        family: Annotated[str | None, typer.Option("--family", help="Dielectric family: ceramic, polypropylene, mica ...")] = None,
        safety: Annotated[str | None, typer.Option("--safety", help="Safety class needed: X1, X2, Y2 ...")] = None,
        position: Annotated[str | None, typer.Option(
            "--position", help="Mains position: line-line (X) or line-earth (Y).")] = None,
        qty: Annotated[int, typer.Option("--qty", help="How many are needed.")] = 1,
        combine: Annotated[bool, typer.Option("--combine", help="Also look for parallel and series pairs.")] = False,
        limit: Annotated[int, typer.Option("--limit", help="At most this many singles and pairs.")] = 10,
        as_json: Annotated[bool, typer.Option("--json", help="Print the answer as JSON.")] = False,
    ) -> None:
        from stock.matching.search import build_requirement, find
        from stock.store.database import open_store

        req = build_requirement(value=value, tol=tol, tempco=tempco, max_tempco=max_tempco, volts=volts,
                                use=use, allow_marginal=allow_marginal, temp=temp, family=family,
                                safety=safety, qty=qty, position=position)
        with open_store(state(ctx).db_path, create=False) as store:
            result = find(store, req, combine=combine, limit=limit)
        if as_json:
            typer.echo(json.dumps(result.to_json(), ensure_ascii=False, indent=2))
        else:
            typer.echo(_format_result(result))
