"""`stock flags`, `stock settle BIN` and `stock merge FROM INTO`: the bins that need a person."""

from __future__ import annotations

import json
from typing import Annotated, Optional

import typer

from stock.cli.context import state

FLAGS_HELP = """List every open flag: the bin, its marking, the readings considered, what would settle it.

Runs the stock checks (unknown quantity, below minimum, shelf life) and the duplicate search
first, so their flags are current; --no-check lists only what is stored.

Example:

    stock flags --kind ambiguous-code
"""

SETTLE_HELP = """Record a decision about a bin and close the flags it settles.

Readings are numbered as `stock flags` lists them: 0 is the decoder's own, 1... its
alternatives. The marking as imported is kept; the decision goes into the ledger.

Examples:

    stock settle "cabinet 1/a2" --reading 1 --note "measured 46.8 nF"

    stock settle a7 --value 100p

    stock settle a9 --count 40

    stock settle a2 --flag 12 --note "different makers, kept apart"

    stock settle a2 --reopen
"""

MERGE_HELP = """Move all parts from one bin into another (two ledger movements) and settle their duplicate flag.

Refuses parts whose decoded facts differ unless --force; never puts parts without a safety
class into a bin of safety-rated (X/Y) parts.

Example:

    stock merge "cabinet 2/c4" "cabinet 1/a2"
"""


def _flag_text(f) -> str:
    where = f.bin_key or "(no bin)"
    if f.location and f.location != f.bin_key:
        where += f" at {f.location}"
    lines = [f"#{f.id}  {f.kind}  bin {where}" + (f"  marking {f.marking!r}" if f.marking else "")]
    lines.append(f"    {f.message}")
    for r in f.readings:
        mark = "decoder's choice" if r.number == 0 else r.reason
        lines.append(f"    reading {r.number}: {r.describe()}  ({mark})")
    if f.decision:
        d = f.decision
        said = f" ({d['note']})" if d.get("note") else ""
        lines.append(f"    settled by {d.get('by', '?')}: {d.get('decision') or d.get('via')}{said}")
    else:
        lines.append(f"    to settle: {f.hint}")
    return "\n".join(lines)


def register(app: typer.Typer) -> None:
    @app.command("flags", help=FLAGS_HELP)
    def flags(
        ctx: typer.Context,
        kind: Annotated[Optional[str], typer.Option("--kind", help="Only flags of this kind.")] = None,
        settled: Annotated[bool, typer.Option("--settled", help="List settled flags instead.")] = False,
        no_check: Annotated[bool, typer.Option("--no-check",
                                               help="Do not run the stock and duplicate checks first.")] = False,
        as_json: Annotated[bool, typer.Option("--json", help="One JSON document on stdout.")] = False,
    ) -> None:
        from stock.inventory.flag_list import list_flags
        from stock.store.database import open_store

        with open_store(state(ctx).db_path, create=False) as store:
            found = list_flags(store, kind=kind, status="settled" if settled else "open",
                               check=not no_check)
        if as_json:
            typer.echo(json.dumps({"flags": [f.to_json() for f in found]}, ensure_ascii=False))
            return
        if not found:
            typer.echo("no settled flags" if settled else "no open flags", err=True)
            return
        typer.echo("\n\n".join(_flag_text(f) for f in found))
        typer.echo(f"{len(found)} flag(s)", err=True)

    @app.command("settle", help=SETTLE_HELP)
    def settle(
        ctx: typer.Context,
        bin_ref: Annotated[str, typer.Argument(metavar="BIN", help="Bin id, key, location or label.")],
        reading: Annotated[Optional[int], typer.Option("--reading", help="Reading number from `stock flags`.")] = None,
        value: Annotated[Optional[str], typer.Option("--value", help="The measured capacitance: 100p, 4n7, 0.1u.")] = None,
        marking: Annotated[Optional[str], typer.Option("--marking", help="The marking as it really reads.")] = None,
        count: Annotated[Optional[int], typer.Option("--count", help="Parts counted in the bin.")] = None,
        note: Annotated[Optional[str], typer.Option("--note", help="Why; kept in the ledger.")] = None,
        flag: Annotated[Optional[int], typer.Option("--flag", help="Settle only this flag id.")] = None,
        by: Annotated[Optional[str], typer.Option("--by", help="Who decided (default: $USER).")] = None,
        reopen: Annotated[bool, typer.Option("--reopen", help="Undo the bin's decisions.")] = False,
        as_json: Annotated[bool, typer.Option("--json", help="One JSON document on stdout.")] = False,
    ) -> None:
        from stock.inventory import settling
        from stock.inventory.readings import describe_summary
        from stock.errors import BadValue
        from stock.store.database import open_store

        with open_store(state(ctx).db_path, create=False) as store:
            if reopen:
                if any(v is not None for v in (reading, value, marking, count, flag)):
                    raise BadValue("--reopen", "with a decision", "--reopen alone (with --note/--by)")
                done = settling.reopen(store, bin_ref, note=note, by=by)
            else:
                done = settling.settle(store, bin_ref, reading=reading, value=value, marking=marking,
                                       count=count, note=note, flag_id=flag, by=by)
        for w in done.warnings:
            typer.echo(f"warning: {w}", err=True)
        if as_json:
            typer.echo(json.dumps(done.to_json(), ensure_ascii=False))
            return
        if done.decision == "reopen":
            typer.echo(f"bin {done.bin_key}: decisions undone; reopened flags"
                       f" {', '.join(map(str, done.reopened)) or 'none'}")
            return
        line = f"bin {done.bin_key}: {done.decision}"
        if done.new is not None:
            line += f"; now reads {done.new['text']!r} as {describe_summary(done.new)}"
        line += f"; closed flags {', '.join(map(str, done.closed)) or 'none'}"
        typer.echo(line)

    @app.command("merge", help=MERGE_HELP)
    def merge(
        ctx: typer.Context,
        from_ref: Annotated[str, typer.Argument(metavar="FROM", help="The bin to empty.")],
        into_ref: Annotated[str, typer.Argument(metavar="INTO", help="The bin that receives the parts.")],
        force: Annotated[bool, typer.Option("--force", help="Merge even though the decoded facts differ.")] = False,
        note: Annotated[Optional[str], typer.Option("--note", help="Why; kept in the ledger.")] = None,
        by: Annotated[Optional[str], typer.Option("--by", help="Who decided (default: $USER).")] = None,
        as_json: Annotated[bool, typer.Option("--json", help="One JSON document on stdout.")] = False,
    ) -> None:
        from stock.inventory.duplicates import merge as do_merge
        from stock.store.database import open_store

        with open_store(state(ctx).db_path, create=False) as store:
            done = do_merge(store, from_ref, into_ref, force=force, note=note, by=by)
        for w in done.warnings:
            typer.echo(f"warning: {w}", err=True)
        if as_json:
            typer.echo(json.dumps(done.to_json(), ensure_ascii=False))
            return
        typer.echo(f"moved {done.moved} from {done.from_key} into {done.into_key}"
                   f" (now {done.into_on_hand}); settled flags"
                   f" {', '.join(map(str, done.settled_flags)) or 'none'}")
