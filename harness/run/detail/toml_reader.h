#pragma once
// Private to the scenario loader: a findings list for one file and a reader of one TOML table that
// checks each key's type and range and says what would be accepted. Same message style as the
// clock tree loader (sim/clock_tree_loader.cpp); the wording helpers both use are in
// sim/toml_text.h.

#include "sim/scenario_error.h"
#include "sim/toml_text.h"

#include <toml++/toml.h>

#include <cstdint>
#include <functional>
#include <optional>
#include <string>
#include <vector>

namespace harness::run::detail {

using sim::got;
using sim::hint;
using sim::in_quotes;
using sim::join;

// The findings of one file.
class findings_list {
public:
    explicit findings_list(std::string file) : file_(std::move(file)) {}
    void add(const toml::source_region& where, std::string key, std::string message) {
        list_.push_back(
            {file_, where.begin.line, where.begin.column, std::move(key), std::move(message)});
    }
    // Findings of another file (a register layout), kept after this file's own.
    void add_foreign(const std::vector<sim::scenario_finding>& f) {
        foreign_.insert(foreign_.end(), f.begin(), f.end());
    }
    // Findings of this file raised by another reader (the clock tree loader).
    void add_own(const std::vector<sim::scenario_finding>& f) {
        list_.insert(list_.end(), f.begin(), f.end());
    }
    bool empty() const { return list_.empty() && foreign_.empty(); }
    // Throws every finding, this file's in file order, then the others.
    void raise_if_any();

private:
    std::string file_;
    std::vector<sim::scenario_finding> list_;
    std::vector<sim::scenario_finding> foreign_;
};

// Reads the keys of one table, each with its type and range, reporting what is wrong. Every
// getter returns nothing both when the key is absent and when it is wrong (with a finding).
class table_reader {
public:
    table_reader(findings_list& out, const toml::table& t, std::string path)
        : out_(out), t_(t), path_(std::move(path)) {}

    const toml::table& table() const { return t_; }
    const std::string& path() const { return path_; }
    std::string key_path(const std::string& key) const { return path_ + "." + key; }
    bool has(const std::string& key) const { return t_.get(key) != nullptr; }

    // Reports keys not in `allowed`; `what` names the table for the message.
    void reject_unknown_keys(const std::vector<std::string>& allowed, const std::string& what);
    // The node under `key`, or null (and, when required, a finding saying what belongs there).
    const toml::node* get(const std::string& key, bool required, const std::string& expected);
    // A finding at `key`'s value: "expected EXPECTED, got VALUE".
    void wrong(const toml::node& n, const std::string& key, const std::string& expected);
    // A finding at `key` (or at the table when absent) with `message`.
    void report(const std::string& key, const std::string& message);

    std::optional<std::int64_t> integer(const std::string& key, std::int64_t lo, std::int64_t hi,
                                        bool required = false);
    std::optional<bool> boolean(const std::string& key);
    std::optional<std::string> string(const std::string& key, bool required,
                                      const std::string& expected);
    // A string that must be one of `choices`.
    std::optional<std::string> choice(const std::string& key,
                                      const std::vector<std::string>& choices);
    std::optional<std::uint64_t> time(const std::string& key, bool required = false);
    // A time from a string node already found.
    std::optional<std::uint64_t> time_of(const toml::node& n, const std::string& key);

private:
    findings_list& out_;
    const toml::table& t_;
    std::string path_;
};

extern const char* const time_words;
extern const char* const frequency_words;

}  // namespace harness::run::detail
