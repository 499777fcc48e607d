#!/usr/bin/env bash
# Installs Debian's chromium (for the browser tests in test/e2e) when it is
# missing. Idempotent; prints nothing when chromium is already there.
set -euo pipefail
if [ -x /usr/bin/chromium ]; then exit 0; fi
echo "ensure-chromium: /usr/bin/chromium is missing; installing Debian's chromium package with apt-get..." >&2
SUDO=""
if [ "$(id -u)" -ne 0 ]; then
  if command -v sudo >/dev/null 2>&1; then SUDO="sudo"; else
    echo "ensure-chromium: not root and no sudo; run as root: apt-get update && apt-get install -y chromium" >&2
    exit 1
  fi
fi
$SUDO apt-get update -qq
DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y -qq chromium >/dev/null
if [ ! -x /usr/bin/chromium ]; then
  echo "ensure-chromium: apt-get finished but /usr/bin/chromium is still missing" >&2
  exit 1
fi
echo "ensure-chromium: installed $(/usr/bin/chromium --version 2>/dev/null || echo chromium)" >&2
