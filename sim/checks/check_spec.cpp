// Names, tolerances and validation of checks; see check_spec.h.

#include "sim/checks/check_spec.h"

#include "sim/checks/condition.h"
#include "sim/wide_int.h"

#include <array>
#include <utility>

namespace sim {

namespace {

constexpr std::array<std::pair<check_kind, const char*>, 9> kind_names{{
    {check_kind::frequency, "frequency"},
    {check_kind::period, "period"},
    {check_kind::duty_cycle, "duty_cycle"},
    {check_kind::pulse_width, "pulse_width"},
    {check_kind::edge_count, "edge_count"},
    {check_kind::phase, "phase"},
    {check_kind::dead_time, "dead_time"},
    {check_kind::latency, "latency"},
    {check_kind::never, "never"},
}};

std::size_t signal_count(check_kind k) {
    switch (k) {
        case check_kind::phase:
        case check_kind::dead_time:
        case check_kind::latency:
            return 2;
        case check_kind::never:
            return 0;
        default:
            return 1;
    }
}

}  // namespace

const char* to_string(check_kind k) {
    for (const auto& [kind, name] : kind_names)
        if (kind == k) return name;
    return "?";
}

std::optional<check_kind> check_kind_from_string(std::string_view text) {
    for (const auto& [kind, name] : kind_names)
        if (text == name) return kind;
    return std::nullopt;
}

const char* to_string(edge_select e) {
    switch (e) {
        case edge_select::rising:
            return "rising";
        case edge_select::falling:
            return "falling";
        case edge_select::both:
            return "both";
    }
    return "?";
}

std::optional<edge_select> edge_select_from_string(std::string_view text) {
    if (text == "rising") return edge_select::rising;
    if (text == "falling") return edge_select::falling;
    if (text == "both") return edge_select::both;
    return std::nullopt;
}

tolerance tolerance::absolute_units(std::uint64_t amount) {
    tolerance t;
    t.kind = tolerance_kind::absolute;
    t.amount = amount;
    return t;
}

tolerance tolerance::absolute_hz(const frequency& f) {
    tolerance t;
    t.kind = tolerance_kind::absolute;
    t.absolute_frequency = f;
    return t;
}

tolerance tolerance::relative_ppb(std::uint64_t ppb) {
    tolerance t;
    t.kind = tolerance_kind::relative;
    t.amount = ppb;
    return t;
}

tolerance tolerance::ticks_of(std::uint64_t count, std::string clock, const frequency& f) {
    if (f.is_zero())
        throw std::invalid_argument("tick tolerance: clock " + clock + " is stopped (0 Hz)");
    // Period = 10^12 * den / num ps, reduced.
    const u128 num = u128{ps_per_second} * f.den();
    const u128 g = gcd128(num, f.num());
    const u128 n = num / g;
    if (n > ~std::uint64_t{0})
        throw arithmetic_error("tick tolerance: period of " + clock + " too long");
    tolerance t;
    t.kind = tolerance_kind::ticks;
    t.amount = count;
    t.clock = std::move(clock);
    t.tick_num = static_cast<std::uint64_t>(n);
    t.tick_den = static_cast<std::uint64_t>(f.num() / g);
    return t;
}

tolerance tolerance::ticks_of(std::uint64_t count, std::string clock, time_ps period_ps) {
    tolerance t;
    t.kind = tolerance_kind::ticks;
    t.amount = count;
    t.clock = std::move(clock);
    t.tick_num = period_ps;
    t.tick_den = 1;
    return t;
}

std::string check_unit(const check_spec& spec) {
    switch (spec.kind) {
        case check_kind::frequency:
            return "Hz";
        case check_kind::duty_cycle:
            return "%";
        case check_kind::phase:
            return spec.phase_as_angle ? "deg" : "s";
        case check_kind::edge_count:
            return "edges";
        case check_kind::never:
            return "occurrences";
        default:
            return "s";
    }
}

std::vector<check_spec_problem> validate(const check_spec& s) {
    std::vector<check_spec_problem> out;
    const auto add = [&](const char* field, std::string message) {
        out.push_back({field, std::move(message)});
    };

    if (s.name.empty()) add("name", "a check needs a name");
    const std::size_t want = signal_count(s.kind);
    if (s.kind == check_kind::never) {
        if (!s.signals.empty())
            add("signals", "a never check takes its signals from its condition; give no signals");
        if (s.condition.empty()) {
            add("condition", "a never check needs a condition such as \"a and b\"");
        } else {
            try {
                condition::parse(s.condition);
            } catch (const condition_error& e) {
                add("condition", e.what());
            }
        }
        if (s.expected || s.expected_frequency || s.minimum || s.maximum ||
            s.tol.kind != tolerance_kind::exact)
            add("expected", "a never check takes no expected value, bounds or tolerance");
    } else {
        if (!s.condition.empty()) add("condition", "only never checks take a condition");
        if (s.signals.size() != want) {
            add("signals",
                std::string("a ") + to_string(s.kind) + " check needs " +
                    (want == 1 ? "exactly one signal" : "exactly two signals (A, then B)") +
                    ", got " + std::to_string(s.signals.size()));
        }
        for (const std::string& name : s.signals)
            if (name.empty()) add("signals", "signal names must not be empty");
    }

    const bool bounds = s.minimum || s.maximum;
    if (s.kind == check_kind::frequency) {
        if (!s.expected_frequency || s.expected_frequency->is_zero())
            add("expected", "a frequency check needs an expected frequency above 0 Hz");
        if (s.expected || bounds)
            add("expected", "a frequency check takes an expected frequency, not bounds or a count");
        if (s.tol.kind == tolerance_kind::absolute && s.tol.amount != 0)
            add("tolerance", "give a frequency check's absolute tolerance in Hz");
    } else if (s.kind != check_kind::never) {
        if (s.expected_frequency)
            add("expected", "only frequency checks take an expected frequency");
        if (s.expected && bounds)
            add("expected",
                "give either an expected value with a tolerance, or bounds (minimum, maximum), not "
                "both");
        if (!s.expected && !bounds)
            add("expected", std::string("a ") + to_string(s.kind) +
                                " check needs an expected value or bounds (minimum, maximum)");
        if (bounds && s.tol.kind != tolerance_kind::exact)
            add("tolerance", "a tolerance applies to an expected value, not to bounds");
        if (s.minimum && s.maximum && *s.minimum > *s.maximum)
            add("minimum", "minimum is above maximum");
        if (!s.tol.absolute_frequency.is_zero())
            add("tolerance", "only frequency checks take a tolerance in Hz");
    }

    if (s.kind == check_kind::duty_cycle) {
        for (const auto& v : {s.expected, s.minimum, s.maximum})
            if (v && *v > ppb_per_whole) add("expected", "a duty cycle lies between 0 % and 100 %");
    }
    if (s.kind == check_kind::phase && s.phase_as_angle) {
        for (const auto& v : {s.expected, s.minimum, s.maximum})
            if (v && *v >= micro_degrees_per_turn)
                add("expected", "a phase angle lies in [0 deg, 360 deg)");
    }
    if ((s.kind == check_kind::period || s.kind == check_kind::frequency ||
         s.kind == check_kind::duty_cycle) &&
        s.edge == edge_select::both) {
        add("edge",
            "a period runs from one edge to the next edge of the same direction: choose rising or "
            "falling");
    }
    if (s.kind == check_kind::edge_count && s.tol.kind != tolerance_kind::exact &&
        s.tol.kind != tolerance_kind::absolute)
        add("tolerance", "an edge count tolerance is a whole number of edges");
    if (s.tol.kind == tolerance_kind::relative && s.tol.amount > ppb_per_whole)
        add("tolerance", "a relative tolerance above 100 % means nothing");
    if (s.tol.kind == tolerance_kind::ticks) {
        if (s.tol.tick_num == 0 || s.tol.tick_den == 0)
            add("tolerance", "a tick tolerance needs the clock's period (name a running clock)");
        if (s.tol.amount > (std::uint64_t{1} << 32))
            add("tolerance", "a tick tolerance above 2^32 ticks");
    }

    if (s.until && *s.until <= s.from)
        add("until", "the window must end after it starts (until > from)");
    if (s.until && s.from + s.settle >= *s.until && *s.until > s.from)
        add("settle", "the settle time leaves nothing of the window to measure");
    if (s.from > max_time_ps - s.settle)
        add("settle", "from + settle lies beyond the last representable instant");
    return out;
}

}  // namespace sim
