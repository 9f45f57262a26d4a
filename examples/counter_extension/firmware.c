/* Counter extension: a 32-bit timestamp from a 16-bit timer plus an overflow count kept by the
 * timer's reload interrupt. Two ways to read it:
 *
 * - naive: reads the overflow count, then the counter. If the counter wraps between the two (the
 *   overflow interrupt runs in between, or is still pending), the result drops by 65536: time goes
 *   backwards. The bug hides on hardware because the window is a few cycles wide.
 * - careful: reads with interrupts held off and, if the overflow is pending, counts it and re-reads
 *   the counter, so the result never goes backwards.
 *
 * The firmware reads the timestamp in a loop across a wrap and records a firmware check "timestamps
 * never go backwards". Parameters: variant = naive | careful, timer_base (address of the timer's
 * register window), reads (loop count), timer_irq (interrupt line name).
 */
#include <tickbench/firmware.h>

#include <stdint.h>
#include <stdlib.h>
#include <string.h>

/* Registers of the demo part's 16-bit timer (models/layouts/timer16_quad.toml). */
#include "demo_timers.h"

static uint32_t base;
static volatile uint32_t overflows;

/* Set by the last run: how many times a timestamp came out smaller than the one before. */
uint32_t counter_extension_backwards;

static void on_overflow(void) {
    tick_write16(base + Q16_STATUS_CLEAR, DEMO_FLAG_RELOAD);
    overflows = overflows + 1;
}

static uint32_t now_naive(void) {
    uint32_t high = overflows;
    uint32_t low = tick_read16(base + Q16_COUNT);
    return (high << 16) | low;
}

static uint32_t now_careful(void) {
    int was_enabled = tick_irq_disable();
    uint32_t high = overflows;
    uint32_t low = tick_read16(base + Q16_COUNT);
    if (tick_read16(base + Q16_STATUS) & DEMO_FLAG_RELOAD) {
        /* The counter wrapped and its interrupt has not run yet: count the wrap, and read the
         * counter again so the low half is surely from after the wrap. */
        high = high + 1;
        low = tick_read16(base + Q16_COUNT);
    }
    if (was_enabled) tick_irq_enable();
    return (high << 16) | low;
}

void tick_firmware_main(void) {
    const int careful = strcmp(tick_param("variant", "careful"), "careful") == 0;
    base = (uint32_t)strtoul(tick_param("timer_base", "0x50000400"), NULL, 0);
    const long reads = strtol(tick_param("reads", "64"), NULL, 0);
    const int line = tick_irq_line(tick_param("timer_irq", "stopwatch"));
    overflows = 0;
    counter_extension_backwards = 0;

    tick_irq_set_handler((unsigned)line, on_overflow);
    tick_write16(base + Q16_LIMIT, 0xffffu);
    tick_write16(base + Q16_SCALE, 0);
    tick_write16(base + Q16_NOTIFY, DEMO_FLAG_RELOAD);
    tick_irq_line_enable((unsigned)line);
    tick_write16(base + Q16_RUN, Q16_RUN_ENABLE); /* counting up from wherever the counter stands */

    uint32_t previous = careful ? now_careful() : now_naive();
    for (long i = 0; i < reads; ++i) {
        tick_cycles(4); /* the loop's own work between two reads */
        const uint32_t t = careful ? now_careful() : now_naive();
        if (t < previous) {
            counter_extension_backwards++;
            tick_log("timestamp went backwards: 0x%08x after 0x%08x", t, previous);
        }
        previous = t;
    }
    tick_check(counter_extension_backwards == 0, "timestamps never go backwards", __FILE__,
               __LINE__);
}
