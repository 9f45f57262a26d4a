// The `report` subcommand; see commands.h.

#include "harness/cli/commands.h"

#include "sim/report/report_html.h"
#include "sim/report/report_model.h"

#include <cerrno>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>

namespace harness::cli {

int run_report_command(const report_options& options, std::ostream& out) {
    namespace fs = std::filesystem;
    const std::string json_path = (fs::path(options.dir) / "report.json").string();
    std::error_code ec;
    if (!fs::is_directory(options.dir, ec))
        throw sim::report_format_error(options.dir +
                                       ": not a folder; expected the output folder of a run");
    std::ifstream in(json_path, std::ios::binary);
    if (!in) {
        const int err = errno;
        throw sim::report_format_error(
            json_path + ": cannot read the file: " + std::strerror(err != 0 ? err : ENOENT) +
            " (runs of this tickbench write it beside report.html)");
    }
    std::ostringstream text;
    text << in.rdbuf();
    const sim::report_model model = sim::parse_report_json(text.str(), json_path);
    const std::string html_path = (fs::path(options.dir) / "report.html").string();
    sim::write_report_html(html_path, model);
    out << "wrote " << html_path << "\n";
    return exit_ok;
}

}  // namespace harness::cli
