#pragma once
// The failure report page (report.html): one self-contained HTML file with inline CSS and inline
// SVG, no script and nothing fetched, drawn from a report_model (docs/cli.md, "report.html").
//
// The pieces a page is made of are public so that tests can hold them to their rules: the time
// axis (round steps of 1, 2 or 5 in the unit that makes them whole numbers), the window around a
// failure (the failing measurement and its expected marks, widened edge by edge while edges stay
// a few pixels apart and their number under a cap), and a trace's path (at most a fixed number of
// points whatever the number of edges: edges closer than a column become one bar). All
// coordinates are computed in integers, so the same model gives the same bytes on every machine.

#include "sim/report/report_model.h"

#include <cstddef>
#include <string>
#include <vector>

namespace sim {

struct axis_tick {
    time_ps at = 0;
    std::string label;  // "250 us"
};

struct time_axis {
    time_ps step = 0;  // 1, 2 or 5 times a power of ten, in ps
    std::string unit;  // "ps", "ns", "us", "ms" or "s"
    std::vector<axis_tick> ticks;
};

// Ticks over [from, to] (from < to): every multiple of the smallest round step that makes at most
// `max_ticks` of them (at least 2), each labelled as a whole number of the largest unit that
// divides the step.
time_axis make_time_axis(time_ps from, time_ps to, unsigned max_ticks);

struct time_window {
    time_ps from = 0;
    time_ps to = 0;
};

struct window_limits {
    unsigned width_px = 760;        // the plot's width
    unsigned min_px_per_edge = 4;   // nearest distinct edge times, outside the focus, in pixels
    std::size_t context_edges = 8;  // edge times added on each side of the focus at most
    std::size_t max_edges = 160;    // edges inside the window at most (focus included)
};

// The window to draw around [focus_from, focus_to]: the focus, widened by the edges of `traces`
// next to it, one edge time at a time on each side, while the limits hold; then a margin of a
// twelfth on each side. A focus with no edge near it gets the traces' known stretch.
time_window select_window(const std::vector<wave_trace>& traces, time_ps focus_from,
                          time_ps focus_to, const window_limits& limits);

// The SVG path ("M x y H x V y ...") of `trace` over `window`, `width_px` wide from x = 0, high at
// y = top and low at y = top + height, coordinates in tenths of a pixel written as decimals; at
// most `max_points` path points. Stretches the trace does not know are left out.
std::string trace_path(const wave_trace& trace, const time_window& window, unsigned width_px,
                       unsigned top, unsigned height, std::size_t max_points);

// The number of points in a path made by trace_path.
std::size_t path_points(const std::string& path);

// The picture of a failed check: its traces around the first failure, the failing span with its
// arrow and label, the first failure's instant, the expected marks, and the time axis.
std::string failure_svg(const report_check& check, const report_model& model);
// A small picture of the last period of a check's first signal.
std::string thumbnail_svg(const report_check& check, const report_model& model);

// The whole page.
std::string report_html_text(const report_model& model);
// Writes report_html_text() to `path`; throws output_error naming the file and the reason.
void write_report_html(const std::string& path, const report_model& model);

}  // namespace sim
