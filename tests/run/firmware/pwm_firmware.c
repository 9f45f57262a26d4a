/* Test firmware for `tickbench run` (tests/run): a two-channel 25 kHz PWM on the demo part's 16-bit
 * timer (models/layouts/timer16_quad.toml) with a reload interrupt. Parameters:
 *   base    address of the timer's window (default 0x50000400)
 *   reloads how many reload interrupts to wait for before the firmware's own check (default 20)
 *   ending  "return" (default), "crash" (a store through a null pointer), "fail-check", "hang"
 *           (a loop that never calls the simulator), or "run-on" (a control loop that never
 *           sleeps or returns: 1 ms of work, then a write of the same compare value and a log
 *           line, again and again)
 * The timer clock is 48 MHz: 1920 ticks are 40 us; channel 1 is active for 480 ticks (25 %),
 * channel 2 for 960 (50 %).
 */
#include <tickbench/firmware.h>

#include <stdint.h>
#include <stdlib.h>
#include <string.h>

/* Registers of the demo part's 16-bit timer (models/layouts/timer16_quad.toml). */
#include "demo_timers.h"

static uint32_t base;
static volatile uint32_t reloads;

static void on_reload(void) {
    tick_write16(base + Q16_STATUS_CLEAR, DEMO_FLAG_RELOAD);
    reloads = reloads + 1;
}

void tick_firmware_main(void) {
    base = (uint32_t)strtoul(tick_param("base", "0x50000400"), NULL, 0);
    const long wanted = strtol(tick_param("reloads", "20"), NULL, 0);
    const char* ending = tick_param("ending", "return");
    const int line = tick_irq_line(tick_param("irq", "pwm"));
    reloads = 0;

    tick_irq_set_handler((unsigned)line, on_reload);
    tick_write16(base + Q16_SCALE, 0);
    tick_write16(base + Q16_LIMIT, 1919);
    tick_write16(base + Q16_MATCH(0), 480);
    tick_write16(base + Q16_MATCH(1), 960);
    /* Channels 1 and 2: active while the counter is below the compare value, main output on. */
    const unsigned shape = Q16_SHAPE_ACTION(DEMO_ACTION_PWM_BELOW) | Q16_SHAPE_MAIN_ENABLE;
    tick_write16(base + Q16_SHAPE_AB,
                 (uint16_t)(Q16_SHAPE_BYTE(0, shape) | Q16_SHAPE_BYTE(1, shape)));
    tick_write8(base + Q16_KICK, Q16_KICK_FORCE_RELOAD); /* load the settings now */
    tick_write16(base + Q16_STATUS_CLEAR, DEMO_FLAG_RELOAD);
    tick_write16(base + Q16_NOTIFY, DEMO_FLAG_RELOAD);
    tick_irq_line_enable((unsigned)line);
    tick_write16(base + Q16_RUN, Q16_RUN_ENABLE | Q16_RUN_SLOPE(DEMO_SLOPE_BOTH)); /* count up */

    while (reloads < (uint32_t)wanted) tick_wait_for_interrupt();
    tick_log("%u reloads seen", (unsigned)reloads);
    if (strcmp(ending, "crash") == 0) *(volatile int*)0 = 1;
    if (strcmp(ending, "hang") == 0)
        for (;;) {
        }
    TICK_ASSERT(strcmp(ending, "fail-check") != 0);
    TICK_ASSERT(reloads >= (uint32_t)wanted);
    if (strcmp(ending, "run-on") == 0) {
        for (unsigned round = 1;; ++round) {
            tick_cycles(48000); /* 1 ms at 48 MHz */
            tick_write16(base + Q16_MATCH(0), 480);
            tick_log("round %u", round);
        }
    }
}
