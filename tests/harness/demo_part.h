#pragma once
// A small part for harness tests: the demo part's 12 MHz crystal, a x8 PLL to 96 MHz clocking the
// CPU and a 16-bit timer ("stopwatch", demo layout timer16_quad in the demo part's peripheral slot
// 1 at 0x5000_0400, interrupt line 0). Demo values (examples/parts/demo_part.toml).

#include "harness/platform.h"
#include "models/layout/register_layout.h"

#include <string>

namespace test_support {

inline constexpr std::uint32_t stopwatch_base = 0x5000'0400;

inline void build_demo_part(harness::platform& p, const harness::cpu_config& cpu,
                            std::function<void()> entry,
                            std::optional<std::uint32_t> counter_start = {}) {
    sim::crystal_params x;
    x.nominal = sim::frequency::hz(12'000'000);
    p.clocks().add_crystal("xtal", x);
    sim::pll_params pll;
    pll.multiplier = 8;
    p.clocks().add_pll("sys", "xtal", pll);
    harness::timer_spec t;
    t.name = "stopwatch";
    t.layout = models::load_register_layout_file(std::string(TICKBENCH_SOURCE_DIR) +
                                                 "/models/layouts/timer16_quad.toml");
    t.clock = "sys";
    t.base = stopwatch_base;
    t.counter_start = counter_start;
    t.running_at_start = counter_start.has_value();  // a free-running counter the sweep can meet
    p.add_timer(std::move(t));
    harness::cpu_config c = cpu;
    c.clock = "sys";
    p.set_firmware(c, std::move(entry));
    p.build();
}

}  // namespace test_support
