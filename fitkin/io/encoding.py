"""From file bytes to text: UTF-8 (with or without a byte-order mark), UTF-16 and UTF-32
(with a byte-order mark, or UTF-16 without one), else Windows-1252 or Latin-1 with a note.

Spreadsheet programs save "Unicode text" as UTF-16, usually with a byte-order mark, but some
instrument software writes UTF-16 without one. Such a file is full of NUL bytes, one beside
every ASCII character; it is recognised by where they sit (every second byte, on the same
side) rather than refused as a binary file.
"""
from __future__ import annotations

import re

from fitkin.errors import InputError

__all__ = ["decode_text", "TextDecodeError"]

_BOMS = (  # longest first: the UTF-32-LE mark starts with the UTF-16-LE one
    (b"\xff\xfe\x00\x00", "utf-32", "UTF-32"),
    (b"\x00\x00\xfe\xff", "utf-32", "UTF-32"),
    (b"\xff\xfe", "utf-16", "UTF-16"),
    (b"\xfe\xff", "utf-16", "UTF-16"),
)
#: Bytes looked at to recognise UTF-16 without a byte-order mark.
_SAMPLE = 4096
#: Share of the high bytes that must be NUL (ASCII-heavy text), and most of the low bytes not.
_NUL_SHARE = 0.6


class TextDecodeError(InputError):
    """Bytes that are not text in any encoding fitkin reads."""


def decode_text(data: bytes, path: str, *, what: str = "a text table",
                hint: str = "give a CSV/TSV text file or an .xlsx workbook",
                legacy_8bit: bool = True) -> tuple[str, list[str]]:
    """Decode file bytes; returns (text, notes), the notes naming any encoding that was guessed.

    Parameters
    ----------
    data : the file's bytes.
    path : the file, for messages.
    what, hint : how the expected content is named in the message for binary data.
    legacy_8bit : read text that is not UTF-8 as Windows-1252 (else Latin-1), with a note;
        False makes it an error (formats such as TOML that must be UTF-8).

    Raises
    ------
    TextDecodeError : NUL or control characters that no Unicode encoding explains (a binary
        file), a byte-order mark followed by undecodable bytes, or (``legacy_8bit=False``)
        text that is not UTF-8.
    """
    notes: list[str] = []
    for bom, codec, name in _BOMS:
        if data.startswith(bom):
            try:
                text = data.decode(codec)
            except UnicodeDecodeError as exc:
                raise TextDecodeError(f"the file starts like {name} text (byte-order mark) but byte "
                                      f"{exc.start} cannot be decoded", file=path,
                                      hint="save it again as UTF-8 text") from None
            return _checked(text, path, what, hint, f"{name} text"), notes
    if b"\x00" in data:
        codec = _utf16_without_bom(data)
        if codec is None:
            raise TextDecodeError(f"this is a binary file, not {what} (it contains NUL bytes and is "
                                  "not UTF-16 text)", file=path, hint=hint)
        try:
            text = data.decode(codec)
        except UnicodeDecodeError as exc:
            raise TextDecodeError(f"the file looks like UTF-16 text without a byte-order mark "
                                  f"({_ENDIAN[codec]}), but byte {exc.start} cannot be decoded",
                                  file=path, hint="save it again as UTF-8 text") from None
        notes.append(f"{path}: read as UTF-16 text ({_ENDIAN[codec]}, no byte-order mark)")
        return _checked(text, path, what, hint, "UTF-16 text"), notes
    try:
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        if not legacy_8bit:
            raise TextDecodeError(f"not UTF-8 text (byte {exc.start} is not UTF-8); {what} must be "
                                  "UTF-8", file=path, hint="save it again as UTF-8 text") from None
        try:
            text = data.decode("cp1252")
            notes.append(f"{path}: not UTF-8; read as Windows-1252 text (check °, µ in the header)")
        except UnicodeDecodeError:
            text = data.decode("latin-1")
            notes.append(f"{path}: not UTF-8; read as Latin-1 text (check °, µ in the header)")
    return _checked(text, path, what, hint, None), notes


#: Control characters no text table holds (below U+0020, except tab, newline, vertical tab,
#: form feed and carriage return): their presence means a binary file.
_CONTROL = re.compile("[\x00-\x08\x0e-\x1f]")
_ENDIAN = {"utf-16-le": "little-endian", "utf-16-be": "big-endian"}


def _utf16_without_bom(data: bytes) -> str | None:
    """'utf-16-le' or 'utf-16-be' when the NUL bytes sit on one side of every byte pair."""
    sample = data[:_SAMPLE - _SAMPLE % 2]
    if len(sample) < 4 or len(data) % 2:
        return None
    even, odd = sample[0::2], sample[1::2]
    even_nul, odd_nul = even.count(0) / len(even), odd.count(0) / len(odd)
    if odd_nul >= _NUL_SHARE and even_nul < 0.05:
        return "utf-16-le"
    if even_nul >= _NUL_SHARE and odd_nul < 0.05:
        return "utf-16-be"
    return None


def _checked(text: str, path: str, what: str, hint: str, decoded_as: str | None) -> str:
    text = text.rstrip("\x1a")  # DOS end-of-file marker
    found = _CONTROL.search(text)
    bad = found.group() if found else None
    if bad is not None:
        how = f" after decoding it as {decoded_as}" if decoded_as else ""
        raise TextDecodeError(f"this is a binary file, not {what} (it contains control characters"
                              f"{how}, e.g. U+{ord(bad):04X})", file=path, hint=hint)
    return text
