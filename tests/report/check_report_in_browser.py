#!/usr/bin/env python3
"""Renders a failing run's report.html in headless Chromium and checks what a person would see.

Runs `tickbench run SCENARIO` (a run that fails a check), takes a screenshot of the page and
checks that it is not blank and that pixels of the failure marker's colour are on it, then dumps
the page's DOM and checks that the failing check and its signal are named. Exits 77 (CTest's
skip) when no chromium is installed; CI installs it (scripts/lib/setup.sh).

usage: check_report_in_browser.py TICKBENCH SCENARIO OUT FAILING_SIGNAL FAILING_CHECK
"""

import os
import shutil
import struct
import subprocess
import sys
import tempfile
import zlib

# The failure marker's colour in sim/report/report_html.cpp.
MARKER = (0xD1, 0x24, 0x2F)


def fail(message):
    print("FAILED: " + message)
    sys.exit(1)


def read_png(path):
    """Decodes an 8-bit RGB or RGBA, non-interlaced PNG into (width, height, channels, rows)."""
    with open(path, "rb") as f:
        data = f.read()
    # PNG signature and chunk layout: ISO/IEC 15948:2004 (PNG), clauses 5.2 and 5.3.
    if data[:8] != b"\x89PNG\r\n\x1a\n":
        fail(path + " is not a PNG file")
    pos, idat, header = 8, [], None
    while pos < len(data):
        (length,) = struct.unpack(">I", data[pos:pos + 4])
        kind = data[pos + 4:pos + 8]
        body = data[pos + 8:pos + 8 + length]
        pos += 12 + length
        if kind == b"IHDR":
            header = struct.unpack(">IIBBBBB", body)
        elif kind == b"IDAT":
            idat.append(body)
        elif kind == b"IEND":
            break
    if header is None:
        fail(path + " has no IHDR chunk")
    width, height, depth, colour, _, _, interlace = header
    # Colour types 2 (RGB) and 6 (RGBA): ISO/IEC 15948:2004 clause 11.2.2.
    if depth != 8 or colour not in (2, 6) or interlace != 0:
        fail("unexpected PNG format: depth %d, colour type %d, interlace %d"
             % (depth, colour, interlace))
    channels = 3 if colour == 2 else 4
    raw = zlib.decompress(b"".join(idat))
    stride = width * channels
    rows, prev = [], bytearray(stride)
    for y in range(height):
        start = y * (stride + 1)
        ftype = raw[start]
        line = bytearray(raw[start + 1:start + 1 + stride])
        # Filter types 0 to 4: ISO/IEC 15948:2004 clause 9.2.
        if ftype == 1:
            for i in range(channels, stride):
                line[i] = (line[i] + line[i - channels]) & 0xFF
        elif ftype == 2:
            line = bytearray((a + b) & 0xFF for a, b in zip(line, prev))
        elif ftype == 3:
            for i in range(stride):
                left = line[i - channels] if i >= channels else 0
                line[i] = (line[i] + ((left + prev[i]) >> 1)) & 0xFF
        elif ftype == 4:
            for i in range(stride):
                a = line[i - channels] if i >= channels else 0
                b = prev[i]
                c = prev[i - channels] if i >= channels else 0
                p = a + b - c
                pa, pb, pc = abs(p - a), abs(p - b), abs(p - c)
                pred = a if pa <= pb and pa <= pc else (b if pb <= pc else c)
                line[i] = (line[i] + pred) & 0xFF
        elif ftype != 0:
            fail("bad PNG filter type %d in row %d" % (ftype, y))
        rows.append(line)
        prev = line
    return width, height, channels, rows


def chromium_args(browser, profile):
    return [browser, "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
            "--no-first-run", "--disable-background-networking", "--disable-component-update",
            "--disable-sync", "--user-data-dir=" + profile]


def main():
    if len(sys.argv) != 6:
        print(__doc__)
        return 2
    tickbench, scenario, out, signal, check = sys.argv[1:]
    browser = shutil.which("chromium") or shutil.which("chromium-browser")
    if browser is None:
        print("SKIPPED: chromium is not installed (Debian package chromium; scripts/lib/setup.sh "
              "installs it): report.html was not rendered in a browser")
        return 77
    shutil.rmtree(out, ignore_errors=True)
    os.makedirs(out)
    run = subprocess.run([tickbench, "run", scenario, "--out", os.path.join(out, "run")],
                         capture_output=True, text=True, timeout=300)
    if run.returncode != 1:
        fail("tickbench run: exit code %d, expected 1\n%s\n%s"
             % (run.returncode, run.stdout, run.stderr))
    page = "file://" + os.path.abspath(os.path.join(out, "run", "report.html"))
    png = os.path.join(out, "report.png")
    with tempfile.TemporaryDirectory() as profile:
        shot = subprocess.run(chromium_args(browser, profile) +
                              ["--screenshot=" + png, "--window-size=1200,2000", page],
                              capture_output=True, text=True, timeout=120)
    if shot.returncode != 0 or not os.path.exists(png):
        fail("chromium --screenshot: exit code %d\n%s" % (shot.returncode, shot.stderr))
    with tempfile.TemporaryDirectory() as profile:
        dom = subprocess.run(chromium_args(browser, profile) + ["--dump-dom", page],
                             capture_output=True, text=True, timeout=120)
    if dom.returncode != 0:
        fail("chromium --dump-dom: exit code %d\n%s" % (dom.returncode, dom.stderr))

    width, height, channels, rows = read_png(png)
    if (width, height) != (1200, 2000):
        fail("screenshot is %dx%d, expected 1200x2000" % (width, height))
    inked = marker = 0
    # Per column, the current and the longest vertical run of marker pixels: the first failure's
    # line is a vertical stroke across the traces, taller than any badge or label.
    run = [0] * width
    longest = [0] * width
    for line in rows:
        for col, x in enumerate(range(0, width * channels, channels)):
            r, g, b = line[x], line[x + 1], line[x + 2]
            if r < 235 or g < 235 or b < 235:
                inked += 1
            if abs(r - MARKER[0]) <= 24 and abs(g - MARKER[1]) <= 24 and abs(b - MARKER[2]) <= 24:
                marker += 1
                run[col] += 1
                longest[col] = max(longest[col], run[col])
            else:
                run[col] = 0
    total = width * height
    print("screenshot %dx%d: %d pixels not white (%.2f %%), %d of the failure marker's colour, "
          "the tallest stroke of it %d pixels"
          % (width, height, inked, 100.0 * inked / total, marker, max(longest)))
    # A page with tables and a waveform inks a few percent of its pixels; a blank or unstyled
    # error page far fewer (a threshold of our own, no source).
    if inked < total // 100:
        fail("the page looks blank: only %d of %d pixels are not white" % (inked, total))
    if marker < 200:
        fail("too few pixels of the failure marker's colour: %d" % marker)
    # The line runs from the picture's top band to the bottom of one 48-pixel trace row.
    if max(longest) < 60:
        fail("no vertical failure line: the longest run of marker pixels is %d pixels"
             % max(longest))
    for want in (signal, check, "first failure at", "<svg"):
        if want not in dom.stdout:
            fail("the rendered page lacks %r" % want)
    print("report.html renders in %s with the failure of %r on %s" % (browser, check, signal))
    return 0


if __name__ == "__main__":
    sys.exit(main())
