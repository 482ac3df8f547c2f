"""What every screen of the window shares: the open store, the knowledge base and who is at the bench.

Plain Python (no widgets) so controllers can be tested without a window.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from fixbench.knowledge import KnowledgeBase, load_knowledge
from fixbench.store import Store


@dataclass
class AppContext:
    store: Store
    knowledge: KnowledgeBase = field(default_factory=load_knowledge)
    technician_id: int | None = None  # who is at the bench; chosen on the bench screen
