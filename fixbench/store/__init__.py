"""The shop's memory: cases, readings, repairs, practice and the owner's figures (SQLAlchemy).

No Qt here. Open a database with :func:`fixbench.store.database.open_store`; it migrates the
schema and sets SQLite's durability settings in one place.
"""

from fixbench.store.database import Store, open_store
from fixbench.store.errors import (ClosedCaseError, OwnerRequired, StoreError, StoreFileError,
                                   StoreInputError)

__all__ = ["ClosedCaseError", "OwnerRequired", "Store", "StoreError", "StoreFileError",
           "StoreInputError", "open_store"]
