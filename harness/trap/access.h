#pragma once

// One load or store by firmware code on a trapped peripheral page, as the trap engine hands it
// to the region's access callback. The engine decodes the faulting instruction, splits it into
// these accesses (a read-modify-write instruction becomes a read and then a write of the same
// width) and completes the instruction with what the callback returns.

#include <cstdint>
#include <functional>

namespace harness {

// A single bus access made by a trapped instruction.
struct access {
    // Data address of the access (the first byte), at the peripheral's real address.
    std::uint64_t address = 0;
    // Width in bytes: 1, 2, 4 or 8.
    unsigned width = 0;
    // True for a store, false for a load.
    bool is_write = false;
    // For a write, the value stored; for a read, the callback sets it. Only the low `width`
    // bytes are significant; the engine ignores the rest.
    std::uint64_t value = 0;
    // Address of the firmware instruction that made the access.
    std::uint64_t instruction_address = 0;
};

// Serves one access on a mapped region. Runs inside the fault handler, on the faulting thread,
// so it must not throw and must not touch a trapped page itself.
using access_handler = std::function<void(access& a)>;

}  // namespace harness
