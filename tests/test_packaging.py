"""The built wheel carries its knowledge files: installed in a fresh environment, `fixbench expect`
works from any folder."""

import json
import os
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent


@pytest.mark.slow
def test_wheel_installed_elsewhere_finds_its_knowledge(tmp_path):
    uv = shutil.which("uv")
    if uv is None:
        pytest.skip("uv is not on PATH")
    dist = tmp_path / "dist"
    subprocess.run([uv, "build", "--wheel", "--out-dir", str(dist)], cwd=ROOT, check=True,
                   capture_output=True)
    wheel = next(dist.glob("fixbench-*.whl"))
    venv = tmp_path / "venv"
    subprocess.run([uv, "venv", "--python", sys.executable, str(venv)], check=True, capture_output=True)
    python = venv / "bin" / "python"
    subprocess.run([uv, "pip", "install", "--python", str(python), str(wheel)], check=True,
                   capture_output=True)
    elsewhere = tmp_path / "elsewhere"
    elsewhere.mkdir()
    env = {k: v for k, v in os.environ.items() if k not in ("PYTHONPATH", "VIRTUAL_ENV")}
    result = subprocess.run(
        [str(venv / "bin" / "fixbench"), "expect", "--family", "pwm_flyback", "--mains", "230",
         "--output", "5V", "--current", "1A", "--json"],
        cwd=elsewhere, env=env, capture_output=True, text=True, check=True)
    rows = json.loads(result.stdout)
    bulk = next(r for r in rows if r["check"] == "bulk_voltage")
    # 230 V mains: rectified peak about 325 V less two diode drops [src: IEC 60038; textbook bridge]
    assert 318 < bulk["nominal"] < 326
    location = subprocess.run([str(python), "-c", "import fixbench.knowledge.locate as l; print(l.knowledge_dir())"],
                              cwd=elsewhere, env=env, capture_output=True, text=True, check=True)
    assert str(ROOT) not in location.stdout  # found inside the installed package, not the checkout
