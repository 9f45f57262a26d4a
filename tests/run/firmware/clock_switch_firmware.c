/* Test firmware for `tickbench run` (tests/run): a driver-style move of the system clock from the
 * internal RC oscillator to the PLL through the demo part's clock-control block
 * (models/layouts/clock_control.toml, docs/clock-control.md), with a 10 kHz PWM on the 16-bit
 * timer before and after. Parameters:
 *   clocks      address of the clock-control block (default 0x50002c00)
 *   timer       address of the timer's window (default 0x50000400)
 *   bus_divide  the bus divider written after the switch (default 2: the timers' boost doubles the
 *               50 MHz bus back to 100 MHz; a wrong value puts every timer off by its ratio)
 * Before the PLL runs, the firmware tries to switch to it and to start it with a VCO out of range,
 * and asserts that both are refused with their status bits and the old setting kept.
 * The timer counts the RC's 8 MHz at first (800 ticks: 10 kHz), then 100 MHz (10000 ticks).
 */
#include <tickbench/firmware.h>

#include <stdint.h>
#include <stdlib.h>

#include "demo_timers.h"

static uint32_t clocks;
static uint32_t timer;

static uint32_t clock_read(uint32_t offset) { return tick_read32(clocks + offset); }
static void clock_write(uint32_t offset, uint32_t value) { tick_write32(clocks + offset, value); }

/* A 50 % PWM of `ticks` timer clocks per period on channel 1, loaded at once. */
static void pwm_period(uint32_t ticks) {
    tick_write16(timer + Q16_SCALE, 0);
    tick_write16(timer + Q16_LIMIT, (uint16_t)(ticks - 1));
    tick_write16(timer + Q16_MATCH(0), (uint16_t)(ticks / 2));
    tick_write8(timer + Q16_KICK, Q16_KICK_FORCE_RELOAD);
}

static void pll_factors(uint32_t multiplier) {
    clock_write(CK_PLL_FACTORS,
                CK_PLL_MULTIPLIER(multiplier) | CK_PLL_INPUT_DIVIDER(3) | CK_PLL_OUTPUT_DIVIDER(2));
}

void tick_firmware_main(void) {
    clocks = (uint32_t)strtoul(tick_param("clocks", "0x50002c00"), NULL, 0);
    timer = (uint32_t)strtoul(tick_param("timer", "0x50000400"), NULL, 0);
    const uint32_t bus_divide = (uint32_t)strtoul(tick_param("bus_divide", "2"), NULL, 0);

    pwm_period(800);
    tick_write16(timer + Q16_SHAPE_AB, Q16_SHAPE_BYTE(0, Q16_SHAPE_ACTION(DEMO_ACTION_PWM_BELOW) |
                                                             Q16_SHAPE_MAIN_ENABLE));
    tick_write16(timer + Q16_RUN, Q16_RUN_ENABLE);
    tick_cycles(8000); /* 1 ms on the 8 MHz RC oscillator */

    /* Refused: the PLL is stopped. */
    clock_write(CK_SYSTEM_SOURCE, CK_SOURCE_PLL);
    TICK_ASSERT(clock_read(CK_REFUSALS) == CK_REFUSED_NOT_READY);
    TICK_ASSERT(CK_SOURCE_NOW(clock_read(CK_SYSTEM_SOURCE)) == CK_SOURCE_RC_FAST);
    clock_write(CK_REFUSALS, CK_REFUSED_NOT_READY);
    /* Refused: 12 MHz / 3 x 80 = 320 MHz is above the PLL's VCO range. */
    pll_factors(80);
    clock_write(CK_PLL_RUN, CK_PLL_RUN_ENABLE);
    TICK_ASSERT(clock_read(CK_REFUSALS) == CK_REFUSED_OUT_OF_RANGE);
    TICK_ASSERT((clock_read(CK_PLL_RUN) & CK_PLL_RUN_ENABLE) == 0);
    clock_write(CK_REFUSALS, CK_REFUSED_OUT_OF_RANGE);

    /* The driver's sequence: factors, enable, wait for lock, switch, confirm. */
    pll_factors(50);
    clock_write(CK_PLL_RUN, CK_PLL_RUN_ENABLE);
    unsigned polls = 0;
    while ((clock_read(CK_PLL_RUN) & CK_PLL_RUN_READY) == 0) {
        tick_cycles(16);
        ++polls;
    }
    tick_log("PLL locked after %u polls", polls);
    clock_write(CK_SYSTEM_SOURCE, CK_SOURCE_PLL);
    while (CK_SOURCE_NOW(clock_read(CK_SYSTEM_SOURCE)) != CK_SOURCE_PLL) tick_cycles(1);
    TICK_ASSERT(clock_read(CK_REFUSALS) == 0);
    tick_log("system clock on the PLL");
    clock_write(CK_BUS_DIVIDE, bus_divide);

    /* The timer still counts 800-tick periods, now of the 100 MHz timer clock, until the driver
     * re-programs it for the new clock 200 us later. */
    tick_cycles(20000);
    pwm_period(10000);
    tick_log("timer re-programmed for 100 MHz");
}
