/* Register offsets and bit encodings of the demo part's two timer layouts, for firmware written
 * against the demo part (models/layouts/timer16_quad.toml and timer32_dual.toml; the tables are in
 * docs/register-layouts.md). The layouts are of our own design. A test (tests/bus/
 * demo_encoding_test.cpp) reads both layout files and proves every value here is what the timer
 * model decodes, so this header, the layout files and the docs cannot drift apart.
 */
#ifndef TICKBENCH_DEMO_TIMERS_H
#define TICKBENCH_DEMO_TIMERS_H

/* Output action codes (docs/timer-model.md, "Output actions"): a 4-bit code, the kind in bits 2..3
 * and the variant in bits 0..1. */
#define DEMO_ACTION_HOLD 0x0u
#define DEMO_ACTION_PWM_BELOW 0x4u
#define DEMO_ACTION_PWM_AT_OR_ABOVE 0x5u
#define DEMO_ACTION_TOGGLE_ON_MATCH 0x8u
#define DEMO_ACTION_SET_ON_MATCH 0x9u
#define DEMO_ACTION_CLEAR_ON_MATCH 0xau
#define DEMO_ACTION_FORCE_LOW 0xcu
#define DEMO_ACTION_FORCE_HIGH 0xdu

/* Count modes, match slopes and reload policies as the demo layouts encode them. */
#define DEMO_MODE_UP 0u
#define DEMO_MODE_DOWN 1u
#define DEMO_MODE_CENTER 2u
#define DEMO_SLOPE_UP 0u
#define DEMO_SLOPE_DOWN 1u
#define DEMO_SLOPE_BOTH 2u
#define DEMO_RELOAD_EVERY 0u
#define DEMO_RELOAD_QUIET_FORCED 1u
#define DEMO_RELOAD_HELD 2u
/* trigger_select: 0 none, 1 + c channel c's match, 7 the reload event. */
#define DEMO_TRIGGER_NONE 0u
#define DEMO_TRIGGER_ON_MATCH(c) (1u + (c))
#define DEMO_TRIGGER_ON_RELOAD 7u

/* Flag and interrupt-enable bits: channel c's match or capture at bit c, reload 8, fault 9,
 * trigger 10. Over-capture flags: timer16_quad's 16-bit registers hold channel c's at bit 12 + c,
 * timer32_dual's at bit 16 + c. */
#define DEMO_FLAG_CHANNEL(c) (1u << (c))
#define DEMO_FLAG_RELOAD 0x100u
#define DEMO_FLAG_FAULT 0x200u
#define DEMO_FLAG_TRIGGER 0x400u
#define Q16_FLAG_OVERCAPTURE(c) (1u << (12u + (c)))
#define D32_FLAG_OVERCAPTURE(c) (1u << (16u + (c)))

/* The input side (docs/timer-model.md, "Inputs"). */
#define DEMO_ROLE_COMPARE 0u
#define DEMO_ROLE_CAPTURE_OWN 1u
#define DEMO_ROLE_CAPTURE_NEIGHBOUR 2u
#define DEMO_EDGE_RISING 0u
#define DEMO_EDGE_FALLING 1u
#define DEMO_EDGE_BOTH 2u
#define DEMO_COUNT_TIMER_CLOCK 0u
#define DEMO_COUNT_TRIGGER_EDGES 1u
#define DEMO_COUNT_ENCODER_X2 2u
#define DEMO_COUNT_ENCODER_X4 3u
#define DEMO_TRIGGER_ACTION_NONE 0u
#define DEMO_TRIGGER_ACTION_RESTART 1u
#define DEMO_TRIGGER_ACTION_GATE 2u
#define DEMO_TRIGGER_ACTION_START 3u
#define DEMO_TRIGGER_FROM_INPUT0 0u
#define DEMO_TRIGGER_FROM_INPUT1 1u
#define DEMO_TRIGGER_FROM_PIN 2u
#define DEMO_TRIGGER_FROM_CHAIN 3u

