/* Timekeeping across a wrap: a 32-bit millisecond count kept by the system tick timer's 1 kHz
 * interrupt, and timeouts computed from it.
 *
 * The count starts `start_before_wrap` milliseconds before it wraps from 0xffffffff to 0 (on
 * hardware it gets there after 49.7 days of uptime; here a parameter puts it there at once). The
 * firmware then runs a control loop: wait for a timeout of `timeout_ms`, then do `work_ms` of other
 * work (a busy stretch that leaves the next timeout starting between two ticks), again and again,
 * `rounds` times. A timeout is "deadline = now + delay", and it has expired when:
 *
 * - naive:     now >= deadline. When the deadline wraps past 0xffffffff it is a small number, and
 *              the comparison holds at once: the timeout expires immediately.
 * - wrap_safe: (int32_t)(now - deadline) >= 0. The difference is right across the wrap as long as
 *              deadlines lie less than 2^31 ms (24.8 days) ahead.
 *
 * After each timeout the firmware measures how long it really lasted in simulated time and records
 * the firmware check "every timeout lasts its delay"; a failure ends the run.
 *
 * Parameters: tick_base (the tick timer's window), tick_irq (its interrupt line's name), variant
 * (naive | wrap_safe), start_before_wrap (N: the count starts at 0xffffffff - N), timeout_ms,
 * work_ms, rounds.
 */
#include <tickbench/firmware.h>

#include <stdint.h>
#include <stdlib.h>
#include <string.h>

/* Registers of the demo part's tick timer (models/layouts/tick24.toml). */
#include "demo_timers.h"

/* The CPU and the tick timer count the board's 96 MHz system clock (timekeeping_wrap.toml). */
#define CPU_CYCLES_PER_MS 96000u
#define PS_PER_MS 1000000000ull

static uint32_t tick_base;
static volatile uint32_t now_ms;
static int wrap_safe;

static void on_tick(void) {
    /* Reading control acknowledges the tick: it clears the reached-zero flag. */
    if (tick_read32(tick_base + TK_CONTROL) & TK_CONTROL_REACHED_ZERO) now_ms = now_ms + 1u;
}

static int expired(uint32_t deadline) {
    if (wrap_safe) return (int32_t)(now_ms - deadline) >= 0;
    return now_ms >= deadline;
}

static uint32_t param_number(const char* name, const char* fallback) {
    return (uint32_t)strtoul(tick_param(name, fallback), NULL, 0);
}

void tick_firmware_main(void) {
    tick_base = param_number("tick_base", "0x50002000");
    wrap_safe = strcmp(tick_param("variant", "wrap_safe"), "wrap_safe") == 0;
    const uint32_t before_wrap = param_number("start_before_wrap", "20");
    const uint32_t timeout_ms = param_number("timeout_ms", "10");
    const uint32_t work_ms = param_number("work_ms", "3");
    const uint32_t rounds = param_number("rounds", "6");
    now_ms = 0xffffffffu - before_wrap;

    const int line = tick_irq_line(tick_param("tick_irq", "heartbeat"));
    TICK_ASSERT(line >= 0);
    tick_irq_set_handler((unsigned)line, on_tick);
    tick_irq_line_enable((unsigned)line);
    /* A reload value of N gives N + 1 counts per tick: 96000 counts of 96 MHz are 1 ms. */
    tick_write32(tick_base + TK_START_VALUE, CPU_CYCLES_PER_MS - 1u);
    tick_write32(tick_base + TK_COUNT_NOW, 0);
    tick_write32(tick_base + TK_CONTROL, TK_CONTROL_ENABLE | TK_CONTROL_NOTIFY);

    for (uint32_t round = 0; round < rounds; ++round) {
        const uint32_t start = now_ms;
        const uint32_t deadline = start + timeout_ms;
        const uint64_t began_ps = tick_now_ps();
        while (!expired(deadline)) tick_wait_for_interrupt();
        const uint64_t took_ps = tick_now_ps() - began_ps;
        tick_log("timeout from 0x%08x to 0x%08x took %llu ps", (unsigned)start, (unsigned)deadline,
                 (unsigned long long)took_ps);
        /* A timeout of n ticks started between two ticks lasts more than n - 1 and at most n tick
         * periods, plus the time to take the interrupt and leave the wait (common practice, no
         * source); 10 us covers that on this 96 MHz part (a demo bound). */
        tick_check(took_ps > (uint64_t)(timeout_ms - 1u) * PS_PER_MS &&
                       took_ps <= (uint64_t)timeout_ms * PS_PER_MS + 10000000ull,
                   "every timeout lasts its delay", __FILE__, __LINE__);
        tick_cycles(work_ms * CPU_CYCLES_PER_MS);
    }
    tick_log("%u rounds done, the count now 0x%08x", (unsigned)rounds, (unsigned)now_ms);
}
