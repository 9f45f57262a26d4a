# The end of scripts/demo: what a run's summary.txt says, in short, and where its outputs are.
# Sourced, not run; a test (tests/readme/) calls it on folders of runs that pass and that fail.

# tb_print_run_summary DIR: prints the check table of DIR/summary.txt (verdict, check, kind,
# signal, measured; a failed check's reason under it), then one verdict line: "all N checks
# passed", or how many failed and their names. Returns 0 when every check passed, 1 when one
# failed, 2 when DIR/summary.txt is missing or has no totals line.
tb_print_run_summary() {
    local dir="$1"
    local summary="$dir/summary.txt"
    if [[ ! -f "$summary" ]]; then
        echo "no $summary: the run ended before its reports were written" >&2
        return 2
    fi
    local line total="" failed=() cells
    while IFS= read -r line; do
        # The totals line ends the table: "10 checks: 10 passed, 0 failed".
        if [[ "$line" =~ ^([0-9]+)\ checks?:\ [0-9]+\ passed,\ [0-9]+\ failed$ ]]; then
            total="${BASH_REMATCH[1]}"
            break
        fi
        printf '  %s\n' "$line"
        # Columns are separated by two spaces or more; the first two are the verdict and the name.
        if [[ "$line" == FAIL\ * ]]; then
            cells="$(sed -E 's/ {2,}/\t/g' <<<"$line")"
            failed+=("$(cut -f2 <<<"$cells")")
        fi
    done <"$summary"
    if [[ -z "$total" ]]; then
        echo "$summary has no line with the totals" >&2
        return 2
    fi
    echo
    if ((${#failed[@]} == 0)); then
        if ((total == 1)); then echo "Verdict: the check passed."; else echo "Verdict: all $total checks passed."; fi
        return 0
    fi
    local names
    names="$(printf '"%s", ' "${failed[@]}")"
    echo "Verdict: ${#failed[@]} of $total checks failed: ${names%, }."
    return 1
}

# tb_print_waveform_hint DIR: how to look at DIR/waves.vcd in GTKWave (Debian package gtkwave).
tb_print_waveform_hint() {
    local dir="$1"
    echo "Waveform: $dir/waves.vcd. Open it with GTKWave (Debian package gtkwave):"
    echo "  gtkwave $dir/waves.vcd"
}
