#pragma once
// What a register file drives: a peripheral model's functional fields, named by their number in
// the vocabulary of the model's kind (docs/register-layouts.md, "Peripheral kinds").
//
// The general-purpose timer is reached through its own interface (timer_core_if); every other kind
// implements this one, so one register file serves all of them and a layout's `kind` alone decides
// which model's vocabulary its fields name.

#include "sim/clock_domain.h"

#include <cstdint>

namespace models {

class field_port {
public:
    virtual ~field_port() = default;
    // The value of functional field `field` at time t.
    virtual std::uint32_t read_field(std::uint32_t field, sim::time_ps t) = 0;
    // Writes functional field `field` at time t.
    virtual void write_field(std::uint32_t field, std::uint32_t value, sim::time_ps t) = 0;
    // Clears the flag bits in mask at time t.
    virtual void clear_flag_bits(std::uint32_t mask, sim::time_ps t) = 0;
};

}  // namespace models
