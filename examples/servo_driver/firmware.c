/* Hobby servo driver: one servo on the demo part, its pulse swept over the whole range.
 *
 * The 16-bit timer "servo" counts microseconds (the 96 MHz system clock divided by 96) over a
 * 20 ms frame and drives the servo's pulse on channel 1: high from the start of the frame while
 * the counter is below the pulse width in microseconds. The 32-bit timer "control" interrupts
 * every `control_period_us` microseconds, a control loop that is not synchronised to the frame:
 * each interrupt moves the pulse width one `step_us` along a sweep from 1.0 ms up to 2.0 ms and
 * back down.
 *
 * How the new width reaches the timer is the point of the example (`update`):
 * - preloaded: the compare value is preloaded, so a write in the middle of a frame waits for the
 *   next frame. Every frame carries exactly one pulse, of a width the sweep asked for.
 * - direct: the compare value changes at once. A write that raises the width after the pulse of
 *   this frame has already ended makes the output go high again until the new width: a second,
 *   short pulse in the same frame, which a servo takes for a command of its own. The control loop
 *   runs slightly slower than the frame, so its writes drift through the frame and one of them
 *   lands right there (servo_driver.toml says when).
 *
 * Parameters: servo_base, control_base (register windows), update = preloaded | direct, step_us,
 * control_period_us.
 */
#include <tickbench/firmware.h>

#include <stdint.h>
#include <stdlib.h>
#include <string.h>

/* Registers of the demo part's timers (models/layouts/timer16_quad.toml, timer32_dual.toml). */
#include "demo_timers.h"

#define SYSTEM_CLOCK_HZ 96000000u
#define COUNTS_PER_US 1u /* the servo timer counts 1 MHz */
#define SERVO_PRESCALER (SYSTEM_CLOCK_HZ / 1000000u - 1u)
/* A 50 Hz frame of 20 ms, and pulses from 1.0 ms to 2.0 ms: common practice for hobby servos, no
 * source. */
#define FRAME_US 20000u
#define PULSE_MIN_US 1000u
#define PULSE_MAX_US 2000u

static uint32_t servo, control;
static uint32_t pulse_us, step_us;
static int rising = 1;
static volatile uint32_t updates;

static void write_pulse(uint32_t width_us) {
    TICK_ASSERT(width_us >= PULSE_MIN_US && width_us <= PULSE_MAX_US);
    tick_write16(servo + Q16_MATCH(0), (uint16_t)(width_us * COUNTS_PER_US));
}

/* The next width of a sweep that turns round at both ends of the range. */
static uint32_t next_width(uint32_t width) {
    if (rising && width + step_us > PULSE_MAX_US) rising = 0;
    if (!rising && width < PULSE_MIN_US + step_us) rising = 1;
    return rising ? width + step_us : width - step_us;
}

static void on_control(void) {
    (void)tick_read32(control + D32_TAKE); /* reading clears the reload flag */
    updates = updates + 1;
    pulse_us = next_width(pulse_us);
    write_pulse(pulse_us);
    tick_cycles(30); /* the rest of the control loop's work */
}

void tick_firmware_main(void) {
    servo = (uint32_t)strtoul(tick_param("servo_base", "0x50000400"), NULL, 0);
    control = (uint32_t)strtoul(tick_param("control_base", "0x50000800"), NULL, 0);
    const int preloaded = strcmp(tick_param("update", "preloaded"), "direct") != 0;
    step_us = (uint32_t)strtoul(tick_param("step_us", "100"), NULL, 0);
    const uint32_t control_us =
        (uint32_t)strtoul(tick_param("control_period_us", "20200"), NULL, 0);
    tick_log("servo update %s, sweep step %u us, control loop every %u us",
             preloaded ? "preloaded" : "direct", (unsigned)step_us, (unsigned)control_us);

    /* Servo: 1 us counts, a 20 ms frame, channel 1 high while the counter is below the width. */
    tick_write16(servo + Q16_SCALE, (uint16_t)SERVO_PRESCALER);
    tick_write16(servo + Q16_LIMIT, (uint16_t)(FRAME_US * COUNTS_PER_US - 1u));
    tick_write8(servo + Q16_PRELOAD,
                (uint8_t)(Q16_PRELOAD_PERIOD | (preloaded ? Q16_PRELOAD_COMPARE(0) : 0u)));
    pulse_us = PULSE_MIN_US;
    write_pulse(pulse_us);
    tick_write16(servo + Q16_SHAPE_AB,
                 (uint16_t)Q16_SHAPE_BYTE(
                     0, Q16_SHAPE_ACTION(DEMO_ACTION_PWM_BELOW) | Q16_SHAPE_MAIN_ENABLE));
    tick_write8(servo + Q16_KICK, Q16_KICK_FORCE_RELOAD); /* prescaler, period, compare now */
    tick_write16(servo + Q16_RUN, Q16_RUN_ENABLE);

    /* Control loop: a reload interrupt every control_us on the system clock. */
    const int line = tick_irq_line("control");
    TICK_ASSERT(line >= 0);
    tick_irq_set_handler((unsigned)line, on_control);
    tick_write32(control + D32_LIMIT, control_us * (SYSTEM_CLOCK_HZ / 1000000u) - 1u);
    tick_write32(control + D32_ALERTS, DEMO_FLAG_RELOAD);
    tick_irq_line_enable((unsigned)line);
    tick_write32(control + D32_SETUP, D32_SETUP_ENABLE);

    for (;;) tick_wait_for_interrupt();
}
