#include "models/clock/clock_bindings.h"

#include <string>

namespace models {

std::vector<sim::scenario_finding> check_clock_bindings(const register_layout& layout,
                                                        const sim::clock_tree& tree) {
    std::vector<sim::scenario_finding> out;
    const std::vector<std::string> names = tree.node_names();
    for (const clock_use& u : layout.clock_uses) {
        const std::string& node = layout.clock_slots.at(u.slot - 1).node;
        sim::scenario_finding f = u.where;
        const std::string field = std::string("\"") + to_string(u.field) + "\"";
        if (!tree.has_node(node)) {
            std::string known;
            for (const auto& n : names) known += (known.empty() ? "\"" : ", \"") + n + "\"";
            f.message = field + " names clock \"" + node +
                        "\", which the scenario's clock tree does not have; accepted: one of " +
                        known;
            out.push_back(f);
            continue;
        }
        const sim::clock_kind k = tree.kind(node);
        const auto kinds = node_kinds_of(u.field);
        bool fits = false;
        std::string accepted;
        for (sim::clock_kind a : kinds) {
            fits = fits || a == k;
            accepted += (accepted.empty() ? "a " : " or a ") + std::string(to_string(a));
        }
        if (!fits) {
            f.message = field + " acts on " + accepted + ", and clock \"" + node + "\" is a " +
                        to_string(k) + "; accepted: the name of " + accepted;
            out.push_back(f);
            continue;
        }
        if (u.field == clock_field::source || u.field == clock_field::source_now) {
            const std::size_t inputs = tree.inputs_of(node).size();
            const std::uint64_t reach = u.width >= 32 ? ~0ULL : (1ULL << u.width);
            if (reach < inputs) {
                unsigned need = 0;
                while ((1ULL << need) < inputs) ++need;
                f.message = field + " holds " + std::to_string(u.width) +
                            (u.width == 1 ? " bit" : " bits") + ", values 0.." +
                            std::to_string(reach - 1) + ", but mux \"" + node + "\" has " +
                            std::to_string(inputs) + " inputs (0.." + std::to_string(inputs - 1) +
                            "); accepted: a field of " + std::to_string(need) + " bits or more";
                out.push_back(f);
            }
        }
    }
    return out;
}

}  // namespace models
