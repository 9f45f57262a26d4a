/* Test firmware: demo 16-bit timers (models/layouts/timer16_quad.toml) counting a quadrature
 * encoder, read at listed instants. The timer at `x4` counts both inputs' edges (encoder x4), the
 * one at `x2` only input 1's (encoder x2); each wraps at its own limit. Entry `encoder_main`.
 * Parameters:
 *   x4, x2              addresses of the two timers' windows (0: no such timer; default 0)
 *   x4_limit, x2_limit  their periods (default 0xffff)
 *   at_us               the instants, in microseconds from time 0, comma-separated
 * At each instant it logs "at 6025 us: x4 count 20, direction up" (and the same for x2), the
 * direction being the timer's direction bit; after the last, the counts from the first instant to
 * the last, taken modulo limit + 1 ("x4: 200 counts from 1025 us to 11025 us").
 */
#include <tickbench/firmware.h>

#include <stdint.h>

#include "demo_timers.h"
#include "input_support.h"

struct wheel {
    const char* name;
    uint32_t base;
    uint32_t limit;
    uint16_t first;
    uint16_t last;
};

static void set_up(const struct wheel* w, unsigned source) {
    if (w->base == 0) return;
    tick_write16(w->base + Q16_LIMIT, (uint16_t)w->limit);
    tick_write16(w->base + Q16_LINK, Q16_LINK_COUNT(source));
    tick_write16(w->base + Q16_RUN, Q16_RUN_ENABLE);
}

static void read_wheel(struct wheel* w, uint64_t at_us, int first) {
    if (w->base == 0) return;
    const uint16_t count = tick_read16(w->base + Q16_COUNT);
    const uint16_t run = tick_read16(w->base + Q16_RUN);
    tick_log("at %llu us: %s count %u, direction %s", (unsigned long long)at_us, w->name,
             (unsigned)count, (run & Q16_RUN_DIRECTION_DOWN) ? "down" : "up");
    if (first) w->first = count;
    w->last = count;
}

void encoder_main(void) {
    struct wheel wheels[2] = {
        {"x4", param_number("x4", 0), param_number("x4_limit", 0xffff), 0, 0},
        {"x2", param_number("x2", 0), param_number("x2_limit", 0xffff), 0, 0},
    };
    set_up(&wheels[0], DEMO_COUNT_ENCODER_X4);
    set_up(&wheels[1], DEMO_COUNT_ENCODER_X2);

    const char* list = tick_param("at_us", "");
    uint64_t at_us = 0, first_us = 0;
    int reads = 0;
    while (next_listed_number(&list, &at_us)) {
        wait_until_ps(at_us * 1000000u);
        if (reads == 0) first_us = at_us;
        for (unsigned i = 0; i < 2; ++i) read_wheel(&wheels[i], at_us, reads == 0);
        ++reads;
    }
    TICK_ASSERT(reads > 0);
    for (unsigned i = 0; i < 2; ++i) {
        const struct wheel* w = &wheels[i];
        if (w->base == 0) continue;
        const uint32_t range = w->limit + 1;
        tick_log("%s: %u counts from %llu us to %llu us", w->name,
                 (unsigned)((w->last + range - w->first) % range), (unsigned long long)first_us,
                 (unsigned long long)at_us);
    }
}
