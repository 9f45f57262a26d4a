#pragma once

// A fake peripheral for the trap engine tests: 256 bytes of little-endian registers mapped at a
// typical peripheral address, recording every access the engine hands it.

#include "harness/trap/trap_engine.h"

#include <cstdint>
#include <cstring>
#include <functional>
#include <ostream>
#include <string>
#include <vector>

namespace trap_test {

// Where the fake peripheral lives: the first of the demo part's peripheral slots (a demo value,
// examples/parts/demo_part.toml).
constexpr std::uint64_t peripheral_base = 0x5000'0000;
constexpr std::uint64_t peripheral_size = 0x100;

// One access as the fake peripheral saw it, with the address as an offset into the block.
struct access_record {
    std::uint64_t offset = 0;
    unsigned width = 0;
    bool is_write = false;
    std::uint64_t value = 0;

    bool operator==(const access_record& o) const {
        return offset == o.offset && width == o.width && is_write == o.is_write && value == o.value;
    }
};

// How GoogleTest prints a record in a failure message.
inline void PrintTo(const access_record& r, std::ostream* os) {
    *os << (r.is_write ? "write" : "read") << r.width * 8 << "@0x" << std::hex << r.offset << "=0x"
        << r.value << std::dec;
}

// Registers as plain bytes, served through a mapped region while `map()`ped.
class fake_peripheral {
public:
    // Maps the block at peripheral_base (plus `offset`, for a second block) under `name`.
    void map(const std::string& name = "fake", std::uint64_t offset = 0) {
        base_ = peripheral_base + offset;
        region_ = harness::trap_engine::instance().map_region(
            name, base_, peripheral_size, [this](harness::access& a) { serve(a); });
    }
    // Unmaps the block.
    void unmap() { region_.reset(); }

    // Reads the register of type T at `offset` directly, bypassing the engine.
    template <typename T>
    T get(std::uint64_t offset) const {
        T v;
        std::memcpy(&v, bytes_ + offset, sizeof v);
        return v;
    }
    // Sets the register of type T at `offset` directly, bypassing the engine.
    template <typename T>
    void set(std::uint64_t offset, T v) {
        std::memcpy(bytes_ + offset, &v, sizeof v);
    }
    // Fills the whole block with `byte`.
    void fill(std::uint8_t byte) { std::memset(bytes_, byte, sizeof bytes_); }

    // The accesses served since the last clear, in order (unless recording is off).
    std::vector<access_record> log;
    // False to serve accesses without recording them (for timing).
    bool recording = true;
    // Called after each access is served, to model registers that change as they are read.
    std::function<void(fake_peripheral&, const access_record&)> after_access;

private:
    void serve(harness::access& a) {
        const std::uint64_t offset = a.address - base_;
        if (a.is_write) {
            std::memcpy(bytes_ + offset, &a.value, a.width);  // little-endian host
        } else {
            a.value = 0;
            std::memcpy(&a.value, bytes_ + offset, a.width);
        }
        const access_record record{offset, a.width, a.is_write, a.value};
        if (recording) log.push_back(record);
        if (after_access) after_access(*this, record);
    }

    std::uint8_t bytes_[peripheral_size] = {};
    std::uint64_t base_ = peripheral_base;
    harness::mapped_region region_;
};

}  // namespace trap_test
