#!/usr/bin/env bash
# Installs Debian's chromium for test/render/browser.test.ts (the HTML report opened headless).
# Does nothing when /usr/bin/chromium is already there. Non-interactive and quiet; needs root
# (or sudo) and network access to the Debian mirrors.
set -euo pipefail

if [ -x /usr/bin/chromium ]; then
  echo "chromium already installed: $(/usr/bin/chromium --version 2>/dev/null || echo /usr/bin/chromium)"
  exit 0
fi

SUDO=""
if [ "$(id -u)" -ne 0 ]; then SUDO="sudo"; fi

export DEBIAN_FRONTEND=noninteractive
$SUDO apt-get update -qq
$SUDO apt-get install -y -qq chromium >/dev/null

if [ ! -x /usr/bin/chromium ]; then
  echo "install-browser: chromium did not install to /usr/bin/chromium" >&2
  exit 1
fi
echo "chromium installed: $(/usr/bin/chromium --version 2>/dev/null || echo /usr/bin/chromium)"
