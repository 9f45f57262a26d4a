// Logging set-up of the command; see log_setup.h.

#include "harness/run/log_setup.h"

#include "harness/cpu.h"
#include "sim/clock_domain.h"

#include <spdlog/pattern_formatter.h>
#include <spdlog/sinks/stdout_color_sinks.h>
#include <spdlog/spdlog.h>
#include <systemc>

#include <atomic>

namespace harness::run {

namespace {

std::atomic<bool> stamping{false};

// The %* flag: "@ <simulated time>: " while a simulation runs, nothing before.
class sim_time_flag final : public spdlog::custom_flag_formatter {
public:
    void format(const spdlog::details::log_msg&, const std::tm&,
                spdlog::memory_buf_t& dest) override {
        if (!stamping.load(std::memory_order_relaxed)) return;
        // Firmware runs ahead of the kernel: while it logs, its own local time is the one that
        // counts.
        const harness::cpu* c = harness::cpu::current();
        const sim::time_ps now =
            c != nullptr && c->in_firmware() ? c->now() : sc_core::sc_time_stamp().value();
        const std::string t = "@ " + sim::format_time(now) + ": ";
        dest.append(t.data(), t.data() + t.size());
    }
    std::unique_ptr<custom_flag_formatter> clone() const override {
        return std::make_unique<sim_time_flag>();
    }
};

}  // namespace

void set_up_logging(const std::string& level) {
    auto logger = spdlog::get("tickbench");
    if (!logger) logger = spdlog::stderr_color_mt("tickbench");
    spdlog::set_default_logger(logger);
    auto formatter = std::make_unique<spdlog::pattern_formatter>();
    formatter->add_flag<sim_time_flag>('*').set_pattern("tickbench: %l: %*%v");
    spdlog::set_formatter(std::move(formatter));
    spdlog::set_level(spdlog::level::from_str(level));
}

void stamp_simulated_time(bool on) { stamping.store(on); }

}  // namespace harness::run
