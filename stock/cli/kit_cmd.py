"""`stock kit`: plan a build from a BOM, pull, undo, drop, show and print the pick list."""

from __future__ import annotations

import json
from pathlib import Path
from typing import Annotated

import typer

from stock.cli.context import state

kit_app = typer.Typer(no_args_is_help=True, help="Kit a build from stock: plan a BOM, pull, undo, drop.")

PLAN_HELP = """Plan a build: choose bins for every capacitor line of a BOM and reserve the parts.

Each line needs qty per board × boards (+ --spare, rounded up). A footprint or package column
(C_0805_2012Metric, CP_Radial_D5.0mm_P2.00mm) is honoured: a bin whose package does not fit is
never used, one whose package is not recorded only after the rest. Among the bins left, the part
that gives up least goes first (no spare safety rating, the plainest dielectric, no tighter
tolerance than asked), then the fullest bin, then location order. A looser tolerance or a lower
dielectric class is used only when --allow says so; a mains line takes only X/Y parts of its
class; a tuned line never takes a Class 2 ceramic. Do-not-fit lines (a DNP column, or DNP in the
value) take nothing; lines for other kinds of parts are listed as not tracked.

Examples:

    stock kit plan amp-board.csv --boards 5 --spare 5%

    stock kit plan control-board.csv --boards 3 --map package=Footprint --map dnp="Do not fit"

    stock kit plan tuner.xlsx --boards 2 --temp -10..60 --combine --allow looser-tolerance --json
"""


def _echo_json(data: object) -> None:
    typer.echo(json.dumps(data, ensure_ascii=False, indent=2))


def _store(ctx: typer.Context):  # noqa: ANN202  (a stock.store.Store)
    from stock.store.database import open_store

    return open_store(state(ctx).db_path, create=False)


@kit_app.command("plan", help=PLAN_HELP)
def plan_command(
    ctx: typer.Context,
    bom: Annotated[Path, typer.Argument(help="The BOM file, CSV or XLSX.")],
    boards: Annotated[int, typer.Option("--boards", min=1, help="How many boards to build.")],
    temp: Annotated[str | None, typer.Option("--temp", help="Temperature range LOW..HIGH in °C, e.g. 0..50.")] = None,
    spare: Annotated[str | None, typer.Option("--spare", help="Extra parts per line, e.g. 5% (rounded up).")] = None,
    combine: Annotated[bool, typer.Option("--combine", help="Fill what singles cannot with pairs (2 parts per position).")] = False,
    allow: Annotated[list[str] | None, typer.Option("--allow", help="Relax a rule: looser-tolerance or lower-class (repeatable).")] = None,
    sheet: Annotated[str | None, typer.Option("--sheet", help="The workbook sheet holding the BOM.")] = None,
    mapping: Annotated[list[str] | None, typer.Option("--map", help="FIELD=HEADER: which column holds a field (repeatable).")] = None,
    as_json: Annotated[bool, typer.Option("--json", help="Print the plan as JSON.")] = False,
    force: Annotated[bool, typer.Option("--force", help="Plan with a sheet that looks like a bin sheet all the same.")] = False,
) -> None:
    from stock.kitting.bom import parse_mappings
    from stock.kitting.planner import kit_options, plan_kit
    from stock.kitting.pick_list import plan_text

    if not force:
        from stock.inventory.sheet_plan import refuse_bin_sheet_as_bom
        refuse_bin_sheet_as_bom(bom, sheet)
    options = kit_options(boards, temp=temp, spare=spare, combine=combine, allow=allow or ())
    with _store(ctx) as store:
        plan = plan_kit(store, bom, options, sheet=sheet, overrides=parse_mappings(mapping or ()))
    if as_json:
        _echo_json(plan.to_json())
    else:
        typer.echo(plan_text(plan))


@kit_app.command("show", help="Show a plan as planned, with its status; with no number, list the plans.\n\n"
                 "Example:\n\n    stock kit show 3 --json")
def show_command(
    ctx: typer.Context,
    plan: Annotated[str | None, typer.Argument(help="The plan number (omit to list every plan).")] = None,
    as_json: Annotated[bool, typer.Option("--json", help="Print the plan as JSON.")] = False,
) -> None:
    from stock.kitting.stored_plans import list_plans, load_plan
    from stock.kitting.pick_list import plan_text

    with _store(ctx) as store:
        if plan is None:
            plans = list_plans(store)
        else:
            kit = load_plan(store, plan)
    if plan is None:
        if as_json:
            _echo_json(plans)
            return
        typer.echo("plan\tstatus\tboards\tlines\tshort\tcreated\tbom")
        for p in plans:
            typer.echo(f"{p['plan']}\t{p['status']}\t{p['boards']}\t{p['lines'] or 0}\t"
                       f"{p['short_lines'] or 0}\t{p['created_at']}\t{p['bom'] or ''}")
        return
    typer.echo(json.dumps(kit.to_json(), ensure_ascii=False, indent=2) if as_json else plan_text(kit))


