/* Test firmware for `tickbench run` (tests/run/scenarios/fault.toml.in): the fault input of a demo
 * 16-bit timer (models/layouts/timer16_quad.toml) driven by the firmware itself with
 * tick_input_set(), as a test bench would. A center-aligned complementary pair runs on a 96 MHz
 * clock; at 1.005 ms the firmware raises the fault input, and 10 us later it logs the flags ("fault
 * flag set" when the fault flag is), lowers the input and re-arms. Parameter: base (the timer's
 * window, default 0x50000400).
 */
#include <tickbench/firmware.h>

#include <stdint.h>
#include <stdlib.h>

#include "demo_timers.h"
#include "input_support.h"

void tick_firmware_main(void) {
    const uint32_t base = param_number("base", 0x50000400u);
    const int fault = tick_input("bridge.fault");
    TICK_ASSERT(fault >= 0);
    tick_write16(base + Q16_LIMIT, 2400);
    tick_write16(base + Q16_MATCH(0), 720);
    tick_write16(base + Q16_GUARD,
                 (uint16_t)(Q16_GUARD_LATENCY(8) | Q16_GUARD_FAULT_ENABLE)); /* safe levels low */
    tick_write16(base + Q16_SHAPE_AB,
                 (uint16_t)Q16_SHAPE_BYTE(0, Q16_SHAPE_ACTION(DEMO_ACTION_PWM_BELOW) |
                                                 Q16_SHAPE_MAIN_ENABLE | Q16_SHAPE_COMP_ENABLE));
    tick_write16(base + Q16_RUN,
                 Q16_RUN_ENABLE | Q16_RUN_MODE(DEMO_MODE_CENTER) | Q16_RUN_SLOPE(DEMO_SLOPE_BOTH));
    wait_until_ps(1005000000ull);
    tick_input_set(fault, 1);
    wait_until_ps(1015000000ull);
    if (tick_read16(base + Q16_STATUS) & DEMO_FLAG_FAULT) tick_log("fault flag set");
    tick_input_set(fault, 0);
    tick_write8(base + Q16_KICK, Q16_KICK_REARM);
}
