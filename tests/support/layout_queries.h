#pragma once
// What tests ask of a loaded register layout and of the documents that describe it: where a
// register sits, which bits a plain field covers, and a file's text. Tests that compare a layout
// with a firmware header or with the docs (tests/bus/demo_encoding_test.cpp, sample_part_test.cpp)
// share them.

#include "models/layout/register_layout.h"

#include <cstdint>
#include <fstream>
#include <sstream>
#include <string>
#include <string_view>

namespace tickbench::test_support {

// The whole text of the file at `path` ("" when it cannot be read).
inline std::string read_file(const std::string& path) {
    std::ifstream in(path);
    std::stringstream all;
    all << in.rdbuf();
    return all.str();
}

// The register-bit mask of plain field f (channel c) in register `reg` of the layout; 0 if absent.
inline std::uint32_t mask_of(const models::register_layout& l, const char* reg,
                             models::timer_field f, unsigned c = 0) {
    const models::register_map* r = l.find(std::string_view(reg));
    if (r == nullptr) return 0;
    for (const auto& fm : r->fields)
        if (!fm.coded() && fm.field == f && fm.channel == c) return fm.register_mask();
    return 0;
}

// The offset of register `reg`; 0xffffffff when the layout has none of that name.
inline std::uint32_t offset_of(const models::register_layout& l, const char* reg) {
    const models::register_map* r = l.find(std::string_view(reg));
    return r == nullptr ? 0xffff'ffffu : r->offset;
}

}  // namespace tickbench::test_support
