// Shared bookkeeping of running checks: windows, expectations, statistics, verdicts and sentences.
// See check_state.h.

#include "sim/checks/detail/check_state.h"

#include "sim/checks/detail/exact_compare.h"

#include <algorithm>

namespace sim::detail {

namespace {

bool is_angle(const check_spec& s) { return s.kind == check_kind::phase && s.phase_as_angle; }

}  // namespace

std::string fixed_text(u128 value, unsigned digits) {
    u128 scale = 1;
    for (unsigned i = 0; i < digits; ++i) scale *= 10;
    std::string frac = u128_text(value % scale);
    if (digits == 0) return u128_text(value);
    frac.insert(frac.begin(), digits - frac.size(), '0');
    while (!frac.empty() && frac.back() == '0') frac.pop_back();
    return u128_text(value / scale) + (frac.empty() ? "" : "." + frac);
}

check_state::check_state(check_spec spec) : spec_(std::move(spec)) {
    names_ = spec_.signals;
    start_ = spec_.from + spec_.settle;
    until_ = spec_.until ? *spec_.until : max_time_ps;

    const tolerance& t = spec_.tol;
    switch (t.kind) {
        case tolerance_kind::exact:
            break;
        case tolerance_kind::absolute:
            tolerance_text_ = spec_.kind == check_kind::frequency
                                  ? t.absolute_frequency.decimal_string() + " Hz"
                                  : value_text(t.amount);
            break;
        case tolerance_kind::relative:
            if (t.amount >= 1'000'000) {
                tolerance_text_ = fixed_text(t.amount, 7) + " %";
            } else if (t.amount % 1000 == 0) {
                tolerance_text_ = fixed_text(t.amount, 3) + " ppm";
            } else {
                tolerance_text_ = std::to_string(t.amount) + " ppb";
            }
            break;
        case tolerance_kind::ticks: {
            const std::string period = t.tick_den == 1 ? format_time(t.tick_num)
                                                       : std::to_string(t.tick_num) + "/" +
                                                             std::to_string(t.tick_den) + " ps";
            tolerance_text_ = std::to_string(t.amount) +
                              (t.amount == 1 ? " tick of " : " ticks of ") +
                              (t.clock.empty() ? period : t.clock);
            break;
        }
    }

    const std::string tol_suffix =
        t.kind == tolerance_kind::exact ? " exactly" : " +/- " + tolerance_text_;
    if (spec_.kind == check_kind::never) {
        expected_text_ = "never";
    } else if (spec_.kind == check_kind::frequency) {
        if (spec_.expected_frequency)
            expected_text_ = spec_.expected_frequency->pretty() + tol_suffix;
    } else if (spec_.expected) {
        expected_text_ = value_text(*spec_.expected) + tol_suffix;
    } else if (spec_.minimum && spec_.maximum) {
        expected_text_ =
            "at least " + value_text(*spec_.minimum) + " and at most " + value_text(*spec_.maximum);
    } else if (spec_.minimum) {
        expected_text_ = "at least " + value_text(*spec_.minimum);
    } else if (spec_.maximum) {
        expected_text_ = "at most " + value_text(*spec_.maximum);
    }
}

void check_state::on_change(unsigned, bool, time_ps) {}
void check_state::on_instant(const std::uint8_t*, time_ps) {}

check_state::verdict check_state::judge(u128 x, u128 t, u128 w) const {
    if (spec_.expected) {
        const u128 lhs = x * w;
        const u128 rhs = u128{*spec_.expected} * t;
        if (lhs == rhs) return verdict::ok;
        const verdict dir = lhs > rhs ? verdict::above : verdict::below;
        const u128 diff = lhs > rhs ? lhs - rhs : rhs - lhs;
        const tolerance& tol = spec_.tol;
        switch (tol.kind) {
            case tolerance_kind::exact:
                return dir;
            case tolerance_kind::absolute:
                return compare_products(diff, 1, tol.amount, t) <= 0 ? verdict::ok : dir;
            case tolerance_kind::relative:
                return compare_products(diff, ppb_per_whole, u128{tol.amount} * *spec_.expected,
                                        t) <= 0
                           ? verdict::ok
                           : dir;
            case tolerance_kind::ticks:
                // Time deviation diff / w ps against amount ticks plus 1 ps of rounding.
                return compare_products(diff, tol.tick_den,
                                        u128{tol.amount} * tol.tick_num + tol.tick_den, w) <= 0
                           ? verdict::ok
                           : dir;
        }
        return dir;
    }
    if (spec_.minimum && compare_products(x, w, *spec_.minimum, t) < 0) return verdict::below;
    if (spec_.maximum && compare_products(x, w, *spec_.maximum, t) > 0) return verdict::above;
    return verdict::ok;
}

check_state::verdict check_state::judge_frequency(time_ps period) const {
    const frequency& f = *spec_.expected_frequency;
    // Measured 1e12 / T Hz against n / d Hz: compare 1e12 d with n T.
    const u128 x = u128{ps_per_second} * f.den();
    const u128 y = u128{f.num()} * period;
    if (x == y) return verdict::ok;
    const verdict dir = x > y ? verdict::above : verdict::below;
    const u128 diff = x > y ? x - y : y - x;  // |f_measured - f| = diff / (d T)
    const tolerance& tol = spec_.tol;
    switch (tol.kind) {
        case tolerance_kind::exact:
            return dir;
        case tolerance_kind::absolute: {
            const frequency& a = tol.absolute_frequency;  // an / ad Hz
            return compare_products(diff, a.den(), u128{a.num()} * f.den(), period) <= 0
                       ? verdict::ok
                       : dir;
        }
        case tolerance_kind::relative:
            return compare_products(diff, ppb_per_whole, u128{tol.amount} * f.num(), period) <= 0
                       ? verdict::ok
                       : dir;
        case tolerance_kind::ticks:
            // The period may deviate by amount ticks (plus 1 ps of rounding): |T - 1e12 d / n| =
            // diff / n.
            return compare_products(diff, tol.tick_den,
                                    u128{tol.amount} * tol.tick_num + tol.tick_den, f.num()) <= 0
                       ? verdict::ok
                       : dir;
    }
    return dir;
}

void check_state::add_stat(std::uint64_t shown) {
    if (count_ == 0 || shown < min_) min_ = shown;
    if (count_ == 0 || shown > max_) max_ = shown;
    sum_ += shown;
    ++count_;
}

std::string check_state::failure_phrase(verdict v) const {
    if (spec_.expected || spec_.expected_frequency)
        return (v == verdict::above ? "exceeds " : "falls short of ") + expected_text_;
    if (v == verdict::below) return "is below the minimum " + value_text(*spec_.minimum);
    return "is above the maximum " + value_text(*spec_.maximum);
}

std::string check_state::value_text(std::uint64_t shown) const {
    switch (spec_.kind) {
        case check_kind::duty_cycle:
            return fixed_text(shown, 7) + " %";
        case check_kind::edge_count:
            return std::to_string(shown) + (shown == 1 ? " edge" : " edges");
        case check_kind::never:
            return std::to_string(shown) + " occurrences";
        default:
            return is_angle(spec_) ? fixed_text(shown, 6) + " deg" : format_time(shown);
    }
}

std::string check_state::window_text() const {
    if (start_ == 0 && until_ == max_time_ps) return "during the run";
    if (until_ == max_time_ps) return "from " + format_time(start_) + " on";
    return "between " + format_time(start_) + " and " + format_time(until_);
}

std::string check_state::signals_text() const {
    std::string s;
    for (std::size_t i = 0; i < names_.size(); ++i) {
        if (i != 0) s += i + 1 == names_.size() ? (names_.size() == 2 ? " and " : ", and ") : ", ";
        s += names_[i];
    }
    return s;
}

void check_state::fail_no_data(time_ps end, const std::string& what) {
    const time_ps at = std::min(end, until_);
    fail(at, [&] {
        if (!moved_) return signals_text() + " never changed " + window_text();
        return "no " + what + " " + window_text();
    });
}

void check_state::conclude(time_ps end, const char* noun_plural) {
    finished_ = true;
    end_ = end;
    if (failed_) {
        detail_ = fail_sentence_;
        if (failures_ > 1 && count_ > 0) {
            detail_ += "; " + std::to_string(failures_) + " of " + std::to_string(count_) + " " +
                       noun_plural + " failed";
        }
        return;
    }
    const bool within =
        (spec_.expected || spec_.expected_frequency) && spec_.tol.kind != tolerance_kind::exact;
    detail_ = std::to_string(count_) + " " + noun_plural + (within ? ", all within " : ", all ") +
              expected_text_;
}

void check_state::conclude_open(time_ps end, const char* noun_plural, const char* noun) {
    if (open_failed_) --failures_;
    conclude(end, noun_plural);
    if (open_failed_ && failures_ > 0)
        detail_ += std::string("; the last ") + noun +
                   ", still open when the window closed, was already too long";
}

std::size_t check_state::footprint_bytes() const {
    std::size_t n = object_bytes() + fail_sentence_.capacity() + detail_.capacity() +
                    expected_text_.capacity() + tolerance_text_.capacity() +
                    ids_.capacity() * sizeof(signal_id);
    for (const std::string& s : names_) n += sizeof(std::string) + s.capacity();
    return n;
}

check_result check_state::result() const {
    check_result r;
    r.name = spec_.name;
    r.kind = spec_.kind;
    r.unit = check_unit(spec_);
    switch (spec_.kind) {
        case check_kind::phase:
        case check_kind::latency:
            r.signal = names_.at(0) + " -> " + names_.at(1);
            break;
        case check_kind::dead_time:
            r.signal = names_.at(0) + " / " + names_.at(1);
            break;
        case check_kind::never:
            r.signal = spec_.condition;
            break;
        default:
            r.signal = names_.empty() ? "" : names_[0];
            break;
    }
    const auto to_unit = [&](double v) {
        switch (spec_.kind) {
            case check_kind::duty_cycle:
                return v / 1e7;
            case check_kind::edge_count:
            case check_kind::never:
                return v;
            default:
                return is_angle(spec_) ? v / 1e6 : v / 1e12;
        }
    };
    if (spec_.kind == check_kind::never) {
        r.expected = 0.0;
    } else if (spec_.kind == check_kind::frequency) {
        if (spec_.expected_frequency) r.expected = spec_.expected_frequency->approx_hz();
    } else if (spec_.expected) {
        r.expected = to_unit(static_cast<double>(*spec_.expected));
    } else {
        if (spec_.minimum) r.expected_min = to_unit(static_cast<double>(*spec_.minimum));
        if (spec_.maximum) r.expected_max = to_unit(static_cast<double>(*spec_.maximum));
    }
    r.expected_text = expected_text_;
    r.tolerance_text = tolerance_text_;
    r.count = count_;
    const bool has_values = spec_.kind != check_kind::edge_count && spec_.kind != check_kind::never;
    if (has_values && count_ > 0) {
        const double mean = static_cast<double>(sum_) / static_cast<double>(count_);
        if (spec_.kind == check_kind::frequency) {
            // Stats hold periods in ps; the mean frequency is periods over their total time.
            r.min = 1e12 / static_cast<double>(max_);
            r.max = 1e12 / static_cast<double>(min_);
            r.mean = 1e12 / mean;
        } else {
            r.min = to_unit(static_cast<double>(min_));
            r.mean = to_unit(mean);
            r.max = to_unit(static_cast<double>(max_));
        }
    }
    r.passed = !failed_;
    r.at = failed_ ? fail_at_ : end_;
    if (failed_ && fail_spans_) r.fail_from = fail_from_;
    r.detail = detail_;
    return r;
}

}  // namespace sim::detail
