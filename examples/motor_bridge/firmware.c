/* Motor half-bridge: one phase leg driven by a complementary pair, with dead time and a fault
 * input, on the demo part's 16-bit timer.
 *
 * The timer counts center-aligned (up to the period, then down) at 20 kHz. Channel 1's main output
 * drives the leg's high-side switch and its complementary output the low-side switch; the timer
 * holds every rise back by the dead time, so one switch is off for at least that long before the
 * other turns on. The fault input (an over-current comparator on a real board) forces both outputs
 * to their safe level, low (both switches off), a few timer ticks after it rises, whatever the
 * counter does, until the firmware re-arms the timer.
 *
 * The firmware takes the fault interrupt, notes the fault, waits `rearm_after_us` (the time the
 * power stage is given to recover), then re-arms; it does this for `faults` faults and checks that
 * no re-arm came before its wait was over.
 *
 * Parameters: bridge_base, bridge_irq, duty_percent, dead_time_ticks, fault_latency_ticks,
 * rearm_after_us, faults.
 */
#include <tickbench/firmware.h>

#include <stdint.h>
#include <stdlib.h>

/* Registers of the demo part's 16-bit timer (models/layouts/timer16_quad.toml). */
#include "demo_timers.h"

/* The timer and the CPU count the board's 96 MHz system clock (motor_bridge.toml). Center-aligned,
 * the PWM frequency is f / (2 x period): 96 MHz / 4800 = 20 kHz. */
#define CYCLES_PER_US 96u
#define PERIOD_TICKS 2400u
#define PS_PER_US 1000000ull

static uint32_t base;
static volatile uint32_t faults_pending;
static volatile uint64_t fault_seen_ps;

static uint32_t param_number(const char* name, const char* fallback) {
    return (uint32_t)strtoul(tick_param(name, fallback), NULL, 0);
}

static void on_bridge(void) {
    if (tick_read16(base + Q16_STATUS) & DEMO_FLAG_FAULT) {
        tick_write16(base + Q16_STATUS_CLEAR, DEMO_FLAG_FAULT);
        fault_seen_ps = tick_now_ps();
        faults_pending = faults_pending + 1u;
    }
}

void tick_firmware_main(void) {
    base = param_number("bridge_base", "0x50000400");
    const uint32_t duty = param_number("duty_percent", "30");
    const uint32_t dead_ticks = param_number("dead_time_ticks", "48");
    const uint32_t latency_ticks = param_number("fault_latency_ticks", "8");
    const uint32_t rearm_after_us = param_number("rearm_after_us", "2000");
    const uint32_t faults = param_number("faults", "2");
    const int line = tick_irq_line(tick_param("bridge_irq", "bridge"));
    TICK_ASSERT(line >= 0);
    TICK_ASSERT(duty <= 100u && latency_ticks <= 15u);

    /* Center-aligned: the main output is active while the counter is below the compare value, so
     * its pulse is centred on the counter's bottom and the duty is compare / period. */
    tick_write16(base + Q16_SCALE, 0);
    tick_write8(base + Q16_PRELOAD, Q16_PRELOAD_PERIOD | Q16_PRELOAD_COMPARE(0));
    tick_write16(base + Q16_LIMIT, PERIOD_TICKS);
    tick_write16(base + Q16_MATCH(0), (uint16_t)(PERIOD_TICKS * duty / 100u));
    tick_write16(base + Q16_DEAD, (uint16_t)Q16_DEAD_TIME(dead_ticks));
    /* Safe levels all low (no safe-high bits): both switches off during a fault. */
    tick_write16(base + Q16_GUARD,
                 (uint16_t)(Q16_GUARD_LATENCY(latency_ticks) | Q16_GUARD_FAULT_ENABLE));
    const unsigned leg =
        Q16_SHAPE_ACTION(DEMO_ACTION_PWM_BELOW) | Q16_SHAPE_MAIN_ENABLE | Q16_SHAPE_COMP_ENABLE;
    tick_write16(base + Q16_SHAPE_AB, (uint16_t)Q16_SHAPE_BYTE(0, leg));
    tick_write8(base + Q16_KICK, Q16_KICK_FORCE_RELOAD); /* load the shadows now */

    tick_irq_set_handler((unsigned)line, on_bridge);
    tick_write16(base + Q16_STATUS_CLEAR, 0xffffu);
    tick_write16(base + Q16_NOTIFY, DEMO_FLAG_FAULT);
    tick_irq_line_enable((unsigned)line);
    tick_write16(base + Q16_RUN,
                 Q16_RUN_ENABLE | Q16_RUN_MODE(DEMO_MODE_CENTER) | Q16_RUN_SLOPE(DEMO_SLOPE_BOTH));

    for (uint32_t handled = 0; handled < faults; ++handled) {
        while (faults_pending == handled) tick_wait_for_interrupt();
        const uint64_t seen_ps = fault_seen_ps;
        tick_log("fault %u: outputs in their safe state, re-arming in %u us",
                 (unsigned)handled + 1u, (unsigned)rearm_after_us);
        /* The recovery wait: other work of the control loop would run here. */
        tick_cycles(rearm_after_us * CYCLES_PER_US);
        tick_check(tick_now_ps() - seen_ps >= (uint64_t)rearm_after_us * PS_PER_US,
                   "the re-arm comes no earlier than the recovery wait after the fault", __FILE__,
                   __LINE__);
        tick_write8(base + Q16_KICK, Q16_KICK_REARM);
        tick_log("fault %u: re-armed", (unsigned)handled + 1u);
    }
    tick_check(faults_pending == faults, "every fault was seen once", __FILE__, __LINE__);
}
