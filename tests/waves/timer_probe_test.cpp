#include "models/timer/timer_probe.h"
#include "sim/vcd_writer.h"
#include "tests/support/timer_event_log.h"
#include "tests/waves/pwm_workload.h"
#include "tests/waves/vcd_reader.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <string>
#include <tuple>
#include <vector>

namespace {

namespace fs = std::filesystem;
using namespace tickbench::waves_test;

// A sink that remembers declarations and changes.
struct recording_sink final : sim::signal_sink {
    void declare(sim::signal_id id, const sim::signal_info& info) override {
        ids.push_back(id);
        names.push_back(info.scope + "." + info.name);
    }
    void begin() override {}
    void change(sim::signal_id id, bool level, sim::time_ps at) override {
        changes.emplace_back(id, level, at);
    }
    void end(sim::time_ps) override {}
    std::vector<sim::signal_id> ids;
    std::vector<std::string> names;
    std::vector<std::tuple<sim::signal_id, bool, sim::time_ps>> changes;
};

TEST(timer_probe_test, declares_outputs_and_irq_in_order) {
    models::timer_config cfg;
    cfg.channels = 2;
    cfg.complementary = true;
    recording_sink sink;
    const models::timer_probe probe("motor", cfg, sink, 7);
    const std::vector<sim::signal_id> ids = {7, 8, 9, 10, 11};
    const std::vector<std::string> names = {"motor.channel1", "motor.channel1_complement",
                                            "motor.channel2", "motor.channel2_complement",
                                            "motor.irq"};
    EXPECT_EQ(sink.ids, ids);
    EXPECT_EQ(sink.names, names);
    EXPECT_EQ(probe.end_id(), 12u);
    EXPECT_EQ(probe.pin_signal(models::comp_pin(1)), 10u);
    EXPECT_EQ(probe.irq_signal(), 11u);
    EXPECT_THROW(probe.pin_signal(models::main_pin(2)), std::out_of_range);

    recording_sink plain_sink;
    const models::timer_probe plain("fan", pwm_config(), plain_sink, 0);
    EXPECT_EQ(plain_sink.names.size(), 4u);  // three main outputs and the irq
    EXPECT_THROW(plain.pin_signal(models::comp_pin(0)), std::out_of_range);
}

TEST(timer_probe_test, forwards_pins_and_irq_and_chains) {
    recording_sink sink;
    tickbench::test_support::timer_event_log log;
    models::timer_probe probe("fan", pwm_config(), sink, 0, &log);
    const sim::clock_domain clock(sim::frequency::hz(clock_hz));
    models::timer_core timer(pwm_config(), clock, &probe);
    timer.write(models::timer_field::irq_enable, 0, models::flag_reload, 0);
    start_pwm(timer);
    timer.advance_to(100'000'000);  // 100 us
    timer.clear_flags(models::flag_reload, 50'000'000 + 100'000'000);
    timer.advance_to(200'000'000);
    // Every report reached the next observer, and each pin or irq report reached the sink.
    std::vector<std::tuple<sim::signal_id, bool, sim::time_ps>> expected;
    for (const auto& e : log.events) {
        if (e.kind == tickbench::test_support::timer_event_kind::pin)
            expected.emplace_back(probe.pin_signal(e.id), e.value != 0, e.at);
        if (e.kind == tickbench::test_support::timer_event_kind::irq)
            expected.emplace_back(probe.irq_signal(), e.value != 0, e.at);
    }
    EXPECT_EQ(sink.changes, expected);
    EXPECT_FALSE(log.flag_sets(models::flag_reload).empty());
    // The forced reload at 0 set the flag at the first clock edge after it (tick 1, 20833 ps),
    // raising the irq; the clear at 150 us (tick 7200) drops it at tick 7201; the reload at 160 us
    // raises it again.
    const std::vector<sim::time_ps> irq = {20'833, 150'020'833, 160'000'000};
    EXPECT_EQ(log.of_kind(tickbench::test_support::timer_event_kind::irq), irq);
}

// The 3-channel 25 kHz PWM at 48 MHz for 2 ms, through the probe into the writer: the file holds
// exactly the timer's edges, at 1 ps and at 10 ns.
TEST(timer_probe_test, pwm_waveform_holds_the_timer_edges_exactly) {
    const fs::path dir =
        fs::temp_directory_path() / ("tickbench_waves_probe_" + std::to_string(::getpid()));
    fs::create_directories(dir);
    for (const sim::time_ps unit : {sim::time_ps{1}, sim::time_ps{10'000}}) {
        SCOPED_TRACE(unit);
        const std::string path = (dir / ("pwm_" + std::to_string(unit) + ".vcd")).string();
        tickbench::test_support::timer_event_log log;
        std::uint64_t rounded = 0;
        {
            sim::vcd_options o;
            o.unit_ps = unit;
            sim::vcd_writer writer(path, o);
            models::timer_probe probe("pwm_timer", pwm_config(), writer, 0, &log);
            const sim::clock_domain clock(sim::frequency::hz(clock_hz));
            models::timer_core timer(pwm_config(), clock, &probe);
            writer.begin();
            start_pwm(timer);
            timer.advance_to(2'000'000'000);
            writer.end(2'000'000'000);
            rounded = writer.rounded_changes();
        }
        EXPECT_EQ(rounded, 0u);
        const vcd_contents v = read_vcd(path);
        EXPECT_EQ(v.unit_ps, unit);
        for (unsigned c = 0; c < 3; ++c) {
            std::vector<std::pair<sim::time_ps, char>> expected;
            for (const auto& e : log.events)
                if (e.kind == tickbench::test_support::timer_event_kind::pin &&
                    e.id == models::main_pin(c))
                    expected.emplace_back(e.at, e.value != 0 ? '1' : '0');
            const auto got = v.of("pwm_timer.channel" + std::to_string(c + 1));
            EXPECT_EQ(got, expected) << "channel " << c + 1;
            // 49 whole periods from 40 us (49 rises, 49 falls) and the rise at 2000 us:
            // advance_to(t) processes everything at or before t.
            EXPECT_EQ(got.size(), 99u);
            ASSERT_FALSE(got.empty());
            EXPECT_EQ(got.front(), std::make_pair(period_ps, '1'));
        }
        EXPECT_EQ(v.times.back(), 2'000'000'000u);
    }
}

}  // namespace
