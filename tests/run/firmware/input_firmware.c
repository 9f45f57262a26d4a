/* Test firmware for the input side end to end (tests/run/scenarios/inputs.toml.in): four demo
 * timers (models/layouts/timer16_quad.toml) on a 48 MHz clock, each fed by another kind of source,
 * and log lines stating what the timers measured:
 *   meter  captures on rising edges: input 1 a 10 kHz square wave (4800 ticks apart), input 2 the
 *          gen timer's channel 2, a 25 kHz PWM, looped back (1920 ticks), input 3 driven by this
 *          firmware with tick_input_set(), rising every 100 us (4800 ticks);
 *   wheel  counts a quadrature encoder x4 (22 quarter lines forward by 6 ms, 14 by 12 ms);
 *   tally  counts the gen timer's reload trigger pulses on its chained input (10 in 400 us).
 * With the parameter misuse=1 the firmware instead asks for meter.input1, which the square wave
 * drives: the run must end with a report.
 */
#include <tickbench/firmware.h>

#include <stdint.h>

#include "demo_timers.h"
#include "input_support.h"

#define GEN 0x50000400u
#define METER 0x50000800u
#define WHEEL 0x50000c00u
#define TALLY 0x50001000u

void tick_firmware_main(void) {
    if (tick_param("misuse", "0")[0] == '1') {
        tick_input("meter.input1");
        return;
    }
    /* gen: 25 kHz PWM on channel 2 (index 1), a trigger pulse at every reload. */
    tick_write16(GEN + Q16_LIMIT, 1919);
    tick_write16(GEN + Q16_MATCH(1), 960);
    tick_write16(GEN + Q16_SHAPE_AB, Q16_SHAPE_BYTE(1, Q16_SHAPE_ACTION(DEMO_ACTION_PWM_BELOW) |
                                                           Q16_SHAPE_MAIN_ENABLE));
    /* meter: channels 1 to 3 capture their own inputs' rising edges; the counter free-runs. */
    tick_write16(METER + Q16_SENSE, Q16_SENSE_ROLE(0, DEMO_ROLE_CAPTURE_OWN) |
                                        Q16_SENSE_ROLE(1, DEMO_ROLE_CAPTURE_OWN) |
                                        Q16_SENSE_ROLE(2, DEMO_ROLE_CAPTURE_OWN));
    tick_write16(METER + Q16_RUN, Q16_RUN_ENABLE);
    /* wheel: an x4 encoder counter. */
    tick_write16(WHEEL + Q16_LINK, DEMO_COUNT_ENCODER_X4);
    tick_write16(WHEEL + Q16_RUN, Q16_RUN_ENABLE);
    /* tally: counts accepted triggers from the chained input. */
    tick_write16(TALLY + Q16_LINK, DEMO_COUNT_TRIGGER_EDGES | (DEMO_TRIGGER_FROM_CHAIN << 4));
    tick_write16(TALLY + Q16_RUN, Q16_RUN_ENABLE);
    tick_write16(GEN + Q16_RUN, Q16_RUN_ENABLE | Q16_RUN_TRIGGER(DEMO_TRIGGER_ON_RELOAD));

    uint16_t a = q16_next_capture(METER, 0);
    uint16_t b = q16_next_capture(METER, 0);
    tick_log("tach period %u", (unsigned)(uint16_t)(b - a));
    a = q16_next_capture(METER, 1);
    b = q16_next_capture(METER, 1);
    tick_log("loopback period %u", (unsigned)(uint16_t)(b - a));

    const int in = tick_input("meter.input3");
    TICK_ASSERT(in >= 0);
    TICK_ASSERT(tick_input("meter.input9") == -1);
    tick_input_set(in, 1);
    tick_cycles(100);
    a = tick_read16(METER + Q16_MATCH(2));
    tick_cycles(2298);
    tick_input_set(in, 0);
    tick_cycles(2400);
    tick_input_set(in, 1);
    tick_cycles(100);
    b = tick_read16(METER + Q16_MATCH(2));
    tick_log("firmware period %u", (unsigned)(uint16_t)(b - a));

    const uint16_t t0 = tick_read16(TALLY + Q16_COUNT);
    tick_cycles(19200 - 2);
    const uint16_t t1 = tick_read16(TALLY + Q16_COUNT);
    tick_log("chained %u", (unsigned)(uint16_t)(t1 - t0));

    wait_until_ps(6500000000ull);
    tick_log("encoder %u", (unsigned)tick_read16(WHEEL + Q16_COUNT));
    wait_until_ps(12000000000ull);
    tick_log("encoder %u", (unsigned)tick_read16(WHEEL + Q16_COUNT));
}
