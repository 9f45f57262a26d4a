// The bus side in a running SystemC kernel: an initiator thread, an address router and two timer
// targets (one per shipped layout) over recording stand-ins for the timer models. SystemC
// elaborates once per process, so this binary holds a single test that builds one platform and
// walks through routing by address, the access latency added to the delay, the time each access
// lands at, the unmapped-address policies with their messages, and the TLM error responses.

#include "models/bus/address_router.h"
#include "models/bus/timer_target.h"
#include "models/layout/register_file.h"
#include "tests/support/recording_timer_core.h"

#include <gtest/gtest.h>
#include <spdlog/sinks/ostream_sink.h>
#include <spdlog/spdlog.h>
#include <tlm_utils/simple_initiator_socket.h>
#include <systemc>
#include <tlm>

#include <functional>
#include <sstream>
#include <string>
#include <vector>

namespace {

using models::timer_field;
using tickbench_test::recording_timer_core;

// Slots 0 and 1 of the demo part's peripheral windows (demo values, examples/parts/demo_part.toml).
constexpr std::uint64_t base_a = 0x5000'0000;
constexpr std::uint64_t base_b = 0x5000'0400;

// One access as the initiator saw it.
struct result {
    tlm::tlm_response_status status;
    std::uint32_t data;
    sc_core::sc_time delay_after;
};

// Runs a scripted list of steps in one thread; each step may issue accesses through `access`.
struct script_initiator : sc_core::sc_module {
    tlm_utils::simple_initiator_socket<script_initiator> socket;
    std::function<void(script_initiator&)> script;

