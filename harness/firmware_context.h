#pragma once
// What the firmware API reaches besides the cpu: the scenario's firmware parameters, and the
// firmware's own checks (TICK_ASSERT / tick_check), which land in the run's assertion log.

#include "sim/clock_domain.h"

#include <functional>
#include <map>
#include <string>
#include <vector>

namespace harness {

// One tick_check() call.
struct firmware_check {
    std::string name;
    std::string file;
    int line = 0;
    bool passed = false;
    sim::time_ps at = 0;
};

class firmware_context {
public:
    // The context of the run in this process.
    static firmware_context& get();

    std::map<std::string, std::string> params;
    std::vector<firmware_check> checks;
    // Called on a failed firmware check, after it is recorded (ends the run).
    std::function<void(const firmware_check&)> on_failed_check;
    // Receives each tick_log() line (already formatted), with the simulated time.
    std::function<void(sim::time_ps, const std::string&)> on_log;
};

}  // namespace harness
