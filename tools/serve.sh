#!/usr/bin/env bash
# Build the site and serve it on http://127.0.0.1:${PORT:-8000}/ (Ctrl-C stops).
set -euo pipefail
cd "$(dirname "$0")/.."

export PIP_DISABLE_PIP_VERSION_CHECK=1 PIP_ROOT_USER_ACTION=ignore
python3 -m pip install -q -r requirements-core.txt "$(grep -i '^jinja2==' requirements-dev.txt)"

exec python3 build.py --serve --port "${PORT:-8000}"
