#pragma once
// Shows a watchdog's reset as a signal, "<name>.reset", low until the watchdog resets the part and
// high from then on, so waveforms show it and checks can count it (an edge_count check saying "a
// reset happens between T1 and T2"; docs/watchdog.md).

#include "models/watchdog/watchdog_core.h"
#include "sim/signal_sink.h"

#include <string>

namespace models {

class watchdog_probe final : public watchdog_observer {
public:
    // Declares "<name>.reset" in `sink` with id `id` (low at time 0). The sink must outlive the
    // probe.
    watchdog_probe(const std::string& name, sim::signal_sink& sink, sim::signal_id id)
        : sink_(sink), id_(id) {
        sink_.declare(id_, sim::signal_info{name, "reset", false});
    }
    void on_reset(watchdog_fault, time_ps at) override { sink_.change(id_, true, at); }
    // The first id after the one this probe declared.
    sim::signal_id end_id() const { return id_ + 1; }

private:
    sim::signal_sink& sink_;
    sim::signal_id id_;
};

}  // namespace models
