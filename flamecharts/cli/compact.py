"""flamecharts compact DIR: migrate a run folder's store and give its free space back."""
from __future__ import annotations

import argparse
from pathlib import Path

from ..errors import StoreError
from ..store import DB_NAME, RunLock, Store


def cmd_compact(args: argparse.Namespace) -> int:
    folder = Path(args.dir)
    path = folder / DB_NAME
    if not path.is_file():
        raise StoreError(f"{folder} holds no results store ({DB_NAME} missing); give the output folder of a run")
    with RunLock(folder), Store(path) as store:  # refused while a run writes the folder; migrates after a backup
        before, after = store.compact()
        n = len(store.keys())
    note = (f"; migrated from schema version {store.migrated_from}, backup {store.backup_path.name}"
            if store.migrated_from is not None and store.backup_path else "")
    print(f"{path}: {before / 1e6:.2f} MB -> {after / 1e6:.2f} MB ({n} flames){note}")
    return 0
