// Metrics of the timer's input side, measured on the fast model as plain C++ (the model's own cost
// per input edge; the stimulus sources that feed a scenario's inputs add their own).
//
// - capture_edges_per_second: a 100 kHz square wave on channel 0's input of a timer clocked at
//   100 MHz, captured on two channels (channel 0 its rising edges, channel 1 the neighbour's
//   falling edges: period and pulse width), 0.2 s simulated: input edges per wall second; median
//   of 5.
// - encoder_cost_spread: a quadrature encoder of 2048 lines turning at 10 000 rpm (x4: 1.37 M
//   edges per second) counted in encoder x4 mode, 0.05 s simulated, at 1 MHz and 1 GHz timer
//   clocks: the wall time per edge of the slower over the faster; medians of 5 interleaved rounds.
//   Cost follows the edges, not the clock.

#include "models/timer/timer_core.h"
#include "tests/bench/interleaved.h"
#include "tests/bench/metric.h"

#include <chrono>
#include <vector>

namespace {

using models::timer_field;
using clock_type = std::chrono::steady_clock;

struct no_observer final : models::timer_observer {
    std::uint64_t pins = 0;
    void on_pin(unsigned, bool, sim::time_ps) override { ++pins; }
    void on_flags_set(std::uint32_t, sim::time_ps) override {}
    void on_irq(bool, sim::time_ps) override {}
    void on_trigger(sim::time_ps) override {}
};

double seconds_since(clock_type::time_point t0) {
    return std::chrono::duration<double>(clock_type::now() - t0).count();
}

// Wall seconds per input edge of a 100 kHz square wave captured on two channels at 100 MHz.
double capture_seconds_per_edge(sim::time_ps simulated) {
    models::timer_config cfg;
    cfg.counter_bits = 32;
    cfg.channels = 2;
    sim::clock_domain clock(sim::frequency::hz(100'000'000));
    no_observer obs;
    models::timer_core timer(cfg, clock, &obs);
    timer.write(timer_field::channel_role, 0,
                static_cast<std::uint32_t>(models::channel_role::capture_own), 0);
    timer.write(timer_field::channel_role, 1,
                static_cast<std::uint32_t>(models::channel_role::capture_neighbour), 0);
    timer.write(timer_field::capture_edge, 1,
                static_cast<std::uint32_t>(models::capture_edge::falling), 0);
    timer.write(timer_field::trigger_action, 0,
                static_cast<std::uint32_t>(models::trigger_action::restart), 0);
    timer.write(timer_field::enable, 0, 1, 0);
    constexpr sim::time_ps half_period = 5'000'000;  // 100 kHz, 50 % duty
    std::uint64_t edges = 0;
    const auto t0 = clock_type::now();
    bool level = false;
    for (sim::time_ps t = 1'234'567; t < simulated; t += half_period) {
        level = !level;
        timer.set_input(models::input_of_channel(0), level, t);
        ++edges;
    }
    timer.advance_to(simulated);
    return seconds_since(t0) / static_cast<double>(edges);
}

double capture_edges_per_second(bool quick) {
    const sim::time_ps simulated = quick ? 2'000'000'000 : 200'000'000'000;  // 2 ms / 0.2 s
    std::vector<double> rates;
    for (int i = 0; i < (quick ? 1 : 5); ++i)
        rates.push_back(1.0 / capture_seconds_per_edge(simulated));
    return bench::median(rates);
}

// Wall seconds per encoder edge at a timer clock of `hz`.
double encoder_seconds_per_edge(std::uint64_t hz, sim::time_ps simulated) {
    models::timer_config cfg;
    cfg.counter_bits = 16;
    cfg.channels = 2;
    sim::clock_domain clock(sim::frequency::hz(hz));
    no_observer obs;
    models::timer_core timer(cfg, clock, &obs);
    timer.write(timer_field::period, 0, 4 * 2048 - 1, 0);
    timer.write(timer_field::count_source, 0,
                static_cast<std::uint32_t>(models::count_source::encoder_x4), 0);
    timer.write(timer_field::enable, 0, 1, 0);
    // 10 000 rpm x 2048 lines x 4 edges per line: an edge every 1 / (1 365 333.3 Hz) = 732421.875
    // ps; A and B alternate, a quarter line apart.
    const double edge_ps = 1e12 / (10'000.0 / 60.0 * 2048.0 * 4.0);
    bool a = false, b = false;
    std::uint64_t edges = 0;
    const auto t0 = clock_type::now();
    for (std::uint64_t k = 1;; ++k) {
        const auto t = static_cast<sim::time_ps>(static_cast<double>(k) * edge_ps);
        if (t >= simulated) break;
        // Quadrature: A rises, B rises, A falls, B falls.
        if (k % 2 == 1) {
            a = !a;
            timer.set_input(models::input_of_channel(0), a, t);
        } else {
            b = !b;
            timer.set_input(models::input_of_channel(1), b, t);
        }
        ++edges;
    }
    timer.advance_to(simulated);
    return seconds_since(t0) / static_cast<double>(edges);
}

double encoder_cost_spread(bool quick) {
    const sim::time_ps simulated = quick ? 2'000'000'000 : 50'000'000'000;  // 2 ms / 50 ms
    const std::vector<double> m = bench::interleaved_medians(
        quick ? 1 : 5, {[&] { return encoder_seconds_per_edge(1'000'000, simulated); },
                        [&] { return encoder_seconds_per_edge(1'000'000'000, simulated); }});
    return std::max(m[0], m[1]) / std::min(m[0], m[1]);
}

const bench::add_metric capture{
    {"capture_edges_per_second", "edges/s",
     "input edges per wall second: 100 kHz square wave captured on two channels (period and "
     "pulse) at a 100 MHz timer clock, fast model as plain C++, 0.2 s simulated, median of 5",
     nullptr, 0, capture_edges_per_second}};
const bench::add_metric encoder{
    {"encoder_cost_spread", "x",
     "wall time per edge of a 2048-line x4 encoder at 10 000 rpm, 1 MHz vs 1 GHz timer clock, "
     "slower / faster, medians of 5 interleaved rounds",
     nullptr, 0, encoder_cost_spread}};

}  // namespace
