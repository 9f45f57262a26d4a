#include "sim/stimulus/source_spec.h"

#include "sim/stimulus/pulse_list.h"

#include <stdexcept>

namespace sim::stimulus {

bool is_fan(const source_ref& ref) { return std::holds_alternative<fan_spec>(ref.spec->settings); }

std::unique_ptr<edge_source> make_source(const source_ref& ref) {
    const auto& v = ref.spec->settings;
    if (const auto* s = std::get_if<square_settings>(&v)) return std::make_unique<square_wave>(*s);
    if (const auto* p = std::get_if<pulses_settings>(&v))
        return std::make_unique<pulse_list>(p->edges, p->idle_level);
    if (const auto* e = std::get_if<encoder_settings>(&v))
        return std::make_unique<quadrature_encoder>(*e, ref.output);
    if (std::holds_alternative<fan_spec>(v))
        throw std::logic_error("fan source '" + ref.spec->name +
                               "' follows a timer pin and runs only inside a timer's inputs");
    const auto& g = std::get<glitch_spec>(v);
    return std::make_unique<glitch_overlay>(make_source(g.base), g.settings);
}

}  // namespace sim::stimulus
