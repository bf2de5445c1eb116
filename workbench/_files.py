"""Files: hashes, path resolution, output-path checks and atomic writes.

Writes are atomic (a temporary file in the same folder, then :func:`os.replace`)
and never overwrite silently.
"""

from __future__ import annotations

import hashlib
import os
import tempfile
from pathlib import Path

__all__ = ["file_sha256", "check_output_path"]


def file_sha256(path: str | os.PathLike) -> str:
    """SHA-256 (hex) of a file's bytes."""
    h = hashlib.sha256()
    with open(path, "rb") as fh:
        for chunk in iter(lambda: fh.read(1 << 16), b""):
            h.update(chunk)
    return h.hexdigest()


def _resolve_path(fpath: str, base_dir: Path | None) -> Path:
    target = Path(fpath).expanduser()
    if not target.is_absolute() and base_dir is not None:
        target = base_dir / target
    return target


def check_output_path(path: str | os.PathLike, overwrite: bool, option: str = "") -> Path:
    """Check that ``path`` may be written: absent, or a regular file and ``overwrite``.

    A FIFO, a device node, a socket, a directory or a symbolic link is refused
    even with ``overwrite`` (replacing it would replace the special file itself,
    or write somewhere else than named); so is a path whose folder does not exist.

    Raises
    ------
    FileExistsError
        A regular file exists and ``overwrite`` is false.
    ValueError
        Not a regular file, or no such folder; the message names ``option``.
    """
    import stat

    path = Path(path)
    where = f"{option}: " if option else ""
    try:
        st = os.lstat(path)
    except FileNotFoundError:
        folder = path.parent if str(path.parent) else Path(".")
        if not folder.is_dir():
            raise ValueError(f"{where}{path}: folder {folder} does not exist") from None
        return path
    mode = st.st_mode
    if stat.S_ISLNK(mode):
        what = "a symbolic link"
    elif stat.S_ISDIR(mode):
        what = "a directory"
    elif stat.S_ISFIFO(mode):
        what = "a FIFO (named pipe)"
    elif stat.S_ISCHR(mode) or stat.S_ISBLK(mode):
        what = "a device node"
    elif stat.S_ISSOCK(mode):
        what = "a socket"
    elif stat.S_ISREG(mode):
        if not overwrite:
            raise FileExistsError(
                f"{where}{path} exists; use --force (overwrite=True) to replace it"
            )
        return path
    else:  # pragma: no cover - no other file types on POSIX
        what = "not a regular file"
    raise ValueError(
        f"{where}{path} is {what}; heatpath writes only regular files and never replaces "
        "a special file or a link, even with --force; choose another output name"
    )


def _atomic_write(path: Path, text: str, overwrite: bool, backup: bool = True) -> None:
    path = Path(path)
    if os.path.lexists(path) and not overwrite:
        raise FileExistsError(f"{path} exists; pass overwrite=True to replace it (a .bak is kept)")
    check_output_path(path, overwrite)
    folder = path.parent if str(path.parent) else Path(".")
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=folder)
    try:
        with os.fdopen(fd, "w", encoding="utf-8", newline="\n") as fh:
            fh.write(text)
            fh.flush()
            os.fsync(fh.fileno())
        os.chmod(tmp, _file_mode(path))
        if path.exists() and backup:
            bak = path.with_name(path.name + ".bak")
            with open(path, "rb") as src:
                old = src.read()
            _replace_bytes(bak, old)
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass
        raise


def _file_mode(path: Path) -> int:
    """Mode for a new file: the old file's, else 0o666 less the process umask."""
    try:
        return os.stat(path).st_mode & 0o777
    except FileNotFoundError:
        mask = os.umask(0)
        os.umask(mask)
        return 0o666 & ~mask


def _replace_bytes(path: Path, data: bytes) -> None:
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
        os.chmod(tmp, _file_mode(path))
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass
        raise
