"""A diagnosis state as plain data (for `--json`, the store and case export) and as text lines.

Both are returned, never printed: the command that asked for them writes them out."""

from __future__ import annotations

from fixbench.engine.conclusion import Conclusion
from fixbench.engine.diagnosis import DiagnosisState, Proposal
from fixbench.physics.expectation import Expectation


def _expectation(expect: Expectation | None, outcome: str | None) -> dict | None:
    if expect is not None:
        return {"unit": expect.unit, "nominal": expect.nominal, "low": expect.low, "high": expect.high,
                "text": expect.describe()}
    if outcome is not None:
        return {"outcome": outcome, "text": outcome}
    return None


def proposal_as_dict(p: Proposal | None) -> dict | None:
    if p is None:
        return None
    return {"check": p.check.id, "title": p.title, "power": p.power, "instrument": p.check.instrument,
            "points": list(p.check.points), "expected": _expectation(p.expected, p.expected_outcome),
            "minutes": p.minutes, "information_bits": round(p.information, 4), "hazard": p.hazard,
            "cautions": list(p.cautions), "how": p.how, "reason": p.reason}


def conclusion_as_dict(c: Conclusion | None) -> dict | None:
    if c is None:
        return None
    part = lambda a: {"part": a.part, "designator": a.label, "marking": a.marking or None, "title": a.title,
                      "mode": a.mode, "probability": round(a.probability, 4), "cost": a.cost,
                      "spec": a.spec}
    return {
        "faults": list(c.faults), "probability": round(c.probability, 4), "certain": c.certain,
        "no_fault": c.no_fault, "replace": [part(a) for a in c.replace],
        "test_before_power": [part(a) for a in c.test_before_power],
        "verify": [{"check": v.check, "title": v.title, "expected": _expectation(v.expected, v.outcome)}
                   for v in c.verify],
        "repair_order": [{"fault": s.fault, "part": s.part, "probability": round(s.probability, 4),
                          "cost_minutes": s.cost} for s in c.repair_order],
    }


def state_as_dict(state: DiagnosisState) -> dict:
    return {
        "family": state.family.id,
        "readings": [{"check": r.check, "value": r.text, "outcome": r.outcome, "in_band": r.in_band}
                     for r in state.readings],
        "suspects": [{"fault": s.fault, "title": s.title, "part": s.part, "designator": s.label or None,
                      "stage": s.stage,
                      "probability": round(s.probability, 6), "group": list(s.group)} for s in state.suspects],
        "next_check": proposal_as_dict(state.next_check),
        "conclusion": conclusion_as_dict(state.conclusion),
    }


def state_text(state: DiagnosisState) -> str:
    """The state as a person reads it at the terminal: suspects, next check, conclusion."""
    lines: list[str] = []
    say = lines.append
    say("Likely faults:")
    for s in state.suspects[:8]:
        where = f" ({s.label}, {state.family.stage(s.stage).title})" if s.part else ""
        together = f"  [cannot be told from: {', '.join(g for g in s.group if g != s.fault)}]" if len(s.group) > 1 else ""
        say(f"  {s.probability:6.1%}  {s.title}{where}{together}")
    p = state.next_check
    if p is not None:
        say(f"\nNext: {p.title}  [{p.power}, {p.check.instrument.replace('_', ' ')}, {p.minutes:g} min, hazard {p.hazard}]")
        say(f"  between: {', '.join(state.family.test_point(t).title for t in p.check.points) or '-'}")
        expected = p.expected.describe() if p.expected else p.expected_outcome
        say(f"  a healthy unit shows: {expected}")
        say(f"  how: {p.how}")
        for caution in p.cautions:
            say(f"  CAUTION: {caution}")
    c = state.conclusion
    if c is not None:
        say(f"\nConclusion ({c.probability:.0%}{'' if c.certain else ', not certain'}): {', '.join(c.faults)}")
        for a in c.replace:
            marked = f", marked {a.marking}" if a.marking else ""
            say(f"  replace {a.label} {a.title} ({a.mode}{marked})")
            say(f"    buy: {a.spec}")
        for a in c.test_before_power:
            say(f"  test before power-up: {a.label} {a.title} ({a.probability:.0%} likely {a.mode})")
        for v in c.verify:
            shown = v.expected.describe() if v.expected else v.outcome
            say(f"  verify: {v.title}: {shown}")
        for s in c.repair_order:
            say(f"  try in this order: {s.fault} ({s.probability:.0%}, {s.cost:g} min)")
    return "\n".join(lines)
