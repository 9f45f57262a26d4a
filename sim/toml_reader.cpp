// The TOML reader every loader builds on; see toml_reader.h.

#include "sim/toml_reader.h"

#include "sim/quantity.h"
#include "sim/toml_text.h"

#include <algorithm>
#include <cctype>
#include <cerrno>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <map>
#include <sstream>
#include <tuple>

namespace sim {

namespace {

// The quantity string at `n`, the value of `key`, read by `parse`; nothing (with a finding) when
// it is no string or `parse` refuses it, whose message says why and what it accepts.
template <typename T, typename Parse>
std::optional<T> read_quantity(table_reader& r, const toml::node& n, const std::string& key,
                               const std::string& expected, Parse parse) {
    if (!n.is_string()) {
        r.wrong(n, key, expected);
        return std::nullopt;
    }
    try {
        return parse(n.as_string()->get());
    } catch (const quantity_error& e) {
        r.report(n, key, e.what());
        return std::nullopt;
    }
}

}  // namespace

const char* const time_words = "a time such as \"200 us\" (units ps, ns, us, \xC2\xB5s, ms, s)";
const char* const frequency_words =
    "a frequency such as \"8 MHz\" (units Hz, kHz, MHz, GHz) or a whole number of hertz";
const char* const plain_name_words = "a letter followed by letters, digits, \"_\" or \"-\"";

toml::table read_toml_text(std::string_view text, const std::string& file) {
    try {
        return toml::parse(text, file);
    } catch (const toml::parse_error& e) {
        const auto& b = e.source().begin;
        throw scenario_error(scenario_finding{file, b.line, b.column, "",
                                              "TOML syntax: " + std::string(e.description())});
    }
}

std::string read_text_file(const std::string& path) {
    auto fail = [&path](const std::string& why) {
        return scenario_error(scenario_finding{path, 0, 0, "", "cannot read the file: " + why});
    };
    std::error_code ec;
    if (std::filesystem::is_directory(path, ec))
        throw fail("it is a directory; accepted: a TOML file");
    errno = 0;
    std::ifstream in(path, std::ios::binary);
    if (!in) throw fail(errno ? std::strerror(errno) : "cannot open it");
    std::ostringstream text;
    text << in.rdbuf();
    if (in.bad()) throw fail(errno ? std::strerror(errno) : "read error");
    return text.str();
}

toml::table read_toml_file(const std::string& path) {
    // A sweep reads the same files once per point: the last parse of each file is kept and handed
    // out again while the file's text is the same, which is what the parse depends on.
    static std::map<std::string, std::pair<std::string, toml::table>> parsed;
    std::string text = read_text_file(path);
    const auto it = parsed.find(path);
    if (it != parsed.end() && it->second.first == text) return it->second.second;
    toml::table table = read_toml_text(text, path);
    parsed[path] = {std::move(text), table};
    return table;
}

bool is_plain_name(const std::string& name) {
    if (name.empty() || !std::isalpha(static_cast<unsigned char>(name[0]))) return false;
    return std::all_of(name.begin(), name.end(), [](char c) {
        return std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '-';
    });
}

std::string unknown_name(const std::string& noun, const std::string& name,
                         const std::vector<std::string>& known, const std::string& none) {
    return "unknown " + noun + " " + in_quotes(name) + hint(name, known) +
           "; accepted: " + (known.empty() ? none : "one of " + join(known));
}

// ---- findings_list -------------------------------------------------------------------------

void findings_list::add(const toml::source_region& where, std::string key, std::string message) {
    own_.push_back(
        {file_, where.begin.line, where.begin.column, std::move(key), std::move(message)});
}

void findings_list::add_own(const std::vector<scenario_finding>& f) {
    own_.insert(own_.end(), f.begin(), f.end());
}

void findings_list::add_foreign(const std::vector<scenario_finding>& f) {
    foreign_.insert(foreign_.end(), f.begin(), f.end());
}

void findings_list::raise_if_any() {
    if (empty()) return;
    std::vector<scenario_finding> all = own_;
    std::stable_sort(all.begin(), all.end(),
                     [](const scenario_finding& a, const scenario_finding& b) {
                         return std::tie(a.line, a.column) < std::tie(b.line, b.column);
                     });
    all.insert(all.end(), foreign_.begin(), foreign_.end());
    throw scenario_error(all);
}

// ---- table_reader --------------------------------------------------------------------------

std::string table_reader::key_path(const std::string& key) const {
    return path_.empty() ? key : path_ + "." + key;
}

void table_reader::reject_unknown_keys(const std::vector<std::string>& allowed,
                                       const std::string& what) {
    for (auto&& [k, v] : t_) {
        (void)v;
        const std::string key(k.str());
        if (std::find(allowed.begin(), allowed.end(), key) != allowed.end()) continue;
        out_.add(k.source(), key_path(key),
                 "unknown key " + in_quotes(key) + " for " + what + hint(key, allowed) +
                     "; accepted: " + join(allowed));
    }
}

const toml::node* table_reader::get(const std::string& key, bool required,
                                    const std::string& expected) {
    const toml::node* n = t_.get(key);
    if (!n && required)
        out_.add(t_.source(), path_, "missing key " + in_quotes(key) + "; accepted: " + expected);
    return n;
}

void table_reader::wrong(const toml::node& n, const std::string& key, const std::string& expected) {
    out_.add(n.source(), key_path(key), "expected " + expected + ", got " + got(n));
}

void table_reader::report(const std::string& key, const std::string& message) {
    const toml::node* n = key.empty() ? nullptr : t_.get(key);
    out_.add(n ? n->source() : t_.source(), n ? key_path(key) : path_, message);
}

void table_reader::report(const toml::node& n, const std::string& key, const std::string& message) {
    out_.add(n.source(), key_path(key), message);
}

const toml::table* table_reader::sub_table(const std::string& key, bool required,
                                           const std::string& accepted) {
    const toml::node* n = t_.get(key);
    if (!n) {
        if (required)
            out_.add(t_.source(), key_path(key),
                     "missing table [" + key_path(key) + "]; accepted: " + accepted);
        return nullptr;
    }
    if (!n->is_table()) {
        out_.add(
            n->source(), key_path(key),
            "expected a table [" + key_path(key) + "], got " + got(*n) + "; accepted: " + accepted);
        return nullptr;
    }
    return n->as_table();
}

std::vector<named_table> table_reader::named_tables(const std::string& noun,
                                                    bool (*valid)(const std::string&),
                                                    const std::string& rule) {
    std::vector<named_table> entries;
    for (auto&& [k, v] : t_) entries.push_back({std::string(k.str()), &k, &v, v.as_table(), true});
    // toml++ keeps keys by name; messages and the order of what is built follow the file.
    std::stable_sort(entries.begin(), entries.end(), [](const auto& a, const auto& b) {
        const auto& pa = a.key->source().begin;
        const auto& pb = b.key->source().begin;
        return std::tie(pa.line, pa.column) < std::tie(pb.line, pb.column);
    });
    for (named_table& e : entries) {
        if (!valid(e.name)) {
            e.name_ok = false;
            out_.add(e.key->source(), key_path(in_quotes(e.name)),
                     noun + " name " + in_quotes(e.name) + " is not accepted; accepted: " + rule);
        } else if (!e.table) {
            out_.add(e.node->source(), key_path(e.name),
                     "expected a table [" + key_path(e.name) + "] describing a " + noun + ", got " +
                         got(*e.node));
        }
    }
    return entries;
}

std::optional<std::int64_t> table_reader::integer(const std::string& key, std::int64_t lo,
                                                  std::int64_t hi, bool required,
                                                  const std::string& expected) {
    const std::string accepted =
        expected.empty() ? "a whole number from " + std::to_string(lo) + " to " + std::to_string(hi)
                         : expected;
    const toml::node* n = get(key, required, accepted);
    if (!n) return std::nullopt;
    const auto* v = n->as_integer();
    if (!v || v->get() < lo || v->get() > hi) {
        wrong(*n, key, accepted);
        return std::nullopt;
    }
    return v->get();
}

std::optional<bool> table_reader::boolean(const std::string& key) {
    const toml::node* n = get(key, false, "true or false");
    if (!n) return std::nullopt;
    if (!n->is_boolean()) {
        wrong(*n, key, "true or false");
        return std::nullopt;
    }
    return n->as_boolean()->get();
}

std::optional<std::string> table_reader::string(const std::string& key, bool required,
                                                const std::string& expected) {
    const toml::node* n = get(key, required, expected);
    if (!n) return std::nullopt;
    if (!n->is_string() || n->as_string()->get().empty()) {
        wrong(*n, key, expected);
        return std::nullopt;
    }
    return n->as_string()->get();
}

std::optional<std::string> table_reader::choice(const std::string& key,
                                                const std::vector<std::string>& choices,
                                                bool required) {
    std::vector<std::string> quoted;
    for (const auto& c : choices) quoted.push_back(in_quotes(c));
    const std::string expected = choices.size() == 1 ? quoted[0] : "one of " + join(quoted);
    const toml::node* n = get(key, required, expected);
    if (!n) return std::nullopt;
    const std::string text = n->is_string() ? n->as_string()->get() : "";
    if (std::find(choices.begin(), choices.end(), text) == choices.end()) {
        out_.add(n->source(), key_path(key),
                 "expected " + expected + ", got " + got(*n) +
                     (text.empty() ? "" : hint(text, choices)));
        return std::nullopt;
    }
    return text;
}

std::optional<std::uint64_t> table_reader::time_of(const toml::node& n, const std::string& key) {
    return read_quantity<std::uint64_t>(*this, n, key, time_words, parse_time);
}

std::optional<std::uint64_t> table_reader::time(const std::string& key, bool required) {
    const toml::node* n = get(key, required, time_words);
    return n ? time_of(*n, key) : std::nullopt;
}

std::optional<std::uint64_t> table_reader::positive_time(const std::string& key, bool required) {
    const auto t = time(key, required);
    if (t && *t == 0) {
        wrong(*t_.get(key), key, "a time above 0 ps");
        return std::nullopt;
    }
    return t;
}

std::optional<frequency> table_reader::frequency_of(const toml::node& n, const std::string& key) {
    if (const auto* i = n.as_integer()) {
        if (i->get() >= 0) return frequency::hz(static_cast<std::uint64_t>(i->get()));
        wrong(n, key, frequency_words);
        return std::nullopt;
    }
    return read_quantity<frequency>(*this, n, key, frequency_words, parse_frequency);
}

std::optional<frequency> table_reader::frequency_at(const std::string& key, bool required) {
    const toml::node* n = get(key, required, frequency_words);
    return n ? frequency_of(*n, key) : std::nullopt;
}

std::optional<std::int64_t> table_reader::signed_quantity(const std::string& key,
                                                          std::int64_t (*parse)(std::string_view),
                                                          std::int64_t lo, std::int64_t hi,
                                                          const std::string& expected) {
    const toml::node* n = get(key, false, expected);
    if (!n) return std::nullopt;
    const auto v = read_quantity<std::int64_t>(*this, *n, key, expected, parse);
    if (v && (*v < lo || *v > hi)) {
        wrong(*n, key, expected);
        return std::nullopt;
    }
    return v;
}

}  // namespace sim
