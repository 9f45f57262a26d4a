// Entry point of the `tickbench` command; everything else lives beside it in harness/cli/.

#include "harness/cli/commands.h"

#include <cstdlib>

// libsystemc's own main() refers to sc_main; this program has its own main() and never calls it.
extern "C" int sc_main(int, char*[]) { return 0; }

int main(int argc, char** argv) {
    // stdout carries only the command's output: no kernel banner.
    setenv("SYSTEMC_DISABLE_COPYRIGHT_MESSAGE", "1", 1);
    return harness::cli::run(argc, argv);
}
