"""The curriculum: where a trainee is weakest (faults missed, slips made, checks wasted), the next
unit drawn there, and repetition spaced over days (Leitner's schedule)."""

from __future__ import annotations

from datetime import date

from fixbench.practice.curriculum import (MISSED, NEW, SLIPPED, SPACING_DAYS, WASTED, next_unit, slip_faults,
                                          weaknesses)
from fixbench.practice.levels import NORMAL
from fixbench.practice.progress import AttemptRecord
from fixbench.practice.safety import MAINS_UNPROVEN, UNDISCHARGED

DAY = date(2025, 3, 3).toordinal()


def attempt(fault, day, right=True, slips=(), wasted=0, family="pwm_flyback"):
    return AttemptRecord(f"drawn:normal:{family}:{fault}:s1", 5, 10.0, 90.0 if right else 20.0, len(slips),
                         day=day, fault_right=right, slip_kinds=tuple(slips), checks_wasted=wasted)


def families(knowledge):
    return sorted(knowledge.families.values(), key=lambda f: f.id)


def test_a_missed_fault_comes_back_the_next_day_and_not_the_same_day(knowledge):
    history = [attempt("R1.open", DAY, right=False)]
    same_day = next_unit(families(knowledge), history, NORMAL, DAY, seed=1)
    assert same_day.why == NEW and same_day.scenario.fault_id != "R1.open"
    next_day = next_unit(families(knowledge), history, NORMAL, DAY + 1, seed=1)
    assert (next_day.why, next_day.scenario.fault_id, next_day.scenario.family_id) == (MISSED, "R1.open", "pwm_flyback")
    assert "R1" not in next_day.words and "start" not in next_day.words.lower()  # never names the fault


def test_each_round_that_goes_well_spaces_the_next_repeat_further(knowledge):
    history = [attempt("R1.open", DAY, right=False), attempt("R1.open", DAY + 1), attempt("R1.open", DAY + 4)]
    item = weaknesses(history).items[0]
    assert item.streak == 2 and item.due == DAY + 4 + SPACING_DAYS[2]
    assert SPACING_DAYS == tuple(sorted(SPACING_DAYS))
    assert next_unit(families(knowledge), history, NORMAL, DAY + 5, seed=1).scenario.fault_id != "R1.open"


def test_a_slip_made_lately_draws_a_unit_that_puts_the_trainee_in_the_same_spot(knowledge):
    flyback = knowledge.family("pwm_flyback")
    history = [attempt("C3.dried", DAY, slips=(MAINS_UNPROVEN,))]
    chosen = next_unit(families(knowledge), history, NORMAL, DAY, seed=2)
    assert chosen.why == SLIPPED
    assert chosen.scenario.fault_id in slip_faults(knowledge.family(chosen.scenario.family_id), MAINS_UNPROVEN)
    assert {"Q1.short", "BD1.short"} <= set(slip_faults(flyback, MAINS_UNPROVEN))
    assert "R1.open" in slip_faults(flyback, UNDISCHARGED) and "Q1.short" not in slip_faults(flyback, UNDISCHARGED)
    # two clean rounds after the slip and it is behind the trainee
    history += [attempt("C2.dried", DAY), attempt("D3.open", DAY)]
    assert next_unit(families(knowledge), history, NORMAL, DAY, seed=2).why != SLIPPED


def test_checks_wasted_bring_a_fault_back_too(knowledge):
    history = [attempt("C2.dried", DAY, wasted=4)]
    assert next_unit(families(knowledge), history, NORMAL, DAY + 1, seed=3).why == WASTED


def test_a_new_trainee_starts_on_faults_drawn_by_the_knowledge_bases_weights(knowledge):
    first = next_unit(families(knowledge), [], NORMAL, DAY, seed=4)
    assert first.why == NEW and first == next_unit(families(knowledge), [], NORMAL, DAY, seed=4)
    drawn = [next_unit(families(knowledge), [], NORMAL, DAY, seed=s).scenario.fault_id for s in range(300)]
    # the commonest fault of the knowledge base comes up more often than the rarest
    flyback = knowledge.family("pwm_flyback")
    ranked = sorted(flyback.faults, key=lambda f: f.weight)
    assert drawn.count(ranked[-1].id) > drawn.count(ranked[0].id)


def test_the_owner_sees_the_faults_missed_and_the_slips_by_kind():
    history = [attempt("R1.open", DAY, right=False), attempt("R1.open", DAY + 1, right=False),
               attempt("C3.dried", DAY, slips=(UNDISCHARGED,)), attempt("C3.dried", DAY + 2, slips=(UNDISCHARGED,)),
               attempt("Q1.short", DAY)]
    found = weaknesses(history)
    assert [(i.fault_id, i.missed, i.rounds) for i in found.weak_faults()] == [("R1.open", 2, 2)]
    assert found.slips == {UNDISCHARGED: 2}
    assert found.items[0].fault_id in ("R1.open", "C3.dried")  # the weakest first
