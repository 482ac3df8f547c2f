"""The debrief as the trainee reads it, in plain words: the verdict and the reading against a wrong
one, the score and what took points, the customer's complaint, the reading that settled the fault,
each kind of safety slip once with why, the parts, every step beside the engine's choice at that
point and why, the checks that told the most and those that told nothing, and the engine's path."""

from __future__ import annotations

from html import escape

from PySide6.QtCore import Signal
from PySide6.QtWidgets import QHBoxLayout, QLabel, QPushButton, QTextBrowser, QVBoxLayout, QWidget

from fixbench.practice.debrief import Debrief, StepReview
from fixbench.practice.scoring import effort_share
from fixbench.ui.bench.look import heading


def _minutes(value: float) -> str:
    return f"{value:g} min"


def _times(n: int) -> str:
    return "once" if n == 1 else "twice" if n == 2 else f"{n} times"


def _verdict(d: Debrief) -> list[str]:
    out = [f"<h2>{'Right' if d.right else 'Wrong'}: {escape(d.true_fault)}</h2>"]
    if not d.right:
        out.append(f"<p>You named: {escape(d.named_fault)}.</p>")
        c = d.contradiction
        if c is not None:
            out.append(f"<p><b>What said otherwise:</b> {escape(c.where)}, {escape(c.check_title)}, read "
                       f"<b>{escape(c.reading)}</b>. With your verdict it would read "
                       f"{escape(c.would_read)} (a healthy unit: {escape(c.healthy)}).</p>")
        else:
            out.append("<p>No reading here tells your verdict from the true fault.</p>")
    if d.same_group:
        out.append("<p>No check tells it from: " + escape("; ".join(d.same_group)) + " (any of these counts).</p>")
    return out


def _score(d: Debrief) -> list[str]:
    s = d.score
    took = []
    if not s.fault_right:
        took.append(f"the fault ({50 - s.fault_points:g}), and so the minutes")
    if s.parts_points < 20:
        took.append(f"parts ({20 - s.parts_points:g})")
    if s.fault_right and s.effort_points < 30:
        took.append(f"minutes ({30 - s.effort_points:.0f})")
    if s.slip_points:
        took.append(f"safety ({s.slip_points:g}: {len(d.slips)} mistake{'s' if len(d.slips) > 1 else ''})")
    if s.coach_points:
        took.append(f"the coach ({s.coach_points:g})")
    cap = (" The band is held down by a safety slip." if s.capped_by_slip else
           " The band is held down by the coach: Bench-ready is earned without it." if s.capped_by_coach else "")
    out = [f"<p><b>Score {s.total:g} / 100 \u2013 {escape(s.band)}.</b> "
           f"{'Points lost on: ' + escape('; '.join(took)) + '.' if took else 'Nothing lost.'}{cap}</p>"]
    full = ("minutes count only with the right fault" if not s.fault_right else
            "full marks" if effort_share(s.minutes, s.par) >= 1.0 else "over the allowance")
    out.append(f"<p>Minutes on the clock: {_minutes(s.minutes)} ({full}); the engine, careful checks before "
               f"power-up included: {_minutes(s.par)}.</p>")
    if d.coach_looks:
        first = ("before any reading" if not d.coach_first_after else
                 f"after {d.coach_first_after} reading{'s' if d.coach_first_after > 1 else ''}")
        out.append(f"<p>Coach asked {_times(d.coach_looks)}, first {first}.</p>")
    return out


def _complaint(d: Debrief) -> list[str]:
    out = [f"<p><b>The customer said:</b> {escape(d.complaint_words)}</p>"] if d.complaint else []
    if d.misleading:
        out.append("<p>The customer was wrong about: " + escape("; ".join(d.misleading)) + ".</p>")
    if d.fault_away:
        out.append("<p>The fault came and went: it was away while the unit was powered at step(s) "
                   + ", ".join(map(str, d.fault_away)) + ".</p>")
    out.append(f"<p><b>What settled it:</b> {escape(d.settled)}.</p>" if d.settled else
               f"<p><b>What settled it:</b> no reading of yours made the fault clear; when you committed, "
               f"the true fault stood at {d.true_chance:.0%}.</p>")
    return out


def _slips(d: Debrief) -> list[str]:
    if not d.lessons:
        return []
    out = ["<h3>\u26a0 Safety slips</h3><ul>"]
    for lesson in d.lessons:
        where = ", ".join(map(str, lesson.steps))
        shouts = f" A colleague stopped you {_times(lesson.shouts)}." if lesson.shouts else ""
        out.append(f"<li><b>{escape(lesson.what)}</b> (step {where}).{shouts}<br>"
                   f"Why it is dangerous: {escape(lesson.why)}</li>")
    out.append("</ul>")
    return out


