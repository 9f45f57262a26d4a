#pragma once
// The waveform tests' workload: a timer driving a 3-channel 25 kHz PWM from a 48 MHz timer clock.
//
// 48 MHz / 1920 ticks = 25 kHz, a 40 us period; the compare values are multiples of 48 ticks
// (1 us), so every edge lies on a whole microsecond and a 10 ns or 100 ns timescale keeps it exact.
// The three duties differ (10 %, 50 %, 85 %) so a reader that mixes channels up is caught.

#include "models/timer/timer_core.h"

#include <array>
#include <cstdint>

namespace tickbench::waves_test {

inline constexpr std::uint64_t clock_hz = 48'000'000;
inline constexpr std::uint32_t period_ticks = 1920;
inline constexpr std::array<std::uint32_t, 3> compare_ticks = {192, 960, 1632};
inline constexpr sim::time_ps period_ps = 40'000'000;  // 1920 / 48 MHz

// The timer's configuration: 3 channels, main outputs only.
inline models::timer_config pwm_config() {
    models::timer_config cfg;
    cfg.channels = 3;
    return cfg;
}

// Programs `timer` at time 0: up-counting, period 1920 ticks, channel c active while the counter is
// below compare_ticks[c]. The outputs are enabled just before the first wrap, which is at 40 us:
// writes show at the next clock edge, so the outputs start there with a whole period and every
// edge lies on a whole microsecond.
inline void start_pwm(models::timer_core_if& timer) {
    using models::timer_field;
    timer.write(timer_field::prescaler, 0, 0, 0);
    timer.write(timer_field::period, 0, period_ticks - 1, 0);
    for (unsigned c = 0; c < compare_ticks.size(); ++c) {
        timer.write(timer_field::compare, c, compare_ticks[c], 0);
        timer.write(timer_field::action, c,
                    static_cast<std::uint32_t>(models::output_action::pwm_below), 0);
    }
    timer.write(timer_field::force_reload, 0, 1, 0);
    timer.write(timer_field::enable, 0, 1, 0);
    for (unsigned c = 0; c < compare_ticks.size(); ++c)
        timer.write(timer_field::main_enable, c, 1, period_ps - 1);
}

}  // namespace tickbench::waves_test
