"""The results store (SQLite, one transaction per finished flame) and the run lock of an output folder."""
from .db import DB_NAME, SCHEMA_VERSION, Store, stored_keys
from .lock import LOCK_NAME, RunLock

__all__ = ["DB_NAME", "SCHEMA_VERSION", "Store", "stored_keys", "LOCK_NAME", "RunLock"]
