"""The HTML report in a real browser: headless Chromium renders it without network, raises no console message,
and the screenshot is not blank (the figures' blue is on the page).

Skipped, with the reason, only where /usr/bin/chromium is absent (.ci/run installs Debian's package when it can).
"""
from __future__ import annotations

import os
import re
import subprocess

import numpy as np
import pytest

from coldplate.cli import main

from .helpers import ROOT

CHROMIUM = "/usr/bin/chromium"
pytestmark = pytest.mark.skipif(not os.path.exists(CHROMIUM),
                                reason=f"{CHROMIUM} is not installed (Debian package 'chromium'; .ci/run installs "
                                       "it with apt-get when run as root)")

FLAGS = ("--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
         "--disable-background-networking", "--disable-component-update", "--disable-sync",
         "--disable-default-apps", "--disable-extensions", "--hide-scrollbars",
         "--enable-logging=stderr", "--v=0")


def shoot(page, tmp_path, size=(1200, 6000)):
    """Screenshot a local page; returns (RGB array in 0..1, the console messages Chromium logged)."""
    png = tmp_path / f"{page.stem}.png"
    profile = tmp_path / f"profile-{page.stem}"
    cmd = [CHROMIUM, *FLAGS, f"--user-data-dir={profile}", f"--screenshot={png}",
           f"--window-size={size[0]},{size[1]}", page.resolve().as_uri()]
    proc = subprocess.run(cmd, capture_output=True, text=True, timeout=180, stdin=subprocess.DEVNULL)
    log = proc.stdout + proc.stderr
    assert png.exists(), f"no screenshot (exit {proc.returncode}): {log[-2000:]}"
    import matplotlib.image

    img = matplotlib.image.imread(png)[..., :3]
    console = [line for line in log.splitlines() if ":CONSOLE" in line or "Uncaught" in line]
    return img, console


def test_console_check_catches_errors(tmp_path):
    # the harness itself: a page with a script error must be caught, or the real test proves nothing
    bad = tmp_path / "bad.html"
    bad.write_text("<!DOCTYPE html><html><body><p>x</p><script>throw new Error('deliberate')</script></body></html>")
    _, console = shoot(bad, tmp_path, (400, 300))
    assert any("deliberate" in line for line in console), console


@pytest.mark.parametrize("name", ["reagent-block-channels", "laser-mount-tube", "sample-stage-thermoelectric",
                                  "tap-to-drain-circuit"])
def test_report_renders_in_chromium(tmp_path, name):
    page = tmp_path / f"{name}.html"
    assert main(["report", str(ROOT / "examples" / f"{name}.toml"), "-o", str(page)]) == 0
    img, console = shoot(page, tmp_path)
    assert console == [], console
    grey = img.mean(axis=2)
    assert grey.std() > 0.05, "the page is blank"
    assert (grey < 0.9).mean() > 0.03, "hardly anything is drawn"
    # the figures' bars and lines in Okabe-Ito blue (#0072B2) are rendered, not just the text
    blue = np.array([0x00, 0x72, 0xB2]) / 255.0
    blue_pixels = int((np.abs(img - blue).max(axis=2) < 0.06).sum())
    assert blue_pixels > 10000, blue_pixels


def test_report_prints(tmp_path):
    # Chromium's print to PDF (its default paper is Letter): the report lays out on whole pages
    page = tmp_path / "print.html"
    assert main(["report", str(ROOT / "examples" / "detector-cavity-glycol.toml"), "-o", str(page)]) == 0
    pdf = tmp_path / "print.pdf"
    cmd = [CHROMIUM, *FLAGS, f"--user-data-dir={tmp_path / 'profile-print'}", "--no-pdf-header-footer",
           f"--print-to-pdf={pdf}", page.resolve().as_uri()]
    proc = subprocess.run(cmd, capture_output=True, text=True, timeout=180, stdin=subprocess.DEVNULL)
    assert pdf.exists(), proc.stderr[-2000:]
    data = pdf.read_bytes()
    assert data.startswith(b"%PDF")
    boxes = re.findall(rb"/MediaBox\s*\[\s*0 0 ([\d.]+) ([\d.]+)\s*\]", data)
    assert len(boxes) >= 3  # results, findings, figures and methods do not fit one page
    assert {(float(w), float(h)) for w, h in boxes} == {(612.0, 792.0)}  # 8.5 x 11 in at 72 pt/in
