#pragma once
// A stimulus source described, not yet running: what a scenario's [stimulus.NAME] table says. A
// described source can drive any number of inputs; each input gets its own running copy from
// make_source(), with its own cursor, so one input asking ahead never disturbs another.

#include "sim/stimulus/edge_source.h"
#include "sim/stimulus/fan_tach.h"
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

// A fan whose tachometer follows the duty of a timer's output pin (fan_tach.h). It is not an
// edge_source: the timer input it drives feeds it the pin (models::timer_inputs::follow_fan).
struct fan_spec {
    fan_settings settings;
    std::string timer;  // the timer whose pin drives the fan ("fans")
    unsigned pin = 0;   // that pin, as the timer numbers its output pins
};

struct source_spec {
    std::string name;  // the scenario's name for it ("tach")
    std::variant<square_settings, pulses_settings, encoder_settings, glitch_spec, fan_spec>
        settings;
};

// Whether `ref` is a fan, which make_source() cannot run on its own.
bool is_fan(const source_ref& ref);

// A running source for `ref`; throws what the source's constructor throws for bad settings, and
// std::logic_error for a fan (is_fan()).
std::unique_ptr<edge_source> make_source(const source_ref& ref);

}  // namespace sim::stimulus
