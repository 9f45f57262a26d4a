#!/usr/bin/env bash
# Runs every command the README shows, so that it cannot go stale (registered in
# tests/CMakeLists.txt; DEVELOPERS.md, "The README test", explains the conventions).
#
#   tests/readme/readme_test.sh SOURCE_DIR BUILD_DIR [MARKDOWN_FILE]
#
# MARKDOWN_FILE defaults to SOURCE_DIR/README.md. Commands run in a scratch copy of the source
# tree whose `build` is a link to BUILD_DIR. Fenced blocks, by their info string:
#   console        each line "$ COMMAND" runs in its own bash in the scratch folder; a command
#                  may continue on lines ending in "\"; "# exit N" at its end is the exit code
#                  it must give (0 without it); the lines after it, up to the next "$ ", are
#                  output it must print, in that order (other lines may come between; "..."
#                  stands for lines left out). `gtkwave FILE` cannot run without a display: it is
#                  replaced by GTKWave's own reader, `vcd2fst FILE`, which must accept the file.
#   sh             the block runs as one bash script in the scratch folder and must exit 0.
#   console setup, sh setup
#                  not run: scripts/demo and scripts/test install packages and build, which a test
#                  must not do. Only those two commands may stand in such a block.
#   LANG file=PATH the block's text must equal the file PATH of the source tree, byte for byte;
#                  every file of examples/first_scenario/ must be shown so.
#   text, json, toml, c ... (no file=)  shown output or fragments: not run, and a "$ " line there
#                  is refused.
# Commands elsewhere (an indented code block, a block with no info string or with bash, shell)
# are refused, so that none escapes the test. Exits 1 at the first difference, saying where.
set -uo pipefail

