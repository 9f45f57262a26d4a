#pragma once
// The TLM-2.0 face of one timer instance: a target socket whose b_transport performs the access on
// a register_file at the access's own time, sc_time_stamp() + the annotated delay, and adds the
// instance's access latency to the delay (loosely timed, temporal decoupling friendly: no wait()).
//
// The module is a thin shell (STYLE: behaviour apart from the kernel shell): all register semantics
// live in models::register_file. It accepts single 1-, 2- or 4-byte accesses, naturally aligned,
// with byte enables whose enabled bytes are contiguous; anything else gets the matching TLM error
// response. It grants no direct memory access: every register access has side effects the model
// must see. Time is handed to the model in exact picoseconds, so the kernel's time resolution must
// be 1 ps; construction fails with a clear message otherwise.

#include "models/layout/register_file.h"

#include <tlm_utils/simple_target_socket.h>
#include <systemc>
#include <tlm>

namespace models {

class timer_target : public sc_core::sc_module {
public:
    // Where initiators (or an address_router) bind.
    tlm_utils::simple_target_socket<timer_target> socket;

    // Serves `registers`, which must outlive the module; each access adds `latency` to the delay.
    // Throws std::runtime_error if the kernel's time resolution is not 1 ps.
    timer_target(sc_core::sc_module_name name, register_file& registers, sc_core::sc_time latency);

    // The latency added to each access's delay.
    const sc_core::sc_time& latency() const { return latency_; }
    // The register file behind the socket.
    register_file& registers() { return registers_; }

private:
    void b_transport(tlm::tlm_generic_payload& trans, sc_core::sc_time& delay);
    bool get_direct_mem_ptr(tlm::tlm_generic_payload& trans, tlm::tlm_dmi& dmi);
    void refuse(tlm::tlm_generic_payload& trans, tlm::tlm_response_status status,
                const std::string& why, sim::time_ps at);

    register_file& registers_;
    sc_core::sc_time latency_;
};

// Throws std::runtime_error unless the kernel's time resolution is exactly 1 ps; `who` names the
// caller.
void require_ps_resolution(const std::string& who);
// sc_time as exact picoseconds (requires the 1 ps resolution).
inline sim::time_ps to_ps(const sc_core::sc_time& t) { return t.value(); }

}  // namespace models
