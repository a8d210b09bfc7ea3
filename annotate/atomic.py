"""Write output files all or nothing: a temporary name in the same folder, then a rename.

contract.md ("Commands"): outputs are written to a temporary name and renamed into
place, so an interrupted run leaves no half-written file.  ``os.replace`` within one
folder (one file system) is atomic on POSIX and Windows.

References
----------
.. [1] Python documentation, ``os.replace`` and ``tempfile.mkstemp``.
"""

from __future__ import annotations

import logging
import os
import tempfile
from collections.abc import Iterable, Iterator
from contextlib import contextmanager
from pathlib import Path

__all__ = ["atomic_path", "write_bytes_atomic", "write_text_atomic"]

log = logging.getLogger(__name__)


def _umask() -> int:
    mask = os.umask(0)
    os.umask(mask)
    return mask


@contextmanager
def atomic_path(path: str | os.PathLike[str]) -> Iterator[Path]:
    """Yield a temporary path beside ``path``; on success rename it onto ``path``.

    The caller writes the whole file to the yielded path.  When the block ends
    normally the file is renamed into place (replacing an older one); when it
    raises, the temporary file is deleted and the exception goes on.

    Parameters
    ----------
    path : path-like
        The final file name.  Its folder must exist.

    Yields
    ------
    pathlib.Path
        The temporary file (created empty) in the same folder.

    Examples
    --------
    >>> import tempfile, pathlib
    >>> folder = pathlib.Path(tempfile.mkdtemp())
    >>> with atomic_path(folder / "a.txt") as tmp:
    ...     _ = tmp.write_text("done")
    >>> (folder / "a.txt").read_text(), sorted(p.name for p in folder.iterdir())
    ('done', ['a.txt'])
    """
    final = Path(path)
    folder = final.parent if str(final.parent) else Path(".")
    fd, tmp_name = tempfile.mkstemp(prefix=f".{final.name}.", suffix=".tmp", dir=folder)
    os.close(fd)
    tmp = Path(tmp_name)
    try:
        yield tmp
        # mkstemp makes the file private (0600); give it the usual permissions
        os.chmod(tmp, 0o666 & ~_umask())
        os.replace(tmp, final)
    except BaseException:
        try:
            tmp.unlink()
        except FileNotFoundError:
            pass
        except OSError as exc:  # pragma: no cover - depends on the file system
            log.warning("could not delete temporary file %s: %s", tmp, exc)
        raise
    log.debug("wrote %s", final)


def write_bytes_atomic(path: str | os.PathLike[str], data: bytes) -> Path:
    """Write ``data`` to ``path`` all or nothing; returns the path."""
    with atomic_path(path) as tmp:
        with open(tmp, "wb") as fh:
            fh.write(data)
            fh.flush()
            os.fsync(fh.fileno())
    return Path(path)


def write_text_atomic(
    path: str | os.PathLike[str], text: str | Iterable[str], *, encoding: str = "utf-8",
    newline: str | None = None
) -> Path:
    """Write ``text`` (a string, or pieces of one written as they come, so a big document
    is never held whole) to ``path`` all or nothing; returns the path."""
    with atomic_path(path) as tmp:
        with open(tmp, "w", encoding=encoding, newline=newline) as fh:
            if isinstance(text, str):
                fh.write(text)
            else:
                for piece in text:
                    fh.write(piece)
            fh.flush()
            os.fsync(fh.fileno())
    return Path(path)
