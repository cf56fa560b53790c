"""Safe output files: atomic writes, and never replacing a file ranker did not write."""

from __future__ import annotations

import errno
import os
import secrets
import shutil
import tempfile
import zipfile
from pathlib import Path

from .errors import InputError

#: Written into every output (a custom property of the workbook, a meta tag of the
#: HTML) so that a later run knows it may replace the file.
MARKER = "ranker-output"
HTML_MARKER = f'<meta name="generator" content="{MARKER}">'
#: The GeoJSON output's marker: the first member of its collection's properties.
GEOJSON_MARKER = f'"generator": "{MARKER}"'


def written_by_ranker(path: Path) -> bool:
    """Return True where ``path`` carries the ranker marker.

    For a workbook the marker is a custom document property *named*
    ``ranker-output`` (parsed, not searched for as text, so a property that
    merely mentions the marker does not count) whose value is a version
    number or ``demo input``. For HTML it is the generator meta tag in the
    first 4 KiB.
    """
    try:
        if path.suffix.lower() == ".html":
            with open(path, "rb") as f:
                return HTML_MARKER.encode() in f.read(4096)
        if path.suffix.lower() == ".geojson":
            with open(path, "rb") as f:
                return GEOJSON_MARKER.encode() in f.read(4096)
        with zipfile.ZipFile(path) as z:
            if "docProps/custom.xml" not in z.namelist():
                return False
            info = z.getinfo("docProps/custom.xml")
            if info.file_size > 1_000_000:
                return False
            return _marker_property(z.read("docProps/custom.xml"))
    except (OSError, zipfile.BadZipFile, KeyError, ValueError, RuntimeError, EOFError):
        return False


def _marker_property(xml: bytes) -> bool:
    """True when the custom properties hold a ``ranker-output`` property of ours."""
    import re

    from defusedxml import ElementTree as SafeET

    try:
        root = SafeET.fromstring(xml)
    except Exception:  # noqa: BLE001 - damaged or unsafe XML carries no marker
        return False
    values = ["".join(prop.itertext()).strip() for prop in root if prop.get("name") == MARKER]
    return len(values) == 1 and (
        values[0] == "demo input"
        or re.fullmatch(r"\d+(\.\d+)*([.+-]?[\w.+-]*)?", values[0]) is not None
    )


def check_replaceable(path: Path) -> None:
    """Raise InputError when ``path`` exists and ranker did not write it."""
    if path.exists() and not written_by_ranker(path):
        raise InputError.one(
            str(path),
            "a file of this name exists and was not written by ranker",
            "move or rename it, or choose another folder with --out",
        )


def _nearest_existing(path: Path) -> Path:
    """Return ``path`` or its nearest ancestor that exists (as the file system sees it)."""
    path = Path(os.path.abspath(path))
    while not os.path.lexists(path) and path.parent != path:
        path = path.parent
    return path


def check_out_dir(out_dir: Path, *, flag: str = "--out") -> None:
    """Raise InputError when ``out_dir`` cannot take the outputs.

    A folder that does not exist yet is fine when it can be created: its
    nearest existing ancestor must be a folder the user may write.
    """
    out_dir = Path(out_dir)
    base = _nearest_existing(out_dir)
    if not base.is_dir():
        what = "is a file, not a folder" if base.exists() else "cannot be reached"
        if base != Path(os.path.abspath(out_dir)):
            what += f", so {shown(out_dir)} cannot be made inside it"
        raise InputError.one(shown(base), what, f"give a folder with {flag}")
    if not os.access(base, os.W_OK | os.X_OK):
        raise InputError.one(
            shown(base),
            "the folder is read-only for you"
            + (
                ""
                if base == out_dir
                else f", so no folder can be created inside it for {shown(out_dir)}"
            ),
            f"choose a folder you can write with {flag}",
        )


def make_out_dir(out_dir: Path, *, flag: str = "--out") -> bool:
    """Create ``out_dir`` (and missing parents) where needed; return True if created.

    Raises
    ------
    InputError
        Where a file stands in the way or the place is not writable.
    """
    out_dir = Path(out_dir)
    check_out_dir(out_dir, flag=flag)
    if out_dir.is_dir():
        return False
    try:
        out_dir.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise os_error(exc, out_dir) from exc
    return True


def shown(path) -> str:
    """Return ``path`` as printable text (bytes that are not UTF-8 shown as U+FFFD)."""
    text = os.fspath(path)
    if isinstance(text, bytes):
        return text.decode("utf-8", "replace")
    return text.encode("utf-8", "surrogateescape").decode("utf-8", "replace")


def _default_mode() -> int:
    """Permission bits a newly created file gets here (0o666 less the umask)."""
    mask = os.umask(0)
    os.umask(mask)
    return 0o666 & ~mask


def _remove(path) -> None:
    try:
        os.unlink(path)
    except OSError:
        pass


