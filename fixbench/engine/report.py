"""A diagnosis state as plain data (for `--json`, the store and case export) and as text."""

from __future__ import annotations

from fixbench.engine.conclusion import Conclusion
from fixbench.engine.session import DiagnosisState, Proposal
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
            "cautions": list(p.cautions), "how": p.check.how, "reason": p.reason}


def conclusion_as_dict(c: Conclusion | None) -> dict | None:
    if c is None:
        return None
    part = lambda a: {"part": a.part, "title": a.title, "mode": a.mode, "probability": round(a.probability, 4),
                      "cost": a.cost}
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
        "suspects": [{"fault": s.fault, "title": s.title, "part": s.part, "stage": s.stage,
                      "probability": round(s.probability, 6), "group": list(s.group)} for s in state.suspects],
        "next_check": proposal_as_dict(state.next_check),
        "conclusion": conclusion_as_dict(state.conclusion),
    }


def print_state(state: DiagnosisState) -> None:
    print("Likely faults:")
    for s in state.suspects[:8]:
        where = f" ({s.part}, {state.family.stage(s.stage).title})" if s.part else ""
        together = f"  [cannot be told from: {', '.join(g for g in s.group if g != s.fault)}]" if len(s.group) > 1 else ""
        print(f"  {s.probability:6.1%}  {s.title}{where}{together}")
    p = state.next_check
    if p is not None:
        print(f"\nNext: {p.title}  [{p.power}, {p.check.instrument.replace('_', ' ')}, {p.minutes:g} min, hazard {p.hazard}]")
        print(f"  between: {', '.join(state.family.test_point(t).title for t in p.check.points) or '-'}")
        expected = p.expected.describe() if p.expected else p.expected_outcome
        print(f"  a healthy unit shows: {expected}")
        print(f"  how: {p.check.how}")
        for caution in p.cautions:
            print(f"  CAUTION: {caution}")
    c = state.conclusion
    if c is not None:
        print(f"\nConclusion ({c.probability:.0%}{'' if c.certain else ', not certain'}): {', '.join(c.faults)}")
        for a in c.replace:
            print(f"  replace {a.part} {a.title} ({a.mode})")
        for a in c.test_before_power:
            print(f"  test before power-up: {a.part} {a.title} ({a.probability:.0%} likely {a.mode})")
        for v in c.verify:
            shown = v.expected.describe() if v.expected else v.outcome
            print(f"  verify: {v.title}: {shown}")
        for s in c.repair_order:
            print(f"  try in this order: {s.fault} ({s.probability:.0%}, {s.cost:g} min)")
