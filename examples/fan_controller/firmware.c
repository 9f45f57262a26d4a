/* Fan controller: three 4-wire fans and a pump, on the demo part.
 *
 * The 16-bit timer "fans" drives three fan PWM outputs (channels 1-3, edge-aligned, 25 kHz) and a
 * pump driver on channel 4 through a complementary pair with dead time. The 32-bit timer "tick"
 * interrupts at 1 kHz; each tick the firmware moves fan 1's duty one step toward its target (a
 * ramp, so the fan does not jump), and at the tick given by `quiet_at_ms` it switches every fan to
 * a quiet-mode PWM period of 44 us, about 22.7 kHz (a period change at run time). All duty and
 * period updates go through preloaded registers, so they land at a reload event and never cut a
 * period short.
 *
 * Parameters: fans_base, tick_base (register windows), ramp_from, ramp_to (fan 1 duty in %),
 * quiet_at_ms.
 */
#include <tickbench/firmware.h>

#include <stdint.h>
#include <stdlib.h>

/* Registers of the demo part's timers (models/layouts/timer16_quad.toml, timer32_dual.toml). */
#include "demo_timers.h"

/* Both timers count the board's 96 MHz system clock (the PLL in fan_controller.toml). One tick is
 * 10416.67 ps, but every period below is a whole number of picoseconds. */
#define FAN_CLOCK_HZ 96000000u
#define NORMAL_TICKS 3840u /* 40 us: 25 kHz */
#define QUIET_TICKS 4224u  /* 44 us: about 22.7 kHz */
#define TICK_HZ 1000u
#define DEAD_TIME_TICKS 96u /* 1 us at 96 MHz */

static uint32_t fans, tick;
static uint32_t period_ticks; /* counter values per PWM period */
static uint32_t fan1_duty, fan1_target, quiet_at;
static volatile uint32_t ticks;

/* The fans share their timer with the pump pair, and the timer's dead time delays the rise of every
 * main output, not only the pump's: a fan's pulse comes out DEAD_TIME_TICKS short. So fan compares
 * add the dead time back. (Without this, fan 2 runs at 47.5 % instead of 50 %: the first run of
 * this example in Tickbench found exactly that.) */
static uint32_t compare_for(uint32_t duty_percent) {
    return period_ticks * duty_percent / 100u + DEAD_TIME_TICKS;
}

static void set_period(uint32_t period) {
    period_ticks = period;
    tick_write16(fans + Q16_LIMIT, (uint16_t)(period_ticks - 1u));
}

static void set_duties(void) {
    tick_write16(fans + Q16_MATCH(0), (uint16_t)compare_for(fan1_duty));
    tick_write16(fans + Q16_MATCH(1), (uint16_t)compare_for(50));
    tick_write16(fans + Q16_MATCH(2), (uint16_t)compare_for(75));
    /* The pump's main output also rises a dead time late, which is the point of dead time there. */
    tick_write16(fans + Q16_MATCH(3), (uint16_t)(period_ticks * 40u / 100u)); /* pump */
}

static void on_tick(void) {
    (void)tick_read32(tick + D32_TAKE); /* reading clears the reload flag */
    ticks = ticks + 1;
    if (fan1_duty < fan1_target)
        fan1_duty++;
    else if (fan1_duty > fan1_target)
        fan1_duty--;
    if (ticks == quiet_at) set_period(QUIET_TICKS);
    set_duties();
    tick_cycles(40); /* the rest of the control loop's work */
}

void tick_firmware_main(void) {
    fans = (uint32_t)strtoul(tick_param("fans_base", "0x50000400"), NULL, 0);
    tick = (uint32_t)strtoul(tick_param("tick_base", "0x50000800"), NULL, 0);
    fan1_duty = (uint32_t)strtoul(tick_param("ramp_from", "30"), NULL, 0);
    fan1_target = (uint32_t)strtoul(tick_param("ramp_to", "60"), NULL, 0);
    quiet_at = (uint32_t)strtoul(tick_param("quiet_at_ms", "20"), NULL, 0);

    /* Fans: preloaded period and compares, PWM on channels 1-3, a complementary pump pair. */
    tick_write16(fans + Q16_SCALE, 0);
    tick_write8(fans + Q16_PRELOAD, Q16_PRELOAD_PERIOD | Q16_PRELOAD_COMPARE(0) |
                                        Q16_PRELOAD_COMPARE(1) | Q16_PRELOAD_COMPARE(2) |
                                        Q16_PRELOAD_COMPARE(3));
    set_period(NORMAL_TICKS);
    set_duties();
    const unsigned fan_shape = Q16_SHAPE_ACTION(DEMO_ACTION_PWM_BELOW) | Q16_SHAPE_MAIN_ENABLE;
    const unsigned pump_shape = fan_shape | Q16_SHAPE_COMP_ENABLE;
    tick_write16(fans + Q16_SHAPE_AB,
                 (uint16_t)(Q16_SHAPE_BYTE(0, fan_shape) | Q16_SHAPE_BYTE(1, fan_shape)));
    tick_write16(fans + Q16_SHAPE_CD,
                 (uint16_t)(Q16_SHAPE_BYTE(2, fan_shape) | Q16_SHAPE_BYTE(3, pump_shape)));
    tick_write16(fans + Q16_DEAD, DEAD_TIME_TICKS);
    tick_write8(fans + Q16_KICK, Q16_KICK_FORCE_RELOAD); /* load the shadows now */
    tick_write16(fans + Q16_RUN, Q16_RUN_ENABLE | Q16_RUN_SLOPE(DEMO_SLOPE_BOTH));

    /* Tick: 1 kHz reload interrupt. */
    const int line = tick_irq_line("tick");
    tick_check(line >= 0, "the tick timer has an interrupt line", __FILE__, __LINE__);
    tick_irq_set_handler((unsigned)line, on_tick);
    tick_write32(tick + D32_LIMIT, FAN_CLOCK_HZ / TICK_HZ - 1u);
    tick_write32(tick + D32_ALERTS, DEMO_FLAG_RELOAD);
    tick_irq_line_enable((unsigned)line);
    tick_write32(tick + D32_SETUP, D32_SETUP_ENABLE | D32_SETUP_SLOPE(DEMO_SLOPE_BOTH));

    for (;;) tick_wait_for_interrupt();
}
