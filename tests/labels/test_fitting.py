"""Setting a label's lines into its box: never wider or taller than the box, smallest type 5 pt.

Sources: widths are measured with the PDF library's own font metrics (Bitstream Vera) or with a
fixed-width stand-in stated in each test; the 5 pt floor is this project's legibility rule
(common practice, no published source).
"""

from __future__ import annotations

from hypothesis import given, settings
from hypothesis import strategies as st

from stock.labels.fitting import MIN_PT, Line, Run, fit_block, run_width, runs_width
from stock.labels.render import measure


def fixed(text, bold, size):
    return 0.5 * size * len(text)


def _inside(block, width, height, measure_with):
    assert block.height <= height + 1e-9
    for line in block.lines:
        assert runs_width(line.runs, measure_with, 0.5) <= width + 1e-9
        assert all(r.size >= MIN_PT - 1e-9 for r in line.runs)


def test_a_long_word_is_set_smaller_before_it_is_broken():
    block = fit_block([Line((Run("polyethylene-naphthalate"),), wrap=2)], width=60.0, height=30.0, measure=fixed)
    assert [r.text for line in block.lines for r in line.runs] == ["polyethylene-naphthalate"]
    assert block.lines[0].runs[0].size == 5.0      # 0.5 × 5 × 24 = 60 pt: fits at the floor exactly


def test_a_word_too_long_even_at_five_points_is_broken_not_overflowed():
    block = fit_block([Line((Run("x" * 40),), wrap=3)], width=50.0, height=40.0, measure=fixed)
    assert "".join(r.text for line in block.lines for r in line.runs) == "x" * 40
    _inside(block, 50.0, 40.0, fixed)


def test_a_number_never_parts_from_its_unit():
    block = fit_block([Line((Run("X7R ±15 % −55…125 °C"),), wrap=3)], width=42.0, height=60.0,
                      measure=fixed, largest=6.0)
    rows = [line.runs[0].text for line in block.lines]
    assert all(not row.startswith(("°C", "%")) for row in rows), rows


def test_lines_that_may_go_are_left_out_in_their_order_before_the_essential_ones_shrink():
    lines = [Line((Run("100 nF", bold=True, scale=2),), name="value"),
             Line((Run("marked " + "104K " * 30),), wrap=2, drop=1, name="marking"),
             Line((Run("X7R ±15 %"),), wrap=2, drop=2, name="dielectric"),
             Line((Run("bin shelf/a1"),), wrap=2, name="bin")]
    block = fit_block(lines, width=60.0, height=18.0, measure=fixed)
    assert block.left_out == ("marking", "dielectric")
    assert [line.name for line in block.lines] == ["value", "bin"]


def test_a_line_that_runs_on_under_the_code_gets_the_wider_room():
    lines = [Line((Run("100 nF"),), name="value"), Line((Run("bin a long cabinet name/a1"),), wrap=1, name="bin")]
    narrow = fit_block(lines, width=40.0, height=40.0, measure=fixed, largest=5.0)
    wide = fit_block(lines, width=40.0, height=40.0, measure=fixed, largest=5.0, wide=(5.0, 80.0))
    assert narrow.shortened == ("bin",) and wide.shortened == ()


@settings(max_examples=60, deadline=None)
@given(st.lists(st.text(alphabet=st.characters(codec="latin-1", exclude_categories=("Cc", "Cs")), min_size=1, max_size=80),
                min_size=1, max_size=8),
       st.floats(min_value=40, max_value=200), st.floats(min_value=20, max_value=120))
def test_whatever_the_text_the_block_never_leaves_its_box(texts, width, height):
    styles = ("plain", "inverted", "plain", "boxed")
    lines = [Line((Run("47 µF", bold=True, scale=2.1),), name="value")] + [
        Line((Run(t, bold=i % 2 == 0, style=styles[i % 4]),), wrap=2, drop=i % 3, name=f"line {i}")
        for i, t in enumerate(texts)]
    block = fit_block(lines, width, height, measure)
    assert block.height <= height + 1e-6
    for line in block.lines:
        assert runs_width(line.runs, measure, 0.5) <= width + 1e-6
        assert all(run_width(r, measure) <= width + 1e-6 and r.size >= MIN_PT - 1e-9 for r in line.runs)
