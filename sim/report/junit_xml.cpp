// The CI report writer; see junit_xml.h.

#include "sim/report/junit_xml.h"

#include "sim/report/detail/output_file.h"
#include "sim/report/summary_text.h"

namespace sim {

std::string xml_escape(const std::string& text) {
    std::string out;
    out.reserve(text.size());
    for (const char ch : text) {
        const auto c = static_cast<unsigned char>(ch);
        switch (c) {
            case '&':
                out += "&amp;";
                break;
            case '<':
                out += "&lt;";
                break;
            case '>':
                out += "&gt;";
                break;
            case '"':
                out += "&quot;";
                break;
            case '\'':
                out += "&apos;";
                break;
            default:
                // XML 1.0 admits no control characters but tab, line feed and carriage return.
                if (c < 0x20 && c != '\t' && c != '\n' && c != '\r') {
                    out += '?';
                } else {
                    out += ch;
                }
        }
    }
    return out;
}

namespace {

std::string value_or_bounds(const check_result& r) {
    if (!r.expected_text.empty()) return r.expected_text;
    return "-";
}

std::string measured_lines(const check_result& r) {
    std::string s = "expected: " + value_or_bounds(r) + "\n";
    s += "measured: count " + std::to_string(r.count);
    if (r.min) s += ", min " + measured_text(*r.min, r.unit);
    if (r.mean) s += ", mean " + measured_text(*r.mean, r.unit);
    if (r.max) s += ", max " + measured_text(*r.max, r.unit);
    s += "\nfirst failure at: " + format_time(r.at) + "\n";
    return s;
}

}  // namespace

std::string junit_xml_text(const std::vector<check_result>& results, const std::string& suite) {
    std::size_t failures = 0;
    for (const check_result& r : results) failures += r.passed ? 0 : 1;
    const std::string counts = " tests=\"" + std::to_string(results.size()) + "\" failures=\"" +
                               std::to_string(failures) + "\" errors=\"0\"";
    std::string x = "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n";
    x += "<testsuites name=\"" + xml_escape(suite) + "\"" + counts + ">\n";
    x += "  <testsuite name=\"" + xml_escape(suite) + "\"" + counts + " skipped=\"0\">\n";
    for (const check_result& r : results) {
        x += "    <testcase name=\"" + xml_escape(r.name) + "\" classname=\"tickbench." +
             r.kind_text() + "\">\n";
        if (!r.passed) {
            x += "      <failure message=\"" + xml_escape(r.detail) + "\" type=\"" + r.kind_text() +
                 "\">" + xml_escape(measured_lines(r)) + "</failure>\n";
        }
        x += "      <system-out>" + xml_escape(r.signal + ": " + r.detail) + "</system-out>\n";
        x += "    </testcase>\n";
    }
    x += "  </testsuite>\n</testsuites>\n";
    return x;
}

void write_junit_xml(const std::string& path, const std::vector<check_result>& results,
                     const std::string& suite) {
    detail::write_output_file(path, junit_xml_text(results, suite));
}

}  // namespace sim
