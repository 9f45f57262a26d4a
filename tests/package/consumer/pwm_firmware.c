/* Firmware of the consumer project: a 25 kHz PWM at 25 % duty on the demo part's 16-bit timer
 * (timer16_quad) clocked at 48 MHz, channel 0's compare value from the parameter "compare"
 * (default 480 of 1920 ticks). It checks the period it wrote and logs when the timer runs. */
#include <tickbench/firmware.h>
#include <tickbench/parts/demo_timers.h>

#include <stdint.h>
#include <stdlib.h>

#define PWM_BASE 0x50000400u

void tick_firmware_main(void) {
    const uint16_t compare = (uint16_t)strtoul(tick_param("compare", "480"), NULL, 0);
    tick_write16(PWM_BASE + Q16_SCALE, 0);
    tick_write16(PWM_BASE + Q16_LIMIT, 1919);
    tick_write16(PWM_BASE + Q16_MATCH(0), compare);
    tick_write16(PWM_BASE + Q16_SHAPE_AB,
                 (uint16_t)Q16_SHAPE_BYTE(
                     0, Q16_SHAPE_ACTION(DEMO_ACTION_PWM_BELOW) | Q16_SHAPE_MAIN_ENABLE));
    tick_write8(PWM_BASE + Q16_KICK, Q16_KICK_FORCE_RELOAD);
    tick_write16(PWM_BASE + Q16_RUN, Q16_RUN_ENABLE);
    TICK_ASSERT(tick_read16(PWM_BASE + Q16_LIMIT) == 1919);
    tick_log("pwm running, compare %u", (unsigned)compare);
}
