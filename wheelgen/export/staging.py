"""Write a build into a staging folder beside the target and swap it in only at the end.

A failed or interrupted build deletes its staging folder and leaves the previous
output exactly as it was; a build killed outright leaves a ``.<name>.staging-<pid>-*``
folder that the next build removes once that process is gone (and, if it was killed
in the instant between the two renames of the swap, the next build first puts the
previous output back). Every path handed out
is checked to stay inside the staging folder, whatever the part names say.
"""

from __future__ import annotations

import os
import re
import shutil
import signal
import tempfile
from pathlib import Path
from types import TracebackType

from ..design.names import NAME_ALLOWED, RESERVED_NAMES, name_key, name_problem

__all__ = ["Staging", "UnsafeNameError", "inside", "safe_name"]


class UnsafeNameError(ValueError):
    """A part or file name that could write outside the output folder."""


def safe_name(name: str, what: str = "part name", reserved: bool = True) -> str:
    """``name`` if it follows the name rule (``design/names.py``), else raise.

    ``reserved=False`` allows the names the build keeps for its own files (a design
    may be called ``report``; a part may not).
    """
    problem = name_problem(name)
    if problem is not None and not (
        not reserved and isinstance(name, str) and name_key(name) in RESERVED_NAMES
    ):
        raise UnsafeNameError(
            f"{what} {name!r} is not allowed in a file name ({problem}); allowed: "
            f"{NAME_ALLOWED}"
        )
    return name


def inside(root: Path, relative: str) -> Path:
    """``root / relative``, refusing anything that resolves outside ``root``."""
    rel = Path(relative)
    if rel.is_absolute() or any(p in ("..", "") for p in rel.parts):
        raise UnsafeNameError(f"path {relative!r} leaves the output folder")
    target = (root / rel).resolve()
    if not target.is_relative_to(root.resolve()):
        raise UnsafeNameError(f"path {relative!r} leaves the output folder")
    return target


def _pid_alive(pid: int) -> bool:
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except PermissionError:
        return True
    return True


_STOPS = {signal.SIGINT, signal.SIGTERM}


def _hold_signals() -> set[signal.Signals] | None:
    if not hasattr(signal, "pthread_sigmask"):
        return None
    return {signal.Signals(s) for s in signal.pthread_sigmask(signal.SIG_BLOCK, _STOPS)}


def _release_signals(held: set[signal.Signals] | None) -> None:
    if held is not None:
        signal.pthread_sigmask(signal.SIG_SETMASK, held)


class Staging:
    """Context manager: ``with Staging(out) as st: ...; st.commit()``.

    Leaving the block without :meth:`commit` (an error, Ctrl-C) removes the staging
    folder and keeps ``target`` untouched.
    """

    def __init__(self, target: Path) -> None:
        self.target = Path(target).absolute()
        self.parent = self.target.parent
        self.prefix = f".{self.target.name}.staging-"
        self.dir: Path | None = None
        self.committed = False

    def _sweep(self) -> None:
        for old in self.parent.glob(self.prefix + "*"):
            m = re.match(re.escape(self.prefix) + r"(\d+)-", old.name)
            if m and not _pid_alive(int(m[1])):
                shutil.rmtree(old, ignore_errors=True)
        for old in self.parent.glob(f".{self.target.name}.old-*"):
            m = re.match(re.escape(f".{self.target.name}.old-") + r"(\d+)-", old.name)
            if not m or _pid_alive(int(m[1])):
                continue
            if self.target.exists():
                shutil.rmtree(old, ignore_errors=True)
            else:
                # killed between the two renames of a commit: put the old one back
                os.rename(old, self.target)

    def __enter__(self) -> Staging:
        self.parent.mkdir(parents=True, exist_ok=True)
        self._sweep()
        self.dir = Path(
            tempfile.mkdtemp(prefix=f"{self.prefix}{os.getpid()}-", dir=self.parent)
        )
        # mkdtemp makes the folder private (0700); the output is an ordinary folder
        umask = os.umask(0)
        os.umask(umask)
        os.chmod(self.dir, 0o777 & ~umask)
        return self

    def path(self, relative: str) -> Path:
        """A file path inside the staging folder; its parent folders are created."""
        assert self.dir is not None, "use Staging as a context manager"
        p = inside(self.dir, relative)
        p.parent.mkdir(parents=True, exist_ok=True)
        return p

    def commit(self) -> None:
        """Move the staging folder into place, replacing the previous output.

        Ctrl-C and SIGTERM wait until both renames are done (where the system allows
        blocking them), so a stop never falls between the two.
        """
        assert self.dir is not None
        held = _hold_signals()
        try:
            self._swap()
        finally:
            _release_signals(held)

    def _swap(self) -> None:
        assert self.dir is not None
        old = None
        if self.target.exists():
            old = Path(
                tempfile.mkdtemp(
                    prefix=f".{self.target.name}.old-{os.getpid()}-", dir=self.parent
                )
            )
            os.rmdir(old)
            os.rename(self.target, old)
        try:
            os.rename(self.dir, self.target)
        except BaseException:
            if old is not None:
                os.rename(old, self.target)
            raise
        self.committed = True
        if old is not None:
            shutil.rmtree(old, ignore_errors=True)

    def __exit__(
        self,
        exc_type: type[BaseException] | None,
        exc: BaseException | None,
        tb: TracebackType | None,
    ) -> None:
        if not self.committed and self.dir is not None:
            shutil.rmtree(self.dir, ignore_errors=True)
