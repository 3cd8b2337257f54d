"""Files a user names: read only regular files, never more than a stated number of bytes; write
whole or not at all; never two outputs onto one file or an output onto an input; and CSV cells a
spreadsheet would run as formulas neutralised.

Every path the command line or a scenario accepts goes through :func:`read_bytes` /
:func:`read_text`; every file it writes through :func:`write_atomic`; every CSV it writes
through :func:`csv_text` or :func:`safe_row`.
"""

from __future__ import annotations

import csv
import io
import os
import stat
import tempfile
from pathlib import Path

from liftcore.errors import InputError

#: Largest data file read (coefficient tables, wind tables, Weibull sectors, tracks). [bytes]
MAX_DATA_BYTES = 50_000_000
#: Cells starting with one of these are run as formulas by spreadsheets (OWASP, CSV injection).
FORMULA_START = ("=", "+", "-", "@", "\t", "\r")


def _os_message(exc: OSError) -> str:
    return exc.strerror or str(exc)


def open_regular(path: str | Path, option: str):
    """Open ``path`` for binary reading if it is a regular file, else raise :class:`InputError`
    naming ``option`` (a folder, a device such as /dev/zero, a named pipe, a socket, a missing
    file, a name too long, a symlink loop, a path through a file). A named pipe is never
    opened, so it cannot hang the reader."""
    p = Path(path)
    who = _short(option) if p.name and p.name in option else f"{option} {_short(p.name or str(p))}"
    try:
        st = os.stat(p)
    except FileNotFoundError:
        raise InputError(option, f"cannot read {who}: file not found") from None
    except OSError as exc:
        raise InputError(option, f"cannot read {who}: {_os_message(exc)}") from None
    if not stat.S_ISREG(st.st_mode):
        what = ("a folder" if stat.S_ISDIR(st.st_mode) else "a named pipe" if stat.S_ISFIFO(st.st_mode)
                else "a device" if stat.S_ISCHR(st.st_mode) or stat.S_ISBLK(st.st_mode) else "not a regular file")
        raise InputError(option, f"cannot read {who}: it is {what}; give a regular file")
    try:
        return open(p, "rb")
    except OSError as exc:
        raise InputError(option, f"cannot read {who}: {_os_message(exc)}") from None


def read_bytes(path: str | Path, option: str, max_bytes: int = MAX_DATA_BYTES) -> bytes:
    """The bytes of a regular file, at most ``max_bytes`` (the cap is applied while reading, so
    a file that grows or lies about its size cannot exhaust memory).

    Parameters
    ----------
    path : str or Path
        The file.
    option : str
        The field or option that named it (for the message).
    max_bytes : int
        Largest size read. [bytes]

    Returns
    -------
    bytes
        The whole file.

    Raises
    ------
    InputError
        Not a regular file, unreadable, or larger than ``max_bytes``.
    """
    p = Path(path)
    who = _short(option) if p.name and p.name in option else f"{option} {_short(p.name or str(p))}"
    with open_regular(p, option) as fh:
        size = os.fstat(fh.fileno()).st_size
        if size > max_bytes:  # refused unread
            raise InputError(option, f"{who} is {size:,} bytes; at most {max_bytes:,} are read")
        data = fh.read(max_bytes + 1)  # the cap holds whatever the size said
    if len(data) > max_bytes:
        raise InputError(option, f"{who} is more than {max_bytes:,} bytes; at most {max_bytes:,} are read")
    return data


def read_text(path: str | Path, option: str, max_bytes: int = MAX_DATA_BYTES) -> str:
    """:func:`read_bytes` decoded as UTF-8 (a byte-order mark dropped; bad bytes replaced)."""
    return read_bytes(path, option, max_bytes).decode("utf-8-sig", errors="replace")


def data_row_line(source, row: int, comment: str = "#") -> int | None:
    """The line of a CSV file (counted from 1, as an editor counts) that holds data row ``row``.

    The CSV readers skip blank lines and lines that hold only a ``comment``, so the n-th data row
    is rarely the file's line n + 1; error messages name both. Only called when a row is refused,
    so the file is scanned once, on the error path, line by line (a long series costs no memory).

    Parameters
    ----------
    source : str, Path, bytes or seekable binary file
        The file that was read.
    row : int
        Data row under the header, from 0.
    comment : str
        Character that starts a comment.

    Returns
    -------
    int or None
        The line, or None when the source cannot be read again (a stream) or has fewer rows (a
        quoted value running over several lines).
    """
    if isinstance(source, (bytes, bytearray)):
        lines = iter(bytes(source).splitlines())
        return _line_of(lines, row, comment)
    if isinstance(source, (str, Path)):
        try:
            with open_regular(source, "file") as fh:
                return _line_of(fh, row, comment)
        except (InputError, OSError):
            return None
    if hasattr(source, "seek") and hasattr(source, "read"):
        try:
            here = source.tell()
            source.seek(0)
            data = source.read(MAX_DATA_BYTES)
            source.seek(here)
        except (OSError, ValueError):
            return None
        if isinstance(data, str):
            data = data.encode("utf-8")
        return _line_of(iter(data.splitlines()), row, comment)
    return None


