"""The whole job on the demo shop, in one run: import, flags, grades, find, kits, pull, a repair,
exports, labels.

The demo shop (Lantern Bench Instruments) and its four BOMs live in ``demo_inventory/`` at the
top of the source tree, written by ``demo_inventory/make_demo.py``. :func:`run_demo` makes a fresh
database in a new folder and runs the real commands on it, printing each command line before
its output, so every step can be repeated by hand.
"""

from __future__ import annotations

import shlex
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from pathlib import Path

from stock.errors import BadValue, NotFound

DEMO_FILES = ("lantern_register.xlsx", "drawer_cabinet_c.csv", "smd_drawers.csv")
BOMS = ("vfo_7mhz_bom.csv", "led_flasher_bom.xlsx", "mains_inlet_bom.csv", "bench_supply_bom.csv")


def demo_source() -> Path:
    """The folder holding the demo shop's files (next to the package in a source checkout).

    Raises:
        NotFound: this copy was installed without the demo files.
    """
    folder = Path(__file__).resolve().parent.parent / "demo_inventory"
    missing = [name for name in DEMO_FILES + BOMS if not (folder / name).exists()]
    if missing:
        raise NotFound("demo file", ", ".join(missing),
                       f"the files of {folder}; rebuild them with python demo_inventory/make_demo.py")
    return folder


def fresh_folder(base: Path, stem: str = "stock-demo") -> Path:
    """The first of ``stem``, ``stem-2``, ``stem-3`` … that does not exist yet in ``base``."""
    for n in range(1, 10_000):
        candidate = base / (stem if n == 1 else f"{stem}-{n}")
        if not candidate.exists():
            return candidate
    raise BadValue("--dir", str(base), "a folder with room for a new demo folder")


@dataclass(frozen=True)
class Step:
    """One command of the tour: why it is run, and its arguments after ``stock --db DB``."""

    why: str
    args: tuple[str, ...]


def tour(src: Path, out: Path) -> list[Step]:
    """The commands the demo runs, in order."""
    return [
        Step("Import the register (two cabinets in one workbook) and the drawer cabinet's CSV.",
             ("import", str(src / "lantern_register.xlsx"), str(src / "drawer_cabinet_c.csv"))),
        Step("Rows that could not be stored are kept, with the reason and how to fix them.",
             ("quarantine",)),
        Step("Bins whose label contradicts their marking, with the readings to choose from.",
             ("flags", "--kind", "label-conflict")),
        Step("Codes that read two ways (a label that agrees settles a doubt by itself).",
             ("flags", "--kind", "ambiguous-code", "--no-check")),
        Step("Settle bin A18 after measuring it: 468 pF, so the label's reading (2) was right.",
             ("settle", "A18", "--reading", "2", "--note", "measured 468 pF")),
        Step("Grades per application at the default conditions (0…50 °C, 10 years).",
             ("grade", "A11", "A12", "A5", "B9", "B24", "B20", "B15", "B17")),
        Step("The whole budget behind one grade.", ("grade", "--explain", "A27")),
        Step("A padder of 250 pF for a tuned circuit: no single part, so look for pairs.",
             ("find", "--value", "250p", "--tol", "5%", "--use", "tuned", "--combine", "--limit", "2")),
        Step("A tempco-compensating pair: 100 pF at −300 ppm/K from N750 and C0G parts.",
             ("find", "--value", "100p", "--tempco", "-300±30", "--combine", "--limit", "2")),
        Step("A mains X2 position: only safety-rated parts may answer.",
             ("find", "--value", "100n", "--use", "mains", "--safety", "X2", "--volts", "250")),
        Step("Kit five VFO boards (stable parts, pairs allowed).",
             ("kit", "plan", str(src / "vfo_7mhz_bom.csv"), "--boards", "5", "--combine")),
        Step("The VFO's first board drifts −176 Hz over a 3 K warm-up; its tank (C1 + C4 + C2 in series "
             "with C3) is 515 pF. Which N750 slice from the shelf nulls it?",
             ("compensate", "--f0", "7MHz", "--tank", "515p", "--drift", "-176Hz", "--delta-t", "3",
              "--combine", "--limit", "2")),
        Step("Kit ten LED flashers (a timing line and a reservoir).",
             ("kit", "plan", str(src / "led_flasher_bom.xlsx"), "--boards", "10", "--spare", "5%")),
        Step("Kit two mains inlets: the X2 and Y2 positions take only safety-rated parts.",
             ("kit", "plan", str(src / "mains_inlet_bom.csv"), "--boards", "2")),
        Step("Add the SMD drawers, whose sheet records each part's package and mounting.",
             ("import", str(src / "smd_drawers.csv"))),
        Step("Kit three bench-supply control boards from a CAD export: footprints honoured, the"
             " C0G reel kept, the do-not-fit line skipped.",
             ("kit", "plan", str(src / "bench_supply_bom.csv"), "--boards", "3")),
        Step("The flashers' pick list, in drawer order.",
             ("kit", "picklist", "2", "--xlsx", str(out / "flasher_pick_list.xlsx"))),
        Step("Pull the flasher parts: one transaction, a ledger movement per bin.", ("kit", "pull", "2")),
        Step("A repair: an old transistor receiver's local oscillator has a failed silver mica,"
             " dots white orange orange red gold brown. What in the bins can take its place?",
             ("replace", "white orange orange red gold brown", "--use", "tuned")),
        Step("What to order for every plan's shortfalls and every bin under its minimum.",
             ("export", "purchasing", str(out / "purchasing.xlsx"), "--below-minimum")),
        Step("The inventory workbook, with the drift-against-temperature chart.",
             ("export", "inventory", str(out / "inventory.xlsx"))),
        Step("A stock-take sheet to fill in and import back.", ("export", "count", str(out / "count.xlsx"))),
        Step("Bin labels for the drawers: value, ratings, fit-for mark and a QR code of the bin.",
             ("labels", str(out / "bin_labels.pdf"), "--layout", "a4-3x7-64x38")),
        Step("Verify the database: integrity, ledger against on-hand, no orphans.", ("check",)),
    ]


