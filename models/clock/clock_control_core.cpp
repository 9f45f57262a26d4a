#include "models/clock/clock_control_core.h"

#include <limits>
#include <set>
#include <stdexcept>
#include <string>
#include <vector>

namespace models {

const char* to_string(clock_field f) {
    switch (f) {
        case clock_field::source:
            return "source";
        case clock_field::source_now:
            return "source_now";
        case clock_field::divide:
            return "divide";
        case clock_field::pll_enable:
            return "pll_enable";
        case clock_field::pll_multiplier:
            return "pll_multiplier";
        case clock_field::pll_input_divider:
            return "pll_input_divider";
        case clock_field::pll_output_divider:
            return "pll_output_divider";
        case clock_field::ready:
            return "ready";
        case clock_field::open:
            return "open";
        case clock_field::refused:
            return "refused";
    }
    return "?";
}

std::vector<sim::clock_kind> node_kinds_of(clock_field f) {
    using k = sim::clock_kind;
    switch (f) {
        case clock_field::source:
        case clock_field::source_now:
            return {k::mux};
        case clock_field::divide:
            return {k::divider};
        case clock_field::pll_enable:
        case clock_field::pll_multiplier:
        case clock_field::pll_input_divider:
        case clock_field::pll_output_divider:
            return {k::pll};
        case clock_field::ready:
            return {k::crystal, k::rc_oscillator, k::external, k::pll,
                    k::divider, k::mux,           k::gate,     k::boost};
        case clock_field::open:
            return {k::gate};
        case clock_field::refused:
            return {};
    }
    return {};
}

unsigned value_width(clock_field f) {
    switch (f) {
        case clock_field::source:
        case clock_field::source_now:
            return 8;
        case clock_field::divide:
        case clock_field::pll_multiplier:
            return 16;
        case clock_field::pll_input_divider:
        case clock_field::pll_output_divider:
            return 8;
        case clock_field::refused:
            return refused_bits;
        default:
            return 1;
    }
}

clock_control_core::clock_control_core(sim::clock_tree& tree, std::vector<clock_slot> slots)
    : tree_(tree) {
    if (!tree.started())
        throw std::logic_error("clock-control block: the clock tree must be started first");
    for (clock_slot& s : slots) {
        slot_state st;
        st.slot = std::move(s);
        st.kind = tree.kind(st.slot.node);
        switch (st.kind) {
            case sim::clock_kind::pll:
                st.pll = tree.pll_at(st.slot.node, 0);
                break;
            case sim::clock_kind::divider:
                st.divide = static_cast<std::uint32_t>(tree.divider_at(st.slot.node, 0));
                break;
            case sim::clock_kind::gate:
                st.open = tree.gate_at(st.slot.node, 0);
                break;
            case sim::clock_kind::mux:
                st.source = st.previous = tree.selected_at(st.slot.node, 0).value_or(0);
                break;
            default:
                break;
        }
        slots_.push_back(std::move(st));
    }
}

clock_control_core::slot_state* clock_control_core::slot_of(std::uint32_t field) {
    const std::uint32_t s = clock_slot_of(field);
    if (s == 0 || s > slots_.size()) return nullptr;
    return &slots_[s - 1];
}

void clock_control_core::refuse(std::uint32_t bit, const std::string& why) {
    refused_ |= bit;
    last_refusal_ = why;
}

bool clock_control_core::in_use(const std::string& node, time_ps t) const {
    // A node is in use while a mux selects it or anything made from it (a divider or gate on the
    // PLL's output, say): walk up from each mux's selected input through the nodes it is made
    // from, through a mux on the way by its own selection only.
    for (time_ps when : {t, sim::max_time_ps}) {
        for (const std::string& name : tree_.node_names()) {
            if (tree_.kind(name) != sim::clock_kind::mux) continue;
            const auto s = tree_.selected_at(name, when);
            const auto& inputs = tree_.inputs_of(name);
            if (!s || *s >= inputs.size()) continue;
            std::vector<std::string> todo{inputs[*s]};
            std::set<std::string> seen;
            while (!todo.empty()) {
                const std::string n = todo.back();
                todo.pop_back();
                if (n == node) return true;
                if (!seen.insert(n).second) continue;
                const auto& up = tree_.inputs_of(n);
                if (tree_.kind(n) == sim::clock_kind::mux) {
                    const auto sel = tree_.selected_at(n, when);
                    if (sel && *sel < up.size()) todo.push_back(up[*sel]);
                } else {
                    todo.insert(todo.end(), up.begin(), up.end());
                }
            }
        }
    }
    return false;
}

std::uint32_t clock_control_core::read_field(std::uint32_t field, time_ps t) {
    const clock_field f = clock_field_of(field);
    if (f == clock_field::refused) return refused_;
    const slot_state* s = slot_of(field);
    if (s == nullptr) return 0;
    switch (f) {
        case clock_field::source:
            return static_cast<std::uint32_t>(s->source);
        case clock_field::source_now:
            return static_cast<std::uint32_t>(t >= s->switch_at ? s->source : s->previous);
        case clock_field::divide:
            return s->divide;
        case clock_field::pll_enable:
            return s->pll.enabled ? 1 : 0;
        case clock_field::pll_multiplier:
            return static_cast<std::uint32_t>(s->pll.multiplier);
        case clock_field::pll_input_divider:
            return static_cast<std::uint32_t>(s->pll.input_divider);
        case clock_field::pll_output_divider:
            return static_cast<std::uint32_t>(s->pll.output_divider);
        case clock_field::ready:
            return tree_.domain(s->slot.node).running_at(t) ? 1 : 0;
        case clock_field::open:
            return s->open ? 1 : 0;
        case clock_field::refused:
            break;
    }
    return 0;
}

void clock_control_core::write_field(std::uint32_t field, std::uint32_t value, time_ps t) {
    const clock_field f = clock_field_of(field);
    slot_state* s = slot_of(field);
    if (s == nullptr) return;
    const std::string& node = s->slot.node;
    const std::string at = " at " + sim::format_time(t);
    switch (f) {
        case clock_field::source: {
            const auto& inputs = tree_.inputs_of(node);
            if (value >= inputs.size()) {
                refuse(refused_out_of_range, "mux '" + node + "'" + at + ": input " +
                                                 std::to_string(value) + " does not exist");
                return;
            }
            if (value == s->source) return;
            const std::string& to = inputs[value];
            if (!tree_.domain(to).running_at(t)) {
                refuse(refused_not_ready, "mux '" + node + "'" + at + ": input '" + to +
                                              "' is not running (not started, not locked or "
                                              "stopped)");
                return;
            }
            try {
                const time_ps effective = tree_.select(node, to, t);
                s->previous = t >= s->switch_at ? s->source : s->previous;
                s->source = value;
                s->switch_at = effective;
            } catch (const sim::clock_config_error& e) {
                refuse(refused_out_of_range, e.what());
            }
            return;
        }
        case clock_field::divide:
            if (value == 0) {
                refuse(refused_out_of_range,
                       "divider '" + node + "'" + at + ": divide factor 0; accepted: 1 or more");
                return;
            }
            if (value == s->divide) return;
            try {
                tree_.set_divider(node, value, t);
                s->divide = value;
            } catch (const sim::clock_config_error& e) {
                refuse(refused_out_of_range, e.what());
            }
            return;
        case clock_field::pll_enable: {
            const bool on = (value & 1) != 0;
            if (on == s->pll.enabled) return;
            if (!on && in_use(node, t)) {
                refuse(refused_in_use,
                       "pll '" + node + "'" + at + ": a mux selects it; switch away first");
                return;
            }
            sim::pll_params p = s->pll;
            p.enabled = on;
            try {
                // The tree checks the input, VCO and output ranges, as `tickbench check` does.
                tree_.set_pll(node, p, t);
                s->pll = p;
            } catch (const sim::clock_config_error& e) {
                refuse(refused_out_of_range, e.what());
            }
            return;
        }
        case clock_field::pll_multiplier:
        case clock_field::pll_input_divider:
        case clock_field::pll_output_divider: {
            auto& into = f == clock_field::pll_multiplier      ? s->pll.multiplier
                         : f == clock_field::pll_input_divider ? s->pll.input_divider
                                                               : s->pll.output_divider;
            // A register write rewrites every field of the register; only a change is a request.
            if (value == into) return;
            if (s->pll.enabled) {
                refuse(refused_while_running, "pll '" + node + "'" + at + ": " + to_string(f) +
                                                  " written while the PLL runs; stop it first");
                return;
            }
            if (value == 0) {
                refuse(refused_out_of_range,
                       "pll '" + node + "'" + at + ": " + to_string(f) + " 0; accepted: 1 or more");
                return;
            }
            into = value;
            return;
        }
        case clock_field::open: {
            const bool on = (value & 1) != 0;
            if (on == s->open) return;
            if (!on && in_use(node, t)) {
                refuse(refused_in_use,
                       "gate '" + node + "'" + at + ": a mux selects it; switch away first");
                return;
            }
            if (on && t > sim::max_time_ps - s->slot.start_up) {
                refuse(refused_out_of_range,
                       "gate '" + node + "'" + at + ": the start-up would end past the time limit");
                return;
            }
            tree_.set_gate(node, on, on ? t + s->slot.start_up : t);
            s->open = on;
            return;
        }
        case clock_field::source_now:
        case clock_field::ready:
        case clock_field::refused:
            return;
    }
}

}  // namespace models