def _line_of(lines, row: int, comment: str) -> int | None:
    mark = comment.encode()
    seen = -2  # the header is the first line with content
    for number, line in enumerate(lines, start=1):
        if line.split(mark, 1)[0].strip():
            seen += 1
            if seen == row:
                return number
    return None


def _short(p) -> str:
    s = str(p)
    return s if len(s) <= 80 else s[:38] + "…" + s[-38:]


def same_file(a: str | Path, b: str | Path) -> bool:
    """Whether two paths are one file (device and inode: hard links and symlinks included)."""
    try:
        sa, sb = os.stat(a), os.stat(b)
    except OSError:
        return False
    return (sa.st_dev, sa.st_ino) == (sb.st_dev, sb.st_ino)


def check_outputs(outputs: dict, inputs: dict) -> None:
    """Refuse outputs that land on an input or on each other.

    Parameters
    ----------
    outputs, inputs : dict
        Option name -> path (``None`` entries are skipped).

    Raises
    ------
    InputError
        Two outputs name one file (by path or by device and inode), or an output is an input.
    """
    given = {k: Path(v) for k, v in outputs.items() if v is not None}
    names = list(given)
    for i, a in enumerate(names):
        for b in names[i + 1:]:
            pa, pb = given[a], given[b]
            if os.path.abspath(pa) == os.path.abspath(pb) or same_file(pa, pb):
                raise InputError(b, f"{b} {pb} is the same file as {a}; give each output its own file")
        for k, src in inputs.items():
            if src is not None and (os.path.abspath(given[a]) == os.path.abspath(src) or same_file(given[a], src)):
                raise InputError(a, f"{a} {given[a]} is the input file {k} itself; choose another name")


def write_atomic(path: str | Path, text: str, option: str) -> None:
    """Write ``text`` (UTF-8) to ``path`` whole or not at all: into a temporary file in the same
    folder, then renamed over ``path``."""
    p = Path(path)
    try:
        fd, tmp = tempfile.mkstemp(prefix=f".{p.name[:40]}.", suffix=".part", dir=p.parent or ".")
    except OSError as exc:
        raise InputError(option, f"{option}: cannot write {_short(p)} ({_os_message(exc)})") from None
    try:
        with os.fdopen(fd, "w", encoding="utf-8", newline="") as fh:
            fh.write(text)
        os.replace(tmp, p)
    except OSError as exc:
        raise InputError(option, f"{option}: cannot write {_short(p)} ({_os_message(exc)})") from None
    finally:
        if os.path.exists(tmp):
            os.unlink(tmp)


# ----------------------------------------------------------------------------- CSV
def _is_number(text: str) -> bool:
    try:
        float(text)
    except ValueError:
        return False
    return True


def safe_cell(value):
    """A cell that no spreadsheet runs as a formula: text starting with ``= + - @``, tab or CR
    gets a leading apostrophe (the OWASP rule); numbers, and text that reads as a number
    ("-5", "+1e3"), are left as they are."""
    if isinstance(value, str) and value.startswith(FORMULA_START) and not _is_number(value):
        return "'" + value
    return value


def safe_row(row) -> list:
    """:func:`safe_cell` on every cell of a row."""
    return [safe_cell(c) for c in row]


class SafeWriter:
    """A ``csv.writer`` that neutralises formula cells (see :func:`safe_cell`)."""

    def __init__(self, buf):
        self._w = csv.writer(buf, lineterminator="\n")

    def writerow(self, row) -> None:
        self._w.writerow(safe_row(row))


def csv_text(df) -> str:
    """A DataFrame as CSV text (no index), its column names and text cells neutralised."""
    out = df.copy()
    for i in range(out.shape[1]):
        if out.dtypes.iloc[i] == object or str(out.dtypes.iloc[i]) in ("string", "str"):
            out.iloc[:, i] = out.iloc[:, i].map(safe_cell)
    out.columns = [safe_cell(str(c)) for c in out.columns]
    buf = io.StringIO()
    out.to_csv(buf, index=False, lineterminator="\n")
    return buf.getvalue()
