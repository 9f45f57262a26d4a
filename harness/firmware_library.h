#pragma once
// Loads firmware built as a shared library and finds its entry point.
//
// Firmware is ordinary C or C++ compiled for the host with -fPIC -shared against
// <tickbench/firmware.h>; its tick_* calls resolve to the running tickbench process at load time.
// The documented entry is `void tick_firmware_main(void)` (docs/firmware-api.md).
//
// The first load of a library in a process keeps a copy of its writable data (initialised data and
// zeroed data, as the library's constructors left them); restore_data() puts that copy back, so a
// process that runs the firmware several times (a sweep's points) starts each run from the state
// a fresh process would have. State the firmware keeps elsewhere (heap blocks, the C library's
// own state, thread-local data) is not covered.

#include <stdexcept>
#include <string>

namespace harness {

// A firmware library that cannot be loaded or has no entry point. The command maps it to exit
// code 2 (bad input).
class firmware_load_error : public std::runtime_error {
public:
    using std::runtime_error::runtime_error;
};

class firmware_library {
public:
    // Opens `path` (RTLD_NOW: every symbol resolved now, so a missing one is an error here, not a
    // crash mid-run) and finds `entry`. Throws firmware_load_error naming the file and the loader's
    // own message.
    explicit firmware_library(const std::string& path,
                              const std::string& entry = "tick_firmware_main");
    ~firmware_library();
    firmware_library(const firmware_library&) = delete;
    firmware_library& operator=(const firmware_library&) = delete;

    // The entry point.
    void (*entry() const)() { return entry_; }
    // Address of a data or function symbol of the library, or null.
    void* symbol(const std::string& name) const;
    const std::string& path() const { return path_; }
    // Puts the library's writable data back as it was when the process first loaded it.
    void restore_data() const;

private:
    std::string path_;
    void* handle_ = nullptr;
    void (*entry_)() = nullptr;
};

}  // namespace harness
