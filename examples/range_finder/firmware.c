/* Ultrasonic range finder on the demo part: a trigger pulse out, the echo pulse's width in.
 *
 * A measurement cycle starts at every reload of the 32-bit timer "echo" (60 ms, counting
 * microseconds). The firmware then fires a 10 us trigger pulse from the 16-bit timer "trigger" in
 * one-pulse mode, which stops by itself, and times the module's echo pulse: channel 1 of "echo"
 * captures its own input on both edges, so the rising and the falling edge each leave a count and
 * the pulse width is their difference (modulo the 60000-count cycle, in case the cycle wrapped in
 * between). Sound travels to the obstacle and back, so
 *
 *     distance = echo time x speed of sound / 2.
 *
 * The firmware logs every distance and checks it against the obstacle the scenario put there
 * (parameter `expected_um`, a list; 0 for no obstacle, when no echo must come).
 *
 * Resolution: one count is 1 us, and a capture lands on the first count step after its edge has
 * passed the input synchroniser, the same delay for both edges up to one tick of the 96 MHz timer
 * clock. So a measured width lies within one count plus one tick, 1.0104 us, of the true width:
 * 173.3 um of distance at 343 m/s (half of 1.0104 us x 343 m/s). The firmware's whole-micrometre
 * arithmetic rounds down by less than 1 um more, so it checks each distance to within 175 um.
 *
 * Parameters: trigger_base, echo_base (register windows), expected_um (comma-separated).
 */
#include <tickbench/firmware.h>

#include <stdint.h>
#include <stdlib.h>

/* Registers of the demo part's timers (models/layouts/timer16_quad.toml, timer32_dual.toml). */
#include "demo_timers.h"

#define SYSTEM_CLOCK_HZ 96000000u
#define US_PRESCALER (SYSTEM_CLOCK_HZ / 1000000u - 1u) /* both timers count 1 MHz */
/* A trigger pulse of 10 us: common practice for the usual hobby ultrasonic modules (from
 * memory). The counter runs 0, 1, ..., 10 and stops at its wrap; the output is high from count 1
 * on: 10 counts. */
#define TRIGGER_START 1u
#define TRIGGER_LAST (TRIGGER_START + 10u - 1u)
/* A new measurement every 60 ms at most, so that the last echo has died out: common practice for
 * the usual modules (from memory). */
#define CYCLE_US 60000u
/* Waiting for an echo ends 40 ms into the cycle: a demo value, longer than the echo of any
 * obstacle within 4 m (23.3 ms). */
#define ECHO_TIMEOUT_US 40000u
/* The speed of sound in dry air at 20 C, 343 m/s: CRC Handbook of Chemistry and Physics, table of
 * the speed of sound in dry air (value from memory). 343 m/s is 343 um/us. */
#define SOUND_UM_PER_US 343u
#define TOLERANCE_UM 175u

static uint32_t trigger, echo;
static volatile uint32_t cycles;

static void on_cycle(void) {
    /* Reading "take" clears the reload flag; no capture is pending at a cycle's start, since the
     * echo of the cycle before ended long ago (and a cycle waits at most ECHO_TIMEOUT_US). */
    const uint32_t taken = tick_read32(echo + D32_TAKE);
    TICK_ASSERT((taken & DEMO_FLAG_CHANNEL(0)) == 0);
    cycles = cycles + 1;
}

/* Waits for the next capture of channel 1; returns 0 and the count in *count, or -1 once the
 * cycle's counter has passed the echo timeout. */
static int next_capture(uint32_t* count) {
    while ((tick_read32(echo + D32_PENDING) & DEMO_FLAG_CHANNEL(0)) == 0) {
        if (tick_read32(echo + D32_COUNT) >= ECHO_TIMEOUT_US) return -1;
        tick_cycles(40);
    }
    *count = tick_read32(echo + D32_MATCH(0)); /* the read clears the capture flag */
    return 0;
}

