#pragma once
// 128-bit integers for exact time arithmetic. GCC and Clang provide them as an extension on 64-bit
// hosts; `__extension__` keeps -Wpedantic quiet about that one deliberate use.

namespace sim {
__extension__ typedef unsigned __int128 u128;
__extension__ typedef __int128 i128;
}  // namespace sim
