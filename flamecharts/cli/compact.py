"""flamecharts compact DIR: migrate a run folder's store, upgrade its flames, give its free space back."""
from __future__ import annotations

import argparse
from pathlib import Path

from ..config import STUDY_COPY, by_mechanism, load_config_copy
from ..errors import StoreError
from ..store import DB_NAME, RunLock, Store
from ..sweep.skeletal import applied
from ..sweep.upgrade import upgrade_store


def cmd_compact(args: argparse.Namespace) -> int:
    folder = Path(args.dir)
    path = folder / DB_NAME
    if not path.is_file():
        raise StoreError(f"{folder} holds no results store ({DB_NAME} missing); give the output folder of a run")
    subs = by_mechanism(applied(load_config_copy(folder), folder)) if (folder / STUDY_COPY).is_file() else []
    with RunLock(folder), Store(path) as store:  # refused while a run writes the folder; migrates after a backup
        upgraded, copy = upgrade_store(store, {s.mechanism_sha256: (s.mechanism_path, s.atoms) for s in subs})
        before, after = store.compact()
        n = len(store.keys())
    note = (f"; migrated from schema version {store.migrated_from}, backup {store.backup_path.name}"
            if store.migrated_from is not None and store.backup_path else "")
    note += f"; {upgraded} flames given their read-out fields, backup {copy}" if upgraded else ""
    print(f"{path}: {before / 1e6:.2f} MB -> {after / 1e6:.2f} MB ({n} flames){note}")
    return 0
