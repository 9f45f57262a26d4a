// Sweep axes, values and points; see sweep_plan.h.

#include "harness/run/sweep_plan.h"

#include <algorithm>
#include <cctype>
#include <limits>

namespace harness::run {

namespace {

__extension__ typedef __int128 wide;

// An axis may take at most this many values: more would not fit the point limit with any other
// axis, and its value texts alone would fill memory.
constexpr std::uint64_t max_axis_values = std::uint64_t{1} << 24;

std::string trim(const std::string& s) {
    std::size_t b = 0;
    std::size_t e = s.size();
    while (b < e && std::isspace(static_cast<unsigned char>(s[b]))) ++b;
    while (e > b && std::isspace(static_cast<unsigned char>(s[e - 1]))) --e;
    return s.substr(b, e - b);
}

std::string quoted(const std::string& s) { return "'" + s + "'"; }

// A decimal integer with an optional sign, the whole of `s`.
bool parse_int(const std::string& s, std::int64_t& out) {
    std::size_t i = 0;
    bool negative = false;
    if (i < s.size() && (s[i] == '-' || s[i] == '+')) negative = s[i++] == '-';
    if (i == s.size()) return false;
    wide v = 0;
    for (; i < s.size(); ++i) {
        if (!std::isdigit(static_cast<unsigned char>(s[i]))) return false;
        v = v * 10 + (s[i] - '0');
        if (v > std::numeric_limits<std::int64_t>::max()) return false;
    }
    out = static_cast<std::int64_t>(negative ? -v : v);
    return true;
}

// A decimal number with its unit, "7.9 MHz": the number as `digits` / 10^`decimals`.
struct decimal_quantity {
    wide digits = 0;
    int decimals = 0;
    std::string unit;
};

bool parse_quantity(const std::string& text, decimal_quantity& q) {
    const std::string s = trim(text);
    std::size_t i = 0;
    bool negative = false;
    if (i < s.size() && (s[i] == '-' || s[i] == '+')) negative = s[i++] == '-';
    bool any_digit = false;
    bool point = false;
    for (; i < s.size(); ++i) {
        const char c = s[i];
        if (std::isdigit(static_cast<unsigned char>(c))) {
            any_digit = true;
            q.digits = q.digits * 10 + (c - '0');
            if (point) ++q.decimals;
            // 30 digits stay far inside 128 bits through the range arithmetic.
            if (q.decimals > 18 || q.digits > wide{1} * 1000000000000000000LL * 1000) return false;
        } else if (c == '.' && !point) {
            point = true;
        } else {
            break;
        }
    }
    if (!any_digit) return false;
    if (negative) q.digits = -q.digits;
    q.unit = trim(s.substr(i));
    if (q.unit.empty()) return false;
    for (const char c : q.unit)
        if (std::isspace(static_cast<unsigned char>(c)) ||
            std::isdigit(static_cast<unsigned char>(c)))
            return false;
    return true;
}

wide pow10(int n) {
    wide p = 1;
    while (n-- > 0) p *= 10;
    return p;
}

wide gcd(wide a, wide b) {
    if (a < 0) a = -a;
    while (b != 0) {
        const wide t = a % b;
        a = b;
        b = t;
    }
    return a;
}

std::string wide_text(wide v) {
    if (v == 0) return "0";
    const bool negative = v < 0;
    if (negative) v = -v;
    std::string s;
    while (v > 0) {
        s += static_cast<char>('0' + static_cast<int>(v % 10));
        v /= 10;
    }
    if (negative) s += '-';
    std::reverse(s.begin(), s.end());
    return s;
}

// num/den (den > 0) as a finite decimal without trailing zeros, or "" when it has none.
std::string decimal_text(wide num, wide den) {
    const wide g = gcd(num, den);
    if (g > 1) {
        num /= g;
        den /= g;
    }
    int decimals = 0;
    wide scale = 1;
    while (scale % den != 0) {
        if (++decimals > 30) return "";
        scale *= 10;
    }
    const wide scaled = num * (scale / den);
    const bool negative = scaled < 0;
    const wide mag = negative ? -scaled : scaled;
    std::string whole = wide_text(mag / scale);
    std::string frac = decimals == 0 ? "" : wide_text(mag % scale);
    if (decimals != 0)
        frac = std::string(static_cast<std::size_t>(decimals) - frac.size(), '0') + frac;
    while (!frac.empty() && frac.back() == '0') frac.pop_back();
    return (negative ? "-" : "") + whole + (frac.empty() ? "" : "." + frac);
}

std::vector<std::string> integer_range(const std::string& where, std::int64_t a, std::int64_t b,
                                       std::int64_t step) {
    if (a > b)
        throw sweep_error(where + ": the range starts above its end; write the smaller end first");
    if (step <= 0) throw sweep_error(where + ": the step must be a whole number above 0");
    const std::uint64_t count = static_cast<std::uint64_t>((static_cast<wide>(b) - a) / step) + 1;
    if (count > max_axis_values)
        throw sweep_error(where + ": " + std::to_string(count) + " values, more than the " +
                          std::to_string(max_axis_values) + " an axis may take");
    std::vector<std::string> out;
    out.reserve(count);
    for (std::uint64_t k = 0; k < count; ++k)
        out.push_back(wide_text(static_cast<wide>(a) + static_cast<wide>(k) * step));
    return out;
}

std::vector<std::string> quantity_range(const std::string& where, const std::string& lo,
                                        const std::string& hi_and_count) {
    const auto slash = hi_and_count.rfind('/');
    if (slash == std::string::npos)
        throw sweep_error(where +
                          ": a quantity range needs its number of points, e.g. "
                          "\"7.9 MHz..8.1 MHz/5\" (5 points, both ends included)");
    const std::string hi = hi_and_count.substr(0, slash);
    const std::string count_text = trim(hi_and_count.substr(slash + 1));
    decimal_quantity a;
    decimal_quantity b;
    if (!parse_quantity(lo, a))
        throw sweep_error(where + ": " + quoted(trim(lo)) +
                          " is not an integer or a quantity; expected a decimal number and a "
                          "unit such as \"7.9 MHz\"");
    if (!parse_quantity(hi, b))
        throw sweep_error(where + ": " + quoted(trim(hi)) +
                          " is not an integer or a quantity; expected a decimal number and a "
                          "unit such as \"8.1 MHz\"");
    if (a.unit != b.unit)
        throw sweep_error(where + ": the ends have different units (" + quoted(a.unit) + " and " +
                          quoted(b.unit) + "); give both ends in the same unit");
    std::int64_t count = 0;
    if (!parse_int(count_text, count) || count < 2)
        throw sweep_error(where + ": the number of points " + quoted(count_text) +
                          " must be a whole number of at least 2 (both ends are points)");
    if (static_cast<std::uint64_t>(count) > max_axis_values)
        throw sweep_error(where + ": " + count_text + " values, more than the " +
                          std::to_string(max_axis_values) + " an axis may take");
    const int decimals = std::max(a.decimals, b.decimals);
    const wide lo_scaled = a.digits * pow10(decimals - a.decimals);
    const wide hi_scaled = b.digits * pow10(decimals - b.decimals);
    if (lo_scaled > hi_scaled)
        throw sweep_error(where + ": the range starts above its end; write the smaller end first");
    const wide steps = count - 1;
    const wide den = steps * pow10(decimals);
    std::vector<std::string> out;
    out.reserve(static_cast<std::size_t>(count));
    for (wide k = 0; k <= steps; ++k) {
        const wide num = lo_scaled * steps + k * (hi_scaled - lo_scaled);
        const std::string text = decimal_text(num, den);
        if (text.empty())
            throw sweep_error(where + ": point " + wide_text(k + 1) + " of " + count_text +
                              " is not a finite decimal number of " + a.unit +
                              "; choose a number of points that divides the range evenly (the "
                              "step is (end - start) / (points - 1))");
        out.push_back(text + " " + a.unit);
    }
    return out;
}

}  // namespace

std::vector<std::string> parse_values(const std::string& axis, const std::string& values_text) {
    const std::string where = "--vary " + axis + "=" + values_text;
    const std::string text = trim(values_text);
    if (text.empty())
        throw sweep_error(where +
                          ": no values; give a list \"a,b,c\", an integer range "
                          "\"0..63\" or \"0..100/5\", or a quantity range "
                          "\"7.9 MHz..8.1 MHz/5\"");
    const auto dots = text.find("..");
    if (dots == std::string::npos) {
        std::vector<std::string> out;
        std::size_t start = 0;
        while (true) {
            const auto comma = text.find(',', start);
            const std::string item =
                trim(text.substr(start, comma == std::string::npos ? comma : comma - start));
            if (item.empty())
                throw sweep_error(where +
                                  ": an empty value in the list; separate values by "
                                  "single commas, e.g. naive,careful");
            out.push_back(item);
            if (comma == std::string::npos) break;
            start = comma + 1;
        }
        for (std::size_t i = 0; i < out.size(); ++i)
            for (std::size_t j = 0; j < i; ++j)
                if (out[i] == out[j])
                    throw sweep_error(where + ": " + quoted(out[i]) +
                                      " is listed twice; list each value once");
        return out;
    }
    if (text.find(',') != std::string::npos)
        throw sweep_error(where +
                          ": a range and a list cannot be mixed; give either "
                          "\"a,b,c\" or \"A..B\"");
    const std::string lo = trim(text.substr(0, dots));
    const std::string rest = trim(text.substr(dots + 2));
    std::int64_t a = 0;
    std::int64_t b = 0;
    std::int64_t step = 1;
    const auto slash = rest.rfind('/');
    const std::string hi = trim(rest.substr(0, slash));
    if (parse_int(lo, a) && parse_int(hi, b)) {
        if (slash != std::string::npos) {
            const std::string step_text = trim(rest.substr(slash + 1));
            if (!parse_int(step_text, step) || step <= 0)
                throw sweep_error(where + ": the step " + quoted(step_text) +
                                  " must be a whole number above 0, as in \"0..100/5\"");
        }
        return integer_range(where, a, b, step);
    }
    if (lo.empty() || hi.empty())
        throw sweep_error(where +
                          ": a range needs both ends, as in \"0..63\" or "
                          "\"7.9 MHz..8.1 MHz/5\"");
    return quantity_range(where, lo, rest);
}

sweep_axis parse_axis(const std::string& text) {
    const auto eq = text.find('=');
    if (eq == std::string::npos || trim(text.substr(0, eq)).empty())
        throw sweep_error("--vary " + quoted(text) +
                          ": expected AXIS=VALUES, e.g. --vary start-offset=0..63 or "
                          "--vary param.variant=naive,careful");
    sweep_axis axis;
    axis.name = trim(text.substr(0, eq));
    axis.spec = text.substr(eq + 1);
    const std::string where = "--vary " + axis.name;
    for (const char c : axis.name)
        if (!(std::isalnum(static_cast<unsigned char>(c)) || c == '.' || c == '-' || c == '_'))
            throw sweep_error(where + ": " + quoted(std::string(1, c)) +
                              " cannot be in an axis name; axes are start-offset, seed, "
                              "param.NAME or a scenario key path such as clocks.xtal.frequency");
    if (axis.name == "start-offset") {
        axis.what = sweep_axis::kind::start_offset;
    } else if (axis.name == "seed") {
        axis.what = sweep_axis::kind::seed;
    } else if (axis.name.rfind("param.", 0) == 0) {
        axis.what = sweep_axis::kind::param;
        axis.target = axis.name.substr(6);
        if (axis.target.empty())
            throw sweep_error(where + ": name the firmware parameter, e.g. param.variant");
    } else {
        axis.what = sweep_axis::kind::key;
        axis.target = axis.name;
        if (axis.name.find('.') == std::string::npos || axis.name.front() == '.' ||
            axis.name.back() == '.' || axis.name.find("..") != std::string::npos)
            throw sweep_error(where +
                              ": not an axis; axes are start-offset, seed, param.NAME "
                              "or a scenario key path with its table, such as "
                              "clocks.xtal.frequency or run.duration");
    }
    axis.values = parse_values(axis.name, axis.spec);
    if (axis.what == sweep_axis::kind::start_offset || axis.what == sweep_axis::kind::seed) {
        for (const std::string& v : axis.values) {
            std::int64_t n = 0;
            if (!parse_int(v, n) || n < 0 || v[0] == '+')
                throw sweep_error(where + ": " + quoted(v) +
                                  " is not a whole number of at least "
                                  "0; " +
                                  axis.name + " takes values such as 0..63 or 1,2,3");
        }
    }
    return axis;
}

shard parse_shard(const std::string& text) {
    const auto slash = text.find('/');
    std::int64_t k = 0;
    std::int64_t n = 0;
    if (slash == std::string::npos || !parse_int(trim(text.substr(0, slash)), k) ||
        !parse_int(trim(text.substr(slash + 1)), n) || n < 1 || k < 1 || k > n)
        throw sweep_error("--shard " + quoted(text) +
                          ": expected K/N with 1 <= K <= N, e.g. --shard 2/4 (the second of four "
                          "shards)");
    return shard{static_cast<std::uint64_t>(k), static_cast<std::uint64_t>(n)};
}

sweep_plan::sweep_plan(std::vector<sweep_axis> axes) : axes_(std::move(axes)) {
    if (axes_.empty())
        throw sweep_error(
            "no --vary given; a sweep needs at least one axis, e.g. "
            "--vary start-offset=0..63");
    for (std::size_t i = 0; i < axes_.size(); ++i) {
        for (std::size_t j = 0; j < i; ++j)
            if (axes_[i].name == axes_[j].name)
                throw sweep_error("--vary " + axes_[i].name +
                                  " is given twice; give each axis once");
        const std::uint64_t n = axes_[i].values.size();
        if (points_ > max_points / n)
            throw sweep_error("the axes span more than " + std::to_string(max_points) +
                              " points; split the sweep");
        points_ *= n;
    }
}

std::vector<std::size_t> sweep_plan::positions(std::uint64_t point) const {
    std::vector<std::size_t> out(axes_.size());
    for (std::size_t i = axes_.size(); i-- > 0;) {
        const std::uint64_t n = axes_[i].values.size();
        out[i] = static_cast<std::size_t>(point % n);
        point /= n;
    }
    return out;
}

std::uint64_t sweep_plan::index_of(const std::vector<std::size_t>& positions) const {
    std::uint64_t index = 0;
    for (std::size_t i = 0; i < axes_.size(); ++i)
        index = index * axes_[i].values.size() + positions[i];
    return index;
}

std::vector<std::string> sweep_plan::values(std::uint64_t point) const {
    const auto pos = positions(point);
    std::vector<std::string> out;
    out.reserve(axes_.size());
    for (std::size_t i = 0; i < axes_.size(); ++i) out.push_back(axes_[i].values[pos[i]]);
    return out;
}

std::string sweep_plan::point_name(std::uint64_t point) const {
    const auto v = values(point);
    std::string out;
    for (std::size_t i = 0; i < axes_.size(); ++i)
        out += (i == 0 ? "" : " ") + axes_[i].name + "=" + v[i];
    return out;
}

scenario_overrides sweep_plan::overrides(std::uint64_t point,
                                         const scenario_overrides& base) const {
    scenario_overrides o = base;
    const auto v = values(point);
    for (std::size_t i = 0; i < axes_.size(); ++i) {
        const sweep_axis& a = axes_[i];
        switch (a.what) {
            case sweep_axis::kind::start_offset:
                o.start_offset_cycles = std::stoull(v[i]);
                break;
            case sweep_axis::kind::seed:
                o.seed = std::stoull(v[i]);
                break;
            case sweep_axis::kind::param:
                o.parameters[a.target] = v[i];
                break;
            case sweep_axis::kind::key:
                o.keys.emplace_back(a.target, v[i]);
                break;
        }
    }
    return o;
}

}  // namespace harness::run
