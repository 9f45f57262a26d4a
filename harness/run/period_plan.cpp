// Prescaler and period choices for a target frequency; see period_plan.h.
//
// With C = c/d and T = a/b, a total division m of the effective clock (C for edge-aligned
// counting, C/2 for center-aligned) gives the relative error |P - m Q| / (m Q) with P = c b and
// Q = a d (times 2 for center-aligned). The error grows with m's distance from P / Q on either
// side, so the search walks outward from there, always taking the side with the smaller exact
// error, and lists the prescaler/period factorizations of each m, finest resolution first.

#include "harness/run/period_plan.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <stdexcept>

namespace harness::run {

namespace {

using sim::u128;

u128 mul(u128 a, u128 b) {
    u128 r = 0;
    if (__builtin_mul_overflow(a, b, &r))
        throw sim::arithmetic_error("plan: the frequencies are too large to compare exactly");
    return r;
}

u128 add(u128 a, u128 b) {
    u128 r = 0;
    if (__builtin_add_overflow(a, b, &r))
        throw sim::arithmetic_error("plan: the frequencies are too large to compare exactly");
    return r;
}

// a/b < c/d for errors (all positive denominators).
bool less_error(const plan_choice& x, const plan_choice& y) {
    return mul(x.error_num, y.error_den) < mul(y.error_num, x.error_den);
}

bool same_error(const plan_choice& x, const plan_choice& y) {
    return mul(x.error_num, y.error_den) == mul(y.error_num, x.error_den);
}

}  // namespace

std::string plan_choice::error_ppm_text() const {
    // ppm * 1000, rounded half up.
    const u128 whole = error_num / error_den;
    const u128 rest = error_num % error_den;
    const u128 scaled =
        add(mul(whole, 1'000'000'000), (mul(rest, 2'000'000'000) / error_den + 1) / 2);
    std::string frac = sim::u128_text(scaled % 1000);
    frac.insert(frac.begin(), 3 - frac.size(), '0');
    return std::string(below && scaled != 0 ? "-" : "+") + sim::u128_text(scaled / 1000) + "." +
           frac;
}

std::string plan_choice::resolution_bits_text() const {
    char b[32];
    // Display only: the ranking compares `steps` as integers.
    std::snprintf(b, sizeof b, "%.2f", std::log2(static_cast<double>(steps)));
    return b;
}

std::vector<plan_choice> plan_periods(const plan_request& rq) {
    if (rq.clock.is_zero() || rq.target.is_zero())
        throw std::invalid_argument("plan: clock and target must be above 0 Hz");
    if (rq.counter_bits < 1 || rq.counter_bits > 32 || rq.prescaler_bits < 1 ||
        rq.prescaler_bits > 32)
        throw std::invalid_argument("plan: counter and prescaler widths must be 1 to 32 bits");
    const u128 unit = rq.center ? 2 : 1;
    const u128 P = mul(rq.clock.num(), rq.target.den());
    const u128 Q = mul(mul(rq.target.num(), rq.clock.den()), unit);
    const u128 q_max = u128{1} << rq.prescaler_bits;  // prescaler + 1 ranges 1 .. q_max
    // Steps per period: n + 1 in 1 .. 2^bits (edge), n in 1 .. 2^bits - 1 (center).
    const u128 steps_max =
        rq.center ? (u128{1} << rq.counter_bits) - 1 : u128{1} << rq.counter_bits;
    const u128 m_max = mul(q_max, steps_max);

    auto choice_for = [&](u128 m, u128 q) {
        plan_choice c;
        c.prescaler = static_cast<std::uint64_t>(q - 1);
        c.steps = static_cast<std::uint64_t>(m / q);
        c.period = rq.center ? c.steps : c.steps - 1;
        const u128 mq = mul(m, Q);
        c.below = mq > P;
        c.error_num = c.below ? mq - P : P - mq;
        c.error_den = mq;
        const u128 g = sim::gcd128(c.error_num, c.error_den);
        if (g > 1) {
            c.error_num /= g;
            c.error_den /= g;
        }
        // achieved = C / (unit m) = c / (d unit m)
        const u128 den = mul(mul(rq.clock.den(), unit), m);
        const u128 g2 = sim::gcd128(rq.clock.num(), den);
        const u128 an = rq.clock.num() / g2;
        const u128 ad = den / g2;
        if (an > (u128{1} << 63) || ad > (u128{1} << 63))
            throw sim::arithmetic_error("plan: the achieved frequency is too large a fraction");
        c.achieved = sim::frequency(static_cast<std::uint64_t>(an), static_cast<std::uint64_t>(ad));
        return c;
    };
    // Every factorization m = q * steps within range, finest resolution (smallest q) first, with
    // at least two compare steps (one step gives only 0 or 100 % duty: no PWM).
    auto add_choices = [&](u128 m, std::vector<plan_choice>& out) {
        const u128 q_first = std::max<u128>(1, (m + steps_max - 1) / steps_max);
        const u128 q_last = std::min(q_max, m / 2);
        for (u128 q = q_first; q <= q_last; ++q)
            if (m % q == 0) out.push_back(choice_for(m, q));
    };
    // err(m1) <= err(m2) for m1 <= P/Q < m2: P (m1 + m2) <= 2 m1 m2 Q.
    auto lower_first = [&](u128 m1, u128 m2) {
        return mul(P, add(m1, m2)) <= mul(mul(2, mul(m1, m2)), Q);
    };

    std::vector<plan_choice> found;
    u128 lo = P / Q;  // candidates at or below P/Q walk down, above walk up
    u128 hi = lo + 1;
    if (lo > m_max) {
        lo = m_max;
        hi = m_max + 1;
    }
    constexpr unsigned max_steps = 200'000;
    for (unsigned step = 0; step < max_steps; ++step) {
        const bool lo_ok = lo >= 1;
        const bool hi_ok = hi <= m_max;
        if (!lo_ok && !hi_ok) break;
        u128 m;
        if (lo_ok && (!hi_ok || lower_first(lo, hi))) {
            m = lo--;
        } else {
            m = hi++;
        }
        if (found.size() >= rq.max_results) {
            // Enough: go on only while candidates tie with the worst error kept.
            if (!same_error(choice_for(m, 1), found.back())) break;
        }
        add_choices(m, found);
    }
    std::stable_sort(found.begin(), found.end(), [](const plan_choice& x, const plan_choice& y) {
        if (!same_error(x, y)) return less_error(x, y);
        return x.steps > y.steps;
    });
    if (found.size() > rq.max_results) found.resize(rq.max_results);
    return found;
}

}  // namespace harness::run
