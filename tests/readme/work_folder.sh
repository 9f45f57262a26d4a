# A scratch copy of the source tree for the tests of this folder, so that the commands they run
# write into it and never into the real tree. Sourced, not run.

# tb_make_work_folder SOURCE_DIR BUILD_DIR: creates a temporary folder holding a copy of the source
# tree (without .git, build folders and earlier outputs) and `build`, a link to BUILD_DIR, so that
# `build/...` in a command reaches the build under test. Sets work_folder; removed on exit.
tb_make_work_folder() {
    local src build entry name
    src="$(cd "$1" && pwd -P)"
    build="$(cd "$2" && pwd -P)"
    work_folder="$(mktemp -d "${TMPDIR:-/tmp}/tickbench-readme.XXXXXX")"
    trap 'rm -rf "$work_folder"' EXIT
    for entry in "$src"/*; do
        name="$(basename "$entry")"
        case "$name" in
            build | build-* | tickbench-out* | tickbench-sweep*) continue ;;
        esac
        [[ "$(cd "$entry" 2>/dev/null && pwd -P)" == "$build" ]] && continue
        cp -R "$entry" "$work_folder/"
    done
    ln -s "$build" "$work_folder/build"
}
