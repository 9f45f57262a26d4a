// Table reading helpers of the scenario loader; see toml_reader.h.

#include "harness/run/detail/toml_reader.h"

#include "sim/quantity.h"

#include <algorithm>
#include <sstream>
#include <tuple>

namespace harness::run::detail {

const char* const time_words = "a time such as \"200 us\" (units ps, ns, us, \xC2\xB5s, ms, s)";
const char* const frequency_words =
    "a frequency such as \"8 MHz\" (units Hz, kHz, MHz, GHz) or a whole number of hertz";

void findings_list::raise_if_any() {
    if (empty()) return;
    std::stable_sort(list_.begin(), list_.end(),
                     [](const sim::scenario_finding& a, const sim::scenario_finding& b) {
                         return std::tie(a.line, a.column) < std::tie(b.line, b.column);
                     });
    std::vector<sim::scenario_finding> all = list_;
    all.insert(all.end(), foreign_.begin(), foreign_.end());
    throw sim::scenario_error(all);
}

void table_reader::reject_unknown_keys(const std::vector<std::string>& allowed,
                                       const std::string& what) {
    for (auto&& [k, v] : t_) {
        (void)v;
        const std::string key(k.str());
        if (std::find(allowed.begin(), allowed.end(), key) != allowed.end()) continue;
        out_.add(k.source(), key_path(key),
                 "unknown key " + in_quotes(key) + " in " + what + hint(key, allowed) +
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

std::optional<std::int64_t> table_reader::integer(const std::string& key, std::int64_t lo,
                                                  std::int64_t hi, bool required) {
    const std::string expected =
        "a whole number from " + std::to_string(lo) + " to " + std::to_string(hi);
    const toml::node* n = get(key, required, expected);
    if (!n) return std::nullopt;
    const auto* v = n->as_integer();
    if (!v || v->get() < lo || v->get() > hi) {
        wrong(*n, key, expected);
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
                                                const std::vector<std::string>& choices) {
    std::vector<std::string> quoted;
    for (const auto& c : choices) quoted.push_back(in_quotes(c));
    const std::string expected = "one of " + join(quoted);
    const toml::node* n = get(key, false, expected);
    if (!n) return std::nullopt;
    const std::string text = n->is_string() ? n->as_string()->get() : "";
    if (std::find(choices.begin(), choices.end(), text) == choices.end()) {
        wrong(*n, key, expected + (text.empty() ? "" : hint(text, choices)));
        return std::nullopt;
    }
    return text;
}

std::optional<std::uint64_t> table_reader::time_of(const toml::node& n, const std::string& key) {
    if (!n.is_string()) {
        wrong(n, key, time_words);
        return std::nullopt;
    }
    try {
        return sim::parse_time(n.as_string()->get());
    } catch (const sim::quantity_error& e) {
        out_.add(n.source(), key_path(key), e.what());
        return std::nullopt;
    }
}

std::optional<std::uint64_t> table_reader::time(const std::string& key, bool required) {
    const toml::node* n = get(key, required, time_words);
    return n ? time_of(*n, key) : std::nullopt;
}

}  // namespace harness::run::detail
