// The C firmware API (harness/include/tickbench/firmware.h), forwarding to the running cpu.

#include "tickbench/firmware.h"

#include "harness/cpu.h"
#include "harness/firmware_context.h"

#include <spdlog/spdlog.h>

#include <cstdarg>
#include <cstdio>
#include <cstdlib>

namespace harness {

firmware_context& firmware_context::get() {
    static firmware_context c;
    return c;
}

namespace {
cpu& running() {
    cpu* c = cpu::current();
    if (!c) {
        std::fputs("tickbench: firmware API called outside a simulation run\n", stderr);
        std::abort();
    }
    return *c;
}
}  // namespace

}  // namespace harness

extern "C" {

uint8_t tick_read8(uint32_t a) { return static_cast<uint8_t>(harness::running().read(a, 1)); }
uint16_t tick_read16(uint32_t a) { return static_cast<uint16_t>(harness::running().read(a, 2)); }
uint32_t tick_read32(uint32_t a) { return harness::running().read(a, 4); }
void tick_write8(uint32_t a, uint8_t v) { harness::running().write(a, 1, v); }
void tick_write16(uint32_t a, uint16_t v) { harness::running().write(a, 2, v); }
void tick_write32(uint32_t a, uint32_t v) { harness::running().write(a, 4, v); }

void tick_cycles(uint32_t n) { harness::running().cycles(n); }
void tick_wait_for_interrupt(void) { harness::running().wait_for_interrupt(); }

int tick_irq_disable(void) { return harness::running().irq_disable() ? 1 : 0; }
void tick_irq_enable(void) { harness::running().irq_enable(); }
void tick_irq_line_enable(unsigned line) { harness::running().irq_line_enable(line, true); }
void tick_irq_line_disable(unsigned line) { harness::running().irq_line_enable(line, false); }
void tick_irq_set_handler(unsigned line, tick_irq_handler_fn h) {
    harness::running().set_handler(line, h);
}
int tick_irq_line(const char* name) {
    try {
        return static_cast<int>(harness::running().interrupts().find(name));
    } catch (const std::out_of_range&) {
        return -1;
    }
}

int tick_input(const char* name) {
    return harness::running().find_input(name == nullptr ? "" : name);
}
void tick_input_set(int handle, int level) { harness::running().set_input(handle, level != 0); }

uint64_t tick_now_ps(void) { return harness::running().now(); }

const char* tick_param(const char* name, const char* fallback) {
    const auto& p = harness::firmware_context::get().params;
    auto it = p.find(name);
    return it == p.end() ? fallback : it->second.c_str();
}

void tick_log(const char* format, ...) {
    char buf[1024];
    va_list args;
    va_start(args, format);
    std::vsnprintf(buf, sizeof buf, format, args);
    va_end(args);
    auto& ctx = harness::firmware_context::get();
    const sim::time_ps at = harness::running().now();
    if (ctx.on_log)
        ctx.on_log(at, buf);
    else
        spdlog::info("[{}] firmware: {}", sim::format_time(at), buf);
}

void tick_check(int passed, const char* name, const char* file, int line) {
    auto& ctx = harness::firmware_context::get();
    const sim::time_ps at = harness::running().now();
    if (name == nullptr) name = "";
    if (file == nullptr) file = "";
    ctx.checks.record(name, file, line, passed != 0, at);
    if (passed == 0 && ctx.on_failed_check)
        ctx.on_failed_check(harness::firmware_check{name, file, line, false, at});
}

}  // extern "C"