    SC_HAS_PROCESS(script_initiator);
    explicit script_initiator(const sc_core::sc_module_name& n)
        : sc_core::sc_module(n), socket("socket") {
        SC_THREAD(run);
    }
    void run() {
        if (script) script(*this);
    }
    // One access; `be` is an optional byte-enable pattern.
    result access(tlm::tlm_command cmd, std::uint64_t address, unsigned length, std::uint32_t value,
                  sc_core::sc_time delay = sc_core::SC_ZERO_TIME,
                  std::vector<unsigned char> be = {}) {
        unsigned char data[8] = {};
        for (unsigned i = 0; i < 4; ++i) data[i] = static_cast<unsigned char>(value >> (8 * i));
        tlm::tlm_generic_payload t;
        t.set_command(cmd);
        t.set_address(address);
        t.set_data_ptr(data);
        t.set_data_length(length);
        t.set_streaming_width(length);
        if (!be.empty()) {
            t.set_byte_enable_ptr(be.data());
            t.set_byte_enable_length(static_cast<unsigned>(be.size()));
        }
        t.set_response_status(tlm::TLM_INCOMPLETE_RESPONSE);
        socket->b_transport(t, delay);
        std::uint32_t out = 0;
        for (unsigned i = 0; i < 4; ++i) out |= std::uint32_t(data[i]) << (8 * i);
        return {t.get_response_status(), out, delay};
    }
};

TEST(bus_platform_test, routes_times_and_polices_accesses) {
    std::ostringstream log;
    auto logger = std::make_shared<spdlog::logger>(
        "bus", std::make_shared<spdlog::sinks::ostream_sink_st>(log));
    logger->set_pattern("%l %v");
    spdlog::drop("bus");
    spdlog::register_logger(logger);
    auto take_log = [&log] {
        auto s = log.str();
        log.str("");
        return s;
    };

    const std::string dir = std::string(TICKBENCH_SOURCE_DIR) + "/models/layouts/";
    const auto quad = models::load_register_layout_file(dir + "timer16_quad.toml");
    const auto dual = models::load_register_layout_file(dir + "timer32_dual.toml");
    recording_timer_core core_a, core_b;
    models::register_file regs_a(quad, core_a, quad.instance, "timer_a",
                                 models::unmapped_policy::ignore, base_a);
    models::register_file regs_b(dual, core_b, dual.instance, "timer_b",
                                 models::unmapped_policy::ignore, base_b);

    const sc_core::sc_time ns(1, sc_core::SC_NS);
    models::timer_target target_a("timer_a", regs_a, 10 * ns);
    models::timer_target target_b("timer_b", regs_b, 20 * ns);

    // Overlapping ranges are refused when the router is built.
    try {
        models::address_router bad(
            "bad_router",
            {{base_a, 0x40, "timer_a", &quad}, {base_a + 0x20, 0x40, "timer_b", &dual}},
            models::unmapped_policy::warn);
        ADD_FAILURE() << "overlapping ranges accepted";
    } catch (const std::invalid_argument& e) {
        EXPECT_NE(std::string(e.what()).find(
                      "range \"timer_b\" 0x50000020..0x5000005f overlaps range \"timer_a\" "
                      "0x50000000..0x5000003f"),
                  std::string::npos)
            << e.what();
    }

    models::address_router router(
        "router", {{base_a, 0x40, "timer_a", &quad}, {base_b, 0x40, "timer_b", &dual}},
        models::unmapped_policy::ignore);
    script_initiator cpu("cpu");
    cpu.socket.bind(router.target_socket);
    router.initiator_socket.bind(target_a.socket);
    router.initiator_socket.bind(target_b.socket);

    std::vector<result> r;
    std::vector<std::string> logs;
    bool dmi = true;
    std::vector<recording_timer_core::call> first_a;
    cpu.script = [&](script_initiator& self) {
        using tlm::TLM_READ_COMMAND;
        using tlm::TLM_WRITE_COMMAND;
        // 0: write "limit" of timer_a at time 0 with 5 ns of local offset.
        r.push_back(self.access(TLM_WRITE_COMMAND, base_a + 0x02, 2, 0x1234, 5 * ns));
        first_a = core_a.calls;
        // 1: read "count" of timer_b, after waiting 1 us.
        sc_core::wait(1000 * ns);
        core_b.set(timer_field::counter, 0, 0xcafe'f00d);
        r.push_back(self.access(TLM_READ_COMMAND, base_b + 0x00, 4, 0, 3 * ns));
        // 2-4: unmapped address under each policy.
        r.push_back(self.access(TLM_READ_COMMAND, base_a + 0x200, 4, 0));
        logs.push_back(take_log());
        router.set_policy(models::unmapped_policy::warn);
        r.push_back(self.access(TLM_READ_COMMAND, base_a + 0x200, 4, 0));
        logs.push_back(take_log());
        router.set_policy(models::unmapped_policy::error);
        r.push_back(self.access(TLM_WRITE_COMMAND, base_b - 4, 4, 0, 7 * ns));
        logs.push_back(take_log());
        // 5: a reserved location inside timer_a's window, with the error policy on its register
        // file.
        regs_a.set_policy(models::unmapped_policy::error);
        r.push_back(self.access(TLM_READ_COMMAND, base_a + 0x2c, 4, 0));
        logs.push_back(take_log());
        // 6-9: misaligned, bad length, scattered byte enables, running past the window.
        r.push_back(self.access(TLM_READ_COMMAND, base_a + 0x02, 4, 0));
        r.push_back(self.access(TLM_READ_COMMAND, base_a + 0x00, 3, 0));
        r.push_back(self.access(
            TLM_WRITE_COMMAND, base_a + 0x08, 4, 0, sc_core::SC_ZERO_TIME,
            {TLM_BYTE_ENABLED, TLM_BYTE_DISABLED, TLM_BYTE_ENABLED, TLM_BYTE_DISABLED}));
        r.push_back(self.access(TLM_READ_COMMAND, base_a + 0x3e, 4, 0));
        logs.push_back(take_log());
        // 10: one enabled byte: byte 1 of timer_a's "run" only.
        core_a.calls.clear();
        r.push_back(self.access(TLM_WRITE_COMMAND, base_a + 0x10, 2, 0x2100, sc_core::SC_ZERO_TIME,
                                {TLM_BYTE_DISABLED, TLM_BYTE_ENABLED}));
        tlm::tlm_generic_payload t;
        tlm::tlm_dmi d;
        t.set_address(base_a);
        dmi = self.socket->get_direct_mem_ptr(t, d);
    };

    sc_core::sc_start(sc_core::sc_time(10, sc_core::SC_US));
    ASSERT_EQ(r.size(), 11u);

    // Routing and time: the write reached timer_a at 0 + 5 ns, and its latency went on the delay.
    EXPECT_EQ(r[0].status, tlm::TLM_OK_RESPONSE);
    EXPECT_EQ(r[0].delay_after, 15 * ns);
    const std::vector<recording_timer_core::call> expected_a = {
        {recording_timer_core::call::kind::write, timer_field::period, 0, 0x1234, 5000}};
    EXPECT_EQ(first_a, expected_a);
    EXPECT_TRUE(core_b.of(recording_timer_core::call::kind::write).empty());

    // The read reached timer_b at 1 us + 3 ns with its own latency.
    EXPECT_EQ(r[1].status, tlm::TLM_OK_RESPONSE);
    EXPECT_EQ(r[1].data, 0xcafe'f00du);
    EXPECT_EQ(r[1].delay_after, 23 * ns);
    ASSERT_FALSE(core_b.calls.empty());
    EXPECT_EQ(core_b.calls.front().field, timer_field::counter);
    EXPECT_EQ(core_b.calls.front().at, 1'003'000u);

    // ignore: zeros, OK, silent.
    EXPECT_EQ(r[2].status, tlm::TLM_OK_RESPONSE);
    EXPECT_EQ(r[2].data, 0u);
    EXPECT_EQ(logs[0], "");
    // warn: the same, with a warning naming address, nearest register and time.
    EXPECT_EQ(r[3].status, tlm::TLM_OK_RESPONSE);
    EXPECT_EQ(r[3].data, 0u);
    EXPECT_EQ(logs[1],
              "warning read of 4 bytes at 0x50000200 hits no peripheral; nearest register: "
              "link of "
              "timer_a, 0x1d9 bytes above it; at 1000000 ps\n");
    // error: an address error and an error message.
    EXPECT_EQ(r[4].status, tlm::TLM_ADDRESS_ERROR_RESPONSE);
    EXPECT_EQ(logs[2],
              "error write of 4 bytes at 0x500003fc hits no peripheral; nearest register: count of "
              "timer_b, "
              "0x4 bytes below it; at 1007000 ps\n");
    // A reserved location inside a window, found by the register file under its own policy.
    EXPECT_EQ(r[5].status, tlm::TLM_ADDRESS_ERROR_RESPONSE);
    EXPECT_NE(
        logs[3].find(
            "error read of 4 bytes at 0x5000002c hits a location reserved in timer_a; nearest "
            "register: link of timer_a, 0x5 bytes above it; at 1000000 ps"),
        std::string::npos)
        << logs[3];

    // Malformed accesses get the matching TLM error responses (IEEE 1666-2011, TLM-2.0 generic
    // payload response status; which status fits which fault recalled from memory).
    EXPECT_EQ(r[6].status, tlm::TLM_ADDRESS_ERROR_RESPONSE);
    EXPECT_EQ(r[7].status, tlm::TLM_BURST_ERROR_RESPONSE);
    EXPECT_EQ(r[8].status, tlm::TLM_BYTE_ENABLE_ERROR_RESPONSE);
    EXPECT_EQ(r[9].status, tlm::TLM_ADDRESS_ERROR_RESPONSE);
    EXPECT_NE(logs[4].find("misaligned"), std::string::npos) << logs[4];
    EXPECT_NE(logs[4].find("runs past the end of \"timer_a\""), std::string::npos) << logs[4];

    // Byte enables: only byte 1 of "run" was written.
    EXPECT_EQ(r[10].status, tlm::TLM_OK_RESPONSE);
    for (const auto& c : core_a.calls) {
        EXPECT_NE(c.field, timer_field::enable);
        EXPECT_NE(c.field, timer_field::mode);
    }
    EXPECT_EQ(core_a.value(timer_field::reload_policy), 1u);
    EXPECT_EQ(core_a.value(timer_field::trigger_select), 2u);

    EXPECT_FALSE(dmi);
    spdlog::drop("bus");
}

}  // namespace
