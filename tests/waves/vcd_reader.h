#pragma once
// A small VCD reader for the waveform tests: enough of IEEE Std 1364-2005 clause 18 (recalled from
// memory) to read back scalar variables, from our writer or from another tool's output.
//
// It keeps what a comparison needs: the timescale, the variables by full hierarchical name, their
// $dumpvars values and every later value change in file order. Vector changes ("b0101 <code>")
// are read and ignored; anything it does not understand throws with the token's position.

#include "sim/clock_domain.h"

#include <cctype>
#include <cstdint>
#include <fstream>
#include <map>
#include <sstream>
#include <stdexcept>
#include <string>
#include <utility>
#include <vector>

namespace tickbench::waves_test {

// One value change of a scalar variable, its time converted to picoseconds.
struct vcd_change {
    sim::time_ps at = 0;
    std::string signal;  // "scope.sub.name"
    char value = '0';
};

struct vcd_contents {
    sim::time_ps unit_ps = 0;
    std::vector<std::string> signals;     // declaration order
    std::map<std::string, char> initial;  // values of the $dumpvars section
    std::vector<vcd_change> changes;      // after $dumpvars, in file order
    std::vector<sim::time_ps> times;      // every "#<time>", in ps, in file order

    // The changes of one signal, in order.
    std::vector<std::pair<sim::time_ps, char>> of(const std::string& signal) const {
        std::vector<std::pair<sim::time_ps, char>> out;
        for (const vcd_change& c : changes)
            if (c.signal == signal) out.emplace_back(c.at, c.value);
        return out;
    }
};

// Parses VCD text; throws std::runtime_error naming the token number on anything unexpected.
inline vcd_contents parse_vcd(const std::string& text) {
    std::istringstream in(text);
    std::vector<std::string> tok;
    for (std::string t; in >> t;) tok.push_back(t);
    std::size_t i = 0;
    auto fail = [&](const std::string& why) {
        throw std::runtime_error("VCD token " + std::to_string(i) +
                                 (i < tok.size() ? " '" + tok[i] + "'" : "") + ": " + why);
    };
    auto next = [&]() -> const std::string& {
        if (i >= tok.size()) fail("unexpected end of file");
        return tok[i++];
    };
    auto skip_to_end = [&]() {
        while (next() != "$end") {
        }
    };
    vcd_contents out;
    std::vector<std::string> scopes;
    std::map<std::string, std::vector<std::string>> by_code;
    sim::time_ps now = 0;
    bool in_dumpvars = false;
    while (i < tok.size()) {
        const std::string t = next();
        if (t == "$date" || t == "$version" || t == "$comment" || t == "$enddefinitions") {
            skip_to_end();
        } else if (t == "$timescale") {
            std::string spec;
            for (std::string s = next(); s != "$end"; s = next()) spec += s;
            std::size_t digits = 0;
            while (digits < spec.size() && std::isdigit(static_cast<unsigned char>(spec[digits])))
                ++digits;
            const std::uint64_t number = std::stoull(spec.substr(0, digits));
            const std::string unit = spec.substr(digits);
            const std::map<std::string, std::uint64_t> ps = {{"ps", 1},
                                                             {"ns", 1'000},
                                                             {"us", 1'000'000},
                                                             {"ms", 1'000'000'000},
                                                             {"s", 1'000'000'000'000}};
            if (ps.count(unit) == 0) fail("unknown time unit " + unit);
            out.unit_ps = number * ps.at(unit);
        } else if (t == "$scope") {
            next();  // scope type
            scopes.push_back(next());
            if (next() != "$end") fail("expected $end after the scope name");
        } else if (t == "$upscope") {
            if (scopes.empty()) fail("$upscope outside every scope");
            scopes.pop_back();
            if (next() != "$end") fail("expected $end after $upscope");
        } else if (t == "$var") {
            next();  // type
            next();  // size
            const std::string code = next();
            std::string name;
            for (const std::string& s : scopes) name += s + ".";
            name += next();
            for (std::string s = next(); s != "$end"; s = next())
                name += s;  // a bit select, if any
            by_code[code].push_back(name);
            out.signals.push_back(name);
        } else if (t == "$dumpvars" || t == "$dumpall" || t == "$dumpon" || t == "$dumpoff") {
            in_dumpvars = t == "$dumpvars";
        } else if (t == "$end") {
            in_dumpvars = false;
        } else if (t[0] == '#') {
            if (out.unit_ps == 0) fail("a time before $timescale");
            now = std::stoull(t.substr(1)) * out.unit_ps;
            out.times.push_back(now);
        } else if (t[0] == 'b' || t[0] == 'B' || t[0] == 'r' || t[0] == 'R') {
            next();  // a vector or real value's code
        } else if (std::string("01xzXZ").find(t[0]) != std::string::npos) {
            const std::string code = t.substr(1);
            const auto found = by_code.find(code);
            if (found == by_code.end()) fail("value change of an undeclared code");
            const char v = static_cast<char>(std::tolower(static_cast<unsigned char>(t[0])));
            for (const std::string& name : found->second) {
                if (in_dumpvars)
                    out.initial[name] = v;
                else
                    out.changes.push_back({now, name, v});
            }
        } else {
            fail("not a VCD token");
        }
    }
    return out;
}

// Reads and parses a VCD file; throws std::runtime_error naming the file.
inline vcd_contents read_vcd(const std::string& path) {
    std::ifstream f(path, std::ios::binary);
    if (!f) throw std::runtime_error("cannot read " + path);
    std::ostringstream text;
    text << f.rdbuf();
    try {
        return parse_vcd(text.str());
    } catch (const std::runtime_error& e) {
        throw std::runtime_error(path + ": " + e.what());
    }
}

}  // namespace tickbench::waves_test
