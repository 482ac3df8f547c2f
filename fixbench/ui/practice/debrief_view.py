"""The debrief as the trainee reads it: the verdict, the score, minutes against the engine's par,
the checks that told the most and those that told nothing, the slips with why, and both paths."""

from __future__ import annotations

from html import escape

from PySide6.QtCore import Signal
from PySide6.QtWidgets import QHBoxLayout, QLabel, QPushButton, QTextBrowser, QVBoxLayout, QWidget

from fixbench.practice.debrief import Debrief
from fixbench.ui.bench.look import heading


def _minutes(value: float) -> str:
    return f"{value:g} min"


def debrief_html(d: Debrief) -> str:
    s = d.score
    verdict = "Right" if d.right else "Wrong"
    out = [f"<h2>{verdict}: {escape(d.true_fault)}</h2>"]
    if not d.right:
        out.append(f"<p>You named: {escape(d.named_fault)}.</p>")
    if d.same_group:
        out.append("<p>No check tells it from: " + escape("; ".join(d.same_group)) + " (any of these counts).</p>")
    out.append(f"<p><b>Score {s.total:g} / 100 \u2013 {escape(s.band)}</b>"
               f" (fault {s.fault_points:g}, parts {s.parts_points:g}, minutes {s.effort_points:g}"
               f"{f', slips -{s.slip_points:g}' if s.slip_points else ''})"
               f"{' \u2013 the band is capped by a safety slip' if s.capped_by_slip else ''}.</p>")
    out.append(f"<p>Minutes on the clock: {_minutes(s.minutes)}; the engine's plan for the same unit: "
               f"{_minutes(s.par)}.</p>")
    if d.coach_looks:
        out.append(f"<p>Coach asked {d.coach_looks} time(s), first after {d.coach_first_after} reading(s).</p>")
    if d.slips:
        out.append("<h3>\u26a0 Safety slips</h3><ul>")
        for slip in d.slips:
            out.append(f"<li><b>Step {slip.step}: {escape(slip.what)}</b><br>Why it is dangerous: "
                       f"{escape(slip.why)}</li>")
        out.append("</ul>")
    if d.parts:
        out.append("<h3>Parts</h3><ul>")
        out += [f"<li>{escape(p.part)} {escape(p.title)}: {escape(p.verdict)}</li>" for p in d.parts]
        out.append("</ul>")
    out.append("<h3>Checks that told the most</h3>")
    out.append("<ul>" + "".join(f"<li>Step {st.number}: {escape(st.title)} \u2192 {escape(st.reading)} "
                                f"({st.bits_told:.2f} bits)</li>" for st in d.most_telling) + "</ul>"
               if d.most_telling else "<p>None of the readings narrowed the fault much.</p>")
    out.append("<h3>Checks that told nothing</h3>")
    out.append("<ul>" + "".join(f"<li>Step {st.number}: {escape(st.title)} \u2013 what was known before "
                                f"already decided it</li>" for st in d.told_nothing) + "</ul>"
               if d.told_nothing else "<p>None: every check could have told something.</p>")
    if d.fault_away:
        out.append("<p>The fault came and went: it was away during step(s) "
                   + ", ".join(map(str, d.fault_away)) + ".</p>")
    if d.misleading:
        out.append("<p>The customer's report was wrong at step(s) " + ", ".join(map(str, d.misleading)) + ".</p>")
    out.append(f"<h3>Your path and the engine's</h3><p>The engine named: {escape(d.engine_fault)} "
               f"({'right' if d.engine_right else 'wrong'}), in {_minutes(d.engine.minutes)}.</p>")
    out.append("<table border='1' cellpadding='3' cellspacing='0' width='100%'><tr><th>#</th>"
               "<th>You</th><th>Reading</th><th>Engine</th><th>Reading</th></tr>")
    for i, (mine, theirs) in enumerate(d.pairs, 1):
        slip = " \u26a0" if mine is not None and mine.slip is not None else ""
        out.append(f"<tr><td>{i}</td><td>{escape(mine.title) + slip if mine else ''}</td>"
                   f"<td>{escape(mine.reading) if mine else ''}</td>"
                   f"<td>{escape(theirs.title) if theirs else ''}</td><td>{escape(theirs.reading) if theirs else ''}</td></tr>")
    out.append("</table>")
    return "".join(out)


class DebriefView(QWidget):
    again_asked = Signal()

    def __init__(self, parent=None) -> None:
        super().__init__(parent)
        self.title = heading("Debrief")
        self.body = QTextBrowser()
        self.saved = QLabel()
        self.again_button = QPushButton("Another round")
        bottom = QHBoxLayout()
        bottom.addWidget(self.saved, 1)
        bottom.addWidget(self.again_button)
        layout = QVBoxLayout(self)
        layout.addWidget(self.title)
        layout.addWidget(self.body, 1)
        layout.addLayout(bottom)
        self.again_button.clicked.connect(self.again_asked)

    def show_debrief(self, debrief: Debrief, saved_for: str | None) -> None:
        self.body.setHtml(debrief_html(debrief))
        self.saved.setText(f"Kept in {saved_for}'s progress." if saved_for else
                           "Not kept: no trainee was chosen.")

    def text(self) -> str:
        return self.body.toPlainText()
