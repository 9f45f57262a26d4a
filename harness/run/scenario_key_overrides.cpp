// Scenario keys replaced by dotted path; see scenario_key_overrides.h.

#include "harness/run/scenario_key_overrides.h"

#include "sim/scenario_error.h"

#include <cstdint>

namespace harness::run {

namespace {

std::vector<std::string> split_path(const std::string& path) {
    std::vector<std::string> parts;
    std::size_t start = 0;
    while (true) {
        const auto dot = path.find('.', start);
        parts.push_back(path.substr(start, dot == std::string::npos ? dot : dot - start));
        if (dot == std::string::npos) return parts;
        start = dot + 1;
    }
}

std::string existing_keys(const toml::table& t) {
    std::string out;
    for (auto&& [k, v] : t) {
        (void)v;
        out += (out.empty() ? "" : ", ") + std::string(k.str());
    }
    return out.empty() ? "none" : out;
}

// Inserts `text` at `key` of `table`: an integer, float or boolean when it reads as one in TOML,
// a string otherwise (and always when `keep_string`). The new node has no source position, so the
// loader's findings about it name the file and key without a line.
void insert_value(toml::table& table, const std::string& key, const std::string& text,
                  bool keep_string) {
    if (!keep_string) {
        try {
            const toml::table t = toml::parse("v = " + text);
            if (t.size() == 1) {
                if (const auto i = t["v"].value_exact<std::int64_t>()) {
                    table.insert_or_assign(key, *i);
                    return;
                }
                if (const auto b = t["v"].value_exact<bool>()) {
                    table.insert_or_assign(key, *b);
                    return;
                }
                if (const auto d = t["v"].value_exact<double>()) {
                    table.insert_or_assign(key, *d);
                    return;
                }
                if (const auto s = t["v"].value_exact<std::string>()) {
                    table.insert_or_assign(key, *s);
                    return;
                }
            }
        } catch (const toml::parse_error&) {
        }
    }
    table.insert_or_assign(key, text);
}

}  // namespace

void apply_key_overrides(toml::table& root,
                         const std::vector<std::pair<std::string, std::string>>& keys,
                         const std::string& file) {
    for (const auto& [path, value] : keys) {
        const std::vector<std::string> parts = split_path(path);
        toml::table* table = &root;
        std::string walked;
        for (std::size_t i = 0; i + 1 < parts.size(); ++i) {
            toml::node* next = table->get(parts[i]);
            const std::string here =
                walked.empty() ? std::string("the scenario") : "[" + walked + "]";
            if (next == nullptr || !next->is_table())
                throw sim::scenario_error(sim::scenario_finding{
                    file, 0, 0, path,
                    (next == nullptr ? here + " has no table \"" + parts[i] + "\""
                                     : "\"" + parts[i] + "\" in " + here + " is not a table") +
                        " (the sweep axis " + path + "); keys in " + here + ": " +
                        existing_keys(*table)});
            walked += (walked.empty() ? "" : ".") + parts[i];
            table = next->as_table();
        }
        const toml::node* old = table->get(parts.back());
        if (old != nullptr && old->is_table())
            throw sim::scenario_error(
                sim::scenario_finding{file, 0, 0, path,
                                      "is a table, not a value (the sweep axis " + path +
                                          "); keys in it: " + existing_keys(*old->as_table())});
        insert_value(*table, parts.back(), value, old != nullptr && old->is_string());
    }
}

}  // namespace harness::run
