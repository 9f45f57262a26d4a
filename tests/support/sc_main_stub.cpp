// For test binaries whose main() is GoogleTest's but which link libsystemc (through the models):
// the shared library's own main() refers to sc_main, and sanitizer builds link without
// --as-needed, so the reference must resolve. It is never called.

extern "C" int sc_main(int, char*[]) { return 0; }
