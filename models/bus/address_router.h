#pragma once
// Routes bus accesses by address to peripheral targets (docs/architecture.md, "Registers are
// data"): one target socket facing the initiator, one initiator socket binding per mapped range, in
// the order the ranges are given.
//
// A range is a window [base, base + size) with the peripheral's name and, optionally, its register
// layout so that messages about unmapped addresses can name the nearest register. Ranges may not
// overlap; the router refuses them at construction. The target sees addresses relative to its base.
// Accesses that hit no range follow the run's unmapped policy: ignore (reads give 0), warn (the
// same, with a warning on the "bus" logger) or error (TLM_ADDRESS_ERROR_RESPONSE and an error
// logged); an access that starts inside a range and runs past its end always fails with an address
// error. The router grants no direct memory access and adds no delay of its own.

#include "models/layout/register_layout.h"
#include "models/layout/unmapped_access.h"

#include <tlm_utils/multi_passthrough_initiator_socket.h>
#include <tlm_utils/simple_target_socket.h>
#include <systemc>
#include <tlm>

#include <cstdint>
#include <string>
#include <vector>

namespace models {

// One mapped window.
struct address_range {
    std::uint64_t base = 0;
    std::uint64_t size = 0;                   // bytes, at least 1
    std::string name;                         // the peripheral instance, for messages
    const register_layout* layout = nullptr;  // optional; must outlive the router
};

class address_router : public sc_core::sc_module {
public:
    // Facing the initiator (a CPU or the firmware runner).
    tlm_utils::simple_target_socket<address_router> target_socket;
    // Bind range i's target as the i-th binding of this socket. A router with no ranges (a part
    // without peripherals) leaves it unbound.
    tlm_utils::multi_passthrough_initiator_socket<address_router, 32, tlm::tlm_base_protocol_types,
                                                  0, sc_core::SC_ZERO_OR_MORE_BOUND>
        initiator_socket;

    // Maps `ranges`; throws std::invalid_argument naming both ranges if two overlap, or naming one
    // of size 0 or one that runs past the 64-bit address space.
    address_router(sc_core::sc_module_name name, std::vector<address_range> ranges,
                   unmapped_policy policy);

    // The ranges, in binding order.
    const std::vector<address_range>& ranges() const { return ranges_; }
    // The index of the range holding `address`, or -1.
    int find(std::uint64_t address) const;
    // The policy for unmapped addresses.
    unmapped_policy policy() const { return policy_; }
    // Changes the policy for unmapped addresses.
    void set_policy(unmapped_policy p) { policy_ = p; }
    // The message an access of `length` bytes at unmapped `address` would produce at time `at`.
    std::string unmapped_text(bool is_write, unsigned length, std::uint64_t address,
                              sim::time_ps at) const;

private:
    void b_transport(tlm::tlm_generic_payload& trans, sc_core::sc_time& delay);
    unsigned transport_dbg(tlm::tlm_generic_payload& trans);
    bool get_direct_mem_ptr(tlm::tlm_generic_payload& trans, tlm::tlm_dmi& dmi);
    void end_of_elaboration() override;

    std::vector<address_range> ranges_;
    unmapped_policy policy_;
};

}  // namespace models
