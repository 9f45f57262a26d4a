#pragma once
// The CI report: junit.xml in the JUnit-style layout CI dashboards read (docs/architecture.md,
// "Outputs").
//
// One <testsuites> holding one <testsuite>, one <testcase> per check (name = the check, classname
// = "tickbench.<kind>"). A failed check carries a <failure> whose message is the check's detail
// and whose text lists the expected and measured values; every check carries its detail in
// <system-out>. Text and attributes are escaped, and characters XML 1.0 cannot hold become '?'.
// No wall-clock times are written, so the file is the same for the same run.

#include "sim/checks/check_result.h"

#include <string>
#include <vector>

namespace sim {

// The XML text for `results`, under a suite named `suite` (the scenario's name).
std::string junit_xml_text(const std::vector<check_result>& results, const std::string& suite);
// Writes junit_xml_text() to `path`; throws output_error naming the file and the reason.
void write_junit_xml(const std::string& path, const std::vector<check_result>& results,
                     const std::string& suite);

// `text` escaped for XML text and attribute values (&, <, >, ", '), invalid characters as '?'.
std::string xml_escape(const std::string& text);

}  // namespace sim
