# Shared steps of scripts/demo and scripts/test: install the missing Debian packages, configure a
# build folder once, build it on every core. Sourced, not run; the caller sets `set -euo pipefail`.

# The Debian packages the project needs to build and test, in one place.
tickbench_packages=(
    build-essential
    cmake
    pkg-config
    libsystemc-dev
    libspdlog-dev
    libfmt-dev
    libgtest-dev
    libgmock-dev
    googletest
    libbenchmark-dev
    nlohmann-json3-dev
    libtomlplusplus-dev
    libcli11-dev
    libxml2-utils
    # the formatting check of .ci/run (scripts/format --check)
    clang-format
    # x86-64 instruction decoder of the trap engine (harness/trap/)
    libzydis-dev
    # outside tools the waveform tests check our VCD files with (tests/waves/)
    gtkwave
    sigrok-cli
    # headless browser the failure report test renders report.html with, and the interpreter of
    # that test's script (tests/report/)
    chromium
    python3
    # a one-node batch scheduler for the job-array test of `tickbench sweep` (tests/sweep/)
    slurm-wlm
    munge
)

tickbench_root="$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)"
tickbench_jobs="$(nproc 2>/dev/null || echo 2)"

tb_say() { printf '==> %s\n' "$*"; }

# Installs the packages of tickbench_packages that are not installed, and only those. As root it
# runs apt-get; otherwise it prints the command to run and exits 1.
tb_install_missing_packages() {
    local missing=() p
    for p in "${tickbench_packages[@]}"; do
        if [[ "$(dpkg-query -W -f='${Status}' "$p" 2>/dev/null || true)" != "install ok installed" ]]; then
            missing+=("$p")
        fi
    done
    if ((${#missing[@]} == 0)); then
        tb_say "Debian packages: all ${#tickbench_packages[@]} installed"
        return 0
    fi
    if [[ "$(id -u)" != 0 ]]; then
        echo "Missing Debian packages: ${missing[*]}" >&2
        echo "Install them with:" >&2
        echo "  sudo apt-get install -y --no-install-recommends ${missing[*]}" >&2
        exit 1
    fi
    tb_say "installing missing Debian packages: ${missing[*]}"
    export DEBIAN_FRONTEND=noninteractive
    apt-get update
    apt-get install -y --no-install-recommends "${missing[@]}"
}

# tb_configure DIR [CMAKE_ARGS...]: configures DIR unless it already is, with the same arguments.
# Cache values stick: a later call without arguments keeps what DIR was configured with.
tb_configure() {
    local dir="$1"
    shift
    local stamp="$dir/tickbench-configure-args.txt"
    local args="$*"
    if [[ -f "$dir/CMakeCache.txt" && ( -f "$dir/Makefile" || -f "$dir/build.ninja" ) ]]; then
        if [[ -z "$args" || ( -f "$stamp" && "$(cat "$stamp")" == "$args" ) ]]; then
            return 0
        fi
    fi
    tb_say "configuring $dir${args:+ with $args}"
    cmake -S "$tickbench_root" -B "$dir" "$@"
    printf '%s' "$args" >"$dir/tickbench-configure-args.txt"
}

# tb_build DIR [TARGET...]: builds DIR (everything, or the targets named) on every core.
tb_build() {
    local dir="$1"
    shift
    local targets=()
    (($# > 0)) && targets=(--target "$@")
    tb_say "building $dir on $tickbench_jobs cores"
    cmake --build "$dir" --parallel "$tickbench_jobs" "${targets[@]}"
}

# Extra CMake arguments from the environment (e.g. TICKBENCH_CMAKE_ARGS=-DTICKBENCH_WERROR=ON),
# split on white space.
tb_env_cmake_args() {
    tickbench_cmake_args=()
    if [[ -n "${TICKBENCH_CMAKE_ARGS:-}" ]]; then
        read -r -a tickbench_cmake_args <<<"$TICKBENCH_CMAKE_ARGS"
    fi
}
