/* The PWM driver of demo_pwm_driver.h: plain volatile register accesses to the demo part. */
#include "demo_pwm_driver.h"

#include "examples/parts/demo_timers.h"

#define REG16(offset) (*(volatile uint16_t*)(uintptr_t)(DEMO_PWM_TIMER_ADDRESS + (offset)))
#define REG8(offset) (*(volatile uint8_t*)(uintptr_t)(DEMO_PWM_TIMER_ADDRESS + (offset)))

volatile uint32_t demo_reloads;

void demo_pwm_init(uint16_t scale, uint16_t limit, uint16_t duty0, uint16_t duty1) {
    REG16(Q16_RUN) &= (uint16_t)~Q16_RUN_ENABLE;
    REG16(Q16_SCALE) = scale;
    REG16(Q16_LIMIT) = limit;
    REG16(Q16_MATCH(0)) = duty0;
    REG16(Q16_MATCH(1)) = duty1;
    REG16(Q16_RUN) =
        (uint16_t)((REG16(Q16_RUN) &
                    ~(Q16_RUN_MODE(3) | Q16_RUN_RELOAD_POLICY(3) | Q16_RUN_TRIGGER(7))) |
                   Q16_RUN_MODE(DEMO_MODE_UP) | Q16_RUN_RELOAD_POLICY(DEMO_RELOAD_EVERY) |
                   Q16_RUN_TRIGGER(DEMO_TRIGGER_NONE));
    /* The prescaler is shadowed: a forced reload makes it count now, from 0. */
    REG8(Q16_KICK) = Q16_KICK_FORCE_RELOAD;
}

void demo_reload_irq_enable(void) {
    REG16(Q16_STATUS_CLEAR) = DEMO_FLAG_RELOAD;
    REG16(Q16_NOTIFY) |= DEMO_FLAG_RELOAD;
}

void demo_pwm_start(void) {
    const unsigned pwm = Q16_SHAPE_ACTION(DEMO_ACTION_PWM_BELOW) | Q16_SHAPE_MAIN_ENABLE;
    REG16(Q16_SHAPE_AB) = (uint16_t)(Q16_SHAPE_BYTE(0, pwm) | Q16_SHAPE_BYTE(1, pwm));
    REG16(Q16_RUN) |= Q16_RUN_ENABLE;
}

void demo_pwm_timer_isr(void) {
    if (REG16(Q16_STATUS) & DEMO_FLAG_RELOAD) {
        REG16(Q16_STATUS_CLEAR) = DEMO_FLAG_RELOAD;
        demo_reloads = demo_reloads + 1u;
    }
}
