#pragma once
// The one TOML reader behind every file Tickbench reads: scenario files (harness/run), their clock
// trees (sim/clock_tree_loader.cpp) and register layouts (models/layout). A file is parsed once;
// then each table is read key by key through a table_reader, and every mistake becomes a finding
// at file:line:column with its key path, so one run lists all of a file's mistakes. Because every
// loader reads through it, every message follows one scheme:
//     missing key "K"; accepted: WHAT                              (at the table, its path)
//     missing table [T]; accepted: WHAT                            (at the parent, T's path)
//     expected WHAT, got VALUE                                     (at the value)
//     unknown key "K" for A THING (did you mean "X"?); accepted: KEYS
//     unknown NOUN "N" (did you mean "X"?); accepted: one of NAMES (a name the file refers to)
// A loader adds its own findings (a rule between keys, a clock loop) with report().
//
// Includes toml++, a large header, because the reader's interface is made of its parsed nodes and
// their source positions; only loader sources include this header, and only the library that
// holds it (tickbench_scenario, sim/CMakeLists.txt) links toml++. Quantity parsing stays in the
// .cpp; sim/frequency.h is here for the frequency getters' return type.

#include "sim/frequency.h"
#include "sim/scenario_error.h"

#include <toml++/toml.h>

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace sim {

// What a time or a frequency may be written as, for messages.
extern const char* const time_words;
extern const char* const frequency_words;
// The rule is_plain_name() applies, for messages.
extern const char* const plain_name_words;

// Parses the TOML file at `path`; an unreadable file and TOML syntax become scenario_error. The
// last parse of each path is reused while the file's text is unchanged.
toml::table read_toml_file(const std::string& path);
// The whole text of the file at `path`; an unreadable file (or a folder) becomes scenario_error.
std::string read_text_file(const std::string& path);
// Parses TOML text; `file` is the name used in messages.
toml::table read_toml_text(std::string_view text, const std::string& file);

// Whether `name` is a letter followed by letters, digits, "_" or "-" (clock and timer names).
bool is_plain_name(const std::string& name);

// `name` refers to none of `known`: "unknown NOUN "NAME" (did you mean "X"?); accepted: one of
// K1, K2" (or "accepted: NONE" when `known` is empty).
std::string unknown_name(const std::string& noun, const std::string& name,
                         const std::vector<std::string>& known, const std::string& none = "none");

// The findings of one file, raised together in file order.
class findings_list {
public:
    explicit findings_list(std::string file) : file_(std::move(file)) {}
    // The file's name as messages show it.
    const std::string& file() const { return file_; }
    // A finding at `where` under key path `key` (empty for the whole file).
    void add(const toml::source_region& where, std::string key, std::string message);
    // Findings of this file raised by another reader (the clock tree's, within a scenario).
    void add_own(const std::vector<scenario_finding>& f);
    // Findings of another file (a timer's register layout), kept after this file's own.
    void add_foreign(const std::vector<scenario_finding>& f);
    bool empty() const { return own_.empty() && foreign_.empty(); }
    // How many findings so far (a reader compares counts to know whether a table read cleanly).
    std::size_t count() const { return own_.size() + foreign_.size(); }
    // Throws scenario_error with every finding, this file's in file order, then the others.
    void raise_if_any();

private:
    std::string file_;
    std::vector<scenario_finding> own_;
    std::vector<scenario_finding> foreign_;
};

// One NAME of a table of named tables such as [clocks.NAME].
struct named_table {
    std::string name;
    const toml::key* key = nullptr;
    const toml::node* node = nullptr;
    const toml::table* table = nullptr;  // null when the entry is no table (reported)
    bool name_ok = true;                 // false when the name breaks the rule (reported)
};

// Reads the keys of one table, each with its type and range. Every getter returns nothing both
// when the key is absent and when its value is wrong; a wrong value, and a missing key that is
// required, leave a finding.
class table_reader {
public:
    // `path` is the table's key path ("clocks.pll"; empty for the top level of the file).
    table_reader(findings_list& out, const toml::table& t, std::string path)
        : out_(out), t_(t), path_(std::move(path)) {}

    const toml::table& table() const { return t_; }
    const std::string& path() const { return path_; }
    findings_list& findings() const { return out_; }
    // The key path of `key` in this table.
    std::string key_path(const std::string& key) const;
    bool has(const std::string& key) const { return t_.get(key) != nullptr; }

    // Reports the keys not in `allowed`; `what` names what the table describes ("a timer").
    void reject_unknown_keys(const std::vector<std::string>& allowed, const std::string& what);
    // The node under `key`, or null (with a finding when it is required).
    const toml::node* get(const std::string& key, bool required, const std::string& expected);
    // A finding at `n`, the value of `key`: "expected EXPECTED, got VALUE".
    void wrong(const toml::node& n, const std::string& key, const std::string& expected);
    // A finding with `message` at `key`'s value (at the table when `key` is absent or empty).
    void report(const std::string& key, const std::string& message);
    // A finding with `message` at `n`, under the key path of `key`.
    void report(const toml::node& n, const std::string& key, const std::string& message);

    // The table under `key`, or null (with a finding when it is something else, or when it is
    // required and absent); `accepted` says what belongs in it.
    const toml::table* sub_table(const std::string& key, bool required,
                                 const std::string& accepted);
    // The entries of this table read as a table of named tables, each describing a `noun`, in
    // file order. Names `valid` refuses (with `rule` saying what it accepts) and entries that are
    // no table are reported.
    std::vector<named_table> named_tables(const std::string& noun,
                                          bool (*valid)(const std::string&),
                                          const std::string& rule);

    // A whole number from `lo` to `hi`; `expected` replaces the range in messages.
    std::optional<std::int64_t> integer(const std::string& key, std::int64_t lo, std::int64_t hi,
                                        bool required = false, const std::string& expected = "");
    std::optional<bool> boolean(const std::string& key);
    // A string that is not empty.
    std::optional<std::string> string(const std::string& key, bool required,
                                      const std::string& expected);
    // A string that must be one of `choices` (a misspelling gets a hint).
    std::optional<std::string> choice(const std::string& key,
                                      const std::vector<std::string>& choices,
                                      bool required = false);
    // A time in picoseconds ("200 us").
    std::optional<std::uint64_t> time(const std::string& key, bool required = false);
    // A time above 0 ps.
    std::optional<std::uint64_t> positive_time(const std::string& key, bool required = false);
    // A time from the node `n` found under `key`.
    std::optional<std::uint64_t> time_of(const toml::node& n, const std::string& key);
    // A frequency ("8 MHz", or a whole number of hertz).
    std::optional<frequency> frequency_at(const std::string& key, bool required = false);
    // A frequency from the node `n` found under `key`.
    std::optional<frequency> frequency_of(const toml::node& n, const std::string& key);
    // A signed quantity string read by `parse` (parse_ppb, parse_ppb_per_c2), within [lo, hi];
    // `expected` says what is accepted.
    std::optional<std::int64_t> signed_quantity(const std::string& key,
                                                std::int64_t (*parse)(std::string_view),
                                                std::int64_t lo, std::int64_t hi,
                                                const std::string& expected);

private:
    findings_list& out_;
    const toml::table& t_;
    std::string path_;
};

}  // namespace sim
