/* Test firmware: input periods measured by captures of a free-running demo 16-bit timer
 * (models/layouts/timer16_quad.toml), with wrap-safe unsigned subtraction. Channels 1 and 2
 * capture the rising edges of their own inputs; the counter runs over its whole 16-bit range
 * (period 0xffff), so the difference of two captures taken modulo 2^16 is the number of counts
 * between them even when the counter wrapped in between, as long as the input period is shorter
 * than 65536 counts. Entry `capture_main`. Parameters:
 *   base       address of the timer's window (default 0x50000800)
 *   captures1  captures taken on channel 1 (default 2), then
 *   captures2  captures taken on channel 2 (default 4)
 * For each channel it logs every period ("input1: 59998 -> 34462, period 40000 across the wrap"
 * when the second capture is below the first), then the total, the shortest and the longest
 * ("input2: 3 periods, 40000 counts, shortest 13333, longest 13334").
 */
#include <tickbench/firmware.h>

#include <stdint.h>

#include "demo_timers.h"
#include "input_support.h"

static void measure(uint32_t base, unsigned channel, uint32_t captures) {
    if (captures < 2) return;
    uint16_t previous = q16_next_capture(base, channel);
    uint32_t total = 0;
    uint16_t shortest = 0xffff, longest = 0;
    for (uint32_t i = 1; i < captures; ++i) {
        const uint16_t now = q16_next_capture(base, channel);
        const uint16_t period = (uint16_t)(now - previous);
        tick_log("input%u: %u -> %u, period %u%s", channel + 1, (unsigned)previous, (unsigned)now,
                 (unsigned)period, now < previous ? " across the wrap" : "");
        total += period;
        if (period < shortest) shortest = period;
        if (period > longest) longest = period;
        previous = now;
    }
    tick_log("input%u: %u periods, %u counts, shortest %u, longest %u", channel + 1,
             (unsigned)(captures - 1), (unsigned)total, (unsigned)shortest, (unsigned)longest);
}

void capture_main(void) {
    const uint32_t base = param_number("base", 0x50000800u);
    tick_write16(base + Q16_SENSE, Q16_SENSE_ROLE(0, DEMO_ROLE_CAPTURE_OWN) |
                                       Q16_SENSE_ROLE(1, DEMO_ROLE_CAPTURE_OWN));
    tick_write16(base + Q16_RUN, Q16_RUN_ENABLE);
    measure(base, 0, param_number("captures1", 2));
    measure(base, 1, param_number("captures2", 4));
}
