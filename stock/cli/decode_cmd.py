"""`stock decode TEXT...`: decode markings and print them in engineering units or as JSON lines."""

from __future__ import annotations

import json
from typing import Annotated

import typer


def register(app: typer.Typer) -> None:
    """Add the ``decode`` command to the app."""
    app.command("decode")(decode)


def decode(
    texts: Annotated[list[str], typer.Argument(metavar="TEXT",
                                               help="Markings as printed, one per argument (quote each).")],
    as_json: Annotated[bool, typer.Option("--json", help="One JSON object per marking, one per line.")] = False,
    colours: Annotated[bool, typer.Option("--colours", "--colors",
                                          help="Read each TEXT as colour bands or dots, e.g. "
                                               "'brown black yellow'.")] = False,
) -> None:
    """Decode capacitor markings: value, tolerance, voltage, dielectric, safety class, doubts.

    Example: stock decode "104K 2A X7R" "4n7 J 100V" --json
    """
    if colours:
        from stock.markings.colours import decode_colours as decoder   # the colour decoder loads only when asked
    else:
        from stock.markings.decoder import decode as decoder
    from stock.markings.description import summary
    from stock.markings.cautions import cautions

    for text in texts:
        marking = decoder(text)
        if as_json:
            typer.echo(json.dumps(marking.to_json(), ensure_ascii=False))
            continue
        typer.echo(f"{text}\t{summary(marking)}")
        for flag in marking.flags:
            typer.echo(f"    {flag.kind}: {flag.message}")
        for alternative in marking.alternatives:
            typer.echo(f"    or: {alternative.reason}")
        for caution in cautions(marking):
            typer.echo(f"    caution: {caution}")
