"""An exclusive lock on an output folder, so two runs never write one store at once."""
from __future__ import annotations

import fcntl
import os
import socket
import time
from pathlib import Path
from typing import TextIO

from ..errors import StoreError

LOCK_NAME = ".flamecharts.lock"


def _lock_holder_text() -> str:
    return (f"pid {os.getpid()} on host {socket.gethostname()}, started "
            f"{time.strftime('%Y-%m-%d %H:%M:%S %Z', time.localtime())}")


#: A refused run waits up to this many tenths of a second for the holder's name to appear.
HOLDER_NAME_POLLS = 20


class RunLock:
    """An exclusive lock on an output folder, so two runs never write one store at once.

    The lock is an ``flock`` on LOCK_NAME in the folder, which the kernel releases when
    its process ends in any way (also kill -9): a lock file left behind by a killed run
    never blocks the next one. The file names its holder (pid, host, start time), so
    a refused run can say who holds the folder.
    """

    def __init__(self, folder: Path) -> None:
        self.path = Path(folder) / LOCK_NAME
        self._fh: TextIO | None = None

    def acquire(self) -> RunLock:
        try:
            fh = open(self.path, "a+")
        except OSError as exc:
            raise StoreError(f"output folder {self.path.parent} cannot be locked: its lock file {self.path.name} "
                             f"cannot be opened for writing ({exc.strerror}); choose another --out") from None
        try:
            fcntl.flock(fh, fcntl.LOCK_EX | fcntl.LOCK_NB)
        except BlockingIOError:
            holder = ""
            for _ in range(HOLDER_NAME_POLLS):  # the holder writes its name just after it takes the lock
                fh.seek(0)
                holder = fh.read(300).strip()
                if holder:
                    break
                time.sleep(0.1)
            holder = holder or "which has not yet written its name"
            fh.close()
            raise StoreError(f"output folder {self.path.parent} is in use by another run ({holder}); "
                             "wait for it to finish or choose another --out") from None
        except OSError as exc:
            fh.close()
            raise StoreError(f"output folder {self.path.parent} cannot be locked ({exc.strerror}); "
                             "choose another --out on a local disk") from None
        fh.seek(0)
        fh.truncate()
        fh.write(_lock_holder_text())
        fh.flush()
        self._fh = fh
        return self

    def release(self) -> None:
        """Unlock and remove the lock file (removed while still held: a run that opens it
        meanwhile fails its non-blocking lock and says the folder is in use, as it should)."""
        if self._fh is not None:
            try:
                os.unlink(self.path)
            except OSError:
                pass  # already gone, or a read-only folder: the flock is what counts
            fcntl.flock(self._fh, fcntl.LOCK_UN)
            self._fh.close()
            self._fh = None

    def __enter__(self) -> RunLock:
        return self.acquire()

    def __exit__(self, *exc: object) -> None:
        self.release()
