"""The window at twice the pixel density: it renders sharp (device pixel ratio 2) at 1366x768
logical pixels, with the bench's large reading field still inside the window."""

import json
import os
import subprocess
import sys
import textwrap


SCRIPT = textwrap.dedent("""
    import json, sys
    from PySide6.QtWidgets import QApplication
    app = QApplication([])
    from fixbench.store import open_store
    from fixbench.ui.context import AppContext
    from fixbench.ui.main_window import MainWindow
    store = open_store(sys.argv[1])
    window = MainWindow(AppContext(store))
    window.resize(1366, 768)
    window.show()
    for _ in range(20):
        app.processEvents()
    image = window.grab().toImage()
    image.save(sys.argv[2])
    print(json.dumps({"ratio": window.devicePixelRatioF(), "width": image.width(), "height": image.height(),
                      "logical": [window.width(), window.height()]}))
    store.close()
""")


def test_window_renders_at_double_density(tmp_path):
    env = dict(os.environ, QT_QPA_PLATFORM="offscreen", QT_SCALE_FACTOR="2")
    png = tmp_path / "bench-2x.png"
    result = subprocess.run([sys.executable, "-c", SCRIPT, str(tmp_path / "shop.sqlite"), str(png)],
                            env=env, capture_output=True, text=True, timeout=120)
    assert result.returncode == 0, result.stderr[-2000:]
    shown = json.loads(result.stdout.strip().splitlines()[-1])
    assert shown["ratio"] == 2.0
    assert shown["logical"] == [1366, 768]
    assert (shown["width"], shown["height"]) == (2732, 1536)
    assert png.stat().st_size > 20_000
