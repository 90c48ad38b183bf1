#!/usr/bin/env bash
# Re-run every reference script in --check mode: each NAME.py recomputes its numbers and compares
# them with the committed NAME.json, exiting non-zero on drift.
set -euo pipefail
cd "$(dirname "$0")"
shopt -s nullglob
for script in *.py; do
    echo "reference check: $script"
    python3 "$script" --check
done
