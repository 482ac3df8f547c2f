"""What every screen of the window shares: the open store, the knowledge base and who is at the bench.

Plain Python (no widgets) so controllers can be tested without a window. Nothing heavy is imported
here: the main window imports this module before it first shows, and the store and knowledge are
loaded after (off the GUI thread).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from fixbench.knowledge import KnowledgeBase
    from fixbench.workflows.shop import Store


def _load_knowledge() -> "KnowledgeBase":
    from fixbench.knowledge import load_knowledge

    return load_knowledge()


@dataclass
class AppContext:
    store: "Store"
    knowledge: "KnowledgeBase" = field(default_factory=_load_knowledge)
    technician_id: int | None = None  # who is at the bench; chosen on the bench screen
