"""Reading the text files users give (recipes, constant tables): UTF-8, said plainly when not.

Every reader of a user's file goes through :func:`read_utf8`, so that a file saved in
another encoding is refused with the line and column of the first byte that is not UTF-8
and a way to fix it, by the caller's own error class (a recipe's error names the recipe, a
table's error the table).
"""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path

#: Builds the caller's error from a problem and a hint.
Refuse = Callable[[str, str], Exception]

NOT_UTF8_HINT = ("save the file as UTF-8 (the encoding offered by 'Save as' in most editors), "
                 "or convert it, e.g. `iconv -f latin1 -t utf-8 OLD > NEW`")


def read_utf8(path: Path, refuse: Refuse) -> str:
    """The text of *path*, read as UTF-8 (a byte-order mark is dropped).

    Raises ``refuse(problem, hint)`` when the file cannot be read or is not UTF-8.
    """
    try:
        raw = Path(path).read_bytes()
    except OSError as exc:
        raise refuse(f"cannot read the file ({exc.strerror or exc})",
                     "check the path (relative paths start from the current folder, or "
                     "from the recipe's folder inside a recipe)") from None
    try:
        return raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise refuse(not_utf8(raw, exc.start), NOT_UTF8_HINT) from None


def not_utf8(raw: bytes, start: int) -> str:
    """The problem text for the byte at *start* of *raw* that is not UTF-8."""
    line = raw.count(b"\n", 0, start) + 1
    column = start - (raw.rfind(b"\n", 0, start) + 1) + 1
    return (f"is not UTF-8 text: byte 0x{raw[start]:02x} at line {line}, column {column} "
            "is not valid UTF-8")


def first_not_utf8(path: Path, block: int = 1 << 20) -> str | None:
    """The problem text for the first byte of *path* that is not UTF-8 (read in blocks,
    so a large file costs no more memory than a block), or None when all of it is."""
    import codecs

    decoder = codecs.getincrementaldecoder("utf-8")()
    offset = lines = 0
    last_newline = -1
    with open(path, "rb") as handle:
        while True:
            data = handle.read(block)
            try:
                decoder.decode(data, final=not data)
            except UnicodeDecodeError as exc:
                start = min(max(exc.start, 0), len(data) - 1)
                line = lines + data.count(b"\n", 0, start) + 1
                head = data.rfind(b"\n", 0, start)
                column = start - head if head >= 0 else offset + start - last_newline
                return (f"is not UTF-8 text: byte 0x{data[start]:02x} at line {line}, column "
                        f"{column} is not valid UTF-8")
            if not data:
                return None
            lines += data.count(b"\n")
            found = data.rfind(b"\n")
            if found >= 0:
                last_newline = offset + found
            offset += len(data)
