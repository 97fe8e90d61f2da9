"""The README's tour is real output, and its numbers are right.

Every ```console block is run in order in a fresh folder holding the demo shop; each step's exit
code must be the one the README shows (0 unless a ``[exit N]`` line follows its output) and its
terminal output (stdout and stderr, as a user sees them) must equal the README's lines.
Regenerate the blocks after a change in output with ``python -m tests.test_readme --write`` and
read the diff: the second half of this file then checks the numbers the tour shows against the
formulas and the demo files, computed here, not read back from the program.

Sources (docs/sources.md): the demo shop in demo_inventory/ (invented for the demo); [IEC 60062]
for the value and tolerance codes; [EIA-198] for the dielectric codes; the series and parallel
formulas and the tempco of a combination from [combination-formulas]; ageing of Class 2 ceramics
per decade-hour past 1000 h from [ageing-faq] and from memory of [IEC 60384-9]; the application
table and derating rules checked against stock/physics/applications.py and
stock/physics/stability.py (common practice of the trade, no published source, as the README says).
"""

from __future__ import annotations

import csv
import math
import os
import re
import shlex
import shutil
import sys
from dataclasses import dataclass, field
from decimal import Decimal
from pathlib import Path

import pytest
from typer.testing import CliRunner

from stock.cli import app

ROOT = Path(__file__).resolve().parent.parent
README = ROOT / "README.md"
DEMO = ROOT / "demo_inventory"
BLOCK = re.compile(r"```console\n(.*?)```", re.DOTALL)
EXIT_MARK = re.compile(r"\[exit (\d+)\]")
ENV = {"COLUMNS": "120", "TERMINAL_WIDTH": "120", "_TYPER_FORCE_DISABLE_TERMINAL": "1", "NO_COLOR": "1"}
D = Decimal


@dataclass
class Step:
    """One ``$ stock …`` line of a console block, what it printed and how it ended."""

    command: str
    lines: list[str] = field(default_factory=list)
    exit_code: int = 0


def _blocks(text: str) -> list[list[Step]]:
    """Each console block as its steps; a ``[exit N]`` line ends a step that exits non-zero."""
    blocks = []
    for match in BLOCK.finditer(text):
        steps: list[Step] = []
        for line in match.group(1).splitlines():
            if line.startswith("$ "):
                steps.append(Step(line[2:]))
            elif steps and EXIT_MARK.fullmatch(line.strip()):
                steps[-1].exit_code = int(EXIT_MARK.fullmatch(line.strip())[1])
            elif steps:
                steps[-1].lines.append(line)
        blocks.append(steps)
    return blocks


def _run_all(text: str, workdir: Path) -> list[list[Step]]:
    """Run every block's commands in order in ``workdir``; returns what each step really did."""
    shutil.copytree(DEMO, workdir / "demo_inventory")
    runner = CliRunner()
    actual = []
    old = Path.cwd()
    os.chdir(workdir)
    try:
        for steps in _blocks(text):
            done = []
            for step in steps:
                words = shlex.split(step.command)
                assert words[0] == "stock", f"README console lines run `stock`, not {words[0]!r}"
                result = runner.invoke(app, words[1:], env=ENV)
                # what the terminal shows: stdout and stderr interleaved as they were written
                done.append(Step(step.command, result.output.rstrip("\n").splitlines(), result.exit_code))
            actual.append(done)
    finally:
        os.chdir(old)
    return actual


def _mismatches(text: str, workdir: Path) -> list[str]:
    """Every way the README's console blocks differ from a real run, in words."""
    expected = _blocks(text)
    actual = _run_all(text, workdir)
    problems = []
    for want_steps, got_steps in zip(expected, actual):
        for want, got in zip(want_steps, got_steps):
            if got.exit_code != want.exit_code:
                problems.append(f"$ {want.command}: exit code {got.exit_code}, the README shows "
                                f"{want.exit_code}; it printed {got.lines[-3:]}")
            if [w.rstrip() for w in want.lines] != [g.rstrip() for g in got.lines]:
                problems.append(f"$ {want.command}: output differs from the README")
    return problems


def test_every_readme_console_block_shows_real_output(tmp_path):
    text = README.read_text(encoding="utf-8")
    assert _blocks(text), "the README has a tour"
    assert _mismatches(text, tmp_path) == []