def run_demo(out: Path, echo: Callable[[str], None], run: Callable[[Sequence[str]], int]) -> int:
    """Run the tour on a fresh database in ``out``; returns how many steps failed.

    ``run`` executes one argument list of the ``stock`` command and returns its exit code;
    ``echo`` prints a line.
    """
    src = demo_source()
    try:
        out.mkdir(parents=True, exist_ok=False)
    except FileExistsError:
        raise BadValue("--dir", str(out), "a folder that does not exist yet (the demo makes a fresh"
                       " database there)") from None
    db = out / "shop.db"
    echo(f"demo shop: Lantern Bench Instruments; database and workbooks in {out}")
    failed = 0
    for number, step in enumerate(tour(src, out), start=1):
        echo("")
        echo(f"── {number}. {step.why}")
        echo("$ stock --db " + shlex.quote(str(db)) + " " + " ".join(shlex.quote(a) for a in step.args))
        code = run(("--db", str(db), *step.args))
        if code not in (0, None):
            failed += 1
            echo(f"(exit code {code})")
    echo("")
    echo("Try next:")
    for line in (
        f"stock --db {shlex.quote(str(db))} flags                      # every open flag and how to settle it",
        f"stock --db {shlex.quote(str(db))} show 'cabinet a/a23'       # one bin: facts, readings, history",
        f"stock --db {shlex.quote(str(db))} kit undo 2                 # put the flasher parts back",
        f"stock --db {shlex.quote(str(db))} show 'BIN:CABINET A/A11'   # what a scanner types from a label",
        f"stock --db {shlex.quote(str(db))} drift --part A5 --f0 7MHz --tank 250p --delta-t 10",
        f"stock --db {shlex.quote(str(db))} import {shlex.quote(str(out / 'count.xlsx'))}   # after filling in Counted",
        "stock decode '104K 2A X7R' '4n7 J 100V' 'yel-vio-brn' --json",
    ):
        echo("  " + line)
    return failed


__all__ = ["BOMS", "DEMO_FILES", "Step", "demo_source", "fresh_folder", "run_demo", "tour"]
