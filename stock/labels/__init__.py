"""Bin labels: sheet layouts, what a label says, fitting text into it, and drawing the PDF.

- :mod:`~stock.labels.layouts`: paper, named sheet geometries, custom sizes, and the checks.
- :mod:`~stock.labels.content`: each label's facts from the store (:func:`select_labels`).
- :mod:`~stock.labels.fitting`: setting lines into a box without overflowing it.
- :mod:`~stock.labels.render`: the PDF (reportlab and segno, imported only when drawing).

:func:`make_labels` is the one call the command makes.
"""

from __future__ import annotations

from collections.abc import Sequence
from pathlib import Path
from typing import TYPE_CHECKING

if TYPE_CHECKING:      # the command's help reads the layouts; drawing code loads only to draw
    from stock.labels.render import LabelSheet


def make_labels(store, out: Path, refs: Sequence[str] = (), *, flagged: bool = False,
                changed_since: str | None = None, paper: str | None = None, layout: str | None = None,
                size: str | None = None, grid: str | None = None, gap: str | None = None,
                margins: str | None = None, skip: int = 0, frames: bool = False) -> LabelSheet:
    """Choose the layout and the bins, then write the sheet (see :func:`choose_layout`,
    :func:`select_labels` and :func:`write_labels` for the options and their errors).

    The layout is checked before the store is read, so a bad option fails fast and writes nothing.
    """
    from stock.labels.content import select_labels
    from stock.labels.layouts import choose_layout
    from stock.labels.render import write_labels

    chosen = choose_layout(paper=paper, name=layout, size=size, grid=grid, margins=margins, gap=gap)
    labels = select_labels(store, refs, flagged=flagged, changed_since=changed_since)
    return write_labels(labels, chosen, Path(out), skip=skip, frames=frames)


__all__ = ["make_labels"]
