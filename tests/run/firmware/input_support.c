/* Helpers shared by the input side's test firmware; see input_support.h. */
#include "input_support.h"

#include <tickbench/firmware.h>

#include <stdlib.h>

#include "demo_timers.h"

uint32_t param_number(const char* name, uint32_t fallback) {
    const char* text = tick_param(name, "");
    if (text[0] == '\0') return fallback;
    char* end = NULL;
    const unsigned long value = strtoul(text, &end, 0);
    tick_check(*end == '\0', "firmware parameters are whole numbers", __FILE__, __LINE__);
    return (uint32_t)value;
}

int next_listed_number(const char** cursor, uint64_t* value) {
    const char* p = *cursor;
    while (*p == ',' || *p == ' ') ++p;
    if (*p == '\0') return 0;
    char* end = NULL;
    *value = strtoull(p, &end, 10);
    tick_check(end != p, "listed parameters are whole numbers", __FILE__, __LINE__);
    *cursor = end;
    return 1;
}

/* A lower bound of the CPU clock's period in ps, measured once over 100 cycles (an interrupt
 * entering meanwhile only makes it larger, and a larger value only makes waits take more steps). */
static uint64_t cycle_ps_estimate(void) {
    static uint64_t estimate;
    if (estimate == 0) {
        tick_cycles(1); /* onto a CPU clock edge */
        const uint64_t before = tick_now_ps();
        tick_cycles(100);
        estimate = (tick_now_ps() - before) / 100;
        if (estimate == 0) estimate = 1;
    }
    return estimate;
}

void wait_until_ps(uint64_t t_ps) {
    uint64_t now = tick_now_ps();
    if (now >= t_ps) return;
    const uint64_t cycle = cycle_ps_estimate() + 1; /* never longer than a cycle, so never past */
    for (now = tick_now_ps(); now < t_ps; now = tick_now_ps()) {
        uint64_t n = (t_ps - now) / cycle;
        if (n == 0) n = 1;
        if (n > 0x7fffffffu) n = 0x7fffffffu;
        tick_cycles((uint32_t)n);
    }
}

uint16_t q16_next_capture(uint32_t base, unsigned channel) {
    tick_write16(base + Q16_STATUS_CLEAR, DEMO_FLAG_CHANNEL(channel));
    while ((tick_read16(base + Q16_STATUS) & DEMO_FLAG_CHANNEL(channel)) == 0) tick_cycles(10);
    return tick_read16(base + Q16_MATCH(channel));
}
