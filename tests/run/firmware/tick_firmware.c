/* Test firmware for `tickbench run` (tests/run): a millisecond tick from the demo part's system
 * tick timer (models/layouts/tick24.toml) and a delay routine built on it, written the way a
 * driver would be. Parameters:
 *   base     address of the tick timer's window (default 0x50002000)
 *   delay_ms length of the delay to measure (default 10)
 * The CPU and the tick timer run on a 48 MHz clock; the tick timer counts it divided by 8
 * (6 MHz), so a reload value of 5999 gives one tick every 6000 counts: 1 ms.
 */
#include <tickbench/firmware.h>

#include <stdint.h>
#include <stdlib.h>

#include "demo_timers.h"

static uint32_t base;
static volatile uint32_t ms_ticks;
static volatile uint64_t tick_at[3];

static void on_tick(void) {
    /* Reading control acknowledges the tick: it clears the reached-zero flag. */
    const uint32_t control = tick_read32(base + TK_CONTROL);
    if (control & TK_CONTROL_REACHED_ZERO) {
        if (ms_ticks < 3) tick_at[ms_ticks] = tick_now_ps();
        ms_ticks = ms_ticks + 1;
    }
}

static void tick_start(uint32_t counts_per_tick) {
    tick_write32(base + TK_CONTROL, 0);
    tick_write32(base + TK_START_VALUE, counts_per_tick - 1u); /* N + 1 counts per tick */
    tick_write32(base + TK_COUNT_NOW, 0);                      /* any value: clears the counter */
    tick_write32(base + TK_CONTROL, TK_CONTROL_ENABLE | TK_CONTROL_DIVIDED | TK_CONTROL_NOTIFY);
}

static void delay_ms(uint32_t ms) {
    const uint32_t start = ms_ticks;
    while ((uint32_t)(ms_ticks - start) < ms) tick_wait_for_interrupt();
}

void tick_firmware_main(void) {
    base = (uint32_t)strtoul(tick_param("base", "0x50002000"), NULL, 0);
    const uint32_t delay = (uint32_t)strtoul(tick_param("delay_ms", "10"), NULL, 0);
    const int line = tick_irq_line(tick_param("irq", "heartbeat"));
    TICK_ASSERT(line >= 0);
    tick_irq_set_handler((unsigned)line, on_tick);
    tick_irq_line_enable((unsigned)line);
    tick_start(6000);

    /* Right after the start the counter is 0 or freshly reloaded, never above the reload value. */
    const uint32_t now = tick_read32(base + TK_COUNT_NOW);
    TICK_ASSERT(now <= 5999u);

    delay_ms(2); /* a whole tick in hand before measuring */
    const uint64_t before = tick_now_ps();
    delay_ms(delay);
    const uint64_t took = tick_now_ps() - before;
    tick_log("delay %u ms took %llu ps", (unsigned)delay, (unsigned long long)took);
    /* A tick-based delay started between ticks lasts between (n - 1) and n tick periods, plus the
     * time to take the interrupt (common practice, no source). */
    TICK_ASSERT(took > (uint64_t)(delay - 1u) * 1000000000ull);
    TICK_ASSERT(took <= (uint64_t)delay * 1000000000ull + 1000000ull);
    /* Handlers entered from the same idle wait are one tick period apart exactly. */
    tick_log("tick period %llu ps", (unsigned long long)(tick_at[2] - tick_at[1]));
    TICK_ASSERT(tick_at[2] - tick_at[1] == 1000000000ull);
    tick_log("%u ticks seen", (unsigned)ms_ticks);
}
