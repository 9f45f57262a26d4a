#pragma once
// What the processor model and the platform need of any peripheral model to bring it along in
// time: process up to an instant, and say when the next thing happens. The timer and the tick
// timer implement it, so the cpu watches both the same way (docs/architecture.md, "Firmware on the
// host").

#include "sim/clock_domain.h"

namespace models {

class event_source {
public:
    virtual ~event_source() = default;
    // Process everything that happens at or before t.
    virtual void advance_to(sim::time_ps t) = 0;
    // The earliest time something may happen that was not yet processed, or none.
    virtual bool next_event(sim::time_ps& at) const = 0;
};

}  // namespace models
