#pragma once
// The error raised for anything wrong in a scenario file: TOML syntax, an unknown or misspelt key,
// a value of the wrong type or out of range, a missing key, or a clock rule broken by what the file
// describes. Each finding carries the file, line, column and key path it refers to and a message
// that says what would be accepted, so the user can go straight to the spot:
//     demo.toml:12:14: clocks.pll.multiplier: expected a whole number from 1 to 1000000, got "nine"
// One error may carry several findings; what() lists them one per line.

#include <cstdint>
#include <stdexcept>
#include <string>
#include <vector>

namespace sim {

// One finding in a scenario file. line and column count from 1; 0 means "the whole file".
struct scenario_finding {
    std::string file;
    std::uint32_t line = 0;
    std::uint32_t column = 0;
    std::string key;      // dotted key path such as "clocks.pll.multiplier"; may be empty
    std::string message;  // what was wrong and what would be accepted

    // "file:line:column: key: message" (parts that are unknown are left out).
    std::string text() const {
        std::string s = file;
        if (line != 0) s += ":" + std::to_string(line) + ":" + std::to_string(column);
        s += ": ";
        if (!key.empty()) s += key + ": ";
        return s + message;
    }
};

class scenario_error : public std::runtime_error {
public:
    // One error holding one or more findings (an empty list is given one that says so).
    explicit scenario_error(std::vector<scenario_finding> findings)
        : std::runtime_error(join(findings)), findings_(std::move(findings)) {
        if (findings_.empty()) findings_.push_back({"", 0, 0, "", "unknown scenario error"});
    }
    explicit scenario_error(scenario_finding finding)
        : scenario_error(std::vector<scenario_finding>{std::move(finding)}) {}

    // Every finding, in file order.
    const std::vector<scenario_finding>& findings() const { return findings_; }
    // The first finding's parts.
    const std::string& file() const { return findings_.front().file; }
    std::uint32_t line() const { return findings_.front().line; }
    std::uint32_t column() const { return findings_.front().column; }
    const std::string& key() const { return findings_.front().key; }
    const std::string& message() const { return findings_.front().message; }

private:
    static std::string join(const std::vector<scenario_finding>& findings) {
        std::string s;
        for (const auto& f : findings) s += (s.empty() ? "" : "\n") + f.text();
        return s.empty() ? "unknown scenario error" : s;
    }
    std::vector<scenario_finding> findings_;
};

}  // namespace sim
