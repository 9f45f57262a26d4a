/* A PWM driver for the Saltmarsh sample part's pulse timer, written against its datasheet
 * (saltmarsh_pulse_timer.h) as a driver that ships: plain volatile register accesses. */
#include "saltmarsh_pulse_timer.h"

volatile uint32_t salt_wraps;

void salt_pwm_init(saltmarsh_pulse_timer* t, uint16_t divider, uint16_t top, uint16_t duty0,
                   uint16_t duty1) {
    t->ctl |= SALT_CTL_HALT;
    t->div = divider;
    t->top = top;
    t->cmp[0] = duty0;
    t->cmp[1] = duty1;
    t->ctl = (t->ctl & ~(SALT_CTL_STYLE_MASK | SALT_CTL_RELOAD_MASK | SALT_CTL_TRIGGER_MASK)) |
             SALT_CTL_STYLE(SALT_STYLE_EDGE) | SALT_CTL_RELOAD(SALT_RELOAD_ALWAYS) |
             SALT_CTL_TRIGGER(SALT_TRIGGER_OFF);
    /* div is buffered: the reload command makes it count now, from 0. */
    t->cmd = SALT_CMD_RELOAD_NOW;
}

void salt_wrap_irq_enable(saltmarsh_pulse_timer* t) {
    t->pend = ~SALT_EVENT_WRAP;
    t->irq_on |= SALT_EVENT_WRAP;
}

void salt_pwm_start(saltmarsh_pulse_timer* t) {
    const uint32_t pwm = SALT_PIN_FUNCTION(SALT_FN_PULSE_BELOW) | SALT_PIN_DRIVE | SALT_PIN_HIGH;
    t->pin_cfg = SALT_PIN_BYTE(0, pwm) | SALT_PIN_BYTE(1, pwm) |
                 SALT_PIN_BYTE(2, SALT_PIN_FUNCTION(SALT_FN_FROZEN) | SALT_PIN_HIGH);
    t->ctl &= ~SALT_CTL_HALT;
}

void salt_pulse_timer_isr(void) {
    saltmarsh_pulse_timer* t = SALT_PT0;
    if (t->pend & SALT_EVENT_WRAP) {
        t->pend = ~SALT_EVENT_WRAP;
        salt_wraps = salt_wraps + 1u;
    }
}