def test_a_readme_step_that_fails_fails_the_check(tmp_path):
    # a step that exits 1 with nothing shown in the README must not pass as "no output"
    text = "```console\n$ stock --db none.db grade NO-SUCH-BIN\n```\n"
    problems = _mismatches(text, tmp_path)
    assert len(problems) == 2 and "exit code 1, the README shows 0" in problems[0], problems


def test_a_failing_step_passes_when_the_readme_shows_its_exit_code_and_message(tmp_path):
    text = ("```console\n$ stock --db none.db grade NO-SUCH-BIN\n"
            "stock: none.db: no stock database here; import a sheet first, or give --db\n[exit 1]\n```\n")
    assert _mismatches(text, tmp_path) == []


def test_the_readme_application_table_matches_the_grading_table():
    from stock.physics.applications import DEFAULT_TABLE

    text = README.read_text(encoding="utf-8")
    for name, row in DEFAULT_TABLE.items():
        line = next((l for l in text.splitlines() if l.startswith(f"| `{name}` |")), None)
        assert line, f"README application table lacks {name}"
        cells = [c.strip() for c in line.strip("|").split("|")]
        assert cells[2] == f"{row['drift_fit_pct']} / {row['drift_marginal_pct']}", name
        assert cells[3] == f"{row['total_fit_pct']} / {row['total_marginal_pct']}", name


# --- The tour's numbers, recomputed --------------------------------------------------------------

def _tour() -> list[Step]:
    """The README's steps, in the order the tour runs them."""
    return [step for steps in _blocks(README.read_text(encoding="utf-8")) for step in steps]


def _step(start: str) -> list[str]:
    """The lines the README shows for the first step whose command starts so (``stock`` left out)."""
    found = [step.lines for step in _tour() if step.command.startswith("stock " + start)]
    assert found, f"the README tour has no step `stock {start}…`"
    return found[0]


def _line(lines: list[str], *words: str) -> str:
    (found,) = [line for line in lines if all(w in line for w in words)]
    return found


def _num(x: Decimal | float) -> str:
    """A number as the tour prints it: no trailing zeros, a minus sign for negatives."""
    text = format(D(str(x)).normalize(), "f")
    return text.replace("-", "−")


def _pf(pf: Decimal) -> str:
    """A capacitance in the unit a bench uses: 470 pF, 4.7 nF, 100 nF, 10 µF."""
    for unit, scale in (("µF", D(10) ** 6), ("nF", D(1000)), ("pF", D(1))):
        if pf >= scale or unit == "pF":
            return f"{_num(pf / scale)} {unit}"
    raise AssertionError(pf)


def test_the_decoded_values_follow_the_code_rules():
    lines = _step("decode")
    # IEC 60062 three-digit code: 10 × 10⁴ pF; K = ±10 %. EIA voltage code 2A = 1.0 × 10² V.
    # EIA-198 Class 2: X = −55 °C, 7 = +125 °C, R = ±15 %.
    assert _line(lines, "104K 2A X7R\t").startswith(
        f"104K 2A X7R\t{_pf(D(10) * 10 ** 4)} ±10 %  {_num(D('1.0') * 10 ** 2)} V DC  X7R (−55…+125 °C, ±15 %)")
    # IEC 60062 letter-and-digit code: 4n7 = 4.7 nF; J = ±5 %.
    assert _line(lines, "4n7 J 100V\t") == f"4n7 J 100V\t{_pf(D('4.7') * 1000)} ±5 %  100 V DC"
    # Three-digit 100 = 10 × 10⁰ pF; printed literally it is 100 pF.
    assert _line(lines, "100\t") == f"100\t{_pf(D(10) * 10 ** 0)}"
    assert _line(lines, "or: 100 printed literally").startswith(f"    or: 100 printed literally as {_pf(D(100))}")
    # IEC 60062 colours: yellow 4, violet 7, brown ×10; no tolerance band = ±20 % ([colour-tables-b]);
    # the other end: brown 1, violet 7, yellow ×10⁴.
    assert _line(lines, "yel-vio-brn").startswith(f"yel-vio-brn, top dot black\t{_pf(D(47) * 10)} ±20 %")
    assert f"(brown violet yellow): {_pf(D(17) * 10 ** 4)} ±20 %" in _line(lines, "other end")


