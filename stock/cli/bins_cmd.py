"""`stock bins`, `stock show BIN` and `stock quarantine`: what the store holds, and what it refused."""

from __future__ import annotations

import json
from typing import Annotated, Any

import typer

from stock.cli.context import state


def text_table(headers: list[str], rows: list[list[Any]]) -> str:
    """Columns padded to their widest cell, numbers right-aligned; blanks shown as "-"."""
    cells = [[("-" if v is None or v == "" else str(v)) for v in row] for row in rows]
    widths = [max([len(h), *(len(r[i]) for r in cells)]) for i, h in enumerate(headers)]
    numeric = [all(isinstance(row[i], int) or row[i] is None for row in rows) and rows
               for i in range(len(headers))]

    def line(values: list[str]) -> str:
        return "  ".join(v.rjust(w) if num else v.ljust(w)
                         for v, w, num in zip(values, widths, numeric)).rstrip()

    return "\n".join([line(headers), *(line(r) for r in cells)])


BINS_HELP = """List every bin: what it holds, how many, how many are free, open flags.

Example:

    stock bins --json
"""

SHOW_HELP = """Show one bin in full: decoded facts, readings not chosen, flags, quantity history, source rows.

BIN is a bin id, key ("cabinet 1/a2"), location or label, or what a scanner reads from the
bin's label (BIN:CABINET 1/A2; see `stock labels`).

Examples:

    stock show "cabinet 1/a2"

    stock show "BIN:CABINET 1/A2"
"""

QUARANTINE_HELP = """List the rows that were not stored: file, sheet, row, raw values, reason, how to fix.

Example:

    stock quarantine --json
"""


def _show_text(d: dict[str, Any]) -> str:
    lines = [f"bin {d['bin_key']}  (id {d['id']})"]
    for name, key in (("location", "location"), ("label", "label"), ("cabinet", "cabinet"),
                      ("marking", "marking"), ("value", "value"), ("tolerance", "tolerance"),
                      ("dielectric", "dielectric"), ("family", "family"), ("voltage", "voltage"),
                      ("safety class", "safety_class"), ("package", "package"),
                      ("mounting", "mounting"),
                      ("notes", "notes"), ("date code", "date_code")):
        if d.get(key) not in (None, ""):
            lines.append(f"  {name:<13}{d[key]}")
    decoded = d.get("decoded") or {}
    diel = decoded.get("dielectric") or {}
    if diel.get("tempco_ppm_per_k") is not None:
        lines.append(f"  {'tempco':<13}{diel['tempco_ppm_per_k']:g}"
                     f" ±{diel.get('tempco_tol_ppm_per_k') or 0:g} ppm/K")
    if decoded.get("polarity"):
        lines.append(f"  {'polarity':<13}{decoded['polarity']}: fit it the right way round")
    if d.get("safety_class"):
        from stock.markings.safety_classes import MAINS_CAUTION

        lines.append(f"  caution: {MAINS_CAUTION}")
    on_hand = "not counted" if d["on_hand"] is None else d["on_hand"]
    lines.append(f"  {'on hand':<13}{on_hand}   available {d['available']}   reserved {d['reserved']}")
    if d.get("settled"):
        lines.append("  (reading settled by a person)")
    from stock.units import format_capacitance
    from decimal import Decimal
    for a in d.get("alternatives", []):
        value = (format_capacitance(Decimal(str(a["capacitance_pf"])))
                 if a.get("capacitance_pf") is not None else "?")
        lines.append(f"  could also be {value}: {a['reason']}")
    if d["flags"]:
        lines.append("flags:")
        lines += [f"  [{f['status']}] {f['kind']}: {f['message']}" for f in d["flags"]]
    if d["history"]:
        lines.append("quantity history:")
        lines += [f"  {m['at']}  {m['kind']:<7}{m['delta']:+d} -> {m['after']}"
                  + (f"  ({m['ref']})" if m["ref"] else "") for m in d["history"]]
    if d["source_rows"]:
        lines.append("from:")
        lines += [f"  {s['file']}" + (f" sheet {s['sheet']!r}" if s["sheet"] else "")
                  + f" row {s['row']} ({s['status']})" for s in d["source_rows"]]
    return "\n".join(lines)


def register(app: typer.Typer) -> None:
    @app.command("bins", help=BINS_HELP)
    def bins_command(
        ctx: typer.Context,
        as_json: Annotated[bool, typer.Option("--json", help="Print the bins as JSON.")] = False,
    ) -> None:
        from stock.inventory.bins import list_bins
        from stock.store.database import open_store
        with open_store(state(ctx).db_path, create=False) as store:
            rows = list_bins(store)
        if as_json:
            typer.echo(json.dumps({"bins": rows}, ensure_ascii=False, indent=2))
            return
        typer.echo(text_table(
            ["bin", "marking", "value", "tolerance", "dielectric", "voltage", "package", "on hand",
             "available", "flags"],
            [[r["bin_key"], r["marking"], r["value"], r["tolerance"], r["dielectric"] or r["family"],
              r["voltage"], r["package_text"], r["on_hand"], r["available"], r["open_flags"]]
             for r in rows]))

    @app.command("show", help=SHOW_HELP)
    def show_command(
        ctx: typer.Context,
        bin_ref: Annotated[str, typer.Argument(metavar="BIN", help="Bin id, key, location or label.")],
        as_json: Annotated[bool, typer.Option("--json", help="Print the bin as JSON.")] = False,
    ) -> None:
        from stock.inventory.bins import bin_detail
        from stock.store.database import open_store
        with open_store(state(ctx).db_path, create=False) as store:
            detail = bin_detail(store, bin_ref)
        if as_json:
            typer.echo(json.dumps(detail, ensure_ascii=False, indent=2, default=str))
        else:
            typer.echo(_show_text(detail))

    @app.command("quarantine", help=QUARANTINE_HELP)
    def quarantine_command(
        ctx: typer.Context,
        as_json: Annotated[bool, typer.Option("--json", help="Print the rows as JSON.")] = False,
    ) -> None:
        from stock.inventory.bins import quarantined_rows
        from stock.store.database import open_store
        with open_store(state(ctx).db_path, create=False) as store:
            rows = quarantined_rows(store)
        if as_json:
            typer.echo(json.dumps({"rows": rows}, ensure_ascii=False, indent=2, default=str))
            return
        if not rows:
            typer.echo("no quarantined rows", err=True)
            return
        for r in rows:
            where = r["file"] + (f" sheet {r['sheet']!r}" if r["sheet"] else "") + f" row {r['row']}"
            raw = ", ".join(f"{k}={v!r}" for k, v in r["raw"].items())
            typer.echo(f"{where}: {r['reason']}\n  raw: {raw}\n  fix: {r['fix']}")