def _review_row(r: StepReview) -> str:
    st = r.step
    slip = " \u26a0" if st.slip is not None else ""
    mark = "" if r.in_band else " <b>(not healthy)</b>"
    told = (f"Told nothing new: {escape(r.settled_by)} had already settled it." if r.told_nothing
            else escape(r.told) + ".")
    if r.engine_title is None:
        engine = escape(r.engine_why)
    elif r.same_as_engine:
        engine = "The same check."
    else:
        engine = f"<b>{escape(r.engine_title)}</b>: {escape(r.engine_why)}."
    return (f"<tr><td>{st.number}</td><td>{escape(st.title)}{slip}<br>read <b>{escape(r.shown)}</b>{mark}"
            f"<br>healthy: {escape(r.healthy)}</td><td>{told}</td><td>{engine}</td></tr>")


def _steps(d: Debrief) -> list[str]:
    out = ["<h3>Your steps, and the engine's choice at each</h3>"]
    if not d.reviews:
        return out + ["<p>No checks taken.</p>"]
    out.append("<table border='1' cellpadding='4' cellspacing='0' width='100%'><tr><th>#</th>"
               "<th>Your check and reading</th><th>What it told</th><th>The engine, at that point</th></tr>")
    out += [_review_row(r) for r in d.reviews]
    out.append("</table>")
    return out


def _telling(d: Debrief) -> list[str]:
    out = ["<h3>Checks that told the most</h3>"]
    out.append("<ul>" + "".join(f"<li>Step {r.step.number}, {escape(r.step.title)}: {escape(r.shown)}. "
                                f"{escape(r.told)}.</li>" for r in d.most_telling) + "</ul>"
               if d.most_telling else "<p>None of your readings narrowed the fault much.</p>")
    out.append("<h3>Checks that told nothing</h3>")
    out.append("<ul>" + "".join(f"<li>Step {r.step.number}, {escape(r.step.title)}: {escape(r.settled_by)} "
                                f"had already settled it.</li>" for r in d.told_nothing) + "</ul>"
               if d.told_nothing else "<p>None: every check could have told something.</p>")
    return out


def _engine(d: Debrief) -> list[str]:
    out = [f"<h3>The engine's own path</h3><p>It named {escape(d.engine_fault)} "
           f"({'right' if d.engine_right else 'wrong'}) in {_minutes(d.engine.minutes)}.</p><ol>"]
    for st in d.engine.steps:
        careful = " <i>(before power-up)</i>" if st.careful else ""
        out.append(f"<li>{escape(st.title)}{careful}: read <b>{escape(st.reading)}</b> "
                   f"(healthy: {escape(st.healthy)}). Why: {escape(st.reason)}.</li>")
    out.append("</ol>")
    return out


def debrief_html(d: Debrief) -> str:
    parts = (_verdict(d) + _score(d) + _complaint(d) + _slips(d))
    if d.parts:
        parts.append("<h3>Parts</h3><ul>")
        parts += [f"<li>{escape(p.part)} {escape(p.title)}: {escape(p.verdict)}</li>" for p in d.parts]
        parts.append("</ul>")
    return "".join(parts + _steps(d) + _telling(d) + _engine(d))


class DebriefView(QWidget):
    again_asked = Signal()

    def __init__(self, parent=None) -> None:
        super().__init__(parent)
        self.title = heading("Debrief")
        self.body = QTextBrowser()
        self.saved = QLabel()
        self.saved.setWordWrap(True)
        self.again_button = QPushButton("Another round")
        bottom = QHBoxLayout()
        bottom.addWidget(self.saved, 1)
        bottom.addWidget(self.again_button)
        layout = QVBoxLayout(self)
        layout.addWidget(self.title)
        layout.addWidget(self.body, 1)
        layout.addLayout(bottom)
        self.again_button.clicked.connect(self.again_asked)

    def show_debrief(self, debrief: Debrief, saved_for: str | None, note: str | None = None) -> None:
        self.body.setHtml(debrief_html(debrief))
        if note is not None:
            self.saved.setText(note)
        else:
            self.saved.setText(f"Kept in {saved_for}'s progress." if saved_for else
                               "Not kept: no trainee was chosen.")

    def text(self) -> str:
        return self.body.toPlainText()
