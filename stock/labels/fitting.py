"""Fitting a label's text into its box: sizes chosen, long lines wrapped or shrunk, never overflowing.

The label's lines are laid out at one scale (the size of the small type), largest first; a line
too wide wraps at spaces (or, for one long word, is set smaller down to :data:`MIN_PT`, then
broken); a line that may not wrap shrinks; past its allowed number of lines the text ends with
"…". When even the smallest scale is too tall, the least needed lines are left out, in the order
their ``drop`` rank says, and the caller is told which.

Widths come from a measuring function (text, bold, size in pt → width in pt), so this module
knows nothing of the PDF writer.

>>> fixed = lambda text, bold, size: 0.5 * size * len(text)
>>> plan = fit_block([Line((Run("100 nF", bold=True, scale=2.0),)), Line((Run("marked 104K 2A X7R"),), wrap=2)],
...                  width=40.0, height=40.0, measure=fixed)
>>> [[r.text for r in line.runs] for line in plan.lines]
[['100 nF'], ['marked 104K'], ['2A X7R']]
>>> all(fixed(r.text, r.bold, r.size) <= 40 for line in plan.lines for r in line.runs), plan.height <= 40
(True, True)
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass, replace

MIN_PT = 5.0        # the smallest type set on a label: small print that stays legible on a laser
MAX_PT = 9.0        # the small type on a large label; the value is set larger
STEP_PT = 0.25
LINE_GAP = 0.12     # extra space between lines, as a share of the size (the font's own box is 1 em)
BOXED_LINE = 1.32   # a line of boxed runs: the box reaches past the face's 1 em, and keeps clear of the next line

Measure = Callable[[str, bool, float], float]


@dataclass(frozen=True)
class Run:
    """A piece of text on a line: its weight, its size as a multiple of the scale, how it is drawn.

    ``style`` is ``plain``, ``boxed`` (outlined), ``inverted`` (white on a black box),
    ``dashed`` (dashed outline) or ``faint`` (grey): the fit-for mark and the warnings use them.
    """

    text: str
    bold: bool = False
    scale: float = 1.0
    style: str = "plain"
    size: float = 0.0          # set by the fitter, in pt

    @property
    def padded(self) -> bool:
        """Whether the run keeps a box's inner margin (the fit-for tags all do, boxed or not)."""
        return self.style in ("boxed", "inverted", "dashed", "faint")


@dataclass(frozen=True)
class Line:
    """One line of a label as wanted: its runs, how many lines it may wrap to, when to leave it out.

    ``wrap`` 0 means the line never wraps (it shrinks instead, and its runs keep together);
    ``drop`` ranks lines that may be left out when the label is full (1 goes first; 0 never).
    ``cells`` lines (the fit-for mark) may break between runs, into at most ``wrap`` rows.
    """

    runs: tuple[Run, ...]
    wrap: int = 0
    drop: int = 0
    cells: bool = False
    name: str = ""
    fallback: str = ""         # a shorter text to set instead of ending the line in "…"


@dataclass(frozen=True)
class SetLine:
    """One line as set: its runs with their sizes, and its height (pt)."""

    runs: tuple[Run, ...]
    height: float
    cells: bool = False
    name: str = ""


@dataclass(frozen=True)
class Block:
    """The lines as set, what was shortened with "…" and what was left out (by line name)."""

    lines: tuple[SetLine, ...]
    shortened: tuple[str, ...] = ()
    left_out: tuple[str, ...] = ()

    @property
    def height(self) -> float:
        return sum(line.height for line in self.lines)


def pad(size: float) -> float:
    """The inner margin of a boxed run (pt), each side."""
    return 0.28 * size


def run_width(run: Run, measure: Measure) -> float:
    width = measure(run.text, run.bold, run.size)
    return width + 2 * pad(run.size) if run.padded else width


def runs_width(runs: Sequence[Run], measure: Measure, gap: float) -> float:
    """Runs side by side, ``gap`` times the size of the second apart."""
    total = 0.0
    for i, run in enumerate(runs):
        total += run_width(run, measure) + (gap * run.size if i else 0.0)
    return total


def _line_height(runs: Sequence[Run]) -> float:
    size = max(r.size for r in runs)
    return size * (BOXED_LINE if any(r.padded for r in runs) else 1 + LINE_GAP)


def _ellipsize(text: str, bold: bool, size: float, width: float, measure: Measure) -> str:
    while text and measure(text + "…", bold, size) > width:
        text = text[:-1].rstrip()
    return text + "…"


