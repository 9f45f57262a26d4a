/* Fan controller: three 4-wire fans and a pump, on the demo part; fan 1 runs in a closed speed
 * loop on its tachometer.
 *
 * The 16-bit timer "fans" drives three fan PWM outputs (channels 1-3, edge-aligned, 25 kHz) and a
 * pump driver on channel 4 through a complementary pair with dead time. Fans 2 and 3 hold fixed
 * duties. Fan 1's tachometer (2 pulses per revolution) reaches channel 1 of the 32-bit timer
 * "tach", which counts microseconds and captures every rising edge: the time between two captures
 * is half a revolution. The 32-bit timer "tick" interrupts at 1 kHz; each tick the firmware takes
 * the latest tachometer period, and on a new one runs a PI controller that moves fan 1's duty
 * toward the speed set-point of the moment (a profile: `setpoints_rpm`, each held for
 * `setpoint_ms`). At the tick given by `quiet_at_ms` it switches every fan to a quiet-mode PWM
 * period of 44 us, about 22.7 kHz (a period change at run time). All duty and period updates go
 * through preloaded registers, so they land at a reload event and never cut a period short.
 *
 * Parameters: fans_base, tick_base, tach_base (register windows), setpoints_rpm (comma-separated),
 * setpoint_ms, fan_nominal_rpm (the fan's speed at 100 % duty as the controller assumes it: its
 * feed-forward), quiet_at_ms.
 */
#include <tickbench/firmware.h>

#include <stdint.h>
#include <stdlib.h>

/* Registers of the demo part's timers (models/layouts/timer16_quad.toml, timer32_dual.toml). */
#include "demo_timers.h"

/* The timers count the board's 96 MHz system clock (the PLL in fan_controller.toml). One tick is
 * 10416.67 ps, but every period below is a whole number of picoseconds. */
#define FAN_CLOCK_HZ 96000000u
#define NORMAL_TICKS 3840u /* 40 us: 25 kHz */
#define QUIET_TICKS 4224u  /* 44 us: about 22.7 kHz */
#define TICK_HZ 1000u
#define DEAD_TIME_TICKS 96u                           /* 1 us at 96 MHz */
#define TACH_PRESCALER (FAN_CLOCK_HZ / 1000000u - 1u) /* the tach timer counts 1 MHz */
/* A 4-wire fan's tachometer gives 2 pulses per revolution: Intel, "4-Wire Pulse Width Modulation
 * (PWM) Controlled Fans" specification (from memory). */
#define PULSES_PER_REV 2u
#define US_PER_MINUTE 60000000u
/* Duties in hundredths of a percent. The controller keeps fan 1 between 20 % and 90 % (demo
 * values: 90 % leaves room for the dead time the compare adds back, below). */
#define DUTY_FULL 10000u
#define DUTY_MIN 2000
#define DUTY_MAX 9000
#define INTEGRAL_LIMIT 200000 /* +-20 % in the integral's 1/100 units */
#define STALL_MS 200u         /* no tachometer edge for this long: the fan stands */
#define SETTLE_MS 200u        /* the last part of each set-point checked against it */
#define MAX_SETPOINTS 8

static uint32_t fans, tick, tach;
static uint32_t period_ticks; /* counter values per PWM period */
static uint32_t fan1_duty;    /* hundredths of a percent */
static uint32_t quiet_at, setpoint_ms, nominal_rpm;
static uint32_t setpoints[MAX_SETPOINTS], setpoint_count;
static volatile uint32_t ticks;
/* The speed loop's state. */
static int have_capture;
static uint32_t last_capture, last_capture_tick, speed_rpm;
static int32_t integral; /* hundredths of a hundredth of a percent */

/* The fans share their timer with the pump pair, and the timer's dead time delays the rise of every
 * main output, not only the pump's: a fan's pulse comes out DEAD_TIME_TICKS short. So fan compares
 * add the dead time back. (Without this, fan 2 runs at 47.5 % instead of 50 %: the first run of
 * this example in Tickbench found exactly that.) */
static uint32_t compare_for(uint32_t duty) {
    return period_ticks * duty / DUTY_FULL + DEAD_TIME_TICKS;
}

static void set_period(uint32_t period) {
    period_ticks = period;
    tick_write16(fans + Q16_LIMIT, (uint16_t)(period_ticks - 1u));
}

static void set_duties(void) {
    tick_write16(fans + Q16_MATCH(0), (uint16_t)compare_for(fan1_duty));
    tick_write16(fans + Q16_MATCH(1), (uint16_t)compare_for(5000));
    tick_write16(fans + Q16_MATCH(2), (uint16_t)compare_for(7500));
    /* The pump's main output also rises a dead time late, which is the point of dead time there. */
    tick_write16(fans + Q16_MATCH(3), (uint16_t)(period_ticks * 40u / 100u)); /* pump */
}

static uint32_t setpoint_now(void) {
    uint32_t i = ticks / setpoint_ms;
    if (i >= setpoint_count) i = setpoint_count - 1u;
    return setpoints[i];
}

