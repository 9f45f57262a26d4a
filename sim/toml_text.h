#pragma once
// Wording shared by the TOML reader (sim/toml_reader.h) and the loaders built on it: how a TOML
// value reads in a message, "did you mean" hints and lists
// (sim/word_hint.h).
// Includes toml++ for got()'s node: only file-reading sources include this header.

#include "sim/word_hint.h"

#include <toml++/toml.h>

#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

namespace sim {

// How a value reads in a message: strings quoted, numbers as written, containers by their kind.
std::string got(const toml::node& n);

}  // namespace sim
