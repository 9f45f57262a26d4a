#pragma once
// 128-bit integers for exact time arithmetic. GCC and Clang provide them as an extension on 64-bit
// hosts; `__extension__` keeps -Wpedantic quiet about that one deliberate use.

#include <string>

namespace sim {
__extension__ typedef unsigned __int128 u128;
__extension__ typedef __int128 i128;

// Decimal digits of a 128-bit value (the standard library has no formatting for it).
std::string u128_text(u128 v);
}  // namespace sim
