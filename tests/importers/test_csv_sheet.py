"""Reading delimited text sheets: encodings, delimiters, quoting, hostile files.

Sources: CSV quoting per RFC 4180 (§2.6 line breaks and delimiters inside quotes, §2.7 doubled
quotes); encodings: cp1252 code page per Microsoft/WHATWG encoding tables (0xB5 is µ MICRO SIGN;
0x81, 0x8D, 0x8F, 0x90, 0x9D are undefined in cp1252 and so mean ISO-8859-1), the UTF-8 and
UTF-16 byte-order marks per the Unicode Standard (U+FEFF). Header aliases: common practice in shop
sheets, no published source. The sheets are our own invented workshop's.
"""

from __future__ import annotations

import csv
import tracemalloc
from collections.abc import Iterator

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from importers import csv_sheet
from importers.raw_sheet import RawRow
from importers.sheet import read_sheets
from stock.errors import BadSheet

HEADER = "Bin,Marking,Value,Qty,Notes"


def write(tmp_path, data: bytes | str, name: str = "bins.csv", encoding: str = "utf-8"):
    path = tmp_path / name
    path.write_bytes(data if isinstance(data, bytes) else data.encode(encoding))
    return path


def read_one(path):
    sheets = read_sheets(path)
    assert len(sheets) == 1
    sheet = sheets[0]
    return sheet, list(sheet.rows)


# Encodings a shop's sheet arrives in; byte values per the Microsoft/WHATWG cp1252 table and the
# Unicode Standard's byte-order marks.
ENCODINGS = [
    pytest.param("utf-8", "Bin,Value\nA1,4µ7 ±10%\n".encode("utf-8"), "utf-8", id="utf-8"),
    pytest.param("utf-8-bom", b"\xef\xbb\xbf" + "Bin,Value\nA1,4µ7 ±10%\n".encode("utf-8"), "utf-8-sig",
                 id="utf-8-with-bom"),
    pytest.param("cp1252", b"Bin,Value\nA1,4\xb57 \xb110%\n", "cp1252", id="cp1252-micro-is-b5"),
    pytest.param("latin-1", b"Bin,Value,Notes\nA1,4\xb57 \xb110%,\x81\n", "latin-1",
                 id="latin-1-when-cp1252-has-a-hole"),
    pytest.param("utf-16", "Bin\tValue\nA1\t4µ7 ±10%\n".encode("utf-16"), "utf-16",
                 id="utf-16-with-bom-as-excel-unicode-text"),
    pytest.param("utf-16-le", "Bin\tValue\nA1\t4µ7 ±10%\n".encode("utf-16-le"), "utf-16-le",
                 id="utf-16-le-without-bom"),
]


@pytest.mark.parametrize(("label", "data", "encoding"), ENCODINGS)
def test_micro_sign_survives_every_encoding(tmp_path, label, data, encoding):
    sheet, rows = read_one(write(tmp_path, data))
    assert sheet.encoding == encoding
    assert sheet.headers[:2] == ("Bin", "Value")
    assert rows[0].cells[1] == "4µ7 ±10%"


def test_cp1252_only_characters_are_read_as_cp1252(tmp_path):
    # Microsoft cp1252 table: 0x80 is € EURO SIGN, 0x96 EN DASH (both C1 controls in ISO-8859-1).
    sheet, rows = read_one(write(tmp_path, b"Bin,Notes\nA1,\x80 2 \x96 bought 1987\n"))
    assert sheet.encoding == "cp1252"
    assert rows[0].cells[1] == "€ 2 – bought 1987"


# The four delimiters shop sheets use; RFC 4180 describes comma, the others are common practice.
DELIMITERS = [
    pytest.param(",", id="comma"),
    pytest.param(";", id="semicolon"),
    pytest.param("\t", id="tab"),
    pytest.param("|", id="pipe"),
]


@pytest.mark.parametrize("delimiter", DELIMITERS)
def test_each_delimiter_is_sniffed(tmp_path, delimiter):
    lines = [["Bin", "Marking", "Qty"], ["A1", "104", "20"], ["A2", "4n7 J", "5"]]
    text = "\n".join(delimiter.join(line) for line in lines) + "\n"
    sheet, rows = read_one(write(tmp_path, text))
    assert sheet.delimiter == delimiter
    assert sheet.headers == ("Bin", "Marking", "Qty")
    assert rows == [RawRow(2, ("A1", "104", "20")), RawRow(3, ("A2", "4n7 J", "5"))]


def test_a_decimal_comma_does_not_fool_the_semicolon_sniffer(tmp_path):
    # common practice in continental European spreadsheet exports, no published source
    text = "Bin;Value (µF);Qty\nA1;4,7;10\nA2;0,47;3\nA3;22;1\n"
    sheet, rows = read_one(write(tmp_path, text))
    assert sheet.delimiter == ";"
    assert [r.cells[1] for r in rows] == ["4,7", "0,47", "22"]


