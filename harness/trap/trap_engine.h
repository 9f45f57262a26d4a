#pragma once

// The trap engine lets unmodified driver code run on the host: it maps a part's peripheral address
// ranges at their real addresses with no access rights, and services every faulting load or store
// there by decoding the instruction, performing the access through the region's callback and
// completing the instruction in the interrupted thread's registers (docs/architecture.md, "Firmware
// on the host"; docs/firmware-api.md, "Unmodified drivers"). The same signal handlers catch the
// crashes that are not peripheral accesses and pass them to a crash hook. x86-64 Linux only. There
// is one engine per process, since signal dispositions are per process.

#include "harness/trap/access.h"
#include "harness/trap/crash_info.h"

#include <cstdint>
#include <stdexcept>
#include <string>

namespace harness {

// A region could not be mapped or unmapped; the message names the range and the reason.
class trap_error : public std::runtime_error {
public:
    using std::runtime_error::runtime_error;
};

class trap_engine;

// Ownership of one mapped region: unmaps it when destroyed. Move-only.
class mapped_region {
public:
    // An empty handle that owns nothing.
    mapped_region() = default;
    mapped_region(const mapped_region&) = delete;
    mapped_region& operator=(const mapped_region&) = delete;
    // Takes over the region of `other`, leaving it empty.
    mapped_region(mapped_region&& other) noexcept;
    // Unmaps the region held, then takes over the region of `other`.
    mapped_region& operator=(mapped_region&& other) noexcept;
    // Unmaps the region, if any.
    ~mapped_region();

    // Unmaps the region now; the handle becomes empty. Does nothing on an empty handle.
    void reset() noexcept;
    // True when the handle owns a mapped region.
    explicit operator bool() const noexcept { return id_ != 0; }

private:
    friend class trap_engine;
    explicit mapped_region(std::uint64_t id) noexcept : id_(id) {}
    std::uint64_t id_ = 0;
};

// The process-wide trap engine.
class trap_engine {
public:
    // The engine of this process, created on first use.
    static trap_engine& instance();

    trap_engine(const trap_engine&) = delete;
    trap_engine& operator=(const trap_engine&) = delete;

    // Maps [base, base + size) as a trapped region named `name` served by `on_access`, installing
    // the signal handlers if needed. Whole pages are mapped; regions may share a page but not
    // bytes. Throws trap_error naming the range when it overlaps another region, when size is
    // 0 or the range wraps, or when the pages cannot be mapped at that address (errno named).
    mapped_region map_region(std::string name, std::uint64_t base, std::uint64_t size,
                             access_handler on_access);

    // Sets the hook called on a fatal signal (replacing any earlier one) and installs the signal
    // handlers. If the hook returns, the engine restores the default action and re-raises, so the
    // process dies of the signal. Without a hook, the crash is written to stderr.
    void set_crash_hook(crash_hook hook);

    // Installs the handlers for SIGSEGV, SIGBUS, SIGFPE, SIGILL and SIGABRT, and an alternate
    // signal stack for the calling thread. Idempotent.
    void install();

    // Gives the calling thread an alternate signal stack if it has none, so that the handlers
    // still run after a stack overflow. Call it on every thread that runs firmware. The access
    // callbacks and the crash hook run on this stack: it is 256 KiB.
    static void ensure_alt_stack();

    // Number of trapped accesses served since the process started (for statistics and tests).
    std::uint64_t accesses_served() const noexcept;

private:
    friend class mapped_region;
    trap_engine();
    void unmap_region(std::uint64_t id) noexcept;
};

}  // namespace harness
