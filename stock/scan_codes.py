"""The text a bin label's QR code carries, and reading back what a handheld scanner types.

A scanner in keyboard mode types the code's payload followed by Enter, so the payload must survive
any keyboard layout and be short enough for a small code. The payload is ``BIN:`` followed by the
bin key in upper case, with every character outside the QR alphanumeric set (digits, A–Z, space
and ``$ * + - . / :``) written as ``%XX`` escapes of its UTF-8 bytes (RFC 3986 percent-encoding).
The result is plain ASCII (nothing a keyboard layout can garble) and fits the QR code's
alphanumeric mode, which packs 2 characters in 11 bits against 8 bits a character in byte mode: a
smaller code, so larger modules on a small label.

Bin keys are lower-cased when they are made (:func:`stock.inventory.row_reading.bin_key`), so the upper-casing
loses nothing and reading back lower-cases the ASCII letters again. The prefix and the hex digits
are read in either case (a scanner with Caps Lock on still works).

>>> bin_payload("cabinet a/a11")
'BIN:CABINET A/A11'
>>> bin_payload("drawer_cabinet_c/c08")
'BIN:DRAWER%5FCABINET%5FC/C08'
>>> bin_key_from_scan("BIN:DRAWER%5FCABINET%5FC/C08\\r\\n")
'drawer_cabinet_c/c08'
>>> is_scan("bin:cabinet a/a11"), is_scan("A11")
(True, False)
"""

from __future__ import annotations

import re

from stock.errors import BadValue

PREFIX = "BIN:"

# The QR alphanumeric character set (ISO/IEC 18004, table 5) less "%", which starts an escape.
_PLAIN = frozenset("0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZ $*+-./:")
_ESCAPE = re.compile(r"%([0-9a-fA-F]{2})")
_EXPECTED = "a bin code as a label's QR code carries it, e.g. BIN:CABINET A/A11"


def bin_payload(bin_key: str) -> str:
    """The QR payload for a bin key (see the module docstring).

    >>> bin_payload("shelf 2/ø10")
    'BIN:SHELF 2/%C3%B810'
    """
    out = [PREFIX]
    for char in bin_key:
        upper = char.upper() if char.isascii() else char
        if upper in _PLAIN:
            out.append(upper)
        else:
            out.extend(f"%{byte:02X}" for byte in char.encode("utf-8"))
    return "".join(out)


def is_scan(text: str) -> bool:
    """Whether ``text`` is a scanned bin code (it starts with the prefix, in any case)."""
    return text.strip().upper().startswith(PREFIX)


def _ascii_lower(text: str) -> str:
    return "".join(c.lower() if c.isascii() else c for c in text)


def bin_key_from_scan(text: str) -> str:
    """The bin key a scanned code carries; surrounding white space (the scanner's Enter) is ignored.

    Raises:
        BadValue: the text lacks the prefix, names no key, or holds a broken escape.

    >>> bin_key_from_scan("bin:shelf 2/%c3%b810")
    'shelf 2/ø10'
    """
    cleaned = text.strip()
    if not is_scan(cleaned):
        raise BadValue("scanned code", text, _EXPECTED)
    body = _ascii_lower(cleaned[len(PREFIX):])
    if "%" in _ESCAPE.sub("", body):
        raise BadValue("scanned code", text, _EXPECTED + " (a % must start a two-digit hex escape)")
    raw = bytearray()
    position = 0
    for match in _ESCAPE.finditer(body):
        raw += body[position:match.start()].encode("utf-8")
        raw.append(int(match[1], 16))
        position = match.end()
    raw += body[position:].encode("utf-8")
    try:
        key = raw.decode("utf-8")
    except UnicodeDecodeError:
        raise BadValue("scanned code", text, _EXPECTED + " (its escapes are not UTF-8)") from None
    if not key.strip():
        raise BadValue("scanned code", text, _EXPECTED)
    return key


__all__ = ["PREFIX", "bin_key_from_scan", "bin_payload", "is_scan"]