/* ---- timer16_quad: 16-bit counter, 4 channels, complementary outputs, dead time, fault ---- */
#define Q16_COUNT 0x00u /* counter */
#define Q16_LIMIT 0x02u /* period */
#define Q16_SCALE 0x04u /* prescaler */
#define Q16_SKIP 0x06u  /* wrap skip (8-bit register) */
#define Q16_MATCH(c) (0x08u + 2u * (c))
#define Q16_RUN 0x10u          /* counting */
#define Q16_KICK 0x12u         /* one-shot commands (8-bit register) */
#define Q16_PRELOAD 0x13u      /* preload switches (8-bit register) */
#define Q16_SHAPE_AB 0x14u     /* output shaping of channels 0 (low byte) and 1 (high byte) */
#define Q16_SHAPE_CD 0x16u     /* the same for channels 2 and 3 */
#define Q16_DEAD 0x18u         /* dead time */
#define Q16_GUARD 0x1au        /* fault input */
#define Q16_NOTIFY 0x1cu       /* interrupt enables */
#define Q16_STATUS 0x1eu       /* flags, read-only */
#define Q16_STATUS_CLEAR 0x20u /* flags, write 1 to clear */
#define Q16_SENSE 0x22u        /* channel roles and captured edges */
#define Q16_SENSE_TUNE 0x24u   /* input filters and capture prescalers */
#define Q16_LINK 0x26u         /* counting source and trigger */

/* run */
#define Q16_RUN_ENABLE 0x0001u
#define Q16_RUN_MODE(m) ((unsigned)(m) << 1)
#define Q16_RUN_SLOPE(s) ((unsigned)(s) << 3)
#define Q16_RUN_ONE_PULSE 0x0020u
#define Q16_RUN_DIRECTION_DOWN 0x0080u
#define Q16_RUN_RELOAD_POLICY(p) ((unsigned)(p) << 8)
#define Q16_RUN_TRIGGER(t) ((unsigned)(t) << 12)
/* kick */
#define Q16_KICK_FORCE_RELOAD 0x01u
#define Q16_KICK_REARM 0x02u
/* preload */
#define Q16_PRELOAD_COMPARE(c) (1u << (c))
#define Q16_PRELOAD_PERIOD 0x80u
/* one shaping byte per channel; place it with Q16_SHAPE_BYTE(c, byte) in SHAPE_AB / SHAPE_CD */
#define Q16_SHAPE_ACTION(a) ((unsigned)(a))
#define Q16_SHAPE_MAIN_ENABLE 0x10u
#define Q16_SHAPE_COMP_ENABLE 0x20u
#define Q16_SHAPE_MAIN_ACTIVE_LOW 0x40u
#define Q16_SHAPE_COMP_ACTIVE_LOW 0x80u
#define Q16_SHAPE_REG(c) ((c) < 2u ? Q16_SHAPE_AB : Q16_SHAPE_CD)
#define Q16_SHAPE_BYTE(c, byte) ((unsigned)(byte) << (8u * ((c)&1u)))
/* dead: the dead time, counted on the timer clock divided by 1 << scale (scale 0..3) */
#define Q16_DEAD_TIME(count) ((unsigned)(count))
#define Q16_DEAD_SCALE(scale) ((unsigned)(scale) << 12)
/* guard */
#define Q16_GUARD_MAIN_SAFE_HIGH(c) (1u << (c))
#define Q16_GUARD_COMP_SAFE_HIGH(c) (1u << (4u + (c)))
#define Q16_GUARD_LATENCY(ticks) ((unsigned)(ticks) << 8)
#define Q16_GUARD_FAULT_ENABLE 0x8000u

