#!/usr/bin/env bash
# Checks what scripts/demo prints after its build: the check table of the fan controller's run, the
# one-line verdict and how to open the waveform; and that the same summary names the failed check
# of a run that fails. Runs scripts/demo with TICKBENCH_DEMO_SKIP_BUILD=1 in a scratch copy of the
# source tree, so nothing is installed or built.
#
#   tests/readme/demo_test.sh SOURCE_DIR BUILD_DIR
set -uo pipefail

if (($# != 2)); then
    echo "usage: $0 SOURCE_DIR BUILD_DIR" >&2
    exit 2
fi
source "$(dirname "${BASH_SOURCE[0]}")/work_folder.sh"
tb_make_work_folder "$1" "$2"
cd "$work_folder" || exit 1
export LC_ALL=C

fail() {
    echo "demo_test: $1" >&2
    exit 1
}
# expect_line TEXT OUTPUT: OUTPUT has TEXT as one of its lines.
expect_line() {
    grep -qxF -- "$1" <<<"$2" || fail "missing the line \"$1\" in:
$2"
}

out="$(TICKBENCH_DEMO_SKIP_BUILD=1 scripts/demo 2>&1)"
code=$?
((code == 0)) || fail "scripts/demo exited $code:
$out"
summary="tickbench-out/fan_controller/summary.txt"
[[ -f "$summary" ]] || fail "no $summary after scripts/demo"
# Every row of the check table is printed, indented; the totals line becomes the verdict.
rows=0
while IFS= read -r row; do
    [[ "$row" =~ ^[0-9]+\ checks: ]] && break
    expect_line "  $row" "$out"
    rows=$((rows + 1))
done <"$summary"
# As many check rows as examples/fan_controller/expected_verdicts.txt lists, all passing, and a
# header row.
checks="$(grep -cE '^pass' examples/fan_controller/expected_verdicts.txt)"
((checks > 0)) || fail "examples/fan_controller/expected_verdicts.txt lists no passing check"
((rows == checks + 1)) || fail "expected a header and $checks check rows in $summary, found $rows rows"
grep -qE '^  pass +fan 2 holds 50 % duty +duty_cycle +fans\.channel2 +mean 50 % over [0-9]+$' <<<"$out" ||
    fail "the row of \"fan 2 holds 50 % duty\" is missing or not a pass:
$out"
expect_line "Verdict: all $checks checks passed." "$out"
expect_line "  gtkwave tickbench-out/fan_controller/waves.vcd" "$out"
[[ -s tickbench-out/fan_controller/waves.vcd ]] || fail "the waveform the demo names is missing"

# A run with a failed check: the summary names it and returns 1.
cc -fPIC -shared -I harness/include -I examples/parts examples/first_scenario/firmware.c \
    -o first_firmware.so || fail "the first scenario's firmware did not build"
build/tickbench run examples/first_scenario/first.toml --firmware first_firmware.so \
    --param duty=30 --out failing >/dev/null 2>&1
code=$?
((code == 1)) || fail "the failing run exited $code, not 1"
source scripts/lib/run_summary.sh
out="$(tb_print_run_summary failing)"
code=$?
((code == 1)) || fail "tb_print_run_summary returned $code for a failed check, not 1:
$out"
expect_line 'Verdict: 1 of 2 checks failed: "duty cycle 25 %".' "$out"
grep -q '^  FAIL  *duty cycle 25 %' <<<"$out" || fail "the failed row is missing:
$out"

# No summary at all: a clear message and 2.
out="$(tb_print_run_summary no-such-folder 2>&1)"
code=$?
((code == 2)) || fail "tb_print_run_summary returned $code for a missing folder, not 2"
expect_line "no no-such-folder/summary.txt: the run ended before its reports were written" "$out"
echo "demo_test: scripts/demo's summary, a failing summary and a missing one are as expected"