def _data_rows() -> dict[str, list[dict[str, object]]]:
    """The demo sheets read here with openpyxl and csv: header row found by its first cell."""
    from openpyxl import load_workbook

    sheets: dict[str, list[dict[str, object]]] = {}
    book = load_workbook(DEMO / "lantern_register.xlsx", read_only=True, data_only=True)
    for ws in book.worksheets:
        rows = list(ws.iter_rows(values_only=True))
        head = next(i for i, r in enumerate(rows) if r and r[0] == "Bin #")
        sheets[ws.title] = [dict(zip(rows[head], r)) for r in rows[head + 1:]
                            if any(c not in (None, "") for c in r)]
    with open(DEMO / "drawer_cabinet_c.csv", encoding="cp1252", newline="") as fh:
        rows = [r for r in csv.reader(fh, delimiter=";")]
    sheets["drawer_cabinet_c.csv"] = [dict(zip(rows[0], r)) for r in rows[1:] if any(r)]
    return sheets


def _count(cell: object) -> int | None:
    """A whole, non-negative count, or None (blank, words, negative)."""
    if isinstance(cell, int) and not isinstance(cell, bool):
        return cell if cell >= 0 else None
    if isinstance(cell, str) and cell.strip().isdigit():
        return int(cell)
    return None


def _quarantined_locations() -> set[str]:
    """The locations of the rows the tour's quarantine step lists, read from their raw cells."""
    return {m[1] for line in _step("--db shop.db quarantine")
            if (m := re.match(r"  raw: (?:Bin #|Drawer)='([^']+)'", line))}


def _location(row: dict[str, object]) -> str:
    return str(row.get("Bin #", row.get("Drawer")))


def _quantity(row: dict[str, object]) -> int | None:
    return _count(row.get("Qty on hand", row.get("Qty")))


def test_the_import_counts_add_up_from_the_demo_files():
    sheets = _data_rows()
    rows_line = re.compile(r"(\S+)\s+(.+?)\s+(\d+)\s+(\d+)\s+(\d+)\s+(\d+)\s+(\d+)\s+\d+ new bins.*")
    table = {(m[1], m[2]): [int(n) for n in m.groups()[2:]]
             for l in _step("--db shop.db import demo_inventory/lantern_register.xlsx") if (m := rows_line.fullmatch(l))}
    quarantined = [l for l in _step("--db shop.db quarantine") if not l.startswith(" ")]
    by_sheet = {("lantern_register.xlsx", "Cabinet A"): sheets["Cabinet A"],
                ("lantern_register.xlsx", "Cabinet B"): sheets["Cabinet B"],
                ("drawer_cabinet_c.csv", "-"): sheets["drawer_cabinet_c.csv"]}
    assert set(table) == set(by_sheet)
    for (file, sheet), (rows, stored, held_back, _, unchanged) in table.items():
        assert rows == len(by_sheet[(file, sheet)])          # every non-blank row read
        assert stored + held_back == rows and unchanged == 0  # each row ends exactly once
        named = [q for q in quarantined if q.startswith(file) and (sheet == "-" or f"'{sheet}'" in q)]
        assert held_back == len(named)
    held = _quarantined_locations()
    stored_rows = [r for rows in sheets.values() for r in rows if _location(r) not in held]
    assert len(stored_rows) == sum(stored for _, stored, *_ in table.values())
    # one 'import' movement per stored row with a count; the pull adds one per bin it takes from
    movements = sum(1 for r in stored_rows if _quantity(r) is not None)
    movements += sum(1 for l in _step("--db shop.db kit pull") if "\t" in l)
    assert _step("--db shop.db check")[-1] == f"ok: {len(stored_rows)} bins, {movements} ledger movements agree"


