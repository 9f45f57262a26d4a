#!/bin/sh
# Ctrl-C stops a sweep cleanly (docs/cli.md, "sweep"): SIGINT to a running sweep ends it with exit
# code 130 and partial reports that say so. Arguments: TICKBENCH SCENARIO FIRMWARE OUT.
set -u
tickbench=$1 scenario=$2 firmware=$3 out=$4
rm -rf "$out"
"$tickbench" sweep "$scenario" --firmware "$firmware" --vary start-offset=0..100000 --jobs 2 \
    --waves none --out "$out" > "$out.stdout" 2> "$out.stderr" &
pid=$!
# Wait until points run (the output folder exists once every input was checked).
tries=0
while [ ! -d "$out" ] && [ $tries -lt 300 ]; do sleep 0.1; tries=$((tries + 1)); done
sleep 1
kill -INT $pid
wait $pid
code=$?
if [ $code -ne 130 ]; then echo "exit $code, expected 130"; cat "$out.stderr"; exit 1; fi
grep -q '^PARTIAL: stopped before every point ran' "$out/summary.txt" || { echo "summary not partial"; cat "$out/summary.txt"; exit 1; }
head -1 "$out/sweep.jsonl" | grep -q '"partial":true' || { echo "sweep.jsonl header not partial"; exit 1; }
grep -q 'name="partial"' "$out/junit.xml" || { echo "junit.xml not partial"; exit 1; }
# Every point line is complete JSON ending in "}" and points come in order.
lines=$(($(wc -l < "$out/sweep.jsonl") - 1))
[ $lines -ge 1 ] && [ $lines -lt 100001 ] || { echo "$lines points recorded"; exit 1; }
last=$(tail -1 "$out/sweep.jsonl" | sed 's/^{"point":\([0-9]*\),.*}$/\1/')
[ "$last" -ge 0 ] 2>/dev/null || { echo "last line is not a point record"; exit 1; }
echo "stopped after $lines points"
