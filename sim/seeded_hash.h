#pragma once
// The seeded draws behind every pseudo-random choice of a run (crystal jitter, square wave jitter,
// random glitches). A draw is a pure function of (seed, index), never of a generator's history, so
// edge k of a source has the same displacement however the run got there: runs repeat exactly, and
// a source can be asked about any edge in any order.

#include <cstdint>

namespace sim {

// splitmix64: a fast, well-mixed 64-bit hash.
inline std::uint64_t mix64(std::uint64_t x) {
    x += 0x9e3779b97f4a7c15ULL;
    x = (x ^ (x >> 30)) * 0xbf58476d1ce4e5b9ULL;
    x = (x ^ (x >> 27)) * 0x94d049bb133111ebULL;
    return x ^ (x >> 31);
}

// The draw of item `index` under `seed`: 64 well-mixed bits.
inline std::uint64_t seeded_draw(std::uint64_t seed, std::uint64_t index) {
    return mix64(seed ^ mix64(index));
}

}  // namespace sim