if (($# < 2 || $# > 3)); then
    echo "usage: $0 SOURCE_DIR BUILD_DIR [MARKDOWN_FILE]" >&2
    exit 2
fi
source_dir="$(cd "$1" && pwd -P)"
build_dir="$2"
readme="${3:-$source_dir/README.md}"
readme_name="$(basename "$readme")"
source "$(dirname "${BASH_SOURCE[0]}")/work_folder.sh"
tb_make_work_folder "$source_dir" "$build_dir"
cd "$work_folder" || exit 1
export LC_ALL=C

fail() {
    echo "$readme_name:$1: $2" >&2
    exit 1
}

ran=0
skipped=0
shown_files=()

# A command allowed in a setup block: scripts/demo or scripts/test, maybe after VAR=value
# assignments and with arguments, maybe with a comment.
is_setup_command() {
    [[ "$1" =~ ^([A-Z_]+=[^[:space:]]*[[:space:]]+)*scripts/(demo|test)([[:space:]].*)?$ ]]
}

# run_console_command LINE COMMAND EXPECTED_EXIT OUTPUT_LINES...
run_console_command() {
    local at="$1" cmd="$2" want="$3"
    shift 3
    local shown=("$@") run="$cmd" out code
    if [[ "$cmd" =~ ^gtkwave[[:space:]]+([^[:space:]]+)[[:space:]]*$ ]]; then
        run="vcd2fst ${BASH_REMATCH[1]} $work_folder/gtkwave-check.fst"
    fi
    out="$(timeout 600 bash -c "$run" 2>&1)"
    code=$?
    ran=$((ran + 1))
    if [[ "$code" != "$want" ]]; then
        fail "$at" "\`$cmd\` exited $code, the README says $want; its output:
$out"
    fi
    # The shown lines must appear in the output in the order shown.
    local i=0 line
    local -a got
    mapfile -t got <<<"$out"
    for line in "${shown[@]}"; do
        [[ "$line" == "..." ]] && continue
        while ((i < ${#got[@]})) && [[ "${got[i]}" != "$line" ]]; do i=$((i + 1)); done
        if ((i == ${#got[@]})); then
            fail "$at" "\`$cmd\` did not print the line the README shows (or not in that order):
  $line
its output:
$out"
        fi
        i=$((i + 1))
    done
}

# run_console_block FIRST_LINE LINES...: the commands of a console block, one at a time.
run_console_block() {
    local first="$1"
    shift
    local lines=("$@") n=${#lines[@]} k=0 at cmd want line
    local -a shown
    while ((k < n)); do
        line="${lines[k]}"
        if [[ "$line" != '$ '* ]]; then
            fail "$((first + k))" "output before any command in a console block: $line"
        fi
        at=$((first + k))
        cmd="${line#\$ }"
        while [[ "$cmd" == *\\ ]] && ((k + 1 < n)); do
            k=$((k + 1))
            cmd="$cmd"$'\n'"${lines[k]}"
        done
        want=0
        if [[ "$cmd" =~ [[:space:]]#[[:space:]]exit[[:space:]]([0-9]+)[[:space:]]*$ ]]; then
            want="${BASH_REMATCH[1]}"
        fi
        shown=()
        k=$((k + 1))
        while ((k < n)) && [[ "${lines[k]}" != '$ '* ]]; do
            shown+=("${lines[k]}")
            k=$((k + 1))
        done
        run_console_command "$at" "$cmd" "$want" "${shown[@]}"
    done
}

check_setup_block() {
    local first="$1" kind="$2"
    shift 2
    local k=0 line cmd
    for line in "$@"; do
        k=$((k + 1))
        if [[ "$kind" == console ]]; then
            [[ "$line" == '$ '* ]] || continue
            cmd="${line#\$ }"
        else
            [[ -z "${line//[[:space:]]/}" || "$line" =~ ^[[:space:]]*# ]] && continue
            cmd="$line"
        fi
        if ! is_setup_command "$cmd"; then
            fail "$((first + k - 1))" "only scripts/demo and scripts/test may stand in a setup block (not run by this test); this command must go in a block the test runs: $cmd"
        fi
        skipped=$((skipped + 1))
    done
}

check_file_block() {
    local first="$1" path="$2"
    shift 2
    local file="$source_dir/$path"
    [[ -f "$file" ]] || fail "$first" "the block shows $path, which does not exist"
    if ! cmp -s <(printf '%s\n' "$@") "$file"; then
        fail "$first" "the block differs from $path (keep them the same text):
$(diff <(printf '%s\n' "$@") "$file")"
    fi
    shown_files+=("$path")
}

process_block() {
    local first="$1" info="$2"
    shift 2
    local lang attrs
    lang="${info%% *}"
    attrs=""
    [[ "$info" == *" "* ]] && attrs=" ${info#* } "
    if [[ "$attrs" =~ [[:space:]]file=([^[:space:]]+) ]]; then
        check_file_block "$first" "${BASH_REMATCH[1]}" "$@"
        return
    fi
    case "$lang" in
        console | sh)
            if [[ "$attrs" == *" setup "* ]]; then
                check_setup_block "$first" "$lang" "$@"
            elif [[ "$lang" == console ]]; then
                run_console_block "$first" "$@"
            else
                local out code
                out="$(printf '%s\n' "$@" | timeout 600 bash 2>&1)"
                code=$?
                ran=$((ran + 1))
                ((code == 0)) || fail "$((first - 1))" "the sh block exited $code; its output:
$out"
            fi
            ;;
        "" | bash | shell | sh-session | shell-session | zsh)
            fail "$((first - 1))" "a block with info string '$info': commands go in console or sh blocks (which this test runs), output in text blocks"
            ;;
        *)
            local k=0 line
            for line in "$@"; do
                if [[ "$line" == '$ '* ]]; then
                    fail "$((first + k))" "a command in a '$lang' block, which this test does not run: put it in a console block"
                fi
                k=$((k + 1))
            done
            ;;
    esac
}

lineno=0
in_fence=0
info=""
first=0
block=()
while IFS= read -r line || [[ -n "$line" ]]; do
    lineno=$((lineno + 1))
    if ((in_fence == 0)); then
        if [[ "$line" =~ ^\`\`\`(.*)$ ]]; then
            in_fence=1
            info="${BASH_REMATCH[1]}"
            first=$((lineno + 1))
            block=()
        elif [[ "$line" =~ ^[[:space:]]+\`\`\` ]]; then
            fail "$lineno" "an indented fence: start fences at column 1 so that this test sees them"
        elif [[ "$line" =~ ^(\ {4}|$'\t')[[:space:]]*(\$\ |build/|scripts/|cc\ |tickbench\ ) ]]; then
            fail "$lineno" "a command in an indented code block: put it in a console block, which this test runs"
        fi
    elif [[ "$line" == '```' ]]; then
        in_fence=0
        process_block "$first" "$info" "${block[@]}"
    else
        block+=("$line")
    fi
done <"$readme"
((in_fence == 0)) || fail "$first" "a fence that is never closed"

# The walk-through shows every file of its folder.
for f in "$source_dir"/examples/first_scenario/*; do
    rel="examples/first_scenario/$(basename "$f")"
    if [[ " ${shown_files[*]} " != *" $rel "* ]]; then
        fail "$lineno" "$rel is not shown in a block with file=$rel"
    fi
done
if ((ran == 0)); then
    fail "$lineno" "no command ran: the test found no console or sh block"
fi
echo "$readme_name: $ran commands and scripts ran as shown, ${#shown_files[@]} files shown equal the tree, $skipped setup commands not run (scripts/demo, scripts/test)"
