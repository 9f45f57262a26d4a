/* A first firmware: a 1 kHz PWM on channel 1 of the demo part's 16-bit timer. */
#include <stdlib.h>
#include <tickbench/firmware.h>

#include "demo_timers.h" /* register offsets and bits of the demo part's timers */

#define PWM_BASE 0x50000000u /* [timers.pwm] base in first.toml */

void tick_firmware_main(void) {
    /* The duty in percent: the scenario's parameter, or --param duty=N on the command line. */
    unsigned duty = (unsigned)strtoul(tick_param("duty", "25"), NULL, 10);

    /* 16 MHz / 16000 counts = 1 kHz; the output is high while the counter is below the compare. */
    tick_write16(PWM_BASE + Q16_LIMIT, 16000 - 1);
    tick_write16(PWM_BASE + Q16_MATCH(0), (uint16_t)(160 * duty));
    const unsigned shape = Q16_SHAPE_ACTION(DEMO_ACTION_PWM_BELOW) | Q16_SHAPE_MAIN_ENABLE;
    tick_write16(PWM_BASE + Q16_SHAPE_AB, (uint16_t)Q16_SHAPE_BYTE(0, shape));
    tick_write16(PWM_BASE + Q16_RUN, Q16_RUN_ENABLE);
    tick_log("PWM started: 1 kHz, %u %% duty", duty);
    /* Returning ends the firmware; the timer runs on to the end of the run. */
}
