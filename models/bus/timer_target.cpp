#include "models/bus/timer_target.h"

#include <spdlog/spdlog.h>

#include <stdexcept>

namespace models {

void require_ps_resolution(const std::string& who) {
    const auto res = sc_core::sc_get_time_resolution();
    if (res != sc_core::sc_time(1, sc_core::SC_PS))
        throw std::runtime_error(
            who + ": the SystemC time resolution is " + res.to_string() +
            "; Tickbench needs exactly 1 ps (call sc_core::sc_set_time_resolution(1, "
            "sc_core::SC_PS) before creating any sc_time, or leave the default)");
}

timer_target::timer_target(sc_core::sc_module_name name, register_file& registers,
                           sc_core::sc_time latency)
    : sc_core::sc_module(name), socket("socket"), registers_(registers), latency_(latency) {
    require_ps_resolution(std::string("timer_target ") + this->name());
    socket.register_b_transport(this, &timer_target::b_transport);
    socket.register_get_direct_mem_ptr(this, &timer_target::get_direct_mem_ptr);
}

bool timer_target::get_direct_mem_ptr(tlm::tlm_generic_payload&, tlm::tlm_dmi& dmi) {
    // Registers have side effects: every access must come through b_transport.
    dmi.set_start_address(0);
    dmi.set_end_address(static_cast<sc_dt::uint64>(-1));
    dmi.allow_none();
    return false;
}

void timer_target::refuse(tlm::tlm_generic_payload& trans, tlm::tlm_response_status status,
                          const std::string& why, sim::time_ps at) {
    bus_logger()->error("{}: {} of {} bytes at offset {} refused: {}; at {} ps",
                        registers_.peripheral(), trans.is_write() ? "write" : "read",
                        trans.get_data_length(), hex_address(trans.get_address()), why, at);
    trans.set_response_status(status);
}

void timer_target::b_transport(tlm::tlm_generic_payload& trans, sc_core::sc_time& delay) {
    const sim::time_ps at = to_ps(sc_core::sc_time_stamp() + delay);
    trans.set_dmi_allowed(false);
    const auto cmd = trans.get_command();
    if (cmd == tlm::TLM_IGNORE_COMMAND) {
        trans.set_response_status(tlm::TLM_OK_RESPONSE);
        return;
    }
    const unsigned length = trans.get_data_length();
    const auto address = trans.get_address();
    // IEEE 1666-2011, TLM-2.0 generic payload response status (rules recalled from memory): burst
    // error for a length or streaming width the target cannot do, address error for an address it
    // cannot serve, byte-enable error for an enable pattern it cannot honour.
    if (length != 1 && length != 2 && length != 4) {
        refuse(trans, tlm::TLM_BURST_ERROR_RESPONSE, "registers take 1, 2 or 4 bytes", at);
        return;
    }
    if (trans.get_streaming_width() != 0 && trans.get_streaming_width() < length) {
        refuse(trans, tlm::TLM_BURST_ERROR_RESPONSE, "streaming accesses are not supported", at);
        return;
    }
    if (address % length != 0) {
        refuse(trans, tlm::TLM_ADDRESS_ERROR_RESPONSE,
               "misaligned; accepted: an address that is a multiple of " + std::to_string(length),
               at);
        return;
    }
    if (address + length > registers_.layout().size) {
        refuse(trans, tlm::TLM_ADDRESS_ERROR_RESPONSE,
               "beyond the " + hex_address(registers_.layout().size) + "-byte window", at);
        return;
    }
    // Byte enables: the enabled bytes must form one run; it becomes the access.
    unsigned first = 0, count = length;
    if (const unsigned char* be = trans.get_byte_enable_ptr()) {
        const unsigned be_len = trans.get_byte_enable_length();
        if (be_len == 0) {
            refuse(trans, tlm::TLM_BYTE_ENABLE_ERROR_RESPONSE, "byte enable pointer with length 0",
                   at);
            return;
        }
        int lo = -1, hi = -1;
        bool gap = false;
        for (unsigned i = 0; i < length; ++i) {
            const bool on = be[i % be_len] == TLM_BYTE_ENABLED;
            if (!on) continue;
            if (lo < 0)
                lo = int(i);
            else if (hi != int(i) - 1)
                gap = true;
            hi = int(i);
        }
        if (gap) {
            refuse(trans, tlm::TLM_BYTE_ENABLE_ERROR_RESPONSE,
                   "enabled bytes are not contiguous; accepted: one run of enabled bytes", at);
            return;
        }
        if (lo < 0) {  // nothing enabled: nothing to do
            delay += latency_;
            trans.set_response_status(tlm::TLM_OK_RESPONSE);
            return;
        }
        first = unsigned(lo);
        count = unsigned(hi - lo + 1);
    }
    unsigned char* data = trans.get_data_ptr();
    const auto offset = static_cast<std::uint32_t>(address + first);
    access_outcome outcome;
    if (trans.is_write()) {
        std::uint32_t value = 0;
        for (unsigned i = 0; i < count; ++i) value |= std::uint32_t(data[first + i]) << (8 * i);
        outcome = registers_.write(offset, count, value, at);
    } else {
        std::uint32_t value = 0;
        outcome = registers_.read(offset, count, value, at);
        for (unsigned i = 0; i < count; ++i)
            data[first + i] = static_cast<unsigned char>(value >> (8 * i));
    }
    delay += latency_;
    trans.set_response_status(outcome.failed ? tlm::TLM_ADDRESS_ERROR_RESPONSE
                                             : tlm::TLM_OK_RESPONSE);
}

}  // namespace models