def test_a_tsv_file_with_one_column_is_read_as_tab_separated(tmp_path):
    sheet, rows = read_one(write(tmp_path, "Marking\n104\n4n7\n", name="list.tsv"))
    assert sheet.delimiter == "\t"
    assert [r.cells for r in rows] == [("104",), ("4n7",)]


def test_quoted_fields_keep_delimiters_line_breaks_and_doubled_quotes(tmp_path):
    # RFC 4180 §2.6 (line breaks, commas inside quotes) and §2.7 (a quote doubled inside quotes)
    text = ('Bin,Marking,Notes\n'
            'A1,104,"bought at the rally,\nbox of 50"\n'
            'A2,"4n7 ""J""",plain\n')
    sheet, rows = read_one(write(tmp_path, text))
    assert rows == [RawRow(2, ("A1", "104", "bought at the rally,\nbox of 50")),
                    RawRow(3, ("A2", '4n7 "J"', "plain"))]


def test_mixed_line_endings_give_one_row_each(tmp_path):
    # \r\n (RFC 4180), \n and a lone \r (old Mac exports) in one file; common practice
    text = "Bin,Qty\r\nA1,1\nA2,2\rA3,3\r\n"
    _, rows = read_one(write(tmp_path, text))
    assert [(r.number, r.cells) for r in rows] == [(2, ("A1", "1")), (3, ("A2", "2")), (4, ("A3", "3"))]


def test_nul_bytes_and_a_dos_end_of_file_mark_are_dropped(tmp_path):
    # A NUL inside text is never meant (common practice); Ctrl-Z ends files from old DOS tools.
    data = b"Bin,Marking\nA1,10\x004\nA2,4n7\x00\n\x00\x00\n\x1a"
    _, rows = read_one(write(tmp_path, data))
    assert rows == [RawRow(2, ("A1", "104")), RawRow(3, ("A2", "4n7"))]


def test_a_one_megabyte_cell_is_read_whole(tmp_path):
    # csv's default field limit is 128 KiB (Python docs); a pasted note may be larger
    big = "x" * 1_000_000
    _, rows = read_one(write(tmp_path, f'Bin,Notes\nA1,"{big}"\nA2,short\n'))
    assert len(rows[0].cells[1]) == 1_000_000
    assert rows[1] == RawRow(3, ("A2", "short"))


def test_a_cell_over_the_field_limit_names_its_row(tmp_path, monkeypatch):
    before = csv.field_size_limit()
    try:
        csv.field_size_limit(1000)
        monkeypatch.setattr(csv_sheet, "FIELD_LIMIT", 1000)
        path = write(tmp_path, "Bin,Notes\nA1,ok\nA2," + "y" * 5000 + "\n")
        with pytest.raises(BadSheet) as caught:
            read_one(path)        # raised while looking for the header, or later while streaming
        assert str(caught.value) == f"{path}, row 3: cannot be read as delimited text: field larger than field limit (1000)"
    finally:
        csv.field_size_limit(before)


def test_a_header_only_file_has_headers_and_no_rows(tmp_path):
    sheet, rows = read_one(write(tmp_path, HEADER + "\n"))
    assert sheet.headers == ("Bin", "Marking", "Value", "Qty", "Notes")
    assert sheet.header_row == 1
    assert rows == []


def test_duplicated_headers_are_made_unique(tmp_path):
    sheet, rows = read_one(write(tmp_path, "Bin,Notes,Notes,notes\nA1,a,b,c\n"))
    assert sheet.headers == ("Bin", "Notes", "Notes (2)", "notes (3)")
    assert rows[0].cells == ("A1", "a", "b", "c")


def test_ten_thousand_columns_are_read(tmp_path):
    headers = ["Bin", "Marking"] + [f"extra {i}" for i in range(3, 10_001)]
    values = ["A1", "104"] + [str(i) for i in range(3, 10_001)]
    sheet, rows = read_one(write(tmp_path, ",".join(headers) + "\n" + ",".join(values) + "\n"))
    assert len(sheet.headers) == 10_000
    assert rows[0].cells[-1] == "10000"
    assert len(rows[0].cells) == 10_000


def test_cells_beyond_the_header_are_kept_under_column_names(tmp_path):
    _, rows = read_one(write(tmp_path, "Bin,Marking\nA1,104,,spare box\nA2\n"))
    assert rows == [RawRow(2, ("A1", "104"), (("column 4", "spare box"),)),
                    RawRow(3, ("A2", None))]


