#!/usr/bin/env bash
# Installs the Debian packages the tests need (Chromium, reference libraries, Unicode data, a C++ toolchain) when absent.
set -euo pipefail

missing=()
[ -x /usr/bin/chromium ] || missing+=(chromium)
/usr/bin/python3 -c 'import sklearn' >/dev/null 2>&1 || missing+=(python3-sklearn)
/usr/bin/python3 -c 'import nltk' >/dev/null 2>&1 || missing+=(python3-nltk)
[ -f /usr/share/unicode/auxiliary/WordBreakTest.txt ] || missing+=(unicode-data)
# The crfsuite dev dependency (CRF reference test and benchmark) compiles its addon with node-gyp.
{ command -v g++ >/dev/null && command -v make >/dev/null; } || missing+=(build-essential)
command -v python3 >/dev/null || missing+=(python3)

[ ${#missing[@]} -eq 0 ] && exit 0
echo "[system] installing missing Debian packages: ${missing[*]}"
sudo=""
if [ "$(id -u)" -ne 0 ]; then
  command -v sudo >/dev/null || { echo "[system] need root or sudo to apt-get install ${missing[*]}" >&2; exit 1; }
  sudo="sudo"
fi
export DEBIAN_FRONTEND=noninteractive
$sudo apt-get update -qq
$sudo apt-get install -y -qq --no-install-recommends "${missing[@]}"
