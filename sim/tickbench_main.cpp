// Entry point of the `tickbench` command; everything else lives in sim/cli/.

#include "sim/cli/commands.h"

int main(int argc, char** argv) { return sim::cli::run(argc, argv); }
