"""Words the owner reads in place of the engine's identifiers (families, faults, parts, checks).

Titles come from the knowledge base; an identifier the knowledge base no longer knows (a case
kept under an older knowledge file) is shown as it was stored rather than hidden.
"""

from __future__ import annotations

from fixbench.knowledge import KnowledgeBase

OUTCOME_WORDS = {
    "repaired": "Repaired",
    "not_economical": "Not worth repairing",
    "no_fault_found": "No fault found",
    "returned_unrepaired": "Returned unrepaired",
}
STATUS_WORDS = {"intake": "At intake", "diagnosing": "Diagnosing", "repairing": "Repairing",
                "verifying": "Verifying", "closed": "Closed"}
FAMILY_SHORT = {"pwm_flyback": "PWM flyback", "self_oscillating": "Self-oscillating",
                "primary_side": "Primary-side regulated", "integrated_opto": "Integrated switch, opto",
                "integrated_primary_side": "Integrated switch, primary-side", "pwm_pfc": "PFC + PWM flyback"}


def family_name(family_id: str) -> str:
    return FAMILY_SHORT.get(family_id, family_id.replace("_", " ").capitalize())


def outcome_name(outcome: str | None, status: str = "closed") -> str:
    if outcome is None:
        return f"Open: {STATUS_WORDS.get(status, status).lower()}"
    return OUTCOME_WORDS.get(outcome, outcome)


class TradeNames:
    """Looks up titles in the knowledge base, falling back to the stored identifier."""

    def __init__(self, knowledge: KnowledgeBase) -> None:
        self.knowledge = knowledge
        # (family, id) -> title, read once: the figures label tens of thousands of counted rows.
        self._faults = {(family.id, f.id): f.title for family in knowledge.families.values()
                        for f in family.faults}
        self._parts = {(family.id, p.id): p.title for family in knowledge.families.values()
                       for p in family.parts}

    def _family(self, family_id: str | None):
        return self.knowledge.families.get(family_id) if family_id else None

    def fault(self, fault_id: str | None, family_id: str | None = None) -> str:
        if not fault_id:
            return ""
        if fault_id == "no_fault":
            return "No fault in the supply"
        families = [family_id] if family_id else list(self.knowledge.families)
        return next((self._faults[(f, fault_id)] for f in families
                     if (f, fault_id) in self._faults), fault_id)

    def fault_label(self, fault_id: str | None, family_id: str | None = None) -> str:
        """What a fault is, for a table cell or a chart bar: its title in its family ("Switching
        MOSFET shorted"); an id this build no longer knows is shown with its family."""
        if not fault_id:
            return ""
        title = self.fault(fault_id, family_id)
        if title == fault_id and family_id:
            return f"{fault_id} ({family_name(family_id)})"
        return title

    def part_label(self, part_id: str | None, family_id: str | None) -> str:
        """What a part is in its family ("Switching MOSFET", "Switching transistor")."""
        if not part_id:
            return ""
        title = self.part(part_id, family_id)
        if title == part_id and family_id:
            return f"{part_id} ({family_name(family_id)})"
        return title

    def part(self, part_id: str | None, family_id: str | None = None) -> str:
        if not part_id:
            return ""
        families = [family_id] if family_id else list(self.knowledge.families)
        return next((self._parts[(f, part_id)] for f in families
                     if (f, part_id) in self._parts), part_id)

    def check(self, check_id: str, family_id: str) -> str:
        family = self._family(family_id)
        if family is not None and family.has_check(check_id):
            return family.check(check_id).title
        return check_id.replace("_", " ")
