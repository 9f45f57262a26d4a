/* Test firmware for `tickbench run` (tests/run): a two-channel 25 kHz PWM on the demo part's 16-bit
 * timer (models/layouts/timer16_quad.toml) with a reload interrupt. Parameters:
 *   base    address of the timer's window (default 0x50000400)
 *   reloads how many reload interrupts to wait for before the firmware's own check (default 20)
 *   ending  "return" (default), "crash" (a store through a null pointer) or "fail-check"
 * The kernel clock is 48 MHz: 1920 ticks are 40 us; channel 1 is active for 480 ticks (25 %),
 * channel 2 for 960 (50 %).
 */
#include <tickbench/firmware.h>

#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#define LIMIT 0x02u
#define SCALE 0x04u
#define MATCH_A 0x08u
#define MATCH_B 0x0au
#define RUN 0x10u
#define KICK 0x12u
#define SHAPE_AB 0x14u
#define NOTIFY 0x1cu
#define STATUS_CLEAR 0x22u
#define RELOAD_FLAG 0x0001u

static uint32_t base;
static volatile uint32_t reloads;

static void on_reload(void) {
    tick_write16(base + STATUS_CLEAR, RELOAD_FLAG);
    reloads = reloads + 1;
}

void tick_firmware_main(void) {
    base = (uint32_t)strtoul(tick_param("base", "0x50000400"), NULL, 0);
    const long wanted = strtol(tick_param("reloads", "20"), NULL, 0);
    const char* ending = tick_param("ending", "return");
    const int line = tick_irq_line(tick_param("irq", "pwm"));
    reloads = 0;

    tick_irq_set_handler((unsigned)line, on_reload);
    tick_write16(base + SCALE, 0);
    tick_write16(base + LIMIT, 1919);
    tick_write16(base + MATCH_A, 480);
    tick_write16(base + MATCH_B, 960);
    /* Channels 1 and 2: active while the counter is below the compare value, main output on. */
    tick_write16(base + SHAPE_AB, 0x1616u);
    tick_write8(base + KICK, 1); /* load the settings now */
    tick_write16(base + STATUS_CLEAR, RELOAD_FLAG);
    tick_write16(base + NOTIFY, RELOAD_FLAG);
    tick_irq_line_enable((unsigned)line);
    tick_write16(base + RUN, 0x0021u); /* count up; keep the reset slope bits */

    while (reloads < (uint32_t)wanted) tick_wait_for_interrupt();
    tick_log("%u reloads seen", (unsigned)reloads);
    if (strcmp(ending, "crash") == 0) *(volatile int*)0 = 1;
    TICK_ASSERT(strcmp(ending, "fail-check") != 0);
    TICK_ASSERT(reloads >= (uint32_t)wanted);
}
