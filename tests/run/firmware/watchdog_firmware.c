/* Test firmware for `tickbench run` (tests/run): a watchdog refresh loop on the demo part's
 * watchdog (models/layouts/watchdog12.toml), written the way a driver would be. Parameters:
 *   base       address of the watchdog's window (default 0x50002400)
 *   period_ms  time between refreshes, in ms of the 48 MHz CPU clock (default 20)
 *   refreshes  how many refreshes before the firmware stops refreshing (default 0: never stops)
 *   min_margin the fewest counter steps that may be left at a refresh (default 0)
 * Set-up: prescaler 1 (a step every 8 oscillator edges), reload 200, window 150: on a 40 kHz
 * oscillator a timeout comes 40 ms after a refresh and the window opens 10 ms after it.
 */
#include <tickbench/firmware.h>

#include <stdint.h>
#include <stdlib.h>

#include "demo_timers.h"

static uint32_t base;

static void watchdog_start(void) {
    tick_write32(base + WD_DIVIDE, 1);
    tick_write32(base + WD_LIMIT, 200);
    tick_write32(base + WD_WINDOW, 150);
    tick_write32(base + WD_ARM, 1);
}

static void watchdog_refresh(void) {
    tick_write32(base + WD_FEED, WD_KEY_FIRST);
    tick_write32(base + WD_FEED, WD_KEY_SECOND);
}

static void wait_ms(uint32_t ms) {
    for (uint32_t i = 0; i < ms; ++i) tick_cycles(48000);
}

void tick_firmware_main(void) {
    base = (uint32_t)strtoul(tick_param("base", "0x50002400"), NULL, 0);
    const uint32_t period = (uint32_t)strtoul(tick_param("period_ms", "20"), NULL, 0);
    const uint32_t refreshes = (uint32_t)strtoul(tick_param("refreshes", "0"), NULL, 0);
    const uint32_t min_margin = (uint32_t)strtoul(tick_param("min_margin", "0"), NULL, 0);
    watchdog_start();
    /* Locked once started: this write is ignored. */
    tick_write32(base + WD_LIMIT, 4000);
    TICK_ASSERT(tick_read32(base + WD_LIMIT) == 200u);

    uint32_t least = WD_COUNTER_MAX;
    for (uint32_t n = 1; refreshes == 0 || n <= refreshes; ++n) {
        wait_ms(period);
        const uint32_t left = tick_read32(base + WD_LEVEL);
        if (left < least) least = left;
        /* The margin: counter steps left before a timeout when the refresh comes. */
        TICK_ASSERT(left >= min_margin);
        watchdog_refresh();
        if (n % 4 == 0)
            tick_log("refresh %u, %u steps left, least %u", (unsigned)n, (unsigned)left,
                     (unsigned)least);
    }
    tick_log("refreshing stops after %u", (unsigned)refreshes);
    for (;;) wait_ms(1);
}
