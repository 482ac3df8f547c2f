"""The screens of the main window, in tab order: (tab title, "module:Class", tooltip).

Each class takes the AppContext and is a QWidget. Modules are imported when the window is built.
"""

SCREENS = (
    ("Bench", "fixbench.ui.bench.screen:BenchScreen", "Guided fault-finding on the unit in front of you (Ctrl+1)"),
    ("History", "fixbench.ui.review.history:HistoryScreen", "Every case the shop has kept (Ctrl+2)"),
    ("Figures", "fixbench.ui.review.figures_screen:FiguresScreen", "What fails, how long jobs take, what comes back (Ctrl+3)"),
    ("Practice", "fixbench.ui.practice.screen:PracticeScreen", "Diagnose simulated faulty units (Ctrl+4)"),
)
