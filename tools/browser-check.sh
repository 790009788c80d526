#!/bin/sh
# The browser check of the HTML report: installs Debian's chromium with apt-get
# when it is missing (as tools/dev installs its packages), builds, then has
# headless Chromium load a freshly written report (tests/browser/).
# The screenshot is kept at build/report-screenshot.png for a look by eye.
set -eu
cd "$(dirname "$0")/.."

. tools/packages.sh
install_missing chromium

cmake -S . -B build -DCMAKE_BUILD_TYPE=Release >/dev/null
cmake --build build -j"$(nproc)"
/usr/bin/python3 tests/browser/check_report_browser.py build/overshoot . build/report-screenshot.png
