#pragma once

// Decodes the x86-64 instruction that faulted on a trapped page and emulates it: turns it into
// peripheral accesses, then writes the results into the interrupted thread's saved registers
// and flags and steps over it. Internal to the trap engine; the decoder library stays behind
// this header.

#include "harness/trap/access.h"

#include <ucontext.h>

#include <cstdint>
#include <string>

namespace harness::detail {

// Where the emulator sends the accesses it makes.
class access_port {
public:
    virtual ~access_port() = default;
    // Performs `a` on the region that holds all its bytes. Returns an empty string on success,
    // or why the access could not be made (outside any region, across a region's end).
    virtual std::string perform(access& a) = 0;
};

// How an emulation ended.
struct emulation_result {
    // True when the instruction was completed and the saved instruction pointer advanced.
    bool completed = false;
    // When not completed: one line saying why, naming the instruction text and addresses.
    std::string error;
    // The data address the instruction was decoded to access (0 if not decoded that far).
    std::uint64_t data_address = 0;
};

// Emulates the instruction at the saved RIP of `context`, which faulted on `fault_address`,
// through `port`. On failure the context is left unchanged except for accesses already made.
emulation_result emulate_instruction(mcontext_t& context, std::uint64_t fault_address,
                                     access_port& port);

// The instruction at `address` in Intel syntax ("movdqu xmm0, xmmword ptr [rax]"), or
// "(undecodable)".
std::string format_instruction(std::uint64_t address);

}  // namespace harness::detail
