"""Writing output files safely: atomic writes and safe file names.

Every file is written atomically: the bytes go to a temporary file in the
same directory, which is flushed, synced and then renamed over the target
with :func:`os.replace`.  A rename within one file system is atomic on POSIX
and Windows, so a run killed part-way leaves either the old file or the new
one, never half a file (common practice, no source).

Output names are derived from input file names and header values, which come
from outside; :func:`safe_name` reduces them to letters, digits, ``-``, ``_``
and ``.`` with no leading dot, so no name can climb out of the output folder
or hide itself.
"""

from __future__ import annotations

import os
import re
import tempfile
from pathlib import Path

__all__ = ["atomic_write", "safe_name", "same_file"]

_SAFE = re.compile(r"[^A-Za-z0-9._-]+")


def atomic_write(path, data) -> Path:
    """Write ``data`` to ``path`` atomically (temporary file + rename).

    Parameters
    ----------
    path : str or os.PathLike
        Target file; its folder must exist.
    data : str or bytes
        Text is written as UTF-8.

    Returns
    -------
    pathlib.Path
        The target path.

    Raises
    ------
    OSError
        When the folder is not writable; the temporary file is removed.

    Notes
    -----
    The temporary file lives in the target's folder so that the final
    :func:`os.replace` is a rename within one file system (common practice,
    no source).

    Examples
    --------
    >>> import tempfile, pathlib
    >>> d = pathlib.Path(tempfile.mkdtemp())
    >>> atomic_write(d / "a.txt", "hello").read_text()
    'hello'
    """
    path = Path(path)
    payload = data.encode("utf-8") if isinstance(data, str) else bytes(data)
    fd, tmp = tempfile.mkstemp(dir=path.parent, prefix=f".{path.name}.", suffix=".tmp")
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(payload)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass
        raise
    return path


def safe_name(text, *, default: str = "line") -> str:
    """Reduce ``text`` to a file-name part with no path separators or traversal.

    Parameters
    ----------
    text : str
        A file stem or header value.
    default : str
        Returned when nothing usable is left.

    Returns
    -------
    str
        Only ``A-Z a-z 0-9 . _ -``, no leading dot or dash, no ``..``, at
        most 120 characters.

    Examples
    --------
    >>> safe_name("../../etc/passwd")
    'etc_passwd'
    >>> safe_name(".hidden line 7.sgy")
    'hidden_line_7.sgy'
    """
    s = _SAFE.sub("_", str(text))
    s = re.sub(r"\.{2,}", "_", s)
    s = re.sub(r"_+", "_", s).strip("._-")
    s = s[:120].rstrip("._-")
    return s or default


def same_file(a, b) -> bool:
    """Whether two paths name the same file (False when either cannot be read)."""
    try:
        return os.path.samefile(a, b)
    except (OSError, ValueError):
        return False
