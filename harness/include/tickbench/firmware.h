/* Tickbench firmware API: what firmware compiled for the host uses to reach the simulated part.
 *
 * Plain C, so drivers written in C or C++ can include it. A host build of a driver maps its own
 * register macros onto tick_read32()/tick_write32() (or runs unmodified through mapped peripheral
 * pages, see docs/firmware-api.md). Every call advances the firmware's simulated time: a bus access
 * costs the configured number of CPU cycles, tick_cycles() what it says. Interrupts may enter
 * between any two bus accesses. Firmware provides `void tick_firmware_main(void)`; when it returns
 * the firmware is done, the simulation runs on to the end of the run.
 */
#ifndef TICKBENCH_FIRMWARE_H
#define TICKBENCH_FIRMWARE_H

#include <stdint.h>

#ifdef __cplusplus
extern "C" {
#endif

/* Bus accesses at an address of the simulated part. */
uint8_t tick_read8(uint32_t address);
uint16_t tick_read16(uint32_t address);
uint32_t tick_read32(uint32_t address);
void tick_write8(uint32_t address, uint8_t value);
void tick_write16(uint32_t address, uint16_t value);
void tick_write32(uint32_t address, uint32_t value);

/* This stretch of code costs `cycles` CPU cycles (interrupts may enter during it). */
void tick_cycles(uint32_t cycles);
/* Sleeps until an interrupt has been handled (returns after its handler). */
void tick_wait_for_interrupt(void);

/* Global interrupt mask: disable returns whether interrupts were enabled before. */
int tick_irq_disable(void);
void tick_irq_enable(void);
/* Per-line enable (the line numbers are the scenario's). */
void tick_irq_line_enable(unsigned line);
void tick_irq_line_disable(unsigned line);
/* Handler for a line; called with interrupts of equal or lower urgency held off. */
typedef void (*tick_irq_handler_fn)(void);
void tick_irq_set_handler(unsigned line, tick_irq_handler_fn handler);
/* Line number of an interrupt line by name (the peripheral's name); -1 if there is none. */
int tick_irq_line(const char* name);

/* A handle for the timer input named `name` ("fan.input1", "fan.trigger", "fan.fault") that the
 * firmware drives itself, as a test bench would; -1 when the part has no such input. An input that
 * the scenario's [inputs] already drives ends the run. No cost. */
int tick_input(const char* name);
/* Sets input `handle` (from tick_input) to `level` (0 low, else high) at the firmware's time now.
 * No cost. */
void tick_input_set(int handle, int level);

/* Simulated time now, in picoseconds (for logs and checks, not for timing decisions). */
uint64_t tick_now_ps(void);
/* Firmware parameter from the scenario, or `fallback` when absent. */
const char* tick_param(const char* name, const char* fallback);

/* A line in the run's log, stamped with simulated time (printf format). */
void tick_log(const char* format, ...) __attribute__((format(printf, 1, 2)));
/* Records a named firmware check in the assertion log; a failed one ends the run. */
void tick_check(int passed, const char* name, const char* file, int line);
#define TICK_ASSERT(condition) tick_check((condition) ? 1 : 0, #condition, __FILE__, __LINE__)

/* The entry point firmware provides. */
void tick_firmware_main(void);

#ifdef __cplusplus
}
#endif

#endif /* TICKBENCH_FIRMWARE_H */
