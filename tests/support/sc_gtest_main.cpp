// Entry point for test binaries that run a SystemC kernel: libsystemc owns main() and calls
// sc_main(), which runs the GoogleTest suite.

#include <gtest/gtest.h>
#include <systemc>

int sc_main(int argc, char* argv[]) {
    testing::InitGoogleTest(&argc, argv);
    return RUN_ALL_TESTS();
}
