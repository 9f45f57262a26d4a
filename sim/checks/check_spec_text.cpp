// Scenario spellings of check values; see check_spec_text.h.

#include "sim/checks/check_spec_text.h"

#include "sim/quantity.h"
#include "sim/wide_int.h"

#include <string>

namespace sim {

namespace {

bool is_time_kind(const check_spec& s) {
    switch (s.kind) {
        case check_kind::period:
        case check_kind::pulse_width:
        case check_kind::dead_time:
        case check_kind::latency:
            return true;
        case check_kind::phase:
            return !s.phase_as_angle;
        default:
            return false;
    }
}

bool is_ratio_kind(const check_spec& s) {
    return s.kind == check_kind::duty_cycle || (s.kind == check_kind::phase && s.phase_as_angle);
}

std::string_view trim(std::string_view s) {
    while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
    while (!s.empty() && (s.back() == ' ' || s.back() == '\t')) s.remove_suffix(1);
    return s;
}

bool ends_with(std::string_view s, std::string_view suffix) {
    return s.size() >= suffix.size() && s.substr(s.size() - suffix.size()) == suffix;
}

// A non-negative decimal with at most `max_fraction` fraction digits, as value * 10^max_fraction.
std::uint64_t parse_fixed(std::string_view text, unsigned max_fraction, std::string_view original) {
    const auto bad = [&](const std::string& why) {
        return quantity_error("\"" + std::string(original) + "\": " + why);
    };
    if (text.empty()) throw bad("expected a number");
    u128 value = 0;
    unsigned fraction = 0;
    bool point = false, digits = false;
    for (char c : text) {
        if (c == '.' && !point) {
            point = true;
            continue;
        }
        if (c < '0' || c > '9') throw bad("expected a non-negative decimal number");
        if (point && ++fraction > max_fraction) {
            throw bad("at most " + std::to_string(max_fraction) +
                      " fraction digits are exact here");
        }
        value = value * 10 + static_cast<unsigned>(c - '0');
        digits = true;
        if (value > (u128{1} << 80)) throw bad("number too large");
    }
    if (!digits) throw bad("expected a number");
    for (; fraction < max_fraction; ++fraction) value *= 10;
    if (value > ~std::uint64_t{0}) throw bad("number too large");
    return static_cast<std::uint64_t>(value);
}

}  // namespace

tolerance parse_tolerance(std::string_view text, const check_spec& spec) {
    const std::string_view t = trim(text);
    const auto bad = [&](const std::string& why) {
        return quantity_error("tolerance \"" + std::string(text) + "\": " + why);
    };
    if (ends_with(t, "ticks") || ends_with(t, "tick")) {
        const std::string_view num = trim(t.substr(0, t.size() - (ends_with(t, "ticks") ? 5 : 4)));
        return tolerance::ticks_of(parse_fixed(num, 0, text), "", time_ps{0});
    }
    if (ends_with(t, "ppm") || ends_with(t, "ppb") || ends_with(t, "%")) {
        const std::int64_t ppb = parse_ppb(t);
        if (ppb < 0) throw bad("a tolerance is not negative");
        const auto amount = static_cast<std::uint64_t>(ppb);
        if (spec.kind == check_kind::duty_cycle) return tolerance::absolute_units(amount);
        if (spec.kind == check_kind::phase && spec.phase_as_angle) {
            if ((u128{amount} * 9) % 25 != 0) throw bad("not a whole number of micro-degrees");
            return tolerance::absolute_units(static_cast<std::uint64_t>(u128{amount} * 9 / 25));
        }
        if (spec.kind == check_kind::edge_count || spec.kind == check_kind::never)
            throw bad("an edge count tolerance is a whole number of edges");
        return tolerance::relative_ppb(amount);
    }
    if (ends_with(t, "deg")) {
        if (!(spec.kind == check_kind::phase && spec.phase_as_angle))
            throw bad("degrees apply to phase checks measured as an angle");
        return tolerance::absolute_units(parse_angle(t));
    }
    if (ends_with(t, "Hz")) {
        if (spec.kind != check_kind::frequency)
            throw bad("a tolerance in Hz applies to frequency checks");
        return tolerance::absolute_hz(parse_frequency(t));
    }
    if (!t.empty() && t.back() >= '0' && t.back() <= '9') {
        if (spec.kind != check_kind::edge_count)
            throw bad("give a unit: a time (\"20 ns\"), \"ppm\", \"%\" or \"ticks\"");
        return tolerance::absolute_units(parse_fixed(t, 0, text));
    }
    if (is_time_kind(spec)) return tolerance::absolute_units(parse_time(t));
    if (is_ratio_kind(spec))
        throw bad("expected \"%\", \"ppm\"" +
                  std::string(spec.kind == check_kind::phase ? ", \"deg\"" : "") + " or \"ticks\"");
    throw bad("expected \"ppm\", \"ppb\", \"%\", \"ticks\" or a value in the check's unit");
}

std::uint64_t parse_angle(std::string_view text) {
    const std::string_view t = trim(text);
    if (ends_with(t, "%")) {
        const std::int64_t ppb = parse_ppb(t);
        if (ppb < 0 || static_cast<std::uint64_t>(ppb) > ppb_per_whole)
            throw quantity_error("angle \"" + std::string(text) +
                                 "\": expected 0 % to 100 % of a period");
        if ((u128(static_cast<std::uint64_t>(ppb)) * 9) % 25 != 0)
            throw quantity_error("angle \"" + std::string(text) +
                                 "\": not a whole number of micro-degrees");
        return static_cast<std::uint64_t>(ppb) * 9 / 25;
    }
    if (!ends_with(t, "deg"))
        throw quantity_error(
            "angle \"" + std::string(text) +
            "\": expected degrees (\"120 deg\") or a percentage of the period (\"25 %\")");
    return parse_fixed(trim(t.substr(0, t.size() - 3)), 6, text);
}

std::uint64_t parse_duty(std::string_view text) {
    const std::int64_t ppb = parse_ppb(text);
    if (ppb < 0 || static_cast<std::uint64_t>(ppb) > ppb_per_whole)
        throw quantity_error("duty \"" + std::string(text) + "\": expected 0 % to 100 %");
    return static_cast<std::uint64_t>(ppb);
}

}  // namespace sim
