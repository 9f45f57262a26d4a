// A sweep's reports; see sweep_report.h.

#include "harness/run/sweep_report.h"

#include "sim/report/junit_xml.h"
#include "sim/vcd_writer.h"

#include <nlohmann/json.hpp>

#include <algorithm>
#include <cctype>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <map>
#include <optional>
#include <sstream>

namespace harness::run {

namespace {

namespace fs = std::filesystem;
using ojson = nlohmann::ordered_json;

std::string dump(const ojson& j) { return j.dump(-1, ' ', false, ojson::error_handler_t::replace); }

bool whole_number(const std::string& s) {
    return !s.empty() && std::all_of(s.begin(), s.end(), [](char c) {
        return std::isdigit(static_cast<unsigned char>(c)) != 0;
    });
}

void write_file(const std::string& path, const std::string& text) {
    std::ofstream f(path, std::ios::binary | std::ios::trunc);
    f << text;
    f.close();
    if (!f) throw sim::output_error("cannot write " + path);
}

std::string plural(std::uint64_t n, const std::string& one, const std::string& many) {
    return std::to_string(n) + " " + (n == 1 ? one : many);
}

sweep_plan plan_of(const sweep_header& h) {
    std::vector<sweep_axis> axes;
    for (const auto& [name, spec] : h.axes) axes.push_back(parse_axis(name + "=" + spec));
    return sweep_plan(std::move(axes));
}

}  // namespace

std::string record_line(const sweep_plan& plan, const point_record& r) {
    ojson j;
    j["point"] = r.index;
    ojson values = ojson::object();
    const auto v = plan.values(r.index);
    for (std::size_t i = 0; i < v.size(); ++i) values[plan.axes()[i].name] = v[i];
    j["values"] = values;
    j["verdict"] = r.verdict;
    j["exit"] = r.exit_code;
    j["outcome"] = r.outcome;
    if (!r.message.empty()) j["message"] = r.message;
    ojson failed = ojson::array();
    for (const std::string& c : r.failed_checks) failed.push_back(ojson::parse(c));
    j["failed"] = failed;
    return dump(j);
}

point_record parse_record_line(const std::string& line, const std::string& where) {
    try {
        const ojson j = ojson::parse(line);
        point_record r;
        r.index = j.at("point").get<std::uint64_t>();
        r.verdict = j.at("verdict").get<std::string>();
        r.exit_code = j.at("exit").get<int>();
        r.outcome = j.at("outcome").get<std::string>();
        if (j.contains("message")) r.message = j.at("message").get<std::string>();
        for (const ojson& c : j.at("failed")) r.failed_checks.push_back(dump(c));
        return r;
    } catch (const nlohmann::json::exception& e) {
        throw sweep_error(where + ": not a point record of a sweep.jsonl (" + e.what() + ")");
    }
}

std::string header_line(const sweep_header& h) {
    ojson s;
    s["scenario"] = h.scenario;
    s["scenario_digest"] = h.scenario_digest;
    ojson axes = ojson::array();
    for (const auto& [name, spec] : h.axes) axes.push_back({{"axis", name}, {"values", spec}});
    s["axes"] = axes;
    s["points"] = h.points;
    if (!h.part.whole()) s["shard"] = h.part.text();
    if (h.partial) s["partial"] = true;
    ojson j;
    j["sweep"] = s;
    return dump(j);
}

sweep_header parse_header_line(const std::string& line, const std::string& where) {
    try {
        const ojson j = ojson::parse(line).at("sweep");
        sweep_header h;
        h.scenario = j.at("scenario").get<std::string>();
        h.scenario_digest = j.at("scenario_digest").get<std::string>();
        for (const ojson& a : j.at("axes"))
            h.axes.emplace_back(a.at("axis").get<std::string>(), a.at("values").get<std::string>());
        h.points = j.at("points").get<std::uint64_t>();
        if (j.contains("shard")) h.part = parse_shard(j.at("shard").get<std::string>());
        h.partial = j.value("partial", false);
        return h;
    } catch (const nlohmann::json::exception& e) {
        throw sweep_error(where + ": not the header line of a sweep.jsonl (" + e.what() + ")");
    }
}

std::string file_digest(const std::string& path) {
    std::ifstream f(path, std::ios::binary);
    if (!f) throw sweep_error(path + ": cannot read the file");
    // FNV-1a, 64 bits (common practice, no source): a fingerprint, not a security measure.
    std::uint64_t h = 0xcbf29ce484222325ULL;
    char buf[65536];
    while (f.read(buf, sizeof buf) || f.gcount() > 0) {
        for (std::streamsize i = 0; i < f.gcount(); ++i) {
            h ^= static_cast<unsigned char>(buf[i]);
            h *= 0x100000001b3ULL;
        }
    }
    char text[17];
    std::snprintf(text, sizeof text, "%016llx", static_cast<unsigned long long>(h));
    return text;
}

std::string sweep_jsonl_text(const sweep_header& h, const sweep_plan& plan,
                             const std::vector<point_record>& records) {
    std::string out = header_line(h) + "\n";
    for (const point_record& r : records) out += record_line(plan, r) + "\n";
    return out;
}

std::string sweep_junit_text(const sweep_header& h, const sweep_plan& plan,
                             const std::vector<point_record>& records) {
    const sweep_totals t = totals_of(records, h.partial);
    const std::uint64_t failures = t.failed_checks + t.failed_firmware;
    const std::uint64_t errors = t.errors + t.internal;
    const std::string suite = fs::path(h.scenario).stem().string() + " sweep";
    std::ostringstream x;
    x << "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n";
    x << "<testsuites name=\"" << sim::xml_escape(suite) << "\" tests=\"" << records.size()
      << "\" failures=\"" << failures << "\" errors=\"" << errors << "\">\n";
    x << "  <testsuite name=\"" << sim::xml_escape(suite) << "\" tests=\"" << records.size()
      << "\" failures=\"" << failures << "\" errors=\"" << errors << "\">\n";
    x << "    <properties>\n";
    x << "      <property name=\"scenario\" value=\"" << sim::xml_escape(h.scenario) << "\"/>\n";
    x << "      <property name=\"points\" value=\"" << h.points << "\"/>\n";
    if (h.partial)
        x << "      <property name=\"partial\" value=\"stopped before every point ran: "
          << records.size() << " of " << h.points << " points here\"/>\n";
    x << "    </properties>\n";
    for (const point_record& r : records) {
        x << "    <testcase name=\"" << sim::xml_escape(plan.point_name(r.index))
          << "\" classname=\"tickbench.sweep\">\n";
        if (r.verdict != "pass") {
            const std::string tag = r.verdict == "fail" ? "failure" : "error";
            std::string text;
            for (const std::string& c : r.failed_checks) {
                const ojson j = ojson::parse(c);
                text += j.value("check", "") + ": " + j.value("detail", "") + "\n";
            }
            x << "      <" << tag << " message=\""
              << sim::xml_escape(r.outcome + (r.message.empty() ? "" : ": " + r.message))
              << "\" type=\"" << sim::xml_escape(r.outcome) << "\">" << sim::xml_escape(text)
              << "</" << tag << ">\n";
        }
        x << "    </testcase>\n";
    }
    x << "  </testsuite>\n</testsuites>\n";
    return x.str();
}

std::string compress_ranges(const std::vector<std::string>& values,
                            const std::vector<std::size_t>& positions) {
    std::string out;
    for (std::size_t i = 0; i < positions.size();) {
        std::size_t j = i;
        while (j + 1 < positions.size() && positions[j + 1] == positions[j] + 1) ++j;
        const std::string& a = values[positions[i]];
        const std::string& b = values[positions[j]];
        out += out.empty() ? "" : ", ";
        if (i == j)
            out += a;
        else
            out += a + (whole_number(a) && whole_number(b) ? "-" : " to ") + b;
        i = j + 1;
    }
    return out;
}

sweep_totals totals_of(const std::vector<point_record>& records, bool partial) {
    sweep_totals t;
    t.partial = partial;
    for (const point_record& r : records) {
        ++t.run;
        if (r.verdict == "pass") continue;
        // A failed point whose run did not end in exit code 1 failed in its firmware (3, or a
        // failure with a code of its own).
        if (r.verdict == "fail")
            ++(r.exit_code == 1 ? t.failed_checks : t.failed_firmware);
        else if (r.exit_code == 2)
            ++t.errors;
        else
            ++t.internal;
    }
    return t;
}

std::string sweep_summary_text(const sweep_header& h, const sweep_plan& plan,
                               const std::vector<point_record>& records) {
    const sweep_totals t = totals_of(records, h.partial);
    const auto& axes = plan.axes();
    const sweep_axis& last = axes.back();
    std::ostringstream s;
    s << "sweep of " << h.scenario << ": " << plural(h.points, "point", "points");
    if (!h.part.whole()) s << ", shard " << h.part.text();
    s << "\n";
    if (h.partial)
        s << "PARTIAL: stopped before every point ran; " << t.run
          << " points ran, the others are left out of every report\n";
    const std::uint64_t failed = t.failed_checks + t.failed_firmware;
    s << t.run << " ran: " << t.run - failed - t.errors - t.internal << " passed, " << failed
      << " failed (" << t.failed_firmware << " firmware, " << t.failed_checks << " checks)";
    if (t.errors + t.internal != 0) s << ", " << t.errors + t.internal << " could not run";
    s << "\n";
    // Groups: the points sharing the values of every axis but the last, in point order.
    struct group {
        std::string label;
        std::uint64_t ran = 0;
        std::vector<std::size_t> failing;
        std::vector<std::size_t> broken;
    };
    std::vector<group> groups;
    std::map<std::uint64_t, std::size_t> group_of;
    const std::uint64_t per_group = last.values.size();
    for (const point_record& r : records) {
        const std::uint64_t g = r.index / per_group;
        auto it = group_of.find(g);
        if (it == group_of.end()) {
            group gr;
            if (axes.size() == 1) {
                gr.label = "all points";
            } else {
                const auto v = plan.values(r.index);
                for (std::size_t i = 0; i + 1 < axes.size(); ++i)
                    gr.label += (i == 0 ? "" : ", ") + axes[i].name + "=" + v[i];
            }
            it = group_of.emplace(g, groups.size()).first;
            groups.push_back(gr);
        }
        group& gr = groups[it->second];
        ++gr.ran;
        const std::size_t pos = static_cast<std::size_t>(r.index % per_group);
        if (r.verdict == "fail") gr.failing.push_back(pos);
        if (r.verdict == "error") gr.broken.push_back(pos);
    }
    for (const group& g : groups) {
        s << g.label << ": ";
        if (g.failing.empty() && g.broken.empty()) {
            s << "passes at every " << last.name << " (0 of " << g.ran << " fail)\n";
            continue;
        }
        if (!g.failing.empty())
            s << "fails at " << last.name << " " << compress_ranges(last.values, g.failing) << " ("
              << g.failing.size() << " of " << g.ran << ")";
        if (!g.broken.empty())
            s << (g.failing.empty() ? "" : "; ") << "cannot run at " << last.name << " "
              << compress_ranges(last.values, g.broken) << " (" << g.broken.size() << " of "
              << g.ran << ")";
        s << "\n";
    }
    return s.str();
}

std::string write_sweep_reports(const std::string& dir, const sweep_header& h,
                                const sweep_plan& plan, const std::vector<point_record>& records) {
    std::error_code ec;
    fs::create_directories(dir, ec);
    if (ec || !fs::is_directory(dir))
        throw sim::output_error("cannot create the output folder '" + dir +
                                "': " + (ec ? ec.message() : "not a folder"));
    const std::string summary = sweep_summary_text(h, plan, records);
    write_file((fs::path(dir) / "sweep.jsonl").string(), sweep_jsonl_text(h, plan, records));
    write_file((fs::path(dir) / "junit.xml").string(), sweep_junit_text(h, plan, records));
    write_file((fs::path(dir) / "summary.txt").string(), summary);
    return summary;
}

sweep_totals merge_sweeps(const std::vector<std::string>& dirs, const std::string& out_dir,
                          std::string& summary) {
    if (dirs.empty()) throw sweep_error("merge: no shard folders given");
    std::optional<sweep_header> first;
    std::string first_where;
    std::map<std::uint64_t, std::string> shard_from;
    std::vector<point_record> records;
    bool partial = false;
    for (const std::string& dir : dirs) {
        const std::string file = (fs::path(dir) / "sweep.jsonl").string();
        std::ifstream f(file, std::ios::binary);
        if (!f)
            throw sweep_error(file + ": cannot read it; give folders written by tickbench sweep");
        std::string line;
        if (!std::getline(f, line)) throw sweep_error(file + ": empty, not a sweep.jsonl");
        const sweep_header h = parse_header_line(line, file + ":1");
        if (!first) {
            first = h;
            first_where = file;
        } else {
            auto differs = [&](const std::string& what) {
                return sweep_error(file + ": a shard of a different sweep than " + first_where +
                                   " (" + what + "); merge only shards of one sweep");
            };
            if (h.scenario != first->scenario)
                throw differs("scenario " + h.scenario + ", not " + first->scenario);
            if (h.scenario_digest != first->scenario_digest)
                throw differs("the scenario file's contents differ");
            if (h.axes != first->axes) throw differs("the axes differ");
            if (h.part.count != first->part.count)
                throw differs("split into " + std::to_string(h.part.count) + " shards, not " +
                              std::to_string(first->part.count));
        }
        if (shard_from.count(h.part.number) != 0)
            throw sweep_error(file + ": shard " + h.part.text() + " is also in " +
                              shard_from[h.part.number] + "; give each shard once");
        shard_from[h.part.number] = file;
        partial = partial || h.partial;
        const sweep_plan plan = plan_of(h);
        std::uint64_t n = 1;
        while (std::getline(f, line)) {
            ++n;
            point_record r = parse_record_line(line, file + ":" + std::to_string(n));
            if (r.index >= plan.points() || !h.part.includes(r.index))
                throw sweep_error(file + ":" + std::to_string(n) + ": point " +
                                  std::to_string(r.index) + " is not in shard " + h.part.text());
            records.push_back(std::move(r));
        }
    }
    std::string missing;
    for (std::uint64_t k = 1; k <= first->part.count; ++k)
        if (shard_from.count(k) == 0)
            missing += (missing.empty() ? "" : ", ") + std::to_string(k) + "/" +
                       std::to_string(first->part.count);
    if (!missing.empty())
        throw sweep_error("merge: shard " + missing + " missing; give the folders of all " +
                          std::to_string(first->part.count) + " shards");
    std::sort(records.begin(), records.end(),
              [](const point_record& a, const point_record& b) { return a.index < b.index; });
    sweep_header whole = *first;
    whole.part = shard{};
    whole.partial = partial;
    const sweep_plan plan = plan_of(whole);
    summary = write_sweep_reports(out_dir, whole, plan, records);
    return totals_of(records, partial);
}

}  // namespace harness::run
