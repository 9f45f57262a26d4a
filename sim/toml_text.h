#pragma once
// Wording shared by the TOML reader (sim/toml_reader.h) and the loaders built on it: how a TOML
// value reads in a message, "did you mean" hints for misspelt keys and names, and lists.
// Includes toml++ for got()'s node: only file-reading sources include this header.

#include <toml++/toml.h>

#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

namespace sim {

// `text` in double quotes.
std::string in_quotes(std::string_view text);
// How a value reads in a message: strings quoted, numbers as written, containers by their kind.
std::string got(const toml::node& n);
// Levenshtein distance between two words.
std::size_t edit_distance(const std::string& a, const std::string& b);
// " (did you mean "x"?)" when one candidate is close to `s` (one edit on words of up to 4
// letters, two up to 12, three beyond), else "".
std::string hint(const std::string& s, const std::vector<std::string>& candidates);
// The words joined by `separator`.
std::string join(const std::vector<std::string>& words, const std::string& separator = ", ");

}  // namespace sim
