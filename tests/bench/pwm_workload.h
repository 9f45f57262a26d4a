#pragma once
// The benchmarks' common workload: a 3-channel 25 kHz edge-aligned PWM (duties 25, 50, 75 %),
// the kind a motor or fan controller runs, on a 32-bit timer instance.

#include "models/timer/timer_types.h"

#include <cstdint>

namespace bench {

inline constexpr std::uint64_t pwm_hz = 25'000;

// The timer instance the workload runs on.
inline models::timer_config pwm_config() {
    models::timer_config cfg;
    cfg.counter_bits = 32;
    cfg.channels = 3;
    return cfg;
}

// Programs the PWM for a timer clock of `clock_hz` through `write(field, channel, value)`.
template <typename Write>
void program_pwm(std::uint64_t clock_hz, Write write) {
    using models::timer_field;
    const auto period = static_cast<std::uint32_t>(clock_hz / pwm_hz);  // ticks per period
    write(timer_field::period, 0, period - 1);
    for (unsigned c = 0; c < 3; ++c) {
        write(timer_field::compare, c, period * (c + 1) / 4);
        write(timer_field::action, c, static_cast<std::uint32_t>(models::output_action::pwm_below));
        write(timer_field::main_enable, c, 1);
    }
    write(timer_field::enable, 0, 1);
}

}  // namespace bench
