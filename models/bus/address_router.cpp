#include "models/bus/address_router.h"

#include "models/bus/timer_target.h"

#include <spdlog/spdlog.h>

#include <algorithm>
#include <cstring>
#include <stdexcept>

namespace models {

namespace {

std::string describe(const address_range& r) {
    return "\"" + r.name + "\" " + hex_address(r.base) + ".." + hex_address(r.base + r.size - 1);
}

}  // namespace

address_router::address_router(sc_core::sc_module_name name, std::vector<address_range> ranges,
                               unmapped_policy policy)
    : sc_core::sc_module(name),
      target_socket("target_socket"),
      initiator_socket("initiator_socket"),
      ranges_(std::move(ranges)),
      policy_(policy) {
    require_ps_resolution(std::string("address_router ") + this->name());
    for (std::size_t i = 0; i < ranges_.size(); ++i) {
        const auto& r = ranges_[i];
        if (r.size == 0)
            throw std::invalid_argument(std::string(this->name()) + ": range \"" + r.name +
                                        "\" has size 0; accepted: at least 1 byte");
        if (r.base + (r.size - 1) < r.base)
            throw std::invalid_argument(std::string(this->name()) + ": range \"" + r.name +
                                        "\" runs past the end of the 64-bit address space");
        for (std::size_t j = 0; j < i; ++j) {
            const auto& o = ranges_[j];
            if (r.base <= o.base + (o.size - 1) && o.base <= r.base + (r.size - 1))
                throw std::invalid_argument(std::string(this->name()) + ": range " + describe(r) +
                                            " overlaps range " + describe(o) +
                                            "; accepted: ranges that share no address");
        }
    }
    target_socket.register_b_transport(this, &address_router::b_transport);
    target_socket.register_transport_dbg(this, &address_router::transport_dbg);
    target_socket.register_get_direct_mem_ptr(this, &address_router::get_direct_mem_ptr);
}

void address_router::end_of_elaboration() {
    if (static_cast<std::size_t>(initiator_socket.size()) != ranges_.size())
        throw std::runtime_error(std::string(name()) + ": " + std::to_string(ranges_.size()) +
                                 " ranges but " + std::to_string(initiator_socket.size()) +
                                 " targets bound; accepted: one binding per range, in range order");
}

int address_router::find(std::uint64_t address) const {
    for (std::size_t i = 0; i < ranges_.size(); ++i)
        if (address >= ranges_[i].base && address - ranges_[i].base < ranges_[i].size)
            return int(i);
    return -1;
}

std::string address_router::unmapped_text(bool is_write, unsigned length, std::uint64_t address,
                                          sim::time_ps at) const {
    nearest_location best;
    bool have = false;
    for (const auto& r : ranges_) {
        nearest_location n;
        if (r.layout != nullptr && !r.layout->registers.empty()) {
            n = nearest_in(*r.layout, r.base, r.name, address);
        } else {
            n.peripheral = r.name;
            n.below = address < r.base;
            n.distance = n.below ? r.base - address : address - (r.base + r.size - 1);
        }
        if (!have || n.distance < best.distance) {
            best = n;
            have = true;
        }
    }
    return unmapped_message(is_write, length, address, "no peripheral", best, at);
}

void address_router::b_transport(tlm::tlm_generic_payload& trans, sc_core::sc_time& delay) {
    const auto address = trans.get_address();
    const unsigned length = trans.get_data_length();
    const int i = find(address);
    if (i >= 0) {
        const auto& r = ranges_[std::size_t(i)];
        if (length > 0 && (address - r.base) + (length - 1) >= r.size) {
            bus_logger()->error("{} of {} bytes at {} runs past the end of {}; at {} ps",
                                trans.is_write() ? "write" : "read", length, hex_address(address),
                                describe(r), to_ps(sc_core::sc_time_stamp() + delay));
            trans.set_response_status(tlm::TLM_ADDRESS_ERROR_RESPONSE);
            return;
        }
        trans.set_address(address - r.base);
        initiator_socket[i]->b_transport(trans, delay);
        trans.set_address(address);
        return;
    }
    if (trans.get_command() == tlm::TLM_IGNORE_COMMAND) {
        trans.set_response_status(tlm::TLM_OK_RESPONSE);
        return;
    }
    const auto at = to_ps(sc_core::sc_time_stamp() + delay);
    if (policy_ != unmapped_policy::ignore &&
        apply_unmapped_policy(policy_, unmapped_text(trans.is_write(), length, address, at))) {
        trans.set_response_status(tlm::TLM_ADDRESS_ERROR_RESPONSE);
        return;
    }
    if (trans.is_read() && trans.get_data_ptr() != nullptr)
        std::memset(trans.get_data_ptr(), 0, length);
    trans.set_response_status(tlm::TLM_OK_RESPONSE);
}

unsigned address_router::transport_dbg(tlm::tlm_generic_payload& trans) {
    const auto address = trans.get_address();
    const int i = find(address);
    if (i < 0) return 0;
    trans.set_address(address - ranges_[std::size_t(i)].base);
    const unsigned n = initiator_socket[i]->transport_dbg(trans);
    trans.set_address(address);
    return n;
}

bool address_router::get_direct_mem_ptr(tlm::tlm_generic_payload&, tlm::tlm_dmi& dmi) {
    // Peripheral registers have side effects; no range is offered for direct access.
    dmi.allow_none();
    dmi.set_start_address(0);
    dmi.set_end_address(static_cast<sc_dt::uint64>(-1));
    return false;
}

}  // namespace models
