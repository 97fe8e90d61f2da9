"""The QR payload of a bin label, and reading back what a scanner types.

Sources: the QR alphanumeric character set is ISO/IEC 18004 (table 5), spelled out here
independently of the code; percent-encoding is RFC 3986 section 2.1; segno (the encoder) and
zxing-cpp (a decoder) are reference libraries.
"""

from __future__ import annotations

import pytest
from hypothesis import given
from hypothesis import strategies as st

from stock.errors import BadValue, NotFound
from stock.inventory.row_reading import bin_key
from stock.scan_codes import bin_key_from_scan, bin_payload, is_scan

QR_ALPHANUMERIC = set("0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZ $%*+-./:")   # ISO/IEC 18004 table 5


@pytest.mark.parametrize("key, payload", [
    pytest.param("cabinet a/a11", "BIN:CABINET A/A11", id="plain"),
    pytest.param("drawer_cabinet_c/c08", "BIN:DRAWER%5FCABINET%5FC/C08", id="underscore-escaped"),
    pytest.param("shelf 2/ø10", "BIN:SHELF 2/%C3%B810", id="utf8-bytes"),   # ø is U+00F8, UTF-8 C3 B8
    pytest.param("box/50%", "BIN:BOX/50%25", id="percent-itself"),
])
def test_a_payload_is_the_prefix_and_the_key_upper_cased_with_percent_escapes(key, payload):
    assert bin_payload(key) == payload
    assert bin_key_from_scan(payload) == key


@given(st.text(min_size=1, max_size=40), st.text(min_size=1, max_size=20))
def test_any_bin_key_survives_the_round_trip_in_plain_qr_alphanumeric_text(cabinet, location):
    key = bin_key(cabinet, location)
    if not key.strip("/").strip():
        return
    payload = bin_payload(key)
    assert set(payload) <= QR_ALPHANUMERIC
    assert bin_key_from_scan(payload) == key
    assert bin_key_from_scan(payload.lower() + "\r\n") == key     # Caps Lock, the scanner's Enter


def test_segno_packs_the_payload_in_alphanumeric_mode():
    import segno

    assert segno.make(bin_payload("drawer_cabinet_c/c08"), error="m", micro=False).mode == "alphanumeric"


@pytest.mark.parametrize("text, why", [
    pytest.param("A11", "prefix", id="not-a-scan"),
    pytest.param("BIN:", "empty", id="no-key"),
    pytest.param("BIN:ABC%4", "hex escape", id="cut-escape"),
    pytest.param("BIN:ABC%ZZ", "hex escape", id="not-hex"),
    pytest.param("BIN:%C3", "UTF-8", id="half-a-character"),
])
def test_a_broken_scan_is_refused_with_what_a_code_looks_like(text, why):
    with pytest.raises(BadValue) as caught:
        bin_key_from_scan(text)
    assert "BIN:CABINET A/A11" in str(caught.value)
    if why in ("hex escape", "UTF-8"):
        assert why in str(caught.value)


def test_a_scanned_code_finds_its_bin_wherever_a_bin_is_named(shelf):
    assert is_scan(" bin:tidewater bench/t3")
    assert shelf.find_bin("BIN:TIDEWATER BENCH/T3")["location"] == "T3"
    with pytest.raises(NotFound, match="another database's label"):
        shelf.find_bin("BIN:TIDEWATER BENCH/T99")