static void measure(uint32_t expected_um) {
    tick_write16(trigger + Q16_RUN, Q16_RUN_ENABLE | Q16_RUN_ONE_PULSE);
    uint32_t rise = 0, fall = 0;
    if (next_capture(&rise) != 0 || next_capture(&fall) != 0) {
        tick_log("cycle %u: no echo", (unsigned)cycles);
        tick_check(expected_um == 0, "an echo comes back from every obstacle", __FILE__, __LINE__);
        return;
    }
    const uint32_t width_us = (fall + CYCLE_US - rise) % CYCLE_US;
    const uint32_t distance_um = width_us * SOUND_UM_PER_US / 2u;
    tick_log("cycle %u: echo %u us, distance %u.%03u mm (obstacle at %u.%03u mm)", (unsigned)cycles,
             (unsigned)width_us, (unsigned)(distance_um / 1000u), (unsigned)(distance_um % 1000u),
             (unsigned)(expected_um / 1000u), (unsigned)(expected_um % 1000u));
    tick_check(expected_um != 0, "no echo comes where no obstacle stands", __FILE__, __LINE__);
    const uint32_t error_um =
        distance_um > expected_um ? distance_um - expected_um : expected_um - distance_um;
    tick_check(error_um <= TOLERANCE_UM, "measured distance within 175 um of the obstacle",
               __FILE__, __LINE__);
}

void tick_firmware_main(void) {
    trigger = (uint32_t)strtoul(tick_param("trigger_base", "0x50000400"), NULL, 0);
    echo = (uint32_t)strtoul(tick_param("echo_base", "0x50000800"), NULL, 0);
    const char* expected = tick_param("expected_um", "");

    /* Trigger: 1 us counts, one pulse from count TRIGGER_START to the wrap after TRIGGER_LAST. */
    tick_write16(trigger + Q16_SCALE, (uint16_t)US_PRESCALER);
    tick_write16(trigger + Q16_LIMIT, (uint16_t)TRIGGER_LAST);
    tick_write16(trigger + Q16_MATCH(0), (uint16_t)TRIGGER_START);
    tick_write16(trigger + Q16_SHAPE_AB,
                 (uint16_t)Q16_SHAPE_BYTE(
                     0, Q16_SHAPE_ACTION(DEMO_ACTION_PWM_AT_OR_ABOVE) | Q16_SHAPE_MAIN_ENABLE));
    tick_write8(trigger + Q16_KICK, Q16_KICK_FORCE_RELOAD); /* the prescaler now */

    /* Echo: 1 us counts over a 60 ms cycle, channel 1 captures both edges of its input. */
    const int line = tick_irq_line("echo");
    TICK_ASSERT(line >= 0);
    tick_irq_set_handler((unsigned)line, on_cycle);
    tick_write32(echo + D32_SCALE, US_PRESCALER);
    tick_write32(echo + D32_LIMIT, CYCLE_US - 1u);
    tick_write32(echo + D32_INPUTS,
                 D32_INPUT_ROLE(0, DEMO_ROLE_CAPTURE_OWN) | D32_INPUT_EDGE(0, DEMO_EDGE_BOTH));
    tick_write32(echo + D32_COMMAND, D32_COMMAND_FORCE_RELOAD); /* the prescaler now */
    tick_write32(echo + D32_ALERTS, DEMO_FLAG_RELOAD); /* the first cycle starts with this reload */
    tick_irq_line_enable((unsigned)line);
    tick_write32(echo + D32_SETUP, D32_SETUP_ENABLE);

    for (uint32_t done = 0;; ++done) {
        char* end = NULL;
        const unsigned long expected_um = strtoul(expected, &end, 10);
        if (end == expected) break;
        expected = *end == ',' ? end + 1 : end;
        while (cycles <= done) tick_wait_for_interrupt(); /* cycle `done` + 1 has started */
        measure((uint32_t)expected_um);
    }
    tick_log("%u measurements done", (unsigned)cycles);
}
