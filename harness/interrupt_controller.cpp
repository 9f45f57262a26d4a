#include "harness/interrupt_controller.h"

#include <algorithm>
#include <stdexcept>

namespace harness {

interrupt_controller::interrupt_controller(std::vector<interrupt_line_config> lines) {
    for (auto& c : lines) lines_.push_back({std::move(c)});
}

unsigned interrupt_controller::find(const std::string& name) const {
    std::string known;
    for (std::size_t i = 0; i < lines_.size(); ++i) {
        if (lines_[i].cfg.name == name) return static_cast<unsigned>(i);
        known += (known.empty() ? "" : ", ") + lines_[i].cfg.name;
    }
    throw std::out_of_range("no interrupt line '" + name + "'; lines: " + known);
}

void interrupt_controller::set_level(unsigned line, bool level, time_ps at) {
    line_state& l = lines_.at(line);
    if (l.level == level) return;
    l.level = level;
    if (level) l.rose_at = at;
    ++changes_;
}

void interrupt_controller::set_enabled(unsigned line, bool enabled, time_ps at) {
    line_state& l = lines_.at(line);
    if (enabled && !l.enabled) l.enabled_at = at;
    l.enabled = enabled;
    ++changes_;
}

bool interrupt_controller::set_global_enable(bool enabled) {
    const bool old = global_enable_;
    global_enable_ = enabled;
    ++changes_;
    return old;
}

time_ps interrupt_controller::ready_at(const line_state& l) const {
    const time_ps rise = l.rose_at + l.cfg.extra_delay;
    return std::max(rise, l.enabled_at);
}

std::optional<interrupt_delivery> interrupt_controller::deliverable(
    time_ps now, unsigned running_priority) const {
    if (!global_enable_) return std::nullopt;
    std::optional<interrupt_delivery> best;
    unsigned best_priority = running_priority;
    for (std::size_t i = 0; i < lines_.size(); ++i) {
        const line_state& l = lines_[i];
        if (!l.level || !l.enabled || l.cfg.priority >= best_priority) continue;
        const time_ps r = ready_at(l);
        if (r > now) continue;
        best = interrupt_delivery{static_cast<unsigned>(i), r};
        best_priority = l.cfg.priority;
    }
    return best;
}

std::optional<time_ps> interrupt_controller::next_ready(time_ps now,
                                                        unsigned running_priority) const {
    if (!global_enable_) return std::nullopt;
    std::optional<time_ps> best;
    for (const line_state& l : lines_) {
        if (!l.level || !l.enabled || l.cfg.priority >= running_priority) continue;
        const time_ps r = std::max(ready_at(l), now);
        if (!best || r < *best) best = r;
    }
    return best;
}

}  // namespace harness