def test_title_and_blank_rows_above_the_header_are_skipped_and_kept(tmp_path):
    text = "Kingsbridge Radio capacitor drawers\n\n,,\nDrawer,Cap.,Qty on hand\nA1,104,20\n\nA2,4n7,5\n"
    sheet, rows = read_one(write(tmp_path, text))
    assert sheet.header_row == 4
    assert sheet.headers == ("Drawer", "Cap.", "Qty on hand")
    assert sheet.skipped_above == (RawRow(1, ("Kingsbridge Radio capacitor drawers", None, None)),)
    assert [r.number for r in rows] == [5, 7]


def test_blank_cells_read_as_none_and_other_text_is_kept_as_typed(tmp_path):
    _, rows = read_one(write(tmp_path, "Bin,Marking,Qty\nA1,  , 007 \n"))
    assert rows[0].cells == ("A1", None, " 007 ")


# Files that are not text sheets: each gets a one-line message naming the file.
NOT_TEXT = [
    pytest.param(bytes(range(256)) * 40, "is not a text sheet (it holds binary data) "
                 "(expected a .csv, .tsv, .txt or .xlsx sheet)", id="binary-junk"),
    pytest.param(b"%PDF-1.7\n%\xe2\xe3\xcf\xd3\n1 0 obj", "is a PDF document, not a text sheet "
                 "(expected a .csv, .tsv, .txt or .xlsx sheet)", id="pdf"),
    pytest.param(b"SQLite format 3\x00" + bytes(100), "is an SQLite database, not a text sheet "
                 "(expected a .csv, .tsv, .txt or .xlsx sheet)", id="sqlite-database"),
    pytest.param(b"", "is empty (expected a header row naming the columns, then one row per bin)", id="empty"),
    pytest.param(b" \r\n\t\n", "is empty (expected a header row naming the columns, then one row per bin)",
                 id="whitespace-only"),
    pytest.param(b",,,\n,,\n\n", "has no rows with anything in them (expected a header row naming the "
                 "columns, then one row per bin)", id="only-delimiters"),
    pytest.param(b"\xef\xbb\xbfBin\n\xff\xfe\n", "claims to be UTF-8-SIG text but does not decode as it "
                 "(expected a file saved again as UTF-8 CSV)", id="broken-utf-8-after-bom"),
]


@pytest.mark.parametrize(("data", "message"), NOT_TEXT)
def test_files_that_are_not_text_sheets_are_refused_in_one_line(tmp_path, data, message):
    path = write(tmp_path, data)
    with pytest.raises(BadSheet) as caught:
        read_one(path)
    assert str(caught.value) == f"{path}: {message}"


def test_rows_stream_without_holding_the_file_in_memory(tmp_path):
    # invariant, no outside source: reading the first row of a ~20 MB file must not load it
    path = tmp_path / "big.csv"
    with path.open("w", encoding="utf-8", newline="") as handle:
        handle.write("Bin,Marking,Qty,Notes\n")
        line = "A{},104K 50V,{},µF in the notes column to make the line longer\n"
        handle.writelines(line.format(i, i % 50) for i in range(300_000))
    tracemalloc.start()
    try:
        sheet = read_sheets(path)[0]
        assert isinstance(sheet.rows, Iterator)
        first = next(sheet.rows)
        _, peak = tracemalloc.get_traced_memory()
    finally:
        tracemalloc.stop()
    assert first == RawRow(2, ("A0", "104K 50V", "0", "µF in the notes column to make the line longer"))
    assert peak < 8_000_000
    assert sum(1 for _ in sheet.rows) == 299_999


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(st.binary(max_size=2000))
def test_any_bytes_give_rows_or_a_bad_sheet_never_a_crash(tmp_path, data):
    # invariant (fuzzing, common practice): a result or a clear error, never a traceback
    path = write(tmp_path, data, name="fuzz.csv")
    try:
        for sheet in read_sheets(path):
            for row in sheet.rows:
                assert len(row.cells) == len(sheet.headers)
    except BadSheet as exc:
        assert str(exc).startswith(str(path))


@settings(max_examples=100, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(st.lists(st.lists(st.text(alphabet=st.characters(blacklist_categories=("Cs", "Cc")),
                                 max_size=8), min_size=3, max_size=3), min_size=1, max_size=6))
def test_written_csv_reads_back_cell_for_cell(tmp_path, records):
    # round trip through Python's RFC 4180 writer; invariant, no outside source needed
    path = tmp_path / "round.csv"
    with path.open("w", encoding="utf-8", newline="") as handle:
        csv.writer(handle).writerows([["Bin", "Marking", "Qty"], *records])
    sheet = read_sheets(path)[0]
    expected = [tuple(c if c.strip() else None for c in r) for r in records if any(c.strip() for c in r)]
    got = [row.cells for row in sheet.rows]
    assert got == expected
