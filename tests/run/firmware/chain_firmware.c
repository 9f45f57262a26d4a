/* Test firmware: a 32-bit count from two chained demo 16-bit timers (models/layouts/
 * timer16_quad.toml), read naively and safely at an instant where the low timer wraps between the
 * reads. The low timer runs over its whole range and sends a trigger pulse at every reload event;
 * the high timer counts the accepted triggers of its chained input ([inputs] "high.chain" =
 * "low"). The value is high << 16 | low. Entry `chain_main`. Parameters:
 *   low, high  addresses of the two timers' windows (default 0x50000400 and 0x50000800)
 *   start      the low counter's value when it starts (default 0xfff0: 16 counts before its wrap)
 *   delay      CPU cycles from the write that starts the low timer to the first read (default 13)
 * Each read runs twice from the same start (both counters set again, the low one stopped first):
 *   naive  high, then low: "naive read 0x00000001"; then, 20 cycles later, the high counter
 *          once the wrap has reached it: "high counter after the hand-off: 1";
 *   safe   high, low, high again, and again from the start while the two highs differ:
 *          "safe read 0x00010007 after 1 retry".
 */
#include <tickbench/firmware.h>

#include <stdint.h>

#include "demo_timers.h"
#include "input_support.h"

static uint32_t low, high;

/* Both counters set, the low one started: returns once the write that starts it is done. It first
 * lets a hand-off still under way from an earlier wrap reach the high timer. */
static void restart(uint16_t start) {
    tick_cycles(20);
    tick_write16(low + Q16_RUN, Q16_RUN_TRIGGER(DEMO_TRIGGER_ON_RELOAD));
    tick_write16(high + Q16_COUNT, 0);
    tick_write16(low + Q16_COUNT, start);
    tick_write16(low + Q16_RUN, Q16_RUN_ENABLE | Q16_RUN_TRIGGER(DEMO_TRIGGER_ON_RELOAD));
}

void chain_main(void) {
    low = param_number("low", 0x50000400u);
    high = param_number("high", 0x50000800u);
    const uint16_t start = (uint16_t)param_number("start", 0xfff0u);
    const uint32_t delay = param_number("delay", 13);

    tick_write16(high + Q16_LINK, Q16_LINK_COUNT(DEMO_COUNT_TRIGGER_EDGES) |
                                      Q16_LINK_TRIGGER_FROM(DEMO_TRIGGER_FROM_CHAIN));
    tick_write16(high + Q16_RUN, Q16_RUN_ENABLE);

    restart(start);
    tick_cycles(delay);
    const uint16_t naive_high = tick_read16(high + Q16_COUNT);
    const uint16_t naive_low = tick_read16(low + Q16_COUNT);
    tick_log("naive read 0x%08x", (unsigned)((uint32_t)naive_high << 16 | naive_low));
    tick_cycles(20);
    tick_log("high counter after the hand-off: %u", (unsigned)tick_read16(high + Q16_COUNT));

    restart(start);
    tick_cycles(delay);
    unsigned retries = 0;
    uint16_t first, second, value;
    for (;;) {
        first = tick_read16(high + Q16_COUNT);
        value = tick_read16(low + Q16_COUNT);
        second = tick_read16(high + Q16_COUNT);
        if (first == second) break;
        ++retries;
    }
    tick_log("safe read 0x%08x after %u %s", (unsigned)((uint32_t)second << 16 | value), retries,
             retries == 1 ? "retry" : "retries");
}
