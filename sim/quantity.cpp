// Exact reading of quantities with units; see quantity.h.

#include "sim/quantity.h"

#include "sim/wide_int.h"

#include <limits>
#include <string>

namespace sim {

namespace {

// More digits than this could overflow 128 bits once scaled by a unit (10^24 * 10^12 < 2^127).
constexpr unsigned max_digits = 24;

struct unit {
    std::string_view name;
    u128 scale;  // target units per one of this unit
};

// A decimal number as mantissa / 10^fraction_digits, with its sign and the unit text after it.
struct decimal {
    bool negative = false;
    u128 mantissa = 0;
    u128 divisor = 1;  // 10^fraction_digits
    std::string_view unit;
};

std::string in_quotes(std::string_view text) { return "\"" + std::string(text) + "\""; }

bool is_space(char c) { return c == ' ' || c == '\t'; }

std::string_view trim(std::string_view s) {
    while (!s.empty() && is_space(s.front())) s.remove_prefix(1);
    while (!s.empty() && is_space(s.back())) s.remove_suffix(1);
    return s;
}

// Splits "  -1.25 ms " into sign, digits and unit; `what` names the quantity for messages
// ("a frequency"), `example` is a good value, `accepted` lists the units.
decimal split(std::string_view original, const char* what, const char* example,
              const std::string& accepted) {
    const std::string_view s = trim(original);
    const std::string bad_number = in_quotes(original) + ": expected " + what +
                                   " as a decimal number and a unit, e.g. \"" + example +
                                   "\"; accepted units: " + accepted;
    if (s.empty())
        throw quantity_error(in_quotes(original) + ": empty; expected " + what + ", e.g. \"" +
                             example + "\"");
    decimal d;
    std::size_t i = 0;
    if (s[i] == '+' || s[i] == '-') d.negative = s[i++] == '-';
    unsigned digits = 0;
    bool any_integer_digit = false;
    auto take_digits = [&]() {
        bool any = false;
        while (i < s.size() && s[i] >= '0' && s[i] <= '9') {
            if (++digits > max_digits)
                throw quantity_error(in_quotes(original) + ": too many digits; accepted: at most " +
                                     std::to_string(max_digits));
            d.mantissa = d.mantissa * 10 + static_cast<unsigned>(s[i] - '0');
            ++i;
            any = true;
        }
        return any;
    };
    any_integer_digit = take_digits();
    if (!any_integer_digit) throw quantity_error(bad_number);
    if (i < s.size() && s[i] == '.') {
        ++i;
        const std::size_t before = i;
        if (!take_digits()) throw quantity_error(bad_number);
        for (std::size_t k = before; k < i; ++k) d.divisor *= 10;
    }
    while (i < s.size() && is_space(s[i])) ++i;
    d.unit = s.substr(i);
    // Something like "1e6 Hz", "1/3 Hz" or "8 M Hz" is a malformed number, not an unknown unit.
    for (char c : d.unit)
        if (is_space(c) || (c >= '0' && c <= '9' && d.unit.find('/') == std::string_view::npos))
            throw quantity_error(bad_number);
    if (!d.unit.empty() &&
        (d.unit.front() == '/' || d.unit.front() == '.' || d.unit.front() == 'e' ||
         d.unit.front() == 'E' || d.unit.front() == '_'))
        throw quantity_error(bad_number);
    return d;
}

std::string unit_list(std::initializer_list<unit> units) {
    std::string s;
    for (const unit& u : units) s += (s.empty() ? "" : ", ") + std::string(u.name);
    return s;
}

// The scale of d's unit among `units`; an empty unit means `bare` (0: a unit is required).
u128 scale_of(std::string_view original, const decimal& d, std::initializer_list<unit> units,
              u128 bare) {
    if (d.unit.empty()) {
        if (bare != 0) return bare;
        throw quantity_error(in_quotes(original) + ": missing unit; accepted: " + unit_list(units));
    }
    for (const unit& u : units)
        if (u.name == d.unit) return u.scale;
    throw quantity_error(in_quotes(original) + ": unknown unit " + in_quotes(d.unit) +
                         "; accepted: " + unit_list(units));
}

// d in target units (whole), or a quantity_error naming the target unit.
u128 whole_value(std::string_view original, const decimal& d, u128 scale, const char* unit_words,
                 const char* unit_name) {
    const u128 scaled = d.mantissa * scale;
    if (scaled % d.divisor != 0)
        throw quantity_error(in_quotes(original) + ": not a whole number of " + unit_words +
                             "; accepted: multiples of 1 " + unit_name);
    return scaled / d.divisor;
}

std::int64_t signed_value(std::string_view original, const decimal& d, u128 v,
                          const char* unit_name) {
    const u128 limit = static_cast<u128>(std::numeric_limits<std::int64_t>::max());
    if (v > limit)
        throw quantity_error(in_quotes(original) + ": too large; accepted: up to " +
                             u128_text(limit) + " " + unit_name);
    const auto s = static_cast<std::int64_t>(v);
    return d.negative ? -s : s;
}

}  // namespace

frequency parse_frequency(std::string_view text) {
    const std::initializer_list<unit> units = {
        {"Hz", 1}, {"kHz", 1'000}, {"MHz", 1'000'000}, {"GHz", 1'000'000'000}};
    const decimal d = split(text, "a frequency", "8 MHz", unit_list(units));
    const u128 scale = scale_of(text, d, units, 1);
    if (d.negative && d.mantissa != 0)
        throw quantity_error(in_quotes(text) +
                             ": a frequency cannot be negative; accepted: 0 Hz or more");
    u128 num = d.mantissa * scale;
    u128 den = d.divisor;
    const u128 g = gcd128(num, den);
    if (g > 1) {
        num /= g;
        den /= g;
    }
    // frequency keeps 63-bit parts (see frequency.h).
    const u128 limit = u128{1} << 63;
    if (num >= limit || den >= limit)
        throw quantity_error(in_quotes(text) +
                             ": too large or too finely divided; accepted: up to about 9.2 EHz, "
                             "in steps no finer than about 1e-18 Hz");
    return frequency(static_cast<std::uint64_t>(num), static_cast<std::uint64_t>(den));
}

time_ps parse_time(std::string_view text) {
    // UTF-8 of U+00B5 MICRO SIGN and U+03BC GREEK SMALL LETTER MU: from memory.
    const std::initializer_list<unit> units = {{"ps", 1},
                                               {"ns", 1'000},
                                               {"us", 1'000'000},
                                               {"\xC2\xB5s", 1'000'000},  // U+00B5 micro sign
                                               {"\xCE\xBCs", 1'000'000},  // U+03BC Greek small mu
                                               {"ms", 1'000'000'000},
                                               {"s", 1'000'000'000'000}};
    const std::string accepted = "ps, ns, us, \xC2\xB5s, ms, s";
    const decimal d = split(text, "a time", "40 us", accepted);
    u128 scale = 0;
    try {
        scale = scale_of(text, d, units, 0);
    } catch (const quantity_error&) {
        // List the micro sign once, not in both of its Unicode spellings.
        throw quantity_error(
            in_quotes(text) +
            (d.unit.empty() ? ": missing unit" : ": unknown unit " + in_quotes(d.unit)) +
            "; accepted: " + accepted);
    }
    if (d.negative && d.mantissa != 0)
        throw quantity_error(in_quotes(text) +
                             ": a time cannot be negative; accepted: 0 ps or more");
    const u128 v = whole_value(text, d, scale, "picoseconds", "ps");
    if (v > max_time_ps)
        throw quantity_error(in_quotes(text) + ": too long; accepted: up to " +
                             format_time(max_time_ps));
    return static_cast<time_ps>(v);
}

std::int64_t parse_ppb(std::string_view text) {
    const std::initializer_list<unit> units = {{"ppb", 1}, {"ppm", 1'000}, {"%", 10'000'000}};
    const decimal d = split(text, "a ratio", "20 ppm", unit_list(units));
    const u128 v = whole_value(text, d, scale_of(text, d, units, 0), "parts per billion", "ppb");
    return signed_value(text, d, v, "ppb");
}

std::int64_t parse_ppb_per_c2(std::string_view text) {
    const std::initializer_list<unit> units = {{"ppb/C2", 1}, {"ppm/C2", 1'000}};
    const decimal d = split(text, "a temperature coefficient", "-34 ppb/C2", unit_list(units));
    const u128 v = whole_value(text, d, scale_of(text, d, units, 0), "ppb/C2", "ppb/C2");
    return signed_value(text, d, v, "ppb/C2");
}

}  // namespace sim
