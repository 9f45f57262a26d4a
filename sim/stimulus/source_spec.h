#pragma once
// A stimulus source described, not yet running: what a scenario's [stimulus.NAME] table says. A
// described source can drive any number of inputs; each input gets its own running copy from
// make_source(), with its own cursor, so one input asking ahead never disturbs another.

#include "sim/stimulus/edge_source.h"
#include "sim/stimulus/glitch_overlay.h"
#include "sim/stimulus/quadrature_encoder.h"
#include "sim/stimulus/square_wave.h"

#include <memory>
#include <string>
#include <variant>
#include <vector>

namespace sim::stimulus {

// A pulse list, its edges already checked (edges_from_points()).
struct pulses_settings {
    std::vector<edge> edges;
    bool idle_level = false;
};

struct source_spec;

// A described source and, for an encoder, which of its two outputs.
struct source_ref {
    std::shared_ptr<const source_spec> spec;
    encoder_output output = encoder_output::a;
};

// Glitches laid over another described source.
struct glitch_spec {
    glitch_settings settings;
    source_ref base;
};

struct source_spec {
    std::string name;  // the scenario's name for it ("tach")
    std::variant<square_settings, pulses_settings, encoder_settings, glitch_spec> settings;
};

// A running source for `ref`; throws what the source's constructor throws for bad settings.
std::unique_ptr<edge_source> make_source(const source_ref& ref);

}  // namespace sim::stimulus
