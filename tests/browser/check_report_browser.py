#!/usr/bin/python3
"""Browser check of the HTML report: headless Chromium (Debian's `chromium`)
loads a freshly written report from a local file, and the page must render:
the screenshot is not blank, the page title and the figures are in the DOM,
and the browser logs no console message.

Not a CTest test (Chromium is installed by tools/browser-check.sh, not by
tools/dev). Fails, never skips, when /usr/bin/chromium is missing, unless
OVERSHOOT_NO_BROWSER=1 is set.

Usage: check_report_browser.py BINARY SOURCE_DIR [SCREENSHOT.png]
"""
import os
import re
import shutil
import struct
import subprocess
import sys
import tempfile
import zlib

CHROMIUM = "/usr/bin/chromium"
FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--no-first-run", "--disable-background-networking",
         "--disable-component-update", "--disable-sync", "--disable-quic", "--hide-scrollbars"]
WIDTH, HEIGHT = 900, 1500

failures = []


def check(cond, what):
    print(("ok:   " if cond else "FAIL: ") + what)
    if not cond:
        failures.append(what)


def chromium(tmp, url, *extra):
    profile = tempfile.mkdtemp(prefix="profile-", dir=tmp)  # a fresh user-data-dir for every run
    cmd = [CHROMIUM, *FLAGS, f"--user-data-dir={profile}", "--enable-logging=stderr", "--v=0", *extra, url]
    return subprocess.run(cmd, capture_output=True, text=True, timeout=120)


def console_lines(stderr):
    # Chromium logs page console messages as "...:CONSOLE(line)] "text", source: ..." (INFO level for
    # console.log, and errors too); the self-test below proves the pattern still matches this version.
    return [l for l in stderr.splitlines() if re.search(r":CONSOLE[(:]", l) or "Uncaught" in l]


def decode_png(data):
    """RGB(A) rows of an 8-bit PNG, with the PNG specification's five row filters undone."""
    if data[:8] != b"\x89PNG\r\n\x1a\n":
        raise ValueError("not a PNG")
    pos, idat, w = 8, b"", None
    while pos < len(data):
        length, kind = struct.unpack(">I4s", data[pos:pos + 8])
        body = data[pos + 8:pos + 8 + length]
        pos += 12 + length
        if kind == b"IHDR":
            w, h, depth, colour = struct.unpack(">IIBB", body[:10])
            if depth != 8 or colour not in (2, 6):
                raise ValueError(f"unsupported PNG: depth {depth}, colour type {colour}")
            bpp = 3 if colour == 2 else 4
        elif kind == b"IDAT":
            idat += body
        elif kind == b"IEND":
            break
    raw = zlib.decompress(idat)
    stride = w * bpp
    rows, prev, i = [], bytearray(stride), 0
    for _ in range(h):
        f = raw[i]
        line = bytearray(raw[i + 1:i + 1 + stride])
        i += 1 + stride
        if f == 1:
            for x in range(bpp, stride):
                line[x] = (line[x] + line[x - bpp]) & 255
        elif f == 2:
            line = bytearray((a + b) & 255 for a, b in zip(line, prev))
        elif f == 3:
            for x in range(stride):
                left = line[x - bpp] if x >= bpp else 0
                line[x] = (line[x] + ((left + prev[x]) >> 1)) & 255
        elif f == 4:
            for x in range(stride):
                a = line[x - bpp] if x >= bpp else 0
                b = prev[x]
                c = prev[x - bpp] if x >= bpp else 0
                p = a + b - c
                pa, pb, pc = abs(p - a), abs(p - b), abs(p - c)
                line[x] = (line[x] + (a if pa <= pb and pa <= pc else b if pb <= pc else c)) & 255
        rows.append(line)
        prev = line
    return w, h, bpp, rows


def pixel_stats(png):
    w, h, bpp, rows = decode_png(png)
    n, s, s2, colours = 0, 0.0, 0.0, set()
    for y in range(0, h, 2):
        r = rows[y]
        for x in range(0, w * bpp, bpp * 2):
            lum = 0.299 * r[x] + 0.587 * r[x + 1] + 0.114 * r[x + 2]
            n += 1
            s += lum
            s2 += lum * lum
            colours.add((r[x], r[x + 1], r[x + 2]))
    mean = s / n
    return w, h, s2 / n - mean * mean, len(colours)


def main():
    binary, source = sys.argv[1], sys.argv[2]
    keep = sys.argv[3] if len(sys.argv) > 3 else None
    if not os.path.exists(CHROMIUM):
        if os.environ.get("OVERSHOOT_NO_BROWSER") == "1":
            print("OVERSHOOT_NO_BROWSER=1: browser check not run")
            return 0
        print(f"FAIL: {CHROMIUM} is missing (tools/browser-check.sh installs it; OVERSHOOT_NO_BROWSER=1 to skip)")
        return 1
    with tempfile.TemporaryDirectory() as tmp:
        report = os.path.join(tmp, "report.html")
        subprocess.run([binary, "report", "--scenario", os.path.join(source, "data", "long-road.toml"),
                        "--lengths", "100..300", "--race", "-o", report], check=True, timeout=300)
        url = "file://" + report

        # The console detector must catch a real console error, or its silence below means nothing.
        probe = os.path.join(tmp, "probe.html")
        with open(probe, "w") as f:
            f.write("<!DOCTYPE html><title>probe</title><script>console.error('probe-error-42')</script>")
        p = chromium(tmp, "file://" + probe, "--dump-dom")
        check(any("probe-error-42" in l for l in console_lines(p.stderr)), "console detector sees a console.error")

        p = chromium(tmp, url, "--dump-dom")
        check(p.returncode == 0, f"dump-dom exit status {p.returncode}")
        dom = p.stdout
        title = re.search(r"<title>(.*?)</title>", dom, re.S)
        check(title is not None and title.group(1) == "overshoot report: walker, trotter, galloper on 600 squares",
              f"page title in the DOM: {title.group(1) if title else None!r}")
        check(dom.count("<svg") >= 3, f"figures in the DOM ({dom.count('<svg')} svg elements)")
        check("Dominance digraph" in dom and "Margin against length" in dom, "figure titles in the DOM")
        bad = console_lines(p.stderr)
        check(not bad, f"no console messages while loading the report: {bad[:3]}")

        shot = os.path.join(tmp, "shot.png")
        p = chromium(tmp, url, f"--screenshot={shot}", f"--window-size={WIDTH},{HEIGHT}")
        check(p.returncode == 0 and os.path.exists(shot), "screenshot written")
        bad = console_lines(p.stderr)
        check(not bad, f"no console messages while taking the screenshot: {bad[:3]}")
        if os.path.exists(shot):
            png = open(shot, "rb").read()
            w, h, var, colours = pixel_stats(png)
            check((w, h) == (WIDTH, HEIGHT), f"screenshot size {w}x{h}")
            # A blank page is one colour with variance 0; the report has text, tables and coloured figures.
            check(var > 100, f"screenshot luminance variance {var:.1f} > 100")
            check(colours > 50, f"screenshot has {colours} distinct colours (> 50)")
            if keep:
                shutil.copyfile(shot, keep)
                print("screenshot kept at", keep)
    if failures:
        print(f"{len(failures)} browser check(s) failed")
        return 1
    print("browser check: all passed")
    return 0


if __name__ == "__main__":
    sys.exit(main())