def _break_word(word: str, bold: bool, size: float, width: float, measure: Measure) -> list[str]:
    pieces, current = [], ""
    for char in word:
        if current and measure(current + char, bold, size) > width:
            pieces.append(current)
            current = char
        else:
            current += char
    return pieces + [current] if current else pieces


def _words(text: str) -> list[str]:
    """The places a line may break: at spaces, but never between a number and its unit.

    >>> _words("X7R ±15 % −55…125 °C")
    ['X7R', '±15 %', '−55…125 °C']
    """
    words: list[str] = []
    for token in text.split():
        glued = words and words[-1][-1].isdigit() and not any(c.isdigit() for c in token) and len(token) <= 5
        if glued:
            words[-1] += " " + token
        else:
            words.append(token)
    return words


def _wrap(run: Run, width: float, limit: int, measure: Measure) -> tuple[list[Run], bool]:
    """A wrapping run in at most ``limit`` lines; True when it had to end in "…"."""
    size = run.size
    words = _words(run.text)
    if not words:
        return [], False          # nothing but white space: no row to set
    full = width

    def room(size: float) -> float:   # a boxed run keeps its box's inner margin inside the width
        return full - 2 * pad(size) if run.padded else full

    widest = max(words, key=lambda w: measure(w, run.bold, 1.0))
    while size > MIN_PT and measure(widest, run.bold, size) > room(size):
        # widths grow with the size: jump near the size that fits, then step down to it
        guess = size * room(size) / measure(widest, run.bold, size)
        size = max(MIN_PT, min(size - STEP_PT, STEP_PT * int(guess / STEP_PT)))
    width = room(size)
    pieces: list[str] = []
    for word in words:
        if measure(word, run.bold, size) > width:
            pieces += _break_word(word, run.bold, size, width, measure)
        else:
            pieces.append(word)
    rows: list[str] = []
    for piece in pieces:
        if rows and measure(rows[-1] + " " + piece, run.bold, size) <= width:
            rows[-1] += " " + piece
        else:
            rows.append(piece)
    cut = len(rows) > limit
    if cut:
        rows = rows[:limit]
        rows[-1] = _ellipsize(rows[-1], run.bold, size, width, measure)
    return [replace(run, text=row, size=size) for row in rows], cut


def _shrink(runs: list[Run], width: float, measure: Measure, gap: float) -> tuple[list[Run], bool]:
    """Runs kept on one line, set smaller until they fit; True when the last had to end in "…"."""
    for _ in range(8):     # widths grow with the sizes: one proportional step, again where a run hit 5 pt
        wide = runs_width(runs, measure, gap)
        if wide <= width or max(r.size for r in runs) <= MIN_PT:
            break
        factor = width / wide * 0.999
        runs = [replace(r, size=max(MIN_PT, r.size * factor)) for r in runs]
    if runs_width(runs, measure, gap) <= width:
        return runs, False
    last = runs[-1]
    room = width - runs_width(runs[:-1], measure, gap) - (gap * last.size if len(runs) > 1 else 0)
    room -= 2 * pad(last.size) if last.padded else 0.0
    return runs[:-1] + [replace(last, text=_ellipsize(last.text, last.bold, last.size, room, measure))], True


