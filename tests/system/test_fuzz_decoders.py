"""The marking and colour decoders give a Marking for any text at all, never a traceback.

Sources: the property "decode never raises" is this project's promise (ambiguity is a result,
not an exception); hostile inputs (control characters, lone surrogates, huge strings, random
Unicode) are common practice in fuzzing, no published source. The code fragments the
generators mix in ("104", "4n7", "brown black red", "X7R", "K") are IEC 60062 / EIA-198 forms,
from memory, used only as seeds that reach deeper into the decoders.
"""

from __future__ import annotations

import json

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from stock.markings.colours import decode_colours
from stock.decoded import Marking
from stock.markings.decoder import MAX_MARKING_CHARS, decode
from tests.helpers_procs import scaled
from tests.regression_inputs import DECODER_TEXTS

DECODERS = [pytest.param(decode, id="markings.decode"),
            pytest.param(decode_colours, id="colour_codes.decode_colours")]

# Pieces of real markings, so random joins reach the code tables instead of failing at once.
FRAGMENTS = ["104", "4n7", "R47", "2u2", "100pF", "0.1uF", "µF", "μ", "K", "J", "M", "Z", "250V",
             "63VDC", "275VAC", "~", "X7R", "C0G", "NP0", "N750", "P100", "X2", "Y1", "+", "-",
             "±", "%", "°C", "105°", "brown", "black", "red", "orange", "yellow", "green", "blue",
             "violet", "grey", "white", "gold", "silver", "BRN", "BLK", "RED", "/", ",", ".", " ",
             "\t", "\n", "\r", "\x00", "\x1b[31m", "\u200b", "\ufeff", "'", '"', ";", "--"]

any_text = st.text(alphabet=st.characters(codec=None, exclude_categories=()), max_size=200)
marking_like = st.lists(st.sampled_from(FRAGMENTS), max_size=25).map("".join)
mixed = st.one_of(any_text, marking_like,
                  st.tuples(marking_like, any_text, marking_like).map("".join))


def _assert_good_marking(m: object, text: str) -> None:
    assert isinstance(m, Marking)
    if m.text != text:
        # only an over-long marking is cut, to its first MAX_MARKING_CHARS characters, and says so
        assert len(text) > MAX_MARKING_CHARS and m.text == text[:MAX_MARKING_CHARS], (text, m.text)
        assert "unreadable" in m.flag_kinds()
    # the JSON contract must hold for whatever was decoded
    data = m.to_json()
    json.dumps(data, ensure_ascii=False)
    # "did not understand" is never a silent nothing: no value means flags, unparsed text or
    # alternatives say why (an empty or blank text may come back bare)
    if m.capacitance_pf is None and text.strip():
        said = {k: v for k, v in data.items() if k != "text" and v not in (None, [], (), {})}
        assert said, f"{text!r} decoded to a bare Marking that says nothing"


@pytest.mark.parametrize("decoder", DECODERS)
@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(text=mixed)
def test_any_text_decodes_to_a_marking_without_raising(decoder, text):
    _assert_good_marking(decoder(text), text)


@pytest.mark.parametrize("decoder", DECODERS)
@pytest.mark.parametrize("text", DECODER_TEXTS,
                         ids=[f"regression-{i}" for i in range(len(DECODER_TEXTS))])
def test_every_kept_regression_text_decodes_to_a_marking(decoder, text):
    _assert_good_marking(decoder(text), text)


@pytest.mark.parametrize("decoder", DECODERS)
@pytest.mark.parametrize("size", [pytest.param(100_000, id="100k-chars"),
                                  pytest.param(1_000_000, id="1M-chars")])
def test_a_huge_string_still_decodes_to_a_marking(decoder, size):
    text = ("104K 4n7 brown " * (size // 15 + 1))[:size]
    _assert_good_marking(decoder(text), text)


@pytest.mark.slow
@pytest.mark.parametrize("decoder", DECODERS)
@settings(max_examples=scaled(300), deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(text=st.text(max_size=5000))
def test_long_random_text_decodes_to_a_marking_without_raising(decoder, text):
    _assert_good_marking(decoder(text), text)
