// The assertion log writer; see checks_jsonl.h.

#include "sim/report/checks_jsonl.h"

#include "sim/report/detail/output_file.h"

#include <nlohmann/json.hpp>

namespace sim {

std::string checks_jsonl_text(const std::vector<check_result>& results) {
    std::string out;
    for (const check_result& r : results) {
        nlohmann::ordered_json j;
        j["check"] = r.name;
        j["signal"] = r.signal;
        j["kind"] = r.kind_text();
        if (r.expected) {
            j["expected"] = *r.expected;
        } else if (r.expected_min || r.expected_max) {
            nlohmann::ordered_json bounds = nlohmann::ordered_json::object();
            if (r.expected_min) bounds["min"] = *r.expected_min;
            if (r.expected_max) bounds["max"] = *r.expected_max;
            j["expected"] = bounds;
        } else {
            j["expected"] = nullptr;
        }
        j["tolerance"] = r.tolerance_text.empty() ? nlohmann::ordered_json(nullptr)
                                                  : nlohmann::ordered_json(r.tolerance_text);
        nlohmann::ordered_json measured = nlohmann::ordered_json::object();
        if (r.min) measured["min"] = *r.min;
        if (r.mean) measured["mean"] = *r.mean;
        if (r.max) measured["max"] = *r.max;
        measured["count"] = r.count;
        j["measured"] = measured;
        j["unit"] = r.unit;
        j["verdict"] = r.passed ? "pass" : "fail";
        j["at_s"] = static_cast<double>(r.at) / static_cast<double>(ps_per_second);
        j["detail"] = r.detail;
        out += j.dump(-1, ' ', false, nlohmann::ordered_json::error_handler_t::replace);
        out += '\n';
    }
    return out;
}

void write_checks_jsonl(const std::string& path, const std::vector<check_result>& results) {
    detail::write_output_file(path, checks_jsonl_text(results));
}

}  // namespace sim