def _cells(line: Line, runs: list[Run], width: float, measure: Measure, gap: float) -> tuple[list[list[Run]], bool]:
    """Cells on as few rows as fit (at most ``line.wrap``), shrinking to fit the widest row."""
    for rows in range(1, max(1, line.wrap) + 1):
        per_row = -(-len(runs) // rows)
        groups = [runs[i:i + per_row] for i in range(0, len(runs), per_row)]
        if all(runs_width(g, measure, gap) <= width for g in groups):
            return groups, False
        shrunk = [_shrink(list(g), width, measure, gap) for g in groups]
        if rows == max(1, line.wrap) or not any(cut for _, cut in shrunk):
            size = min(r.size for g, _ in shrunk for r in g)
            groups = [[replace(r, size=size) for r in g] for g, _ in shrunk]
            return groups, any(cut for _, cut in shrunk)
    raise AssertionError("unreachable")


def _set_line(line: Line, scale: float, width: float, measure: Measure, gap: float,
              fallbacks: bool) -> tuple[list[SetLine], bool]:
    runs = [replace(r, size=max(MIN_PT, scale * r.scale)) for r in line.runs]
    if line.cells:
        groups, cut = _cells(line, runs, width, measure, gap)
        return [SetLine(tuple(g), _line_height(g), True, line.name) for g in groups], cut
    if line.wrap and len(runs) == 1:
        rows, cut = _wrap(runs[0], width, line.wrap, measure)
        if cut and line.fallback and fallbacks:
            rows, cut = _wrap(replace(runs[0], text=line.fallback), width, line.wrap, measure)
        return [SetLine((r,), _line_height([r]), False, line.name) for r in rows], cut
    runs, cut = _shrink(runs, width, measure, gap)
    return [SetLine(tuple(runs), _line_height(runs), False, line.name)], cut


def set_lines(lines: Sequence[Line], scale: float, width: float, measure: Measure,
              gap: float = 0.5, wide: tuple[float, float] | None = None, fallbacks: bool = False) -> Block:
    """Every line set at one scale (pt of the small type) within ``width`` pt.

    ``wide`` is (depth, width): a line starting at least ``depth`` pt below the top may use the
    wider width (the text runs on under the QR code).
    """
    out: list[SetLine] = []
    shortened: list[str] = []
    depth = 0.0
    for line in lines:
        room = wide[1] if wide and depth >= wide[0] else width
        rows, cut = _set_line(line, scale, room, measure, gap, fallbacks)
        out += rows
        depth += sum(r.height for r in rows)
        if cut:
            shortened.append(line.name)
    return Block(tuple(out), tuple(shortened))


def fit_block(lines: Sequence[Line], width: float, height: float, measure: Measure,
              largest: float = MAX_PT, wide: tuple[float, float] | None = None) -> Block:
    """The lines set as large as fits in ``width`` × ``height`` pt, leaving lines out if it must.

    The result's height never exceeds ``height`` and no run is wider than its room. Lines that
    may be left out go (in their ``drop`` order) before a line that may not is shortened; only
    lines of ``drop`` 0 are kept however full the label is.
    """
    essential = {line.name for line in lines if not line.drop}
    block, complete = _fit(lines, width, height, measure, largest, wide, fallbacks=False)
    if complete or not any(line.fallback for line in lines if line.name in essential):
        return block
    # An essential line is still cut with every other line left out: try its shorter form.
    shorter, complete = _fit(lines, width, height, measure, largest, wide, fallbacks=True)
    return shorter if complete else block


def _fit(lines: Sequence[Line], width: float, height: float, measure: Measure, largest: float,
         wide: tuple[float, float] | None, fallbacks: bool) -> tuple[Block, bool]:
    """fit_block's search; the flag says no essential line had to be cut.

    Leaving lines out helps an essential line only where it gains the room under the code; when
    it does not, the first block that fitted (fewest lines left out) is the answer.
    """
    kept = list(lines)
    left_out: list[str] = []
    essential = {line.name for line in lines if not line.drop}
    first_fit: Block | None = None
    scales = [max(MIN_PT, largest - i * STEP_PT) for i in range(int((largest - MIN_PT) / STEP_PT) + 1)]
    while True:
        def attempt(scale: float) -> Block:
            return set_lines(kept, scale, width, measure, wide=wide, fallbacks=fallbacks)

        def whole(block: Block) -> bool:
            return block.height <= height and not block.shortened

        block = attempt(scales[-1])
        if whole(block):
            # the largest scale that still fits: a smaller scale never fits worse, so bisect
            low, high = 0, len(scales) - 1          # scales[high] fits; find the first that does
            while low < high:
                middle = (low + high) // 2
                if whole(found := attempt(scales[middle])):
                    high, block = middle, found
                else:
                    low = middle + 1
            return replace(block, left_out=tuple(left_out)), True
        if block.height <= height:
            if not essential & set(block.shortened):
                return replace(block, left_out=tuple(left_out)), True
            first_fit = first_fit or replace(block, left_out=tuple(left_out))
        droppable = [line for line in kept if line.drop]
        if not droppable:
            return (first_fit, False) if first_fit else (_clip(block, height, left_out), False)
        first = min(droppable, key=lambda line: line.drop)
        kept.remove(first)
        left_out.append(first.name)


def _clip(block: Block, height: float, left_out: list[str]) -> Block:
    """Last resort: the lines that fit, from the top (only reached with impossible content)."""
    lines: list[SetLine] = []
    total = 0.0
    for line in block.lines:
        if total + line.height > height:
            left_out.append(line.name)
            continue
        lines.append(line)
        total += line.height
    return Block(tuple(lines), block.shortened, tuple(dict.fromkeys(left_out)))


__all__ = ["LINE_GAP", "MAX_PT", "MIN_PT", "Block", "Line", "Run", "SetLine", "fit_block", "pad",
           "run_width", "runs_width", "set_lines"]
