#include "models/timer/timer_types.h"

#include <stdexcept>

namespace models {

const char* to_string(timer_field f) {
    switch (f) {
        case timer_field::enable:
            return "enable";
        case timer_field::mode:
            return "mode";
        case timer_field::slope:
            return "slope";
        case timer_field::one_pulse:
            return "one_pulse";
        case timer_field::period_preload:
            return "period_preload";
        case timer_field::reload_policy:
            return "reload_policy";
        case timer_field::force_reload:
            return "force_reload";
        case timer_field::prescaler:
            return "prescaler";
        case timer_field::period:
            return "period";
        case timer_field::counter:
            return "counter";
        case timer_field::wrap_skip:
            return "wrap_skip";
        case timer_field::direction:
            return "direction";
        case timer_field::dead_time:
            return "dead_time";
        case timer_field::dead_time_scale:
            return "dead_time_scale";
        case timer_field::fault_enable:
            return "fault_enable";
        case timer_field::fault_latency:
            return "fault_latency";
        case timer_field::rearm:
            return "rearm";
        case timer_field::flags:
            return "flags";
        case timer_field::irq_enable:
            return "irq_enable";
        case timer_field::trigger_select:
            return "trigger_select";
        case timer_field::compare:
            return "compare";
        case timer_field::compare_preload:
            return "compare_preload";
        case timer_field::action:
            return "action";
        case timer_field::main_enable:
            return "main_enable";
        case timer_field::main_active_low:
            return "main_active_low";
        case timer_field::comp_enable:
            return "comp_enable";
        case timer_field::comp_active_low:
            return "comp_active_low";
        case timer_field::main_safe_level:
            return "main_safe_level";
        case timer_field::comp_safe_level:
            return "comp_safe_level";
        case timer_field::filter_divider:
            return "filter_divider";
        case timer_field::count_source:
            return "count_source";
        case timer_field::trigger_action:
            return "trigger_action";
        case timer_field::trigger_source:
            return "trigger_source";
        case timer_field::trigger_edge:
            return "trigger_edge";
        case timer_field::trigger_filter:
            return "trigger_filter";
        case timer_field::channel_role:
            return "channel_role";
        case timer_field::capture_edge:
            return "capture_edge";
        case timer_field::capture_prescaler:
            return "capture_prescaler";
        case timer_field::input_filter:
            return "input_filter";
    }
    return "?";
}

bool is_channel_field(timer_field f) { return f >= timer_field::compare; }

void timer_config::validate() const {
    auto bad = [](const std::string& what) { throw std::invalid_argument("timer: " + what); };
    if (counter_bits < 8 || counter_bits > 32)
        bad("counter width " + std::to_string(counter_bits) + " bits; accepted: 8 to 32");
    if (channels < 1 || channels > 6)
        bad("channels " + std::to_string(channels) + "; accepted: 1 to 6");
    if (prescaler_bits < 1 || prescaler_bits > 32)
        bad("prescaler width " + std::to_string(prescaler_bits) + " bits; accepted: 1 to 32");
    if (wrap_skip_bits > 16)
        bad("wrap skip width " + std::to_string(wrap_skip_bits) + " bits; accepted: 0 to 16");
    if (compare_latency > 2)
        bad("compare latency " + std::to_string(compare_latency) + " ticks; accepted: 0 to 2");
    if (input_sync_ticks < 1 || input_sync_ticks > 3)
        bad("input synchroniser of " + std::to_string(input_sync_ticks) +
            " ticks; accepted: 1 to 3");
    if (filter_lengths.empty() || filter_lengths.size() > 16)
        bad(std::to_string(filter_lengths.size()) + " filter lengths; accepted: 1 to 16");
    for (const unsigned n : filter_lengths)
        if (n < 1 || n > 255)
            bad("filter length " + std::to_string(n) + " samples; accepted: 1 to 255");
    if (chain_latency > 3)
        bad("chain latency " + std::to_string(chain_latency) + " ticks; accepted: 0 to 3");
}

bool is_defined_value(const timer_config& cfg, timer_field f, std::uint32_t value) {
    switch (f) {
        case timer_field::mode:
        case timer_field::slope:
        case timer_field::channel_role:
        case timer_field::capture_edge:
            return value <= 2;
        case timer_field::filter_divider:
        case timer_field::capture_prescaler:
        case timer_field::count_source:
        case timer_field::trigger_action:
        case timer_field::trigger_source:
            return value <= 3;
        case timer_field::trigger_edge:
            return value <= 1;
        case timer_field::trigger_filter:
        case timer_field::input_filter:
            return value < cfg.filter_lengths.size();
        case timer_field::reload_policy:
            return value <= static_cast<std::uint32_t>(reload_policy::held);
        case timer_field::trigger_select:
            return value == trigger_none || value == trigger_on_reload ||
                   (value >= trigger_on_match(0) && value < trigger_on_match(cfg.channels));
        case timer_field::action:
            switch (static_cast<output_action>(value)) {
                case output_action::hold:
                case output_action::pwm_below:
                case output_action::pwm_at_or_above:
                case output_action::toggle_on_match:
                case output_action::set_on_match:
                case output_action::clear_on_match:
                case output_action::force_low:
                case output_action::force_high:
                    return true;
            }
            return false;
        default:
            return true;
    }
}

}  // namespace models