def _keep_aside(path: Path) -> Path:
    """Keep the existing output under a hidden name, so a failed move can put it back."""
    while True:
        bak = path.with_name(f".{path.name}.{secrets.token_hex(4)}.bak")
        try:
            os.link(path, bak)  # no moment without a file at ``path``
            return bak
        except FileExistsError:
            continue
        except OSError:  # a file system without hard links
            if bak.exists():
                continue
            shutil.copy2(path, bak)
            return bak


def write_all_atomic(files: dict[Path, bytes]) -> None:
    """Write several files, each to a temporary name, then move all into place.

    Every target is checked first (:func:`check_replaceable`). Each file is
    written and flushed to disk under a hidden temporary name in its own
    folder, then moved over its target. A failure at any step (a full disk, a
    read-only folder, a file held open by another program) removes every
    temporary file and puts back any output already replaced, so either all
    files are new or none is, and nothing half-written is left behind.

    Raises
    ------
    InputError
        Naming the output that could not be written and how to fix it.
    """
    for path in files:
        check_replaceable(path)
    batch = _Batch(_default_mode())
    try:
        for path, data in files.items():
            batch.write_aside(path, data)
        for path in files:
            batch.move_into_place(path)
    except BaseException as exc:  # undo on any failure, then report it
        batch.undo()
        if isinstance(exc, OSError):
            raise os_error(exc, batch.current) from exc
        raise
    batch.drop_backups()


class _Batch:
    """The files of one :func:`write_all_atomic` call, on their way into place.

    Attributes
    ----------
    mode : int
        Permission bits each new file gets.
    temps : dict
        Target to the hidden temporary file holding its new bytes.
    backups : dict
        Target to the hidden copy of the output it replaces (:func:`_keep_aside`).
    moved : list of Path
        Targets whose move into place has begun, in order.
    current : Path or None
        The target of the step under way (the one a failure names).
    """

    def __init__(self, mode: int):
        self.mode = mode
        self.temps: dict[Path, str] = {}
        self.backups: dict[Path, Path] = {}
        self.moved: list[Path] = []
        self.current: Path | None = None

    def write_aside(self, path: Path, data: bytes) -> None:
        """Write ``data`` to a hidden temporary file beside ``path``, flushed to disk."""
        self.current = path
        fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
        self.temps[path] = tmp
        with os.fdopen(fd, "wb") as f:
            if hasattr(os, "fchmod"):
                os.fchmod(f.fileno(), self.mode)  # mkstemp makes 0600; outputs are shared
            f.write(data)
            f.flush()
            os.fsync(f.fileno())

    def move_into_place(self, path: Path) -> None:
        """Keep the existing output at ``path`` aside, then move the new file over it."""
        self.current = path
        if path.exists():
            self.backups[path] = _keep_aside(path)
        # Counted as moved first: a signal landing just after the move must still undo it.
        self.moved.append(path)
        os.replace(self.temps[path], path)

    def undo(self) -> None:
        """Put every replaced output back, remove new outputs and every hidden file."""
        for path in self.moved:
            if path in self.backups:
                _put_back(self.backups.pop(path), path)
            else:
                _remove(path)
        for bak in self.backups.values():  # outputs never moved: still in place
            _remove(bak)
        for tmp in self.temps.values():
            _remove(tmp)

    def drop_backups(self) -> None:
        """Remove the hidden copies of the replaced outputs (all files are in place)."""
        for bak in self.backups.values():
            _remove(bak)


def _put_back(bak: Path, path: Path) -> None:
    """Move the output kept aside at ``bak`` back to ``path``.

    Where the move never happened (``bak`` is still a link to the file at
    ``path``) the copy is only removed; where putting it back fails, the
    hidden copy is kept rather than the old output lost.
    """
    try:
        if os.path.samefile(bak, path):
            _remove(bak)
        else:
            os.replace(bak, path)
    except OSError:
        pass


def os_error(exc: OSError, path: Path | None = None) -> InputError:
    where = shown(path) if path is not None else shown(exc.filename or "output")
    if exc.errno == errno.ENOSPC:
        return InputError.one(
            str(where), "the disk is full", "free some space or choose another --out"
        )
    if exc.errno in (errno.EACCES, errno.EPERM, errno.EROFS):
        return InputError.one(
            str(where),
            "cannot write here (read-only, or the file is open in another program)",
            "close the file in the spreadsheet program, or choose another folder with --out",
        )
    if exc.errno in (errno.ENOTDIR, errno.EEXIST):
        return InputError.one(
            str(where), "a file stands where a folder is needed", "give a folder with --out"
        )
    if exc.errno == errno.ENOENT:
        return InputError.one(
            str(where),
            "the output folder does not exist",
            "create it, or choose another with --out",
        )
    return InputError.one(
        str(where), f"cannot write the output ({exc.strerror})", "choose another --out"
    )
