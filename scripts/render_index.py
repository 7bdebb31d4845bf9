"""Render a batch review page (index.html) once in headless Chromium to a PNG.

Usage::

    python scripts/render_index.py OUT_DIR/index.html [--png shot.png] [--size 1400,1800]

Looks for ``chromium`` (Debian's package: ``apt-get install chromium``),
``chromium-browser`` or ``google-chrome`` on the PATH.  Chromium runs with a
new temporary profile, no GPU, no network features it would start by itself
(background networking, component update, sync), and quits after taking the
screenshot.  The page itself needs no network: everything it uses is inline
or a relative file.  Prints the PNG path; exit 0 when it was written, 1 when
no browser is installed, 2 when rendering failed.
"""

from __future__ import annotations

import argparse
import shutil
import subprocess
import sys
import tempfile
from pathlib import Path

#: browsers tried, in order
BROWSERS = ("chromium", "chromium-browser", "google-chrome")


def find_browser():
    """Path of the first headless-capable Chromium on the PATH, or None."""
    for name in BROWSERS:
        found = shutil.which(name)
        if found:
            return found
    return None


def render(index_html, png, *, width=1400, height=1800, timeout_s=120.0, fragment=""):
    """Screenshot ``index_html`` into ``png`` with headless Chromium; returns the PNG path.

    ``fragment`` presets the page's view, e.g. ``"sort=review_status"``.

    Raises
    ------
    FileNotFoundError
        No browser, or no page.
    RuntimeError
        Chromium exited with an error or wrote no PNG.
    """
    browser = find_browser()
    if browser is None:
        raise FileNotFoundError(f"no Chromium found (tried {', '.join(BROWSERS)}); apt-get install chromium")
    page = Path(index_html).resolve()
    if not page.is_file():
        raise FileNotFoundError(f"{page}: no such page")
    png = Path(png).resolve()
    with tempfile.TemporaryDirectory(prefix="clinometry-chromium-") as profile:
        cmd = [
            browser, "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
            "--disable-background-networking", "--disable-component-update", "--disable-sync",
            f"--user-data-dir={profile}", f"--screenshot={png}", f"--window-size={width},{height}",
            "--hide-scrollbars", page.as_uri() + (f"#{fragment}" if fragment else ""),
        ]
        proc = subprocess.run(cmd, capture_output=True, text=True, timeout=timeout_s)
    if proc.returncode != 0 or not png.is_file():
        tail = (proc.stderr or "").strip().splitlines()[-3:]
        raise RuntimeError(f"chromium failed (exit {proc.returncode}): {' | '.join(tail)}")
    return png


def dump_dom(url, *, timeout_s=120.0) -> str:
    """The page's DOM after its scripts ran (``chromium --headless --dump-dom``)."""
    browser = find_browser()
    if browser is None:
        raise FileNotFoundError(f"no Chromium found (tried {', '.join(BROWSERS)}); apt-get install chromium")
    with tempfile.TemporaryDirectory(prefix="clinometry-chromium-") as profile:
        cmd = [browser, "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
               "--disable-background-networking", "--disable-component-update", "--disable-sync",
               f"--user-data-dir={profile}", "--dump-dom", url]
        proc = subprocess.run(cmd, capture_output=True, text=True, timeout=timeout_s)
    if proc.returncode != 0:
        raise RuntimeError(f"chromium failed (exit {proc.returncode}): {proc.stderr.strip()[-300:]}")
    return proc.stdout


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("index", help="the index.html of a batch output folder")
    ap.add_argument("--png", help="screenshot path (default: index.png beside the page)")
    ap.add_argument("--size", default="1400,1800", help="window WIDTH,HEIGHT in pixels (default: %(default)s)")
    args = ap.parse_args(argv)
    w, h = (int(v) for v in args.size.split(","))
    png = args.png or str(Path(args.index).with_name("index.png"))
    if find_browser() is None:
        print(f"render_index: no Chromium found (tried {', '.join(BROWSERS)})", file=sys.stderr)
        return 1
    try:
        print(render(args.index, png, width=w, height=h))
    except (OSError, RuntimeError, subprocess.TimeoutExpired) as err:
        print(f"render_index: {err}", file=sys.stderr)
        return 2
    return 0


if __name__ == "__main__":
    sys.exit(main())