/* sense: a nibble per channel, channel c at bits 4c..4c+3 */
#define Q16_SENSE_ROLE(c, role) ((unsigned)(role) << (4u * (c)))
#define Q16_SENSE_EDGE(c, edge) ((unsigned)(edge) << (4u * (c) + 2u))
/* sense_tune: a nibble per channel */
#define Q16_TUNE_FILTER(c, index) ((unsigned)(index) << (4u * (c)))
#define Q16_TUNE_PRESCALER(c, p) ((unsigned)(p) << (4u * (c) + 2u))
/* link */
#define Q16_LINK_COUNT(source) ((unsigned)(source))
#define Q16_LINK_ACTION(action) ((unsigned)(action) << 2)
#define Q16_LINK_TRIGGER_FROM(source) ((unsigned)(source) << 4)
#define Q16_LINK_TRIGGER_FALLING 0x0040u
#define Q16_LINK_TRIGGER_FILTER(index) ((unsigned)(index) << 8)
#define Q16_LINK_FILTER_DIVIDER(d) ((unsigned)(d) << 12)

/* ---- timer32_dual: 32-bit counter, 2 channels ---- */
#define D32_COUNT 0x00u
#define D32_LIMIT 0x04u
#define D32_SCALE 0x08u
#define D32_MATCH(c) (0x0cu + 4u * (c))
#define D32_SETUP 0x14u
#define D32_COMMAND 0x18u
#define D32_OUTPUTS 0x1cu
#define D32_TAKE 0x20u    /* flags, cleared by the read that returns them */
#define D32_PENDING 0x24u /* flags, read-only */
#define D32_ALERTS 0x28u  /* interrupt enables */
#define D32_INPUTS 0x2cu  /* the input side */

/* setup */
#define D32_SETUP_ENABLE 0x0001u
#define D32_SETUP_ONE_PULSE 0x0002u
#define D32_SETUP_PERIOD_PRELOAD 0x0004u
#define D32_SETUP_MODE(m) ((unsigned)(m) << 4)
#define D32_SETUP_SLOPE(s) ((unsigned)(s) << 6)
#define D32_SETUP_RELOAD_POLICY(p) ((unsigned)(p) << 8)
#define D32_SETUP_TRIGGER(t) ((unsigned)(t) << 12)
#define D32_SETUP_DIRECTION_DOWN 0x80000000u
/* command */
#define D32_COMMAND_FORCE_RELOAD 0x1u
/* one outputs byte per channel, at bits 8c..8c+7 */
#define D32_OUTPUT_ACTION(a) ((unsigned)(a))
#define D32_OUTPUT_MAIN_ENABLE 0x10u
#define D32_OUTPUT_MAIN_ACTIVE_LOW 0x20u
#define D32_OUTPUT_COMPARE_PRELOAD 0x40u
#define D32_OUTPUT_BYTE(c, byte) ((unsigned)(byte) << (8u * (c)))

/* inputs: a byte per channel, then the counting source and the trigger */
#define D32_INPUT_ROLE(c, role) ((unsigned)(role) << (8u * (c)))
#define D32_INPUT_EDGE(c, edge) ((unsigned)(edge) << (8u * (c) + 2u))
#define D32_INPUT_PRESCALER(c, p) ((unsigned)(p) << (8u * (c) + 4u))
#define D32_INPUT_FILTER(c, index) ((unsigned)(index) << (8u * (c) + 6u))
#define D32_INPUT_COUNT(source) ((unsigned)(source) << 16)
#define D32_INPUT_ACTION(action) ((unsigned)(action) << 18)
#define D32_INPUT_TRIGGER_FROM(source) ((unsigned)(source) << 20)
#define D32_INPUT_TRIGGER_FALLING 0x400000u
#define D32_INPUT_TRIGGER_FILTER(index) ((unsigned)(index) << 24)
#define D32_INPUT_FILTER_DIVIDER(d) ((unsigned)(d) << 28)

/* ---- tick24: the system tick timer, a 24-bit down-counter (docs/tick-timer.md) ---- */
#define TK_START_VALUE 0x00u /* reload value, bits 0..23 */
#define TK_COUNT_NOW 0x04u   /* current value; any write clears it to 0 */
#define TK_CONTROL 0x08u     /* reading it clears the reached-zero flag */
#define TK_CONTROL_ENABLE 0x01u
#define TK_CONTROL_DIVIDED 0x02u /* count the instance clock divided by 8 */
#define TK_CONTROL_NOTIFY 0x08u  /* interrupt request on reaching zero */
#define TK_CONTROL_REACHED_ZERO 0x80u
#define TK_COUNTER_MAX 0xffffffu

