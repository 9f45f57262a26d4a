// libsystemc's main() refers to sc_main; run_tests has GoogleTest's main() and never calls it.
// C linkage, as libsystemc declares it.

extern "C" int sc_main(int, char*[]) { return 0; }