def test_the_parallel_pair_for_250pf_sums_its_parts_and_its_worst_case():
    lines = _step("--db shop.db find --value 250p")
    # A11 101J C0G 2A and A13 151J 1H C0G: 100 pF and 150 pF, both ±5 %, 0 ± 30 ppm/K, 100 V and 50 V.
    c1, c2, tol = D(100), D(150), D("0.05")
    total = c1 + c2                                    # parallel: C = C₁ + C₂
    low, high = c1 * (1 - tol) + c2 * (1 - tol), c1 * (1 + tol) + c2 * (1 + tol)
    tempco = (c1 * 0 + c2 * 0) / total                 # parallel: capacitance-weighted mean
    head = _line(lines, "parallel:")
    assert f"→ {_pf(total)}, {_num(tempco)} ppm/K, worst case ±{_num(max(high - 250, 250 - low) / 250 * 100)} %" in head
    assert head.endswith(f"stands {min(100, 50)} V")   # a pair stands the lower rating
    assert _line(lines, "(C₁ + C₂)").strip() == f"{_pf(c1)} ∥ {_pf(c2)} = {_pf(total)} (C₁ + C₂)"
    assert _line(lines, "worst case", "within").strip() == f"worst case {_pf(low)}…{_pf(high)}, within ±5 %"
    # Class 1 drift: α's worst edge × the largest |T − 25 °C| over 0…+50 °C: 30 ppm/K × 25 K; the
    # only term, so compounding leaves it as it is.
    drift_pct = D(30) * max(abs(0 - 25), abs(50 - 25)) / D(10) ** 6 * 100
    for bin_key in ("cabinet a/a11", "cabinet a/a13"):
        assert f"expect a drift of up to ±{_num(drift_pct)} % (temperature ±{_num(drift_pct)} %, compounded)" in \
            _line(lines, f"{bin_key}: fit for tuned")


# The compensating pair: A6 390J N750 (39 pF ±5 %, α −750, tolerance not marked) ∥ A9 620J 1H C0G
# (62 pF ±5 %, 0 ± 30 ppm/K), asked for 100 pF at −300 ± 80 ppm/K.
PAIR_C1, PAIR_C2, PAIR_A1, PAIR_A2 = D(39), D(62), D(-750), D(0)
PAIR_WANTED, PAIR_WANTED_TOL = D(-300), D(80)


def test_the_tempco_pair_sums_its_parts_and_weights_its_tempcos():
    lines = _step("--db shop.db find --value 100p --tempco")
    total = PAIR_C1 + PAIR_C2
    alpha = (PAIR_C1 * PAIR_A1 + PAIR_C2 * PAIR_A2) / total          # capacitance-weighted mean
    worst = max(abs(total * D("1.05") - 100), abs(100 - total * D("0.95"))) / 100 * 100
    assert _line(lines, "for 100 pF") == f"for 100 pF, {_num(PAIR_WANTED)}±{_num(PAIR_WANTED_TOL)} ppm/K:"
    head = _line(lines, "parallel:")
    assert f"→ {_pf(total)}, {_num(round(alpha))} ppm/K, worst case ±{_num(worst)} %" in head
    net = _line(lines, "net tempco")
    assert f"= {_num(round(alpha, 1))}±" in net
    assert net.endswith(f"within {_num(PAIR_WANTED - PAIR_WANTED_TOL)}…{_num(PAIR_WANTED + PAIR_WANTED_TOL)} ppm/K")


def test_the_tempco_pair_spread_counts_the_unmarked_part_at_its_usual_tolerance():
    # EIA-198: N750 is usually sold as U2J, J = ±120 ppm/K; C0G's G = ±30 ppm/K.
    spread = (PAIR_C1 * 120 + PAIR_C2 * 30) / (PAIR_C1 + PAIR_C2)
    net = _line(_step("--db shop.db find --value 100p --tempco"), "net tempco")
    assert f"±{_num(round(spread, 2))} ppm/K" in net


def test_the_combination_formulas_used_by_the_tour_hold_on_a_worked_example():
    # [combination-formulas]: 47 pF N750 with 100 pF NP0. Parallel: 147 pF, (47·−750 + 100·0)/147
    # = −239.8 ppm/K; series: 47·100/147 = 31.97 pF, α weighted by the other part:
    # (100·−750 + 47·0)/147 = −510.2 ppm/K.
    c1, c2, a1, a2 = D(47), D(100), D(-750), D(0)
    assert c1 + c2 == 147 and round((c1 * a1 + c2 * a2) / (c1 + c2), 1) == D("-239.8")
    assert round(c1 * c2 / (c1 + c2), 2) == D("31.97")
    assert round((c2 * a1 + c1 * a2) / (c1 + c2), 1) == D("-510.2")
    # the same by calculus: C = C₁C₂/(C₁+C₂) at +1 K, each part moved by its own α
    cs = lambda x, y: x * y / (x + y)  # noqa: E731
    moved = cs(float(c1) * (1 + float(a1) * 1e-6), float(c2) * (1 + float(a2) * 1e-6))
    assert (moved / cs(float(c1), float(c2)) - 1) * 1e6 == pytest.approx(-510.2, abs=0.3)


