#!/usr/bin/env bash
# Runs the README test on a README gone stale and requires it to fail with exit code 1 and a
# message holding the given reason, so that the README test is known to catch that kind of change.
#
#   tests/readme/expect_refusal.sh SOURCE_DIR BUILD_DIR MARKDOWN_FILE REASON
set -uo pipefail
if (($# != 4)); then
    echo "usage: $0 SOURCE_DIR BUILD_DIR MARKDOWN_FILE REASON" >&2
    exit 2
fi
out="$(bash "$(dirname "${BASH_SOURCE[0]}")/readme_test.sh" "$1" "$2" "$3" 2>&1)"
code=$?
if ((code != 1)); then
    echo "the README test exited $code on $3, not 1:" >&2
    echo "$out" >&2
    exit 1
fi
if ! grep -qF -- "$4" <<<"$out"; then
    echo "the README test refused $3 but without the reason \"$4\":" >&2
    echo "$out" >&2
    exit 1
fi
echo "refused as expected: $out"