@kit_app.command("picklist", help="The pick list of a plan, in location order (A2 before A10).\n\n"
                 "Example:\n\n    stock kit picklist 3 --xlsx pick-3.xlsx")
def picklist_command(
    ctx: typer.Context,
    plan: Annotated[str, typer.Argument(help="The plan number.")],
    xlsx: Annotated[Path | None, typer.Option("--xlsx", help="Also write the pick list to this XLSX file.")] = None,
    as_json: Annotated[bool, typer.Option("--json", help="Print the pick list as JSON.")] = False,
) -> None:
    from stock.kitting.pick_list import pick_list, pick_list_text
    from stock.sheets_out.pick_sheet import write_pick_list_xlsx

    with _store(ctx) as store:
        picks = pick_list(store, plan)
    if xlsx is not None:
        rows = write_pick_list_xlsx(picks, xlsx)
        typer.echo(f"wrote {rows} pick rows to {xlsx}", err=True)
    typer.echo(json.dumps(picks.to_json(), ensure_ascii=False, indent=2) if as_json
               else pick_list_text(picks))


def _action(ctx: typer.Context, name: str, plan: str, as_json: bool) -> None:
    from stock.kitting import stored_plans as kit_plans

    function = {"pull": kit_plans.pull_plan, "undo": kit_plans.undo_pull, "drop": kit_plans.drop_plan}[name]
    with _store(ctx) as store:
        done = function(store, plan)
    if as_json:
        _echo_json(done.to_json())
        return
    typer.echo(f"plan {done.plan}: {done.status}")
    for bin_key, delta in done.moves:
        typer.echo(f"{bin_key}\t{delta:+d}")


PULL_HELP = """Take a plan's parts out of their bins (one transaction; a second pull is refused).

With --scan, confirm each pick first: scan each bin's label (or type the bin) as you take its
parts, one per line. A bin outside the plan is named and changes nothing; the plan is pulled
when every bin has been confirmed, and nothing is taken if the input ends before that.

Examples:

    stock kit pull 3

    stock kit pull 3 --scan
"""


@kit_app.command("pull", help=PULL_HELP)
def pull_command(ctx: typer.Context,
                 plan: Annotated[str, typer.Argument(help="The plan number.")],
                 scan: Annotated[bool, typer.Option("--scan", help="Confirm each bin by scanning its label first.")] = False,
                 as_json: Annotated[bool, typer.Option("--json", help="Print what moved as JSON.")] = False) -> None:
    if scan:
        _scan_and_pull(ctx, plan, as_json)
        return
    _action(ctx, "pull", plan, as_json)


def _scan_and_pull(ctx: typer.Context, plan: str, as_json: bool) -> None:
    import sys

    from stock.kitting.pick_scan import check_scan, plan_picks, pull_confirmed

    with _store(ctx) as store:
        picks = plan_picks(store, plan)
        confirmed: set[str] = set()
        scans = []
        if picks:
            typer.echo(f"plan {plan}: scan each bin as you pick ({len(picks)} bins)", err=True)
        for text in sys.stdin if picks else ():
            if not text.strip():
                continue
            result = check_scan(store, picks, confirmed, text)
            scans.append(result)
            if result.in_plan:
                typer.echo(f"ok\t{result.bin_key}\ttake {result.take}\t{len(result.remaining)} to go", err=True)
            else:
                typer.echo(f"not this\t{result.problem}", err=True)
            if not result.remaining:
                break
        done = pull_confirmed(store, plan, confirmed)
    if as_json:
        _echo_json({**done.to_json(), "scans": [s.to_json() for s in scans]})
        return
    typer.echo(f"plan {done.plan}: {done.status}")
    for bin_key, delta in done.moves:
        typer.echo(f"{bin_key}\t{delta:+d}")


@kit_app.command("undo", help="Put a pulled plan's parts back in their bins.\n\nExample:\n\n    stock kit undo 3")
def undo_command(ctx: typer.Context,
                 plan: Annotated[str, typer.Argument(help="The plan number.")],
                 as_json: Annotated[bool, typer.Option("--json", help="Print what moved as JSON.")] = False) -> None:
    _action(ctx, "undo", plan, as_json)


@kit_app.command("drop", help="Free a plan's reservation without taking the parts.\n\nExample:\n\n    stock kit drop 3")
def drop_command(ctx: typer.Context,
                 plan: Annotated[str, typer.Argument(help="The plan number.")],
                 as_json: Annotated[bool, typer.Option("--json", help="Print the result as JSON.")] = False) -> None:
    _action(ctx, "drop", plan, as_json)


def register(app: typer.Typer) -> None:
    app.add_typer(kit_app, name="kit")
