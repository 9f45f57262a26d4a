/* Test firmware: a capture interrupt served late sees the over-capture flag. Channel 1 of a demo
 * 16-bit timer (models/layouts/timer16_quad.toml) captures the rising edges of its input; its
 * capture flag raises the timer's interrupt, whose handler reads the status, then the captured
 * value (which clears the capture flag), clears an over-capture flag it found, and logs the
 * period since the value it read before ("capture period 2000", "capture period 4000,
 * over-capture"). The main loop takes `before` captures, then runs a stretch of `masked_us`
 * microseconds of work, with interrupts globally disabled when the parameter handler is "late"
 * (a critical section longer than the input period: a second capture lands before the handler
 * reads the first) and enabled when it is "prompt"; then it takes captures until `total` were
 * handled and logs "N captures handled, over-captures seen: M". Entry `overcapture_main`.
 * Parameters: base       address of the timer's window (default 0x50000800) irq        the timer's
 * interrupt line name (default "meter") handler    "late" or "prompt" (default "prompt") before
 * captures handled before the stretch (default 3) total      captures handled in all (default 6)
 *   masked_us  the stretch's length in microseconds (default 120)
 */
#include <tickbench/firmware.h>

#include <stdint.h>
#include <string.h>

#include "demo_timers.h"
#include "input_support.h"

static uint32_t base;
static volatile uint32_t handled;
static volatile uint32_t overcaptures;
static uint16_t last_value;

static void on_capture(void) {
    const uint16_t status = tick_read16(base + Q16_STATUS);
    const uint16_t value = tick_read16(base + Q16_MATCH(0));
    const int over = (status & Q16_FLAG_OVERCAPTURE(0)) != 0;
    if (over) {
        tick_write16(base + Q16_STATUS_CLEAR, Q16_FLAG_OVERCAPTURE(0));
        overcaptures = overcaptures + 1;
    }
    if (handled == 0)
        tick_log("first capture%s", over ? ", over-capture" : "");
    else
        tick_log("capture period %u%s", (unsigned)(uint16_t)(value - last_value),
                 over ? ", over-capture" : "");
    last_value = value;
    handled = handled + 1;
}

static void wait_for_captures(uint32_t count) {
    while (handled < count) tick_wait_for_interrupt();
}

void overcapture_main(void) {
    base = param_number("base", 0x50000800u);
    const int line = tick_irq_line(tick_param("irq", "meter"));
    TICK_ASSERT(line >= 0);
    const char* handler = tick_param("handler", "prompt");
    const int late = strcmp(handler, "late") == 0;
    TICK_ASSERT(late || strcmp(handler, "prompt") == 0);

    tick_irq_set_handler((unsigned)line, on_capture);
    tick_irq_line_enable((unsigned)line);
    tick_write16(base + Q16_SENSE, Q16_SENSE_ROLE(0, DEMO_ROLE_CAPTURE_OWN));
    tick_write16(base + Q16_NOTIFY, DEMO_FLAG_CHANNEL(0));
    tick_write16(base + Q16_RUN, Q16_RUN_ENABLE);

    wait_for_captures(param_number("before", 3));
    if (late) tick_irq_disable();
    wait_until_ps(tick_now_ps() + (uint64_t)param_number("masked_us", 120) * 1000000u);
    if (late) tick_irq_enable();
    wait_for_captures(param_number("total", 6));
    tick_log("%u captures handled, over-captures seen: %u", (unsigned)handled,
             (unsigned)overcaptures);
}
