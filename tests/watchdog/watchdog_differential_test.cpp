// Randomized differential test of the watchdog: the fast core, which computes its timeout by
// arithmetic, against a tick-exact reference written here, a loop over every oscillator edge
// applying the rules of docs/watchdog.md one by one. Random programs of starts, settings, key
// writes and reads at random times must give the same reads, the same reset (cause and
// picosecond) and the same next-event times.
#include "models/watchdog/watchdog_core.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <optional>
#include <random>
#include <sstream>
#include <string>

namespace {

using models::watchdog_fault;
using models::watchdog_field;

class watchdog_reference {
public:
    watchdog_reference(const models::watchdog_config& cfg, const sim::clock_domain& clock)
        : cfg_(cfg), clock_(clock), reload_(cfg.counter_max()), window_(cfg.counter_max()) {}

    void advance_to(sim::time_ps t) {
        const std::uint64_t n = clock_.tick_at(t + 1);
        for (; done_ < n; ++done_) step(done_);
    }
    void write(watchdog_field f, std::uint32_t v, sim::time_ps t) {
        advance_to(t);
        if (fault_) return;
        switch (f) {
            case watchdog_field::key:
                if (v == models::watchdog_key_first) {
                    armed_ = true;
                } else if (v == models::watchdog_key_second && armed_) {
                    armed_ = false;
                    if (!running_) break;
                    if (counter_ > window_) {
                        fault_ = watchdog_fault::early_refresh;
                        fault_at_ = t;
                        break;
                    }
                    counter_ = reload_;
                    since_ = 0;
                } else {
                    armed_ = false;
                }
                break;
            case watchdog_field::start:
                if ((v & 1) != 0 && !running_) {
                    running_ = true;
                    counter_ = reload_;
                    since_ = 0;
                }
                break;
            case watchdog_field::prescaler:
                if (!running_) prescaler_ = std::min<std::uint32_t>(v, 6);
                break;
            case watchdog_field::reload:
                if (!running_) reload_ = v & cfg_.counter_max();
                break;
            case watchdog_field::window:
                if (!running_) window_ = v & cfg_.counter_max();
                break;
            case watchdog_field::count:
                break;
        }
    }
    std::uint32_t read(watchdog_field f, sim::time_ps t) {
        advance_to(t);
        switch (f) {
            case watchdog_field::key:
                return 0;
            case watchdog_field::start:
                return running_;
            case watchdog_field::prescaler:
                return prescaler_;
            case watchdog_field::reload:
                return reload_;
            case watchdog_field::window:
                return window_;
            case watchdog_field::count:
                return fault_ ? 0 : running_ ? counter_ : reload_;
        }
        return 0;
    }
    // Found by stepping a copy edge by edge.
    bool next_event(sim::time_ps& at) const {
        if (!running_ || fault_) return false;
        watchdog_reference probe = *this;
        for (std::uint64_t k = done_;; ++k) {
            probe.step(k);
            if (probe.fault_) {
                at = probe.fault_at_;
                return true;
            }
        }
    }
    std::optional<watchdog_fault> fault() const { return fault_; }
    sim::time_ps fault_at() const { return fault_at_; }

private:
    void step(std::uint64_t k) {
        if (!running_ || fault_) return;
        if (++since_ < (4u << prescaler_)) return;
        since_ = 0;
        if (counter_ <= 1) {
            counter_ = 0;
            fault_ = watchdog_fault::timeout;
            fault_at_ = clock_.time_of(k);
            return;
        }
        --counter_;
    }

    models::watchdog_config cfg_;
    const sim::clock_domain& clock_;
    std::uint64_t done_ = 0;
    bool running_ = false;
    bool armed_ = false;
    std::uint32_t prescaler_ = 0;
    std::uint32_t reload_;
    std::uint32_t window_;
    std::uint32_t counter_ = 0;
    std::uint32_t since_ = 0;  // edges counted since the last step or load
    std::optional<watchdog_fault> fault_;
    sim::time_ps fault_at_ = 0;
};

std::string run_program(std::uint64_t seed) {
    std::mt19937_64 rng(seed);
    const auto pick = [&](std::uint64_t lo, std::uint64_t hi) {
        return std::uniform_int_distribution<std::uint64_t>(lo, hi)(rng);
    };
    models::watchdog_config cfg;
    cfg.counter_bits = unsigned(pick(4, 6));
    // Slow oscillators around 40 kHz, some with periods that are not whole picoseconds.
    const sim::clock_domain clock(sim::frequency(pick(20'000, 60'000) * 3 + pick(0, 2), 3));
    models::watchdog_core fast(cfg, clock);
    watchdog_reference ref(cfg, clock);
    const sim::time_ps edge = clock.time_of(1) - clock.time_of(0) + 1;
    sim::time_ps t = 0;
    std::ostringstream trace;
    for (int op = 0; op < 200; ++op) {
        t += pick(0, edge * 40);
        const auto what = pick(0, 9);
        if (what <= 1) {
            const auto f = static_cast<watchdog_field>(pick(1, 4));
            const auto v = static_cast<std::uint32_t>(pick(0, cfg.counter_max() + 2));
            trace << "write " << to_string(f) << "=" << v << " @" << t << "\n";
            fast.write(f, v, t);
            ref.write(f, v, t);
        } else if (what <= 5) {
            const std::uint32_t keys[] = {models::watchdog_key_first, models::watchdog_key_second,
                                          models::watchdog_key_second, 0x1234};
            const std::uint32_t v = keys[pick(0, 3)];
            trace << "key " << v << " @" << t << "\n";
            fast.write(watchdog_field::key, v, t);
            ref.write(watchdog_field::key, v, t);
        } else if (what <= 7) {
            sim::time_ps a = 0, b = 0;
            const bool fa = fast.next_event(a), rb = ref.next_event(b);
            if (fa != rb || (fa && a != b))
                return trace.str() + "next event differs: fast " +
                       (fa ? std::to_string(a) : "none") + ", reference " +
                       (rb ? std::to_string(b) : "none");
        }
        for (std::uint32_t i = 0; i < models::watchdog_field_count; ++i) {
            const auto f = static_cast<watchdog_field>(i);
            const auto a = fast.read(f, t), b = ref.read(f, t);
            if (a != b)
                return trace.str() + "read " + to_string(f) + " @" + std::to_string(t) + ": fast " +
                       std::to_string(a) + ", reference " + std::to_string(b);
        }
        if (fast.fault() != ref.fault() || (fast.fault() && fast.fault_time() != ref.fault_at()))
            return trace.str() + "resets differ after " + std::to_string(op) + " steps";
        if (fast.fault()) break;
    }
    return "";
}

TEST(watchdog_differential_test, fast_core_matches_the_tick_exact_reference) {
    for (std::uint64_t seed = 1; seed <= 300; ++seed) {
        const std::string diff = run_program(seed);
        ASSERT_EQ(diff, "") << "seed " << seed;
    }
}

}  // namespace
