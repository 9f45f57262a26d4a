// Running a sweep; see sweep_runner.h.

#include "harness/run/sweep_runner.h"

#include "harness/firmware_library.h"
#include "harness/platform.h"
#include "harness/run/scenario_runner.h"
#include "sim/clock_tree.h"
#include "sim/quantity.h"
#include "sim/report/checks_jsonl.h"
#include "sim/scenario_error.h"
#include "sim/vcd_writer.h"

#include <fcntl.h>
#include <poll.h>
#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cerrno>
#include <chrono>
#include <csignal>
#include <cstdio>
#include <deque>
#include <filesystem>
#include <fstream>
#include <map>
#include <memory>

namespace harness::run {

namespace {

namespace fs = std::filesystem;

volatile std::sig_atomic_t interrupted = 0;

void on_interrupt(int) { interrupted = 1; }

// Key axes with more values than this are checked at their first and last value before the
// sweep starts; a bad value in between shows as that point's "bad-input" record.
constexpr std::size_t max_checked_values = 1000;

bool write_all(int fd, const std::string& s) {
    std::size_t done = 0;
    while (done < s.size()) {
        const ssize_t n = ::write(fd, s.data() + done, s.size() - done);
        if (n < 0 && errno == EINTR) continue;
        if (n <= 0) return false;
        done += static_cast<std::size_t>(n);
    }
    return true;
}

std::string first_line(const std::string& text) { return text.substr(0, text.find('\n')); }

// The body of a point's process: runs the point and sends its record on `fd`. Never returns.
[[noreturn]] void run_point(const sweep_options& o, const sweep_plan& plan, std::uint64_t point,
                            bool keep, int fd) {
    struct sigaction sa {};
    sa.sa_handler = SIG_DFL;
    sigaction(SIGINT, &sa, nullptr);
    // The parent reports; a point's own messages would only interleave on the terminal.
    const int null_fd = ::open("/dev/null", O_WRONLY);
    if (null_fd >= 0) {
        ::dup2(null_fd, STDOUT_FILENO);
        ::dup2(null_fd, STDERR_FILENO);
    }
    point_record r;
    r.index = point;
    bool sent = false;
    // A record that cannot be written leaves the parent none: it records the point as an
    // internal error.
    auto send = [&] {
        write_all(fd, record_line(plan, r) + "\n");
        sent = true;
    };
    run_options ro;
    ro.out_dir = point_folder(o.out_dir, point);
    ro.write_outputs = keep;
    ro.overrides = plan.overrides(point, o.base);
    ro.on_results = [&](const std::vector<sim::check_result>& results, const failure_report* f) {
        for (const sim::check_result& c : results) {
            if (c.passed) continue;
            std::string line = sim::checks_jsonl_text({c});
            if (!line.empty() && line.back() == '\n') line.pop_back();
            r.failed_checks.push_back(line);
        }
        if (f) {
            r.verdict = "fail";
            r.exit_code = exit_code_of(f->outcome);  // as `tickbench run` would end
            r.outcome = to_string(f->outcome);
            r.message = first_line(f->message);
        } else if (!r.failed_checks.empty()) {
            r.verdict = "fail";
            r.exit_code = 1;
            r.outcome = "checks-failed";
        }
        send();
    };
    std::ostream discard(nullptr);
    int code = 4;
    auto bad_input = [&](const std::exception& e) {
        r.verdict = "error";
        r.exit_code = code = 2;
        r.outcome = "bad-input";
        r.message = first_line(e.what());
    };
    try {
        const run_summary s = run_scenario(o.scenario, ro, discard);
        code = s.all_passed() ? 0 : 1;
    } catch (const sim::scenario_error& e) {
        bad_input(e);
    } catch (const sim::clock_config_error& e) {
        bad_input(e);
    } catch (const harness::firmware_load_error& e) {
        bad_input(e);
    } catch (const sim::quantity_error& e) {
        bad_input(e);
    } catch (const sim::output_error& e) {
        bad_input(e);
    } catch (const std::exception& e) {
        r.verdict = "error";
        r.exit_code = code = 4;
        r.outcome = "internal-error";
        r.message = first_line(e.what());
    }
    if (!sent) send();
    ::close(fd);
    _exit(code);
}

struct running_point {
    pid_t pid = 0;
    int fd = -1;
    std::uint64_t point = 0;
    bool rerun = false;  // a failing point run again to keep its folder
    std::string data;
    bool eof = false;
};

// The record of a point whose process ended: the one it sent, or one saying how it ended.
point_record finish_point(running_point& c, int status) {
    if (!c.data.empty() && c.data.back() == '\n') {
        try {
            point_record r =
                parse_record_line(c.data.substr(0, c.data.size() - 1), "a point's record");
            if (r.index == c.point) {
                // The process's own exit code is what `tickbench run` gives for the point (a
                // firmware failure may have a code of its own).
                if (WIFEXITED(status)) r.exit_code = WEXITSTATUS(status);
                return r;
            }
        } catch (const sweep_error&) {
        }
    }
    point_record r;
    r.index = c.point;
    r.verdict = "error";
    r.exit_code = 4;
    r.outcome = "internal-error";
    if (WIFSIGNALED(status))
        r.message = "the point's process ended by signal " + std::to_string(WTERMSIG(status)) +
                    " without a result";
    else
        r.message = "the point's process exited with code " +
                    std::to_string(WIFEXITED(status) ? WEXITSTATUS(status) : -1) +
                    " without a result";
    return r;
}

// Checks the scenario with the overrides of `point` without running it (a clock tree of its own,
// no kernel).
void check_point(const sweep_options& o, const sweep_plan& plan, std::uint64_t point) {
    sim::clock_tree tree;
    const scenario s = load_scenario(o.scenario, tree, plan.overrides(point, o.base));
    if (!s.run.duration)
        throw sim::scenario_error(sim::scenario_finding{
            o.scenario, 0, 0, "run.duration",
            "missing: give [run] duration = \"10 ms\" (a time), or --duration on the command "
            "line"});
}

class progress_display {
public:
    progress_display(bool on, std::uint64_t total) : on_(on), total_(total) {}
    void show(std::uint64_t done, std::uint64_t failed, bool force = false) {
        if (!on_) return;
        const auto now = std::chrono::steady_clock::now();
        if (!force && now - last_ < std::chrono::milliseconds(250)) return;
        last_ = now;
        const double secs = std::chrono::duration<double>(now - start_).count();
        const double rate = secs > 0 ? static_cast<double>(done) / secs : 0;
        char line[160];
        std::snprintf(line, sizeof line,
                      "\rsweep: %llu of %llu points, %llu failed, %.0f points/s, %.0f s left\033[K",
                      static_cast<unsigned long long>(done),
                      static_cast<unsigned long long>(total_),
                      static_cast<unsigned long long>(failed), rate,
                      rate > 0 ? static_cast<double>(total_ - done) / rate : 0.0);
        std::fputs(line, stderr);
        std::fflush(stderr);
    }
    void stop() {
        if (!on_) return;
        std::fputs("\r\033[K", stderr);
        std::fflush(stderr);
    }

private:
    bool on_;
    std::uint64_t total_;
    std::chrono::steady_clock::time_point start_ = std::chrono::steady_clock::now();
    std::chrono::steady_clock::time_point last_{};
};

}  // namespace

std::string point_folder(const std::string& out_dir, std::uint64_t index) {
    return (fs::path(out_dir) / "points" / std::to_string(index)).string();
}

sweep_totals run_sweep(const sweep_options& o, std::ostream& out) {
    const sweep_plan plan(o.axes);
    // Bad input shows before any point runs: the first point in full, and each value of every
    // scenario-key axis with the other axes at their first value.
    check_point(o, plan, 0);
    for (std::size_t i = 0; i < plan.axes().size(); ++i) {
        const sweep_axis& a = plan.axes()[i];
        if (a.what != sweep_axis::kind::key) continue;
        std::vector<std::size_t> pos(plan.axes().size(), 0);
        const std::size_t n = a.values.size();
        for (std::size_t j = 0; j < n; ++j) {
            if (n > max_checked_values && j != 0 && j != n - 1) continue;
            pos[i] = j;
            check_point(o, plan, plan.index_of(pos));
        }
    }
    // Loaded once here, the library is already mapped in every point's process.
    std::unique_ptr<firmware_library> firmware;
    {
        sim::clock_tree tree;
        const scenario s = load_scenario(o.scenario, tree, plan.overrides(0, o.base));
        if (s.firmware) {
            try {
                firmware =
                    std::make_unique<firmware_library>(s.firmware->library, s.firmware->entry);
            } catch (const firmware_load_error& e) {
                throw firmware_load_error(s.firmware->origin + ": " + e.what());
            }
        }
    }
    sweep_header h;
    h.scenario = o.scenario;
    h.scenario_digest = file_digest(o.scenario);
    for (const sweep_axis& a : plan.axes()) h.axes.emplace_back(a.name, a.spec);
    h.points = plan.points();
    h.part = o.part;

    std::error_code ec;
    fs::create_directories(o.out_dir, ec);
    if (ec || !fs::is_directory(o.out_dir))
        throw sim::output_error("cannot create the output folder '" + o.out_dir +
                                "': " + (ec ? ec.message() : "not a folder"));
    for (const char* name : {"sweep.jsonl", "junit.xml", "summary.txt"})
        fs::remove(fs::path(o.out_dir) / name, ec);
    fs::remove_all(fs::path(o.out_dir) / "points", ec);

    const std::uint64_t in_shard =
        plan.points() / o.part.count + (plan.points() % o.part.count >= o.part.number ? 1 : 0);
    std::uint64_t next = o.part.number - 1;
    std::deque<std::uint64_t> reruns;
    // Finished records go to a spool file in point order as soon as every earlier point of the
    // shard is in: the parent stays small however many points there are, and forking a small
    // process is what keeps a point cheap. `pending` holds the few that finished early.
    const fs::path spool_path = fs::path(o.out_dir) / ".sweep.jsonl.spool";
    std::ofstream spool(spool_path, std::ios::binary | std::ios::trunc);
    if (!spool) throw sim::output_error("cannot write " + spool_path.string());
    std::map<std::uint64_t, point_record> pending;
    std::uint64_t next_to_spool = o.part.number - 1;
    std::uint64_t finished = 0;
    std::vector<running_point> running;
    std::uint64_t failed = 0;
    const unsigned jobs = o.jobs == 0 ? 1 : o.jobs;
    progress_display progress(o.progress, in_shard);

    interrupted = 0;
    struct sigaction sa {};
    struct sigaction old_sa {};
    sa.sa_handler = on_interrupt;
    sigemptyset(&sa.sa_mask);
    sigaction(SIGINT, &sa, &old_sa);
    std::fflush(stdout);
    out.flush();

    auto start = [&](std::uint64_t point, bool rerun) {
        int fds[2];
        if (::pipe(fds) != 0) throw std::runtime_error("cannot make a pipe for a point's result");
        const bool keep = rerun || o.keep == keep_folders::all;
        const pid_t pid = ::fork();
        if (pid < 0) {
            ::close(fds[0]);
            ::close(fds[1]);
            throw std::runtime_error("cannot start a process for a point");
        }
        if (pid == 0) {
            ::close(fds[0]);
            for (const running_point& c : running) ::close(c.fd);
            run_point(o, plan, point, keep, fds[1]);
        }
        ::close(fds[1]);
        running.push_back(running_point{pid, fds[0], point, rerun, {}, false});
    };

    while (!interrupted) {
        while (running.size() < jobs && !interrupted) {
            if (!reruns.empty()) {
                start(reruns.front(), true);
                reruns.pop_front();
            } else if (next < plan.points()) {
                start(next, false);
                next += o.part.count;
            } else {
                break;
            }
        }
        if (running.empty()) break;
        std::vector<pollfd> fds;
        for (const running_point& c : running) fds.push_back(pollfd{c.fd, POLLIN, 0});
        const int n = ::poll(fds.data(), fds.size(), 250);
        if (n < 0 && errno != EINTR) throw std::runtime_error("poll failed while running points");
        for (std::size_t i = 0; n > 0 && i < fds.size(); ++i) {
            if ((fds[i].revents & (POLLIN | POLLHUP | POLLERR)) == 0) continue;
            char buf[4096];
            const ssize_t got = ::read(fds[i].fd, buf, sizeof buf);
            if (got > 0)
                running[i].data.append(buf, static_cast<std::size_t>(got));
            else if (got == 0 || errno != EINTR)
                running[i].eof = true;
        }
        for (std::size_t i = running.size(); i-- > 0;) {
            running_point& c = running[i];
            if (!c.eof) continue;
            int status = 0;
            while (::waitpid(c.pid, &status, 0) < 0 && errno == EINTR) {
            }
            ::close(c.fd);
            // A point ended by Ctrl-C did not run to its end: it is left out.
            const bool stopped = WIFSIGNALED(status) && WTERMSIG(status) == SIGINT;
            if (!c.rerun && !stopped) {
                point_record r = finish_point(c, status);
                if (r.verdict == "fail") {
                    ++failed;
                    if (o.keep == keep_folders::failing) reruns.push_back(r.index);
                }
                ++finished;
                pending.emplace(r.index, std::move(r));
                for (auto it = pending.begin(); it != pending.end() && it->first == next_to_spool;
                     it = pending.erase(it)) {
                    spool << record_line(plan, it->second) << '\n';
                    next_to_spool += o.part.count;
                }
            }
            running.erase(running.begin() + static_cast<std::ptrdiff_t>(i));
        }
        progress.show(finished, failed);
    }
    for (running_point& c : running) {
        ::kill(c.pid, SIGKILL);
        int status = 0;
        while (::waitpid(c.pid, &status, 0) < 0 && errno == EINTR) {
        }
        ::close(c.fd);
    }
    sigaction(SIGINT, &old_sa, nullptr);
    progress.stop();

    // Points stopped by Ctrl-C leave gaps; those that finished after a gap follow in order.
    for (auto& [index, r] : pending) spool << record_line(plan, r) << '\n';
    spool.close();
    if (!spool) throw sim::output_error("cannot write " + spool_path.string());
    std::vector<point_record> records;
    {
        std::ifstream in(spool_path, std::ios::binary);
        std::string line;
        std::uint64_t n = 0;
        while (std::getline(in, line))
            records.push_back(
                parse_record_line(line, spool_path.string() + ":" + std::to_string(++n)));
    }
    fs::remove(spool_path, ec);
    h.partial = records.size() < in_shard;
    const std::string summary = write_sweep_reports(o.out_dir, h, plan, records);
    out << summary;
    out << "outputs in " << o.out_dir << ": sweep.jsonl, junit.xml, summary.txt";
    if (o.keep != keep_folders::none) out << ", points/";
    out << "\n";
    out.flush();
    return totals_of(records, h.partial);
}

}  // namespace harness::run