/* ---- watchdog12: the watchdog, a 12-bit down-counter on the slow RC oscillator
 * (docs/watchdog.md) ---- */
#define WD_FEED 0x00u   /* key register: write WD_KEY_FIRST then WD_KEY_SECOND to refresh */
#define WD_ARM 0x04u    /* write 1: start; reads 1 once started */
#define WD_DIVIDE 0x08u /* prescaler: the counter steps every 4 << value edges (0..6) */
#define WD_LIMIT 0x0cu  /* reload value */
#define WD_WINDOW 0x10u /* refresh allowed only while the counter is at or below this */
#define WD_LEVEL 0x14u  /* the counter, read-only */
#define WD_KEY_FIRST 0x3c71u
#define WD_KEY_SECOND 0x9e24u
#define WD_COUNTER_MAX 0xfffu

/* ---- slow32: the slow-clock counter, a 32-bit up-counter on the watch crystal, asynchronous to
 * the bus (docs/slow-counter.md) ---- */
#define SC_TICKS 0x00u   /* the counter; a read sees it as of 40 ns before: read until two agree */
#define SC_WAKE_AT 0x04u /* alarm value */
#define SC_SETUP 0x08u
#define SC_SETUP_ENABLE 0x01u
#define SC_SETUP_NOTIFY 0x02u /* interrupt request on the alarm (acts at once) */
#define SC_SETUP_PRESCALE(k) ((unsigned)(k) << 4) /* count every 2^k-th slow edge */
#define SC_STATUS 0x0cu
#define SC_STATUS_BUSY 0x01u  /* a write waits for its slow edge; another write now is lost */
#define SC_STATUS_ALARM 0x02u /* write 1 to clear */
#define SC_WRITE_LATENCY 3u   /* slow edges from a write to its effect */

/* ---- clock_control: the clock-control block over the demo part's clock tree, slot 11 at
 * 0x5000_2C00 (models/layouts/clock_control.toml, docs/clock-control.md). A refused request sets a
 * bit of CK_REFUSALS (write 1 to clear) and keeps the old setting. ---- */
#define CK_SYSTEM_SOURCE 0x00u
#define CK_SOURCE_RC_FAST 0u /* the system clock's inputs, in the order of the mux "sys" */
#define CK_SOURCE_PLL 1u
#define CK_SOURCE_NOW(reg) (((reg) >> 4) & 3u) /* the input followed now */
#define CK_BUS_DIVIDE 0x04u                    /* the bus divider's factor, 1..255 */
#define CK_PLL_FACTORS 0x08u                   /* written while the PLL is stopped */
#define CK_PLL_MULTIPLIER(m) ((unsigned)(m))
#define CK_PLL_INPUT_DIVIDER(d) ((unsigned)(d) << 8)
#define CK_PLL_OUTPUT_DIVIDER(d) ((unsigned)(d) << 12)
#define CK_PLL_RUN 0x0cu
#define CK_PLL_RUN_ENABLE 0x001u
#define CK_PLL_RUN_READY 0x100u /* rises one lock time after the enable */
#define CK_TIMER_GATES 0x10u
#define CK_GATE_TIMER_A 0x1u
#define CK_GATE_TIMER_B 0x2u
#define CK_REFUSALS 0x14u
#define CK_REFUSED_NOT_READY 0x1u     /* selected a stopped input (PLL not locked...) */
#define CK_REFUSED_OUT_OF_RANGE 0x2u  /* a value the clock rules forbid (VCO range...) */
#define CK_REFUSED_IN_USE 0x4u        /* stopped a clock the system clock runs from */
#define CK_REFUSED_WHILE_RUNNING 0x8u /* PLL factors written while it runs */
#define CK_OSCILLATORS 0x18u
#define CK_OSC_RC_FAST_READY 0x1u
#define CK_OSC_XTAL_READY 0x2u

#endif
