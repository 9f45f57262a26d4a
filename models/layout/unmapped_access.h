#pragma once
// What happens when firmware touches an address no register answers for: an address outside every
// peripheral window (the address router finds it) or a reserved location inside a window (the
// register file finds it). One per-run policy governs both, so a run is either lenient or strict
// everywhere. The message names the address in hex, the nearest register (its name, its peripheral
// and the distance to it) and the simulated time, and goes to the spdlog logger "bus".

#include "models/layout/register_layout.h"
#include "sim/clock_domain.h"

#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <string_view>

namespace spdlog {
class logger;
}

namespace models {

// The per-run policy for unmapped and reserved locations.
enum class unmapped_policy : std::uint32_t {
    ignore,  // reads give 0, writes vanish, nothing is said
    warn,    // as ignore, and a warning goes to the "bus" logger
    error,   // the access fails (TLM_ADDRESS_ERROR_RESPONSE on the bus) and an error is logged
};
// "ignore", "warn" or "error".
const char* to_string(unmapped_policy p);
// The policy spelled `text`, or none.
std::optional<unmapped_policy> unmapped_policy_from_string(std::string_view text);

// A register and the peripheral it belongs to, found nearest to an address.
struct nearest_location {
    std::string register_name;   // empty when nothing is known about the neighbourhood
    std::string peripheral;      // the peripheral instance's name
    std::uint64_t distance = 0;  // bytes between the address and the register
    bool below = false;          // the address lies below the register
};

// The nearest register of `layout` (mapped at `base` under the name `peripheral`) to `address`.
nearest_location nearest_in(const register_layout& layout, std::uint64_t base,
                            const std::string& peripheral, std::uint64_t address);

// The message for an access nobody answers, e.g.
// "read of 4 bytes at 0x50000024 hits a location reserved in timer_a; nearest register:
// status_clear of timer_a, 0x1 byte above it; at 1000000 ps".
// `what` says where the access went ("no peripheral", "a location reserved in timer_a").
std::string unmapped_message(bool is_write, unsigned length, std::uint64_t address,
                             std::string_view what, const nearest_location& nearest,
                             sim::time_ps at);

// Applies the policy to a finished message: logs it on "bus" (warn: warning; error: error level)
// and returns true when the access must fail.
bool apply_unmapped_policy(unmapped_policy policy, const std::string& message);

// The "bus" logger: the one registered under that name, else a new stderr logger registered so.
std::shared_ptr<spdlog::logger> bus_logger();
// Hexadecimal with a 0x prefix, for messages.
std::string hex_address(std::uint64_t v);

}  // namespace models
