/* Helpers the input side's test firmware shares (the files beside this one): reading
 * numeric parameters, waiting for an instant, and taking the next capture of a demo 16-bit timer
 * (models/layouts/timer16_quad.toml). Test firmware acts as a test bench, so it may steer by the
 * simulated time that firmware on hardware would not have.
 */
#ifndef TICKBENCH_TEST_INPUT_SUPPORT_H
#define TICKBENCH_TEST_INPUT_SUPPORT_H

#include <stdint.h>

/* The firmware parameter `name` as a whole number (decimal, or hex after 0x), or `fallback`. */
uint32_t param_number(const char* name, uint32_t fallback);

/* The next whole number of the comma-separated list at *cursor (advanced past it); 0 at the end. */
int next_listed_number(const char** cursor, uint64_t* value);

/* Runs CPU cycles until the first CPU clock edge at or after `t_ps` (at once if already there). */
void wait_until_ps(uint64_t t_ps);

/* The value channel `channel` of the 16-bit timer at `base` captures next: clears the channel's
 * flag, polls until it sets again, and reads the captured value (which clears the flag). */
uint16_t q16_next_capture(uint32_t base, unsigned channel);

#endif
