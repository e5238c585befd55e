#!/bin/sh
# Set up Shaftwright on this machine and run it:
#
#   sh setup.sh serve    the app on the demo design, at http://127.0.0.1:8000/
#   sh setup.sh test     the test suite (browser tests included)
#
# What it does, each step only when it is still needed:
#   1. Debian/Ubuntu packages (apt-get, as root or through sudo): python3-venv for the virtual
#      environment, chromium for `shaftwright note` and the browser tests, poppler-utils
#      (pdftotext) for the tests.
#   2. A virtual environment in .venv (the system Python stays untouched: PEP 668), with
#      Shaftwright installed in it (`pip install -e .`, or `.[test]` for the tests).
#   3. `.venv/bin/shaftwright serve`, or `.venv/bin/python -m pytest`.
#
# Settings (environment): PYTHON (default python3; 3.11 or later), SHAFTWRIGHT_PORT (8000),
# SHAFTWRIGHT_HOST (127.0.0.1). Arguments after `test` go to pytest.
set -eu
cd "$(dirname "$0")"
mode=${1:-serve}
[ $# -gt 0 ] && shift
case $mode in serve|test) ;; *) echo "usage: sh setup.sh serve|test [pytest arguments]" >&2; exit 2 ;; esac
PYTHON=${PYTHON:-python3}

say() { printf 'setup: %s\n' "$*" >&2; }

as_root() {
    if [ "$(id -u)" = 0 ]; then "$@"
    elif command -v sudo >/dev/null 2>&1; then sudo "$@"
    else say "needs root to run: $*"; return 1
    fi
}

apt_install() {  # apt_install PACKAGE...: install what apt-get knows, once per run
    command -v apt-get >/dev/null 2>&1 || { say "no apt-get here: install $* yourself"; return 1; }
    if [ -z "${_apt_updated:-}" ]; then
        as_root env DEBIAN_FRONTEND=noninteractive apt-get update -qq || return 1
        _apt_updated=1
    fi
    as_root env DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends "$@"
}

command -v "$PYTHON" >/dev/null 2>&1 || apt_install python3 || { say "install Python 3.11 or later"; exit 1; }
"$PYTHON" -c 'import sys; sys.exit(sys.version_info < (3, 11))' \
    || { say "$PYTHON is $("$PYTHON" -V 2>&1); Shaftwright needs Python 3.11 or later (set PYTHON=...)"; exit 1; }

# 1. system packages
if [ ! -x .venv/bin/python ] && ! "$PYTHON" -c 'import ensurepip, venv' >/dev/null 2>&1; then
    minor=$("$PYTHON" -c 'import sys; print(f"{sys.version_info[0]}.{sys.version_info[1]}")')
    apt_install "python$minor-venv" || apt_install python3-venv
fi
if [ -z "${SHAFTWRIGHT_CHROMIUM:-}" ] && ! command -v chromium >/dev/null 2>&1 \
        && ! command -v chromium-browser >/dev/null 2>&1; then
    if ! { apt_install chromium || apt_install chromium-browser; }; then
        [ "$mode" = test ] && { say "the browser tests need Chromium"; exit 1; }
        say "no Chromium: the app runs, but 'shaftwright note' cannot print until you install it"
        say "(apt-get install chromium) or set SHAFTWRIGHT_CHROMIUM to a Chromium or Chrome program"
    fi
fi
if [ "$mode" = test ] && ! command -v pdftotext >/dev/null 2>&1; then
    apt_install poppler-utils
fi

# 2. the virtual environment and the package in it (again only when pyproject.toml changed)
[ -x .venv/bin/python ] || "$PYTHON" -m venv .venv
extras=.
[ "$mode" = test ] && extras='.[test]'
stamp=".venv/.installed-$mode"
want=$(cksum < pyproject.toml)
if [ ! -f "$stamp" ] || [ "$(cat "$stamp")" != "$want" ]; then
    say "installing Shaftwright into .venv (pip install -e '$extras')"
    .venv/bin/python -m pip install --quiet --disable-pip-version-check --upgrade pip
    .venv/bin/python -m pip install --quiet --disable-pip-version-check -e "$extras"
    echo "$want" > "$stamp"
fi

# 3. run
if [ "$mode" = serve ]; then
    exec .venv/bin/shaftwright serve --host "${SHAFTWRIGHT_HOST:-127.0.0.1}" --port "${SHAFTWRIGHT_PORT:-8000}"
fi
exec .venv/bin/python -m pytest "$@"
