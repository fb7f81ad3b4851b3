#!/usr/bin/env bash
# Installs the Debian packages the test suite drives for real, when missing:
# chromium (browser tests), postgresql (the PostgreSQL integration tests) and
# LibreOffice Calc (recomputes exported workbooks). Needs root or sudo.
set -euo pipefail
need=()
[ -x /usr/bin/chromium ] || need+=(chromium)
ls /usr/lib/postgresql/*/bin/initdb >/dev/null 2>&1 || need+=(postgresql)
command -v soffice >/dev/null 2>&1 || need+=(libreoffice-calc-nogui)
if [ ${#need[@]} -eq 0 ]; then
  echo "System packages present: chromium, postgresql, libreoffice-calc."
  exit 0
fi
SUDO=""
[ "$(id -u)" -eq 0 ] || SUDO="sudo"
echo "Installing: ${need[*]}"
$SUDO apt-get update -qq
DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq --no-install-recommends "${need[@]}" >/dev/null
