#!/usr/bin/env bash
# Installs the Debian packages the test suite drives for real, when missing:
# chromium (browser tests), postgresql (the PostgreSQL integration tests) and
# LibreOffice Calc (recomputes exported workbooks) and poppler-utils (pdftotext,
# pdftoppm: read and render the decision pack). Needs root or sudo.
set -euo pipefail
need=()
[ -x /usr/bin/chromium ] || need+=(chromium)
ls /usr/lib/postgresql/*/bin/initdb >/dev/null 2>&1 || need+=(postgresql)
command -v soffice >/dev/null 2>&1 || need+=(libreoffice-calc-nogui)
{ command -v pdftotext && command -v pdftoppm; } >/dev/null 2>&1 || need+=(poppler-utils)
if [ ${#need[@]} -eq 0 ]; then
  echo "System packages present: chromium, postgresql, libreoffice-calc, poppler-utils."
  exit 0
fi
SUDO=""
[ "$(id -u)" -eq 0 ] || SUDO="sudo"
echo "Installing: ${need[*]}"
$SUDO apt-get update -qq
DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq --no-install-recommends "${need[@]}" >/dev/null
