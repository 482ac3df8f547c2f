"""The bench follows the desktop's palette (light or dark), shows live steps unmistakably, and
fits 1366x768."""

from __future__ import annotations

from PySide6.QtGui import QColor, QPalette
from PySide6.QtWidgets import QApplication

from fixbench.workflows import step_wording as wording
from tests.ui.bench.conftest import acknowledge, fill_intake, open_intake, shoot

CHARGER = {"mains": "230 V", "output": "5 V", "current": "2 A"}


def _dark() -> QPalette:
    palette = QPalette()
    for role, colour in ((QPalette.ColorRole.Window, "#202124"), (QPalette.ColorRole.Base, "#17181a"),
                         (QPalette.ColorRole.Text, "#e8e8e8"), (QPalette.ColorRole.WindowText, "#e8e8e8"),
                         (QPalette.ColorRole.Button, "#303134"), (QPalette.ColorRole.ButtonText, "#e8e8e8")):
        palette.setColor(role, QColor(colour))
    return palette


def test_dark_palette_is_followed_by_the_stage_picture(qtbot, bench, tmp_path):
    app = QApplication.instance()
    old = app.palette()
    app.setPalette(_dark())
    try:
        intake = fill_intake(qtbot, bench, ticket="BW-4001", make="Quillon", model="QX-5",
                             family="pwm_flyback", ratings=CHARGER, symptoms=("symptom_dead",))
        open_intake(qtbot, bench, intake)
        acknowledge(qtbot, bench)
        guided = bench.panels["guided"]
        path = shoot(bench.window(), tmp_path, "guided-dark")
        image = guided.picture.grab().toImage()
        corner = image.pixelColor(2, image.height() // 2)
        assert corner.lightness() < 60  # the picture's ground is the dark Base, not white
        assert path.stat().st_size > 10_000
    finally:
        app.setPalette(old)


def test_live_step_shows_mains_caution_and_badge(qtbot, bench, tmp_path):
    intake = fill_intake(qtbot, bench, ticket="BW-4002", make="Quillon", model="QX-5",
                         family="pwm_flyback", ratings=CHARGER)
    open_intake(qtbot, bench, intake)
    acknowledge(qtbot, bench)
    bench.controller.choose_check("series_lamp")
    card = bench.panels["guided"].card
    assert card.power_strip.isVisible()
    assert card.power_label.text() == "LIVE through the series lamp"
    assert "Mains voltage is present" in card.caution_label.text()
    assert "series lamp" in card.caution_label.text().lower()
    assert "LIVE STEP" in bench.power_badge.text()
    assert card.expected.text() == "flash, then dim or dark"
    # the lamp named from the unit's ratings: 40-60 W at 230 V for chargers [practice; trade primer 8]
    assert "40 W incandescent lamp" in card.how.text()
    # chosen before the clamp was read: the open-clamp caution comes with it [practice]
    assert "open clamp" in card.caution_label.text()
    assert "no flash at all" in card.how.text()
    shoot(bench, tmp_path, "series_lamp_step")


def test_window_fits_1366_by_768(qtbot, window):
    assert window.size().width() <= 1366 and window.size().height() <= 768
    assert window.minimumSizeHint().height() <= 768


def test_meter_range_is_above_the_healthy_value():
    # 325 V bulk on a 600 V range; a 4.7 kohm resistor on 20 kohm; 22 uF on 200 uF [practice].
    assert wording.meter_range("dc_volts", "V", 291.0, 356.0, 323.0) == "range 600 V (or auto)"
    assert wording.meter_range("ohmmeter", "ohm", 4465.0, 4935.0, 4700.0) == "range 20 kohm (or auto)"
    assert wording.meter_range("capacitance", "F", 17.6e-6, 26.4e-6, 22e-6) == "range 200 uF (or auto)"
    assert wording.meter_range("ohmmeter", "ohm", 1e5, None, None).startswith("highest ohms range")
    assert wording.meter_range("dc_volts", "V", None, 5000.0, None).endswith("stop")
