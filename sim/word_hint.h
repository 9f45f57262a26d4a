#pragma once
// "Did you mean" hints for misspelt names, shared by every reader of user input (the TOML loaders
// and the command line): a distance between words that counts two swapped letters as one slip,
// the closest candidate within a few slips, and lists joined for messages. Cheap to include.

#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

namespace sim {

// `text` in double quotes.
std::string in_quotes(std::string_view text);
// Edits (insert, delete, replace a letter, swap two neighbours) from one word to the other.
std::size_t edit_distance(const std::string& a, const std::string& b);
// " (did you mean "x"?)" when one candidate is close to `s` (one edit on words of up to 4
// letters, two up to 12, three beyond), else "".
std::string hint(const std::string& s, const std::vector<std::string>& candidates);
// The words joined by `separator`.
std::string join(const std::vector<std::string>& words, const std::string& separator = ", ");

}  // namespace sim