def test_the_kit_needs_are_boards_times_references_and_the_windows_are_right():
    plan = _step("--db shop.db kit plan demo_inventory/vfo_7mhz_bom.csv")
    with open(DEMO / "vfo_7mhz_bom.csv", encoding="utf-8", newline="") as fh:
        bom = [r for r in csv.DictReader(fh) if r["Type"] == "capacitor"]
    boards = 5
    needs = [int(m[1]) for l in plan if (m := re.search(r"\tneed (\d+)\t", l))]
    assert needs == [int(r["Qty"]) * boards for r in bom]
    short = sum(1 for l in plan if re.search(r"\tshort \d+$", l))
    assert plan[0] == f"plan 1: {boards} boards, reserved, {len(bom)} capacitor lines, {short} short"
    # 220 pF ±5 % spans 209…231 pF; the 250 pF ±5 % window is 237.5…262.5 pF.
    near = _line(plan, "2 parts at 220 pF")
    assert f"may deliver {_pf(D(220) * D('0.95'))}…{_pf(D(220) * D('1.05'))}" in near
    assert f"outside {_pf(D(250) * D('0.95'))}…{_pf(D(250) * D('1.05'))}" in near
    # X7R over 0…+50 °C for 10 years: its ±15 % window, ageing of 4 % per decade-hour past 1000 h
    # (the high end of the 1.5…4 % of maker ageing notes: [mlcc-selection-article], [ageing-blog],
    # [ageing-maker-notes]), 10 years = 87 660 h; freshly soldered it sits up to two decades' ageing
    # above nominal (de-aged, [ageing-maker-notes]). The worst case compounds the terms:
    # (1 + a)(1 + b) − 1 for gains, (1 − a)(1 − b) − 1 for losses.
    rate, window = D(4), D(15)
    ageing = rate * D(math.log10(10 * 8766 / 1000))
    deaged = rate * 2
    gain = ((1 + window / 100) * (1 + deaged / 100) - 1) * 100
    loss = (1 - (1 - window / 100) * (1 - ageing / 100)) * 100
    x7r = _line(plan, ": marginal for signal: X7R")
    assert (f"+{_num(round(gain, 1))}/−{_num(round(loss, 1))} % (temperature ±{_num(window)} %,"
            f" ageing +{_num(deaged)}/−{_num(round(ageing, 2))} %, compounded)") in x7r


def test_the_pull_takes_boards_times_references_from_each_bin():
    with open(DEMO / "mains_inlet_bom.csv", encoding="utf-8", newline="") as fh:
        bom = [r for r in csv.DictReader(fh) if r["Type"] == "capacitor"]
    boards = 2
    pulled = [int(l.split("\t")[1]) for l in _step("--db shop.db kit pull 2") if "\t" in l]
    assert pulled == [-int(r["Qty"]) * boards for r in bom]


def test_the_purchasing_rows_are_the_short_lines_and_the_bins_under_their_minimum():
    sheets, held = _data_rows(), _quarantined_locations()
    taken = {l.split("\t")[0]: -int(l.split("\t")[1]) for l in _step("--db shop.db kit pull 2") if "\t" in l}
    under = 0
    for name, rows in sheets.items():
        for r in rows:
            minimum = _count(r.get("Min"))
            if minimum is None or _location(r) in held:
                continue
            have = _quantity(r)       # an unknown count under a minimum is ordered too
            if have is None or have - taken.get(f"{name.lower()}/{_location(r).lower()}", 0) < minimum:
                under += 1
    short = sum(1 for l in _step("--db shop.db kit plan demo_inventory/vfo_7mhz_bom.csv")
                if re.search(r"\tshort \d+$", l))
    assert _step("--db shop.db export purchasing")[-1] == f"wrote order.xlsx ({short + under} rows)"


def _write() -> None:
    import tempfile

    text = README.read_text(encoding="utf-8")
    with tempfile.TemporaryDirectory() as tmp:
        actual = iter(_run_all(text, Path(tmp)))

        def fill(match: re.Match) -> str:
            body = ""
            for step in next(actual):
                body += f"$ {step.command}\n" + "".join(f"{line}\n" for line in step.lines)
                body += f"[exit {step.exit_code}]\n" if step.exit_code else ""
            return f"```console\n{body}```"

        README.write_text(BLOCK.sub(fill, text), encoding="utf-8")


if __name__ == "__main__":
    if "--write" in sys.argv:
        _write()
        print(f"rewrote the console blocks of {README}")
    else:
        sys.exit(pytest.main([__file__, "-q"]))
