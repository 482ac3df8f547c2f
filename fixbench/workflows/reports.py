"""What the printed reports share: the shop's footer from its settings ("report_footer"), the
safety note, and the month a summary covers. What each report says is in
:mod:`fixbench.workflows.job_report` (the customer's one-page job report, from the one case loader)
and :mod:`fixbench.workflows.monthly_summary` (the owner's month, from the figures the Figures
screen shows); the ui lays them out on the page (:mod:`fixbench.ui.review.reports`).
"""

from __future__ import annotations

from datetime import date, timedelta

from fixbench.store.case_filters import CaseFilter
from fixbench.store.database import Store
from fixbench.store.shop_settings import get_setting, set_setting

FOOTER_KEY = "report_footer"
SAFETY_NOTE = (
    "Safety: this power supply runs from mains voltage, and its capacitors can keep a dangerous "
    "charge for some time after it is unplugged. Please do not open its case. Any further work on "
    "it, or on the installation it plugs into, belongs with a suitably licensed person working to "
    "the electrical rules that apply where you live; where those rules ask for more than this "
    "report says, follow them.")


def shop_footer(store: Store) -> str:
    """The shop's footer text from its settings (empty if none has been set)."""
    return get_setting(store, FOOTER_KEY, "") or ""


def set_shop_footer(store: Store, text: str) -> None:
    set_setting(store, FOOTER_KEY, text)


def month_scope(any_day: date) -> CaseFilter:
    first = any_day.replace(day=1)
    last = (first + timedelta(days=32)).replace(day=1) - timedelta(days=1)
    return CaseFilter(since=first, until=last)


