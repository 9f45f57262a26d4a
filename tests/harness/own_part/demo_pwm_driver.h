/* The same PWM driver as saltmarsh_pwm_driver.c, written for the demo part's 16-bit timer
 * (layout timer16_quad, examples/parts/demo_timers.h): the same steps in the same order, so that
 * tests/harness/own_part_test.cpp can require both to make the same waveform. */
#ifndef DEMO_PWM_DRIVER_H
#define DEMO_PWM_DRIVER_H

#include <stdint.h>

#ifdef __cplusplus
extern "C" {
#endif

/* Where the test places the demo part's timer16_quad instance. */
#define DEMO_PWM_TIMER_ADDRESS 0x40001000u

/* Reload events counted by demo_pwm_timer_isr(). */
extern volatile uint32_t demo_reloads;

/* Stops the timer and sets it up for edge-aligned PWM on channels 0 and 1: the counter steps
 * every scale + 1 clocks through 0..limit, channel c is active while it is below duty[c]. */
void demo_pwm_init(uint16_t scale, uint16_t limit, uint16_t duty0, uint16_t duty1);
/* Enables the reload interrupt, dropping a reload flag already set. */
void demo_reload_irq_enable(void);
/* Drives channels 0 and 1 and lets the counter run. */
void demo_pwm_start(void);
/* The timer's interrupt handler: clears the reload flag (write 1 to clear) and counts. */
void demo_pwm_timer_isr(void);

#ifdef __cplusplus
}
#endif

#endif
