#!/usr/bin/env bash
# docs/firmware-api.md, "Worked example": builds the C block shown there and runs it with the
# scenario block shown there, so the example cannot drift from the layouts it writes to.
# Usage: worked_example_test.sh SOURCE_DIR BUILD_DIR
set -euo pipefail
source_dir="$1"
build_dir="$2"
work="$(mktemp -d)"
trap 'rm -rf "$work"' EXIT

python3 - "$source_dir/docs/firmware-api.md" "$work" <<'PY'
import re, sys
text = open(sys.argv[1]).read()
section = text[text.index("## Worked example"):]
section = section[:section.index("### Testing firmware with GoogleTest")]
blocks = re.findall(r"```(\w+)\n(.*?)```", section, re.S)
c = [b for lang, b in blocks if lang == "c"]
toml = [b for lang, b in blocks if lang == "toml"]
if len(c) != 1 or len(toml) != 1:
    sys.exit(f"expected one c and one toml block in the worked example, found {len(c)} and {len(toml)}")
open(sys.argv[2] + "/fw.c", "w").write(c[0])
open(sys.argv[2] + "/fan.toml", "w").write(toml[0].replace('"models/layouts/', f'"{sys.argv[2]}/layouts/'))
PY
ln -s "$source_dir/models/layouts" "$work/layouts"
cd "$work"
cc -fPIC -shared -I "$source_dir/harness/include" fw.c -o fw.so
status=0
"$build_dir/tickbench" run fan.toml --out out >run.txt 2>&1 || status=$?
cat run.txt
if ((status != 0)); then
    echo "worked example: tickbench run exited $status; the document says 0" >&2
    exit 1
fi
grep -q "3 checks: 3 passed, 0 failed" run.txt || { echo "worked example: not 3 passed checks" >&2; exit 1; }
grep -q "100 ticks, duty 40 %" out/firmware.log || { echo "worked example: the log line is missing" >&2; exit 1; }
