// The failure report page; see report_html.h.

#include "sim/report/report_html.h"

#include "sim/report/detail/output_file.h"
#include "sim/report/junit_xml.h"  // xml_escape
#include "sim/wide_int.h"

#include <algorithm>

namespace sim {

namespace {

// The failure marker's colour; the browser test looks for it in the rendered page.
const char* const fail_colour = "#d1242f";
const char* const mark_colour = "#1f6feb";
const char* const wave_colour = "#0b5d6b";

std::string esc(const std::string& s) { return xml_escape(s); }

// Tenths of a pixel as a decimal ("123.4", "7").
std::string px(std::uint64_t tenths) {
    std::string s = std::to_string(tenths / 10);
    if (tenths % 10 != 0) s += "." + std::to_string(tenths % 10);
    return s;
}
std::string px_whole(std::uint64_t whole) { return std::to_string(whole); }

// x of time t in tenths of a pixel, clamped to the window.
std::uint64_t x10(time_ps t, const time_window& w, unsigned width_px) {
    if (t <= w.from) return 0;
    if (t >= w.to) return static_cast<std::uint64_t>(width_px) * 10;
    return static_cast<std::uint64_t>(static_cast<u128>(t - w.from) * width_px * 10 /
                                      (w.to - w.from));
}

struct unit_row {
    time_ps ps;
    const char* name;
};
const unit_row units[] = {{1'000'000'000'000ULL, "s"},
                          {1'000'000'000ULL, "ms"},
                          {1'000'000ULL, "us"},
                          {1'000ULL, "ns"},
                          {1ULL, "ps"}};

}  // namespace

time_axis make_time_axis(time_ps from, time_ps to, unsigned max_ticks) {
    time_axis axis;
    if (to <= from) return axis;
    max_ticks = std::max(2u, max_ticks);
    const time_ps span = to - from;
    // The smallest 1-2-5 step giving at most max_ticks ticks.
    time_ps step = 1;
    for (time_ps decade = 1;; decade *= 10) {
        bool found = false;
        for (time_ps m : {1ULL, 2ULL, 5ULL}) {
            const time_ps s = decade * m;
            if (span / s + 1 <= max_ticks) {
                step = s;
                found = true;
                break;
            }
        }
        if (found || decade > max_time_ps / 100) break;
    }
    axis.step = step;
    time_ps unit = 1;
    axis.unit = "ps";
    for (const unit_row& u : units) {
        if (step % u.ps == 0) {
            unit = u.ps;
            axis.unit = u.name;
            break;
        }
    }
    const time_ps first = (from + step - 1) / step * step;
    for (time_ps t = first; t <= to; t += step) {
        axis.ticks.push_back({t, std::to_string(t / unit) + " " + axis.unit});
        if (to - t < step) break;
    }
    return axis;
}

time_window select_window(const std::vector<wave_trace>& traces, time_ps focus_from,
                          time_ps focus_to, const window_limits& limits) {
    if (focus_to < focus_from) std::swap(focus_from, focus_to);
    std::vector<time_ps> times;
    time_ps known_from = max_time_ps, known_to = 0;
    for (const wave_trace& t : traces) {
        known_from = std::min(known_from, t.known_from);
        known_to = std::max(known_to, t.known_to);
        for (time_ps e : t.edges)
            if (e >= t.known_from && e <= t.known_to) times.push_back(e);
    }
    std::sort(times.begin(), times.end());
    const auto lo_it = std::lower_bound(times.begin(), times.end(), focus_from);
    const auto hi_it = std::upper_bound(times.begin(), times.end(), focus_to);
    std::size_t inside = static_cast<std::size_t>(hi_it - lo_it);
    // Next candidates: left is the index one past the next edge to the left; right the next one.
    std::size_t left = static_cast<std::size_t>(lo_it - times.begin());
    std::size_t right = static_cast<std::size_t>(hi_it - times.begin());
    time_ps a = focus_from, b = focus_to;
    // Nearest distinct edge times seen so far outside the focus (0: none yet).
    time_ps min_gap = 0;
    std::size_t added_left = 0, added_right = 0;
    // True when [na, nb] with `gap` as the new nearest pair still keeps edges apart.
    const auto fits = [&](time_ps na, time_ps nb, time_ps gap) {
        if (gap == 0) return true;
        return static_cast<u128>(gap) * limits.width_px >=
               static_cast<u128>(limits.min_px_per_edge) * (nb - na);
    };
    bool grew = true;
    while (grew) {
        grew = false;
        if (left > 0 && added_left < limits.context_edges) {
            const time_ps t = times[left - 1];
            std::size_t n = 0;
            while (left - n > 0 && times[left - n - 1] == t) ++n;
            const time_ps gap = a - t;
            const time_ps new_gap = min_gap == 0 ? gap : std::min(min_gap, gap);
            if (inside + n <= limits.max_edges && fits(t, b, gap == 0 ? 0 : new_gap)) {
                left -= n;
                inside += n;
                a = t;
                if (gap != 0) min_gap = new_gap;
                ++added_left;
                grew = true;
            } else {
                added_left = limits.context_edges;
            }
        }
        if (right < times.size() && added_right < limits.context_edges) {
            const time_ps t = times[right];
            std::size_t n = 0;
            while (right + n < times.size() && times[right + n] == t) ++n;
            const time_ps gap = t - b;
            const time_ps new_gap = min_gap == 0 ? gap : std::min(min_gap, gap);
            if (inside + n <= limits.max_edges && fits(a, t, gap == 0 ? 0 : new_gap)) {
                right += n;
                inside += n;
                b = t;
                if (gap != 0) min_gap = new_gap;
                ++added_right;
                grew = true;
            } else {
                added_right = limits.context_edges;
            }
        }
    }
    if (b == a) {
        // Nothing around the focus: show what is known, or a nanosecond each side.
        if (known_from < known_to && known_from <= a && a <= known_to) {
            a = known_from;
            b = known_to;
        } else {
            a = a >= 1000 ? a - 1000 : 0;
            b = b + 1000;
        }
    }
    const time_ps margin = std::max<time_ps>((b - a) / 12, 1);
    time_window w;
    w.from = a >= margin ? a - margin : 0;
    w.to = b + margin;
    return w;
}

std::string trace_path(const wave_trace& trace, const time_window& window, unsigned width_px,
                       unsigned top, unsigned height, std::size_t max_points) {
    if (window.to <= window.from || width_px == 0) return "";
    const time_ps a = std::max(window.from, trace.known_from);
    const time_ps b = std::min(window.to, trace.known_to);
    if (a >= b) return "";
    max_points = std::max<std::size_t>(max_points, 10);
    const std::uint64_t y_high = static_cast<std::uint64_t>(top) * 10;
    const std::uint64_t y_low = static_cast<std::uint64_t>(top + height) * 10;
    const auto y = [&](bool level) { return level ? y_high : y_low; };
    // Columns of `bucket` tenths of a pixel: at most total / bucket + 1 of them, each drawn with
    // at most 4 points, plus the M and the last H, so the path stays within max_points.
    const std::uint64_t total = static_cast<std::uint64_t>(width_px) * 10;
    const std::uint64_t bucket =
        std::max<std::uint64_t>(10, (total * 4 + (max_points - 6) - 1) / (max_points - 6));
    bool level = trace.before;
    std::size_t i = 0;
    while (i < trace.edges.size() && trace.edges[i] <= a) {
        level = !level;
        ++i;
    }
    std::string d = "M" + px(x10(a, window, width_px)) + " " + px(y(level));
    while (i < trace.edges.size() && trace.edges[i] < b) {
        const std::uint64_t x = x10(trace.edges[i], window, width_px);
        const std::uint64_t col = x / bucket;
        std::size_t k = 0;
        while (i < trace.edges.size() && trace.edges[i] < b &&
               x10(trace.edges[i], window, width_px) / bucket == col) {
            ++k;
            ++i;
        }
        const bool after = k % 2 == 0 ? level : !level;
        d += " H" + px(x);
        if (k == 1) {
            d += " V" + px(y(after));
        } else {
            // Several edges in one column: a bar over the full height, then the level after them.
            d += " V" + px(y(!level)) + " V" + px(y(level)) + " V" + px(y(after));
        }
        level = after;
    }
    d += " H" + px(x10(b, window, width_px));
    return d;
}

std::size_t path_points(const std::string& path) {
    std::size_t n = 0;
    for (char c : path) n += c == 'M' || c == 'H' || c == 'V' ? 1 : 0;
    return n;
}

namespace {

// Layout of a failure picture, in pixels.
constexpr unsigned fig_width = 960;
constexpr unsigned label_width = 180;
constexpr unsigned plot_width = 750;
constexpr unsigned top_band = 62;
constexpr unsigned row_height = 48;
constexpr unsigned wave_height = 26;
constexpr std::size_t max_points_per_trace = 600;

std::string line(std::uint64_t x1, std::uint64_t y1, std::uint64_t x2, std::uint64_t y2,
                 const std::string& attrs) {
    return "<line x1=\"" + px(x1) + "\" y1=\"" + px(y1) + "\" x2=\"" + px(x2) + "\" y2=\"" +
           px(y2) + "\" " + attrs + "/>";
}

// A label at x (tenths) placed so that it stays inside the plot.
std::string label(std::uint64_t x, unsigned y, const std::string& text, const std::string& cls) {
    const std::uint64_t w = static_cast<std::uint64_t>(plot_width) * 10;
    const char* anchor = x < w / 6 ? "start" : (x > w - w / 6 ? "end" : "middle");
    return "<text x=\"" + px(x) + "\" y=\"" + px_whole(y) + "\" text-anchor=\"" + anchor +
           "\" class=\"" + cls + "\">" + esc(text) + "</text>";
}

}  // namespace

std::string failure_svg(const report_check& check, const report_model& model) {
    (void)model;
    time_ps focus_from = check.from ? *check.from : check.at;
    time_ps focus_to = check.at;
    for (const report_mark& m : check.marks) {
        focus_from = std::min(focus_from, m.at);
        focus_to = std::max(focus_to, m.at);
    }
    window_limits limits;
    limits.width_px = plot_width;
    const time_window w = select_window(check.traces, focus_from, focus_to, limits);
    const unsigned n = static_cast<unsigned>(check.traces.size());
    const unsigned traces_bottom = top_band + n * row_height;
    const unsigned marks_y = traces_bottom + 16;
    const unsigned axis_y = marks_y + (check.marks.empty() ? 4 : 36);
    const unsigned height = axis_y + 30;
    const auto X = [&](time_ps t) { return x10(t, w, plot_width); };

    std::string s = "<svg xmlns=\"http://www.w3.org/2000/svg\" class=\"wave\" width=\"" +
                    px_whole(fig_width) + "\" height=\"" + px_whole(height) + "\" viewBox=\"0 0 " +
                    px_whole(fig_width) + " " + px_whole(height) + "\" role=\"img\">";
    s += "<title>" + esc(check.name) + " around its first failure</title>";
    // Signal names in the left column.
    for (unsigned i = 0; i < n; ++i) {
        const unsigned top = top_band + i * row_height;
        s += "<text x=\"" + px_whole(label_width - 12) + "\" y=\"" +
             px_whole(top + wave_height / 2 + 4) + "\" text-anchor=\"end\" class=\"sig\">" +
             esc(check.traces[i].name) + "</text>";
    }
    s += "<g transform=\"translate(" + px_whole(label_width) + ",0)\">";
    const time_axis axis = make_time_axis(w.from, w.to, 8);
    for (const axis_tick& t : axis.ticks)
        s += line(X(t.at), top_band * 10 - 60, X(t.at), traces_bottom * 10, "class=\"grid\"");
    // The failing measurement, shaded, with an arrow over it.
    if (check.from && *check.from < check.at) {
        const std::uint64_t x1 = X(*check.from), x2 = X(check.at);
        s += "<rect x=\"" + px(x1) + "\" y=\"" + px_whole(top_band - 18) + "\" width=\"" +
             px(x2 - x1) + "\" height=\"" + px_whole(traces_bottom - top_band + 18) + "\" fill=\"" +
             fail_colour + "\" fill-opacity=\"0.1\"/>";
        const unsigned ay = top_band - 12;
        s += line(x1, ay * 10, x2, ay * 10,
                  std::string("stroke=\"") + fail_colour + "\" stroke-width=\"1.5\"");
        if (x2 - x1 >= 120) {
            s += "<polygon points=\"" + px(x1) + "," + px_whole(ay) + " " + px(x1 + 70) + "," +
                 px_whole(ay - 4) + " " + px(x1 + 70) + "," + px_whole(ay + 4) + "\" fill=\"" +
                 fail_colour + "\"/>";
            s += "<polygon points=\"" + px(x2) + "," + px_whole(ay) + " " + px(x2 - 70) + "," +
                 px_whole(ay - 4) + " " + px(x2 - 70) + "," + px_whole(ay + 4) + "\" fill=\"" +
                 fail_colour + "\"/>";
        }
        s += label((x1 + x2) / 2, ay - 7, check.span_label, "span");
    }
    // Expected marks: dashed lines across the traces, labels below them in two staggered rows.
    for (std::size_t k = 0; k < check.marks.size(); ++k) {
        const std::uint64_t x = X(check.marks[k].at);
        s += line(x, (top_band - 4) * 10, x, (marks_y + 2 + (k % 2) * 16) * 10,
                  std::string("stroke=\"") + mark_colour +
                      "\" stroke-width=\"1.5\" stroke-dasharray=\"5 3\"");
        s += label(x, marks_y + 12 + static_cast<unsigned>(k % 2) * 16, check.marks[k].label,
                   "mark");
    }
    // The traces, with stretches the report does not know drawn as a dotted middle line.
    for (unsigned i = 0; i < n; ++i) {
        const wave_trace& t = check.traces[i];
        const unsigned top = top_band + i * row_height;
        const std::uint64_t mid = (top * 10) + wave_height * 5;
        if (w.from < t.known_from)
            s += line(X(w.from), mid, X(std::min(t.known_from, w.to)), mid, "class=\"unknown\"");
        if (t.known_to < w.to)
            s += line(X(std::max(t.known_to, w.from)), mid, X(w.to), mid, "class=\"unknown\"");
        const std::string d = trace_path(t, w, plot_width, top, wave_height, max_points_per_trace);
        if (!d.empty())
            s += "<path d=\"" + d + "\" fill=\"none\" stroke=\"" + wave_colour +
                 "\" stroke-width=\"1.5\"/>";
    }
    // The first failure's instant.
    const std::uint64_t xf = X(check.at);
    s += line(xf, 40, xf, traces_bottom * 10,
              std::string("stroke=\"") + fail_colour + "\" stroke-width=\"2.5\"");
    {
        // Beside the line, on the side with more room.
        const bool right = xf < static_cast<std::uint64_t>(plot_width) * 7;
        s += "<text x=\"" + px(right ? xf + 60 : xf - 60) + "\" y=\"16\" text-anchor=\"" +
             (right ? "start" : "end") + "\" class=\"fail\">" +
             esc("first failure at " + format_time(check.at)) + "</text>";
    }
    // The time axis.
    s += line(0, axis_y * 10, static_cast<std::uint64_t>(plot_width) * 10, axis_y * 10,
              "class=\"axis\"");
    for (const axis_tick& t : axis.ticks) {
        s += line(X(t.at), axis_y * 10, X(t.at), (axis_y + 5) * 10, "class=\"axis\"");
        s += "<text x=\"" + px(X(t.at)) + "\" y=\"" + px_whole(axis_y + 18) +
             "\" text-anchor=\"middle\" class=\"tick\">" + esc(t.label) + "</text>";
    }
    s += "</g></svg>";
    return s;
}

std::string thumbnail_svg(const report_check& check, const report_model& model) {
    constexpr unsigned w_px = 200, row = 16, gap = 6;
    if (check.traces.empty()) return "";
    const wave_trace& first = check.traces.front();
    time_window w;
    const std::size_t ne = first.edges.size();
    if (ne >= 3) {
        // One period of the first signal: from the third-last edge to the last.
        w.from = first.edges[ne - 3];
        w.to = first.edges[ne - 1];
    } else {
        w.from = first.known_from;
        w.to = std::max(first.known_to, model.end);
    }
    if (w.to <= w.from) w.to = w.from + 1;
    const time_ps margin = std::max<time_ps>((w.to - w.from) / 8, 1);
    w.from = w.from >= margin ? w.from - margin : 0;
    w.to += margin;
    const unsigned n = static_cast<unsigned>(check.traces.size());
    const unsigned height = n * (row + gap) + gap;
    std::string s = "<svg xmlns=\"http://www.w3.org/2000/svg\" class=\"thumb\" width=\"" +
                    px_whole(w_px) + "\" height=\"" + px_whole(height) + "\" viewBox=\"0 0 " +
                    px_whole(w_px) + " " + px_whole(height) + "\" role=\"img\"><title>" +
                    esc(check.signal) + ", the last " + (ne >= 3 ? "period" : "stretch") +
                    "</title>";
    for (unsigned i = 0; i < n; ++i) {
        const std::string d = trace_path(check.traces[i], w, w_px, gap + i * (row + gap), row, 64);
        if (!d.empty())
            s += "<path d=\"" + d + "\" fill=\"none\" stroke=\"" + wave_colour +
                 "\" stroke-width=\"1.2\"/>";
    }
    s += "</svg>";
    return s;
}

namespace {

const char* const page_style =
    R"(body{font:14px/1.45 system-ui,sans-serif;color:#1b1f24;margin:24px 32px;max-width:1100px}
h1{font-size:22px;margin:0 0 4px}h2{font-size:18px;margin:28px 0 8px;border-bottom:1px solid #d8dee4;padding-bottom:4px}
h3{font-size:16px;margin:20px 0 4px}
.verdict{display:inline-block;padding:2px 10px;border-radius:10px;font-weight:600;color:#fff}
.v-fail{background:#d1242f}.v-pass{background:#1a7f37}
table{border-collapse:collapse;margin:6px 0;max-width:100%}td.mono{word-break:break-all}th,td{border:1px solid #d8dee4;padding:4px 8px;text-align:left;vertical-align:middle}
th{background:#f3f5f7;font-weight:600}td.num{text-align:right;font-variant-numeric:tabular-nums}
code,.mono{font-family:ui-monospace,monospace;font-size:13px}
.detail{margin:2px 0 8px;color:#3b434b}
dl.vals{display:grid;grid-template-columns:max-content auto;gap:2px 14px;margin:6px 0 10px}dl.vals dt{font-weight:600}dl.vals dd{margin:0}
svg.wave{border:1px solid #d8dee4;background:#fff}svg.thumb{background:#fbfcfd;border:1px solid #e4e8ec}
svg text{font-family:ui-monospace,monospace;font-size:12px;fill:#1b1f24}
svg text.fail,svg text.span{fill:#d1242f;font-weight:600}svg text.mark{fill:#1f6feb}
svg .grid{stroke:#eef1f4;stroke-width:1}svg .axis{stroke:#57606a;stroke-width:1}
svg .unknown{stroke:#9aa4ad;stroke-width:1;stroke-dasharray:2 4}
.note{color:#57606a;font-size:13px})";

std::string verdict_badge(bool passed) {
    return passed ? "<span class=\"verdict v-pass\">pass</span>"
                  : "<span class=\"verdict v-fail\">FAIL</span>";
}

}  // namespace

std::string report_html_text(const report_model& model) {
    std::size_t failed = 0;
    for (const report_check& c : model.checks) failed += c.passed ? 0 : 1;
    // The expectation with its tolerance, unless the words already name it.
    const auto expected = [](const report_check& c) {
        if (c.tolerance.empty() || c.expected.find(c.tolerance) != std::string::npos)
            return esc(c.expected);
        return esc(c.expected) + " (" + esc(c.tolerance) + ")";
    };
    std::string h = "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n";
    h += "<title>" + esc(model.scenario) + ": tickbench report</title>\n";
    h += "<style>\n" + std::string(page_style) + "\n</style>\n</head>\n<body>\n";
    h += "<h1>" + esc(model.scenario) + "</h1>\n<p>" + verdict_badge(failed == 0) + " " +
         std::to_string(model.checks.size()) +
         (model.checks.size() == 1 ? " check, " : " checks, ") + std::to_string(failed) +
         " failed; simulated " + esc(format_time(model.end)) + "</p>\n";

    h += "<h2>Checks</h2>\n<table class=\"checks\">\n<tr><th>verdict</th><th>check</th>"
         "<th>kind</th><th>signal</th><th>expected</th><th>measured</th><th>at</th>"
         "<th>waveform</th></tr>\n";
    std::size_t fail_no = 0;
    for (const report_check& c : model.checks) {
        h += "<tr><td>" + verdict_badge(c.passed) + "</td><td>" + esc(c.name) + "</td><td>" +
             esc(c.kind) + "</td><td class=\"mono\">" + esc(c.signal) + "</td><td>" + expected(c) +
             "</td><td>" + esc(c.measured) + "</td><td class=\"num\">" + esc(format_time(c.at)) +
             "</td><td>";
        if (!c.passed) {
            ++fail_no;
            h += "<a href=\"#failure-" + std::to_string(fail_no) + "\">see failure " +
                 std::to_string(fail_no) + "</a>";
        } else {
            h += c.traces.empty() ? "<span class=\"note\">no signal</span>"
                                  : thumbnail_svg(c, model);
        }
        h += "</td></tr>\n";
    }
    h += "</table>\n";

    h += "<h2>Clock plan</h2>\n<table class=\"clocks\">\n<tr><th>clock</th><th>kind</th>"
         "<th>frequency (Hz)</th><th>exact (Hz)</th><th>settings</th><th>feeds</th></tr>\n";
    for (const report_clock& c : model.clocks) {
        h += "<tr><td class=\"mono\">" + esc(c.name) + "</td><td>" + esc(c.kind) +
             "</td><td class=\"num\">" + esc(c.hz) + "</td><td class=\"num\">" + esc(c.hz_exact) +
             "</td><td>" + esc(c.settings) + "</td><td class=\"mono\">" + esc(c.feeds) +
             "</td></tr>\n";
    }
    h += "</table>\n";
    if (model.clocks.empty()) h += "<p class=\"note\">no clocks</p>\n";

    if (failed != 0) {
        h += "<h2>Failures</h2>\n";
        fail_no = 0;
        for (const report_check& c : model.checks) {
            if (c.passed) continue;
            ++fail_no;
            h += "<section id=\"failure-" + std::to_string(fail_no) + "\">\n<h3>" +
                 std::to_string(fail_no) + ". " + esc(c.name) + " <span class=\"note\">" +
                 esc(c.kind) + " on <code>" + esc(c.signal) + "</code></span></h3>\n";
            h += "<p class=\"detail\">" + esc(c.detail) +
                 "</p>\n<dl class=\"vals\"><dt>expected</dt><dd>" + expected(c) +
                 "</dd><dt>measured</dt><dd>" + esc(c.measured) +
                 (c.span_label.empty() ? "" : "; first failure: " + esc(c.span_label)) +
                 "</dd><dt>first failure</dt><dd>" + esc(format_time(c.at)) + "</dd></dl>\n";
            if (c.traces.empty())
                h += "<p class=\"note\">no waveform: this check watches no signal</p>\n";
            else
                h += failure_svg(c, model) + "\n";
            h += "</section>\n";
        }
    }
    h += "<p class=\"note\">Written by tickbench from report.json; times are simulated time.</p>\n";
    h += "</body>\n</html>\n";
    return h;
}

void write_report_html(const std::string& path, const report_model& model) {
    detail::write_output_file(path, report_html_text(model));
}

}  // namespace sim
