/* Encoder position and speed: a quadrature encoder counted by a 16-bit timer in encoder x4 mode,
 * sampled by the system tick timer's 1 kHz interrupt.
 *
 * The timer counts every edge of both encoder outputs, up or down as the quadrature says, and wraps
 * at its period (`wheel_limit` + 1 counts; a short period here, so that the run wraps it in both
 * directions). Each tick, the handler reads the counter and takes the step since the last sample
 * modulo the counter's range, as a signed number: right across a wrap as long as the shaft moves
 * less than half the range per sample. It adds the step to a 32-bit software position (wider than
 * the counter, so the position survives every wrap) and turns it into a speed in rpm.
 *
 * After `samples` ticks the firmware checks, against the speed profile the scenario gives the
 * encoder:
 * - the position at the end equals the profile's net count exactly (`expected_position`);
 * - in each segment of `segments` ("FROM UNTIL RPM; ...": samples FROM to UNTIL, numbered from 1
 *   at 1 ms), every sample's speed lies within `tolerance_rpm` of RPM.
 *
 * Parameters: wheel_base, wheel_limit, tick_base, tick_irq, lines (encoder lines per revolution),
 * samples, expected_position, segments, tolerance_rpm.
 */
#include <tickbench/firmware.h>

#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>

/* Registers of the demo part's timers (models/layouts/timer16_quad.toml, tick24.toml). */
#include "demo_timers.h"

/* The tick timer counts the board's 96 MHz system clock (encoder_speed.toml): 96000 counts a
 * millisecond. */
#define COUNTS_PER_TICK 96000u
#define SAMPLES_PER_MINUTE 60000
#define MAX_SAMPLES 1000u
#define MAX_SEGMENTS 8u

static uint32_t wheel_base, tick_base, range, counts_per_rev, samples_wanted;
static volatile uint32_t samples;
static uint16_t last_count;
static int32_t position;
static int32_t speed_rpm[MAX_SAMPLES + 1u];

static uint32_t param_number(const char* name, const char* fallback) {
    return (uint32_t)strtoul(tick_param(name, fallback), NULL, 0);
}

static void on_tick(void) {
    if (!(tick_read32(tick_base + TK_CONTROL) & TK_CONTROL_REACHED_ZERO)) return;
    const uint16_t count = tick_read16(wheel_base + Q16_COUNT);
    /* The step since the last sample, modulo the counter's range, taken as signed. */
    int32_t step = (int32_t)((count + range - last_count) % range);
    if (step >= (int32_t)(range / 2u)) step -= (int32_t)range;
    last_count = count;
    position += step;
    if (samples < samples_wanted) {
        samples = samples + 1u;
        speed_rpm[samples] = step * SAMPLES_PER_MINUTE / (int32_t)counts_per_rev;
    }
}

struct segment {
    long from, until, rpm;
};

/* Reads "FROM UNTIL RPM; ..." into `out`; returns how many segments it held. */
static unsigned read_segments(const char* text, struct segment* out) {
    unsigned n = 0;
    char* end = NULL;
    while (n < MAX_SEGMENTS) {
        out[n].from = strtol(text, &end, 10);
        if (end == text) break;
        out[n].until = strtol(end, &end, 10);
        out[n].rpm = strtol(end, &end, 10);
        ++n;
        while (*end == ' ' || *end == ';') ++end;
        text = end;
    }
    return n;
}

static void check_segment(const struct segment* s, long tolerance) {
    long lowest = speed_rpm[s->from], highest = speed_rpm[s->from];
    for (long k = s->from; k <= s->until; ++k) {
        if (speed_rpm[k] < lowest) lowest = speed_rpm[k];
        if (speed_rpm[k] > highest) highest = speed_rpm[k];
    }
    tick_log("samples %ld to %ld: speed %ld to %ld rpm, expected %ld +/- %ld rpm", s->from,
             s->until, lowest, highest, s->rpm, tolerance);
    static char name[96];
    snprintf(name, sizeof name, "speed within %ld rpm of %ld rpm from sample %ld to %ld", tolerance,
             s->rpm, s->from, s->until);
    tick_check(labs(lowest - s->rpm) <= tolerance && labs(highest - s->rpm) <= tolerance, name,
               __FILE__, __LINE__);
}

void tick_firmware_main(void) {
    wheel_base = param_number("wheel_base", "0x50000400");
    tick_base = param_number("tick_base", "0x50002000");
    range = param_number("wheel_limit", "99") + 1u;
    counts_per_rev = 4u * param_number("lines", "250");
    samples_wanted = param_number("samples", "60");
    const int32_t expected_position =
        (int32_t)strtol(tick_param("expected_position", "0"), NULL, 0);
    const long tolerance = strtol(tick_param("tolerance_rpm", "60"), NULL, 0);
    struct segment segments[MAX_SEGMENTS];
    const unsigned n_segments = read_segments(tick_param("segments", ""), segments);
    int segments_fit = samples_wanted <= MAX_SAMPLES && n_segments > 0;
    for (unsigned i = 0; i < n_segments; ++i)
        segments_fit = segments_fit && segments[i].from >= 1 &&
                       segments[i].from <= segments[i].until &&
                       segments[i].until <= (long)samples_wanted;
    tick_check(segments_fit, "the speed segments lie within the samples", __FILE__, __LINE__);

    /* The wheel: encoder x4 on inputs 1 (A) and 2 (B), wrapping at the limit. */
    tick_write16(wheel_base + Q16_LIMIT, (uint16_t)(range - 1u));
    tick_write16(wheel_base + Q16_LINK, Q16_LINK_COUNT(DEMO_COUNT_ENCODER_X4));
    tick_write16(wheel_base + Q16_RUN, Q16_RUN_ENABLE);
    last_count = tick_read16(wheel_base + Q16_COUNT);

    /* The sampling tick: a reload value of N gives N + 1 counts per tick. */
    const int line = tick_irq_line(tick_param("tick_irq", "heartbeat"));
    TICK_ASSERT(line >= 0);
    tick_irq_set_handler((unsigned)line, on_tick);
    tick_irq_line_enable((unsigned)line);
    tick_write32(tick_base + TK_START_VALUE, COUNTS_PER_TICK - 1u);
    tick_write32(tick_base + TK_COUNT_NOW, 0);
    tick_write32(tick_base + TK_CONTROL, TK_CONTROL_ENABLE | TK_CONTROL_NOTIFY);

    while (samples < samples_wanted) tick_wait_for_interrupt();

    tick_log("position after %u samples: %ld counts (expected %ld)", (unsigned)samples_wanted,
             (long)position, (long)expected_position);
    tick_check(position == expected_position,
               "the position at the end equals the profile's net count", __FILE__, __LINE__);
    for (unsigned i = 0; i < n_segments; ++i) check_segment(&segments[i], tolerance);
}
