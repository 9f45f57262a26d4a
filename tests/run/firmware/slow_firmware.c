/* Test firmware for `tickbench run` (tests/run): the demo part's slow-clock counter
 * (models/layouts/slow32.toml) driven the way a driver would be. Parameters:
 *   base       address of the counter's window (default 0x50002800)
 *   job        "naive-read": one read of the counter at read_at_ps;
 *              "safe-read": read it from read_at_ps on until two reads agree;
 *              "write-twice": set the counter, then the alarm, without waiting between;
 *              "write-waiting": the same, waiting for busy to clear before each write
 *   read_at_ps the instant the timestamp read starts (default 1953125000, slow edge 64)
 */
#include <tickbench/firmware.h>

#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#include "demo_timers.h"

static uint32_t base;

static void wait_while_busy(void) {
    while (tick_read32(base + SC_STATUS) & SC_STATUS_BUSY) tick_cycles(4);
}

/* The naive timestamp: one read, which can return the count before an edge that just happened. */
static uint32_t timestamp_naive(void) { return tick_read32(base + SC_TICKS); }

/* The safe timestamp: read until two successive reads agree. */
static uint32_t timestamp_safe(void) {
    uint32_t last = tick_read32(base + SC_TICKS);
    for (;;) {
        const uint32_t again = tick_read32(base + SC_TICKS);
        if (again == last) return again;
        last = again;
    }
}

void tick_firmware_main(void) {
    base = (uint32_t)strtoul(tick_param("base", "0x50002800"), NULL, 0);
    const char* job = tick_param("job", "naive-read");
    const uint64_t read_at = strtoull(tick_param("read_at_ps", "1953125000"), NULL, 0);
    tick_write32(base + SC_SETUP, SC_SETUP_ENABLE);
    wait_while_busy();
    tick_log("counting from %llu ps", (unsigned long long)tick_now_ps());
    /* The enable write waits for the third slow edge: 3 periods of 2^-15 s = 91552734.375 ps. */
    TICK_ASSERT(tick_now_ps() >= 91552734ull);
    if (strcmp(job, "naive-read") == 0 || strcmp(job, "safe-read") == 0) {
        while (tick_now_ps() < read_at) tick_cycles(1);
        const uint64_t at = tick_now_ps();
        const uint32_t v = strcmp(job, "naive-read") == 0 ? timestamp_naive() : timestamp_safe();
        tick_log("%s at %llu ps: %u", job, (unsigned long long)at, (unsigned)v);
        return;
    }
    const int waiting = strcmp(job, "write-waiting") == 0;
    TICK_ASSERT(waiting || strcmp(job, "write-twice") == 0);
    tick_write32(base + SC_TICKS, 1000u);
    if (waiting) wait_while_busy();
    tick_write32(base + SC_WAKE_AT, 1005u);
    wait_while_busy();
    const uint32_t alarm = tick_read32(base + SC_WAKE_AT);
    tick_log("alarm reads %u", (unsigned)alarm);
    TICK_ASSERT(alarm == 1005u);
}
