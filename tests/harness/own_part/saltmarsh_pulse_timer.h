/* The pulse timer of the Saltmarsh sample part, a fictional part of our own design
 * (docs/register-layouts.md, "Bring your own part"), as its datasheet describes it: the registers
 * as a struct at their real offsets, their bits, and a small PWM driver that reaches them through
 * volatile pointers only. tests/data/parts/saltmarsh_pulse_timer.toml tells Tickbench the same;
 * tests/bus/sample_part_test.cpp checks that the two agree, and tests/harness/own_part_test.cpp
 * runs the driver unmodified on the simulated part.
 */
#ifndef SALTMARSH_PULSE_TIMER_H
#define SALTMARSH_PULSE_TIMER_H

#include <stdint.h>

#ifdef __cplusplus
extern "C" {
#endif

typedef struct {
    volatile uint32_t ctl;     /* 0x00 control */
    volatile uint32_t div;     /* 0x04 the counter steps every div + 1 clocks (buffered) */
    volatile uint32_t top;     /* 0x08 the last count of a cycle */
    volatile uint32_t now;     /* 0x0c the counter (bits 0..15), RISING (bit 16, read-only) */
    volatile uint32_t cmp[3];  /* 0x10 compare value of pins 0, 1, 2 */
    volatile uint32_t pin_cfg; /* 0x1c one byte per pin: pin p at bits 8p..8p+7 */
    volatile uint32_t irq_on;  /* 0x20 interrupt enables, the bits of pend */
    volatile uint32_t pend;    /* 0x24 events seen; write 0 to a bit to clear it, 1 leaves it */
    volatile uint32_t cmd;     /* 0x28 commands, write-only */
} saltmarsh_pulse_timer;

/* Where the part places its pulse timer. */
#define SALT_PT0_ADDRESS 0x61000400u
#define SALT_PT0 ((saltmarsh_pulse_timer*)(uintptr_t)SALT_PT0_ADDRESS)

/* ctl */
#define SALT_CTL_HALT 0x0001u                     /* 1: the counter stands still */
#define SALT_CTL_STYLE(s) ((uint32_t)(s) << 1)    /* SALT_STYLE_* */
#define SALT_CTL_DIR_DOWN 0x0008u                 /* edge style: 1 counts down */
#define SALT_CTL_SINGLE 0x0010u                   /* halt at the next wrap */
#define SALT_CTL_TOP_BUFFERED 0x0020u             /* top writes wait for a wrap */
#define SALT_CTL_RELOAD(r) ((uint32_t)(r) << 8)   /* SALT_RELOAD_* */
#define SALT_CTL_TRIGGER(t) ((uint32_t)(t) << 12) /* SALT_TRIGGER_* */
#define SALT_CTL_STYLE_MASK (SALT_CTL_STYLE(3) | SALT_CTL_DIR_DOWN)
#define SALT_CTL_RELOAD_MASK SALT_CTL_RELOAD(3)
#define SALT_CTL_TRIGGER_MASK SALT_CTL_TRIGGER(7)
/* counting styles; edge counts one way (SALT_CTL_DIR_DOWN), the others up and down */
#define SALT_STYLE_EDGE 0u
#define SALT_STYLE_CENTER_FALLING 1u /* compare events on the falling slope */
#define SALT_STYLE_CENTER_RISING 2u  /* ... on the rising slope */
#define SALT_STYLE_CENTER_BOTH 3u    /* ... on both */
/* what a wrap and a reload command do */
#define SALT_RELOAD_NEVER 0u         /* wraps load nothing; the command moves the counter only */
#define SALT_RELOAD_ALWAYS 1u        /* every wrap and command loads and raises WRAP */
#define SALT_RELOAD_QUIET_COMMAND 3u /* as ALWAYS, but the command raises no WRAP */
/* what the trigger output follows */
#define SALT_TRIGGER_WRAP 0u
#define SALT_TRIGGER_MATCH(p) (4u + (p))
#define SALT_TRIGGER_OFF 7u

/* now */
#define SALT_NOW_RISING 0x00010000u /* 1 while the counter counts up */

/* one pin_cfg byte; place it with SALT_PIN_BYTE(p, byte) */
#define SALT_PIN_FUNCTION(f) ((uint32_t)(f)) /* SALT_FN_* */
#define SALT_PIN_DRIVE 0x08u                 /* 0: the pin sits inactive */
#define SALT_PIN_HIGH 0x10u                  /* 1: the pin is high while active (reset 1) */
#define SALT_PIN_BUFFERED 0x20u              /* cmp writes wait for a wrap */
#define SALT_PIN_BYTE(p, byte) ((uint32_t)(byte) << (8u * (p)))
#define SALT_FN_LOW 0u         /* inactive */
#define SALT_FN_HIGH 1u        /* active */
#define SALT_FN_SET 2u         /* active at a compare event */
#define SALT_FN_CLEAR 3u       /* inactive at a compare event */
#define SALT_FN_TOGGLE 4u      /* flips at a compare event */
#define SALT_FN_FROZEN 5u      /* keeps its level (reset) */
#define SALT_FN_PULSE_BELOW 6u /* active while the counter is below cmp */
#define SALT_FN_PULSE_FROM 7u  /* active while the counter is at or above cmp */

/* irq_on and pend */
#define SALT_EVENT_WRAP 0x1u
#define SALT_EVENT_MATCH(p) (1u << (1u + (p)))

/* cmd */
#define SALT_CMD_RELOAD_NOW 0x1u /* load the buffered values and restart the count now */

/* ---- driver ---- */

/* Wraps counted by salt_pulse_timer_isr(). */
extern volatile uint32_t salt_wraps;

/* Halts `t` and sets it up for edge-aligned PWM on pins 0 and 1: the counter steps every
 * divider + 1 clocks through 0..top, pin p is active while it is below duty[p]. */
void salt_pwm_init(saltmarsh_pulse_timer* t, uint16_t divider, uint16_t top, uint16_t duty0,
                   uint16_t duty1);
/* Enables the WRAP interrupt of `t`, dropping a WRAP already pending. */
void salt_wrap_irq_enable(saltmarsh_pulse_timer* t);
/* Drives pins 0 and 1 and lets the counter run. */
void salt_pwm_start(saltmarsh_pulse_timer* t);
/* The pulse timer's interrupt handler: clears WRAP the part's way (writing 0 to it) and counts. */
void salt_pulse_timer_isr(void);

#ifdef __cplusplus
}
#endif

#endif