/* A new tachometer period, if channel 1 of the tach timer captured since the last tick: returns 1
 * and updates speed_rpm. A fan that gives no edge for STALL_MS stands: speed 0. */
static int measure_speed(void) {
    if ((tick_read32(tach + D32_PENDING) & DEMO_FLAG_CHANNEL(0)) == 0) {
        if (have_capture && ticks - last_capture_tick > STALL_MS) {
            have_capture = 0;
            speed_rpm = 0;
        }
        return 0;
    }
    const uint32_t now = tick_read32(tach + D32_MATCH(0)); /* the read clears the capture flag */
    const int had = have_capture;
    const uint32_t period_us = now - last_capture; /* modulo 2^32: right across a wrap */
    have_capture = 1;
    last_capture = now;
    last_capture_tick = ticks;
    if (!had || period_us == 0) return 0;
    speed_rpm = US_PER_MINUTE / (period_us * PULSES_PER_REV);
    return 1;
}

/* PI control of fan 1's duty, run on each new speed measurement, with a feed-forward from the
 * fan's nominal speed. Gains (demo values): proportional 1 and integral 0.2 per measurement, in
 * units of the feed-forward's duty per rpm. */
static void control(uint32_t setpoint) {
    const int32_t error = (int32_t)setpoint - (int32_t)speed_rpm;
    integral += error * 200000 / (int32_t)nominal_rpm;
    if (integral > INTEGRAL_LIMIT) integral = INTEGRAL_LIMIT;
    if (integral < -INTEGRAL_LIMIT) integral = -INTEGRAL_LIMIT;
    int32_t duty = (int32_t)(setpoint * DUTY_FULL / nominal_rpm) +
                   error * (int32_t)DUTY_FULL / (int32_t)nominal_rpm + integral / 100;
    if (duty < DUTY_MIN) duty = DUTY_MIN;
    if (duty > DUTY_MAX) duty = DUTY_MAX;
    fan1_duty = (uint32_t)duty;
}

static void on_tick(void) {
    (void)tick_read32(tick + D32_TAKE); /* reading clears the reload flag */
    ticks = ticks + 1;
    const uint32_t setpoint = setpoint_now();
    if (measure_speed()) {
        control(setpoint);
        /* Settled: the speed lies within 3 % of the set-point in the last SETTLE_MS of each. A
         * demo tolerance of our own. */
        if (ticks % setpoint_ms >= setpoint_ms - SETTLE_MS) {
            const uint32_t off = speed_rpm > setpoint ? speed_rpm - setpoint : setpoint - speed_rpm;
            tick_check(off * 100u <= 3u * setpoint,
                       "fan 1 speed within 3 % of its set-point after settling", __FILE__,
                       __LINE__);
        }
    }
    if (ticks % setpoint_ms == setpoint_ms - 1u)
        tick_log("fan 1 at %u rpm for a set-point of %u rpm, duty %u.%02u %%", (unsigned)speed_rpm,
                 (unsigned)setpoint, (unsigned)(fan1_duty / 100u), (unsigned)(fan1_duty % 100u));
    if (ticks == quiet_at) set_period(QUIET_TICKS);
    set_duties();
    tick_cycles(120); /* the rest of the control loop's work */
}

static void read_setpoints(const char* text) {
    setpoint_count = 0;
    while (setpoint_count < MAX_SETPOINTS) {
        char* end = NULL;
        const unsigned long rpm = strtoul(text, &end, 10);
        if (end == text) break;
        setpoints[setpoint_count++] = (uint32_t)rpm;
        text = *end == ',' ? end + 1 : end;
    }
    tick_check(setpoint_count > 0, "fan 1 has at least one set-point", __FILE__, __LINE__);
}

void tick_firmware_main(void) {
    fans = (uint32_t)strtoul(tick_param("fans_base", "0x50000400"), NULL, 0);
    tick = (uint32_t)strtoul(tick_param("tick_base", "0x50000800"), NULL, 0);
    tach = (uint32_t)strtoul(tick_param("tach_base", "0x50000000"), NULL, 0);
    read_setpoints(tick_param("setpoints_rpm", "1200,2400,1800"));
    setpoint_ms = (uint32_t)strtoul(tick_param("setpoint_ms", "1000"), NULL, 0);
    nominal_rpm = (uint32_t)strtoul(tick_param("fan_nominal_rpm", "3000"), NULL, 0);
    quiet_at = (uint32_t)strtoul(tick_param("quiet_at_ms", "1500"), NULL, 0);
    fan1_duty = setpoints[0] * DUTY_FULL / nominal_rpm;

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

    /* Tachometer: a free-running 32-bit count of microseconds, rising edges captured. */
    tick_write32(tach + D32_SCALE, TACH_PRESCALER);
    tick_write32(tach + D32_INPUTS,
                 D32_INPUT_ROLE(0, DEMO_ROLE_CAPTURE_OWN) | D32_INPUT_EDGE(0, DEMO_EDGE_RISING));
    tick_write32(tach + D32_COMMAND, D32_COMMAND_FORCE_RELOAD); /* the prescaler now */
    tick_write32(tach + D32_SETUP, D32_SETUP_ENABLE);

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
