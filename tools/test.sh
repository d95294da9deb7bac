#!/usr/bin/env bash
# The test command: install the test dependencies, build site/, run the
# whole suite. With CI set, missing browser or Node is an error, never a skip.
set -euo pipefail
cd "$(dirname "$0")/.."

export PIP_DISABLE_PIP_VERSION_CHECK=1 PIP_ROOT_USER_ACTION=ignore
python3 -m pip install -q -r requirements-dev.txt -e .

if [[ -n "${CI:-}" ]]; then
  command -v node >/dev/null || { echo "tools/test.sh: node is required in CI" >&2; exit 1; }
  [[ -x /usr/bin/chromium ]] || { echo "tools/test.sh: /usr/bin/chromium is required in CI" >&2; exit 1; }
fi

python3 build.py

status=0
python3 -m pytest -q "$@" || status=$?
case "$status" in
  0) ;;
  5) echo "tools/test.sh: pytest collected no tests" >&2; exit 1 ;;
  *) exit "$status" ;;
esac
