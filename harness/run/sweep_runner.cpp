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

#include <systemc>

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

// Runs one point in this process and sends its record on `fd`; returns the exit code `tickbench
// run` gives for it. A firmware failure on the firmware's thread ends the point, not the process;
// one elsewhere (a crash) sends the record from the closers and ends the process.
int run_point(const sweep_options& o, const sweep_plan& plan, std::uint64_t point, bool keep,
              int fd) {
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
    ro.keep_process = true;
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
        code = r.exit_code;
        (void)s;
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
    return code;
}

// The body of a worker process: runs the points the parent sends on `commands` ("INDEX KEEP"
// lines), each on a fresh kernel, and sends their records on `records`; exits when the parent
// closes `commands`. Never returns.
[[noreturn]] void run_worker(const sweep_options& o, const sweep_plan& plan, int commands,
                             int records) {
    struct sigaction sa {};
    sa.sa_handler = SIG_DFL;
    sigaction(SIGINT, &sa, nullptr);
    sigaction(SIGPIPE, &sa, nullptr);
    // The parent reports; a point's own messages would only interleave on the terminal.
    const int null_fd = ::open("/dev/null", O_WRONLY);
    if (null_fd >= 0) {
        ::dup2(null_fd, STDOUT_FILENO);
        ::dup2(null_fd, STDERR_FILENO);
    }
    // A firmware failure stops the kernel (platform::set_keep_process): nothing may run after the
    // outputs were finished, as when a failure ended the process. Set once, before any kernel ran.
    sc_core::sc_set_stop_mode(sc_core::SC_STOP_IMMEDIATE);
    std::string pending;
    for (;;) {
        std::size_t eol;
        while ((eol = pending.find('\n')) == std::string::npos) {
            char buf[256];
            const ssize_t got = ::read(commands, buf, sizeof buf);
            if (got < 0 && errno == EINTR) continue;
            if (got <= 0) _exit(0);
            pending.append(buf, static_cast<std::size_t>(got));
        }
        const std::string line = pending.substr(0, eol);
        pending.erase(0, eol + 1);
        unsigned long long point = 0;
        int keep = 0;
        if (std::sscanf(line.c_str(), "%llu %d", &point, &keep) != 2) _exit(4);
        // Tells the parent the point started: a point handed to a worker that was already ending
        // (after a crash's record) goes to another worker instead of being lost.
        write_all(records, "started\n");
        harness::start_fresh_kernel();
        run_point(o, plan, point, keep != 0, records);
    }
}

// A worker process and the point it runs, if any.
struct worker {
    pid_t pid = 0;
    int commands = -1;  // to the worker; closed to let it exit
    int records = -1;   // from the worker
    std::string data;   // bytes received that do not make a whole line yet
    bool eof = false;
    bool busy = false;
    bool started = false;  // the worker said it started `point`
    std::uint64_t point = 0;
    bool rerun = false;  // a failing point run again to keep its folder
    std::uint64_t assigned = 0;
};

// The record of a point whose worker ended before sending one: how it ended.
point_record lost_point(std::uint64_t point, int status) {
    point_record r;
    r.index = point;
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
    std::vector<worker> workers;
    // Points handed to a worker that was gone already, with whether each is a rerun.
    std::deque<std::pair<std::uint64_t, bool>> returned;
    std::uint64_t failed = 0;
    const unsigned jobs = o.jobs == 0 ? 1 : o.jobs;
    progress_display progress(o.progress, in_shard);

    interrupted = 0;
    struct sigaction sa {};
    struct sigaction old_sa {};
    sa.sa_handler = on_interrupt;
    sigemptyset(&sa.sa_mask);
    sigaction(SIGINT, &sa, &old_sa);
    // A worker that died leaves a closed pipe: writing to it must fail, not end the sweep.
    struct sigaction ignore_pipe {};
    struct sigaction old_pipe {};
    ignore_pipe.sa_handler = SIG_IGN;
    sigemptyset(&ignore_pipe.sa_mask);
    sigaction(SIGPIPE, &ignore_pipe, &old_pipe);
    std::fflush(stdout);
    out.flush();

    auto spawn = [&] {
        int to[2];
        int from[2];
        if (::pipe(to) != 0) throw std::runtime_error("cannot make a pipe for a point process");
        if (::pipe(from) != 0) {
            ::close(to[0]);
            ::close(to[1]);
            throw std::runtime_error("cannot make a pipe for a point process");
        }
        const pid_t pid = ::fork();
        if (pid < 0) {
            for (int fd : {to[0], to[1], from[0], from[1]}) ::close(fd);
            throw std::runtime_error("cannot start a process for points");
        }
        if (pid == 0) {
            ::close(to[1]);
            ::close(from[0]);
            for (const worker& w : workers) {
                if (w.commands >= 0) ::close(w.commands);
                ::close(w.records);
            }
            run_worker(o, plan, to[0], from[1]);
        }
        ::close(to[0]);
        ::close(from[1]);
        worker w;
        w.pid = pid;
        w.commands = to[1];
        w.records = from[0];
        workers.push_back(std::move(w));
    };
    // A finished point's record, whether it came from its worker or stands for a lost one.
    // A rerun (a failing point run again to keep its folder) records nothing new.
    auto record_point = [&](bool rerun, point_record r) {
        if (rerun) return;
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
    };
    // A point whose worker ended before starting it goes to another worker, a bounded number of
    // times: workers that keep ending before any point (killed from outside, out of memory) must
    // end the sweep with the point recorded as lost, not hand it round for ever.
    constexpr unsigned max_hand_backs = 3;
    std::map<std::uint64_t, unsigned> hand_backs;
    auto give_back = [&](std::uint64_t point, bool rerun, int status) {
        if (++hand_backs[point] <= max_hand_backs) {
            returned.emplace_front(point, rerun);
            return;
        }
        point_record r = lost_point(point, status);
        r.message += "; " + std::to_string(max_hand_backs + 1) +
                     " processes in a row ended before starting it";
        record_point(rerun, std::move(r));
    };
    // Gives `w` its next point; false when there is none left.
    auto assign = [&](worker& w) {
        bool rerun = false;
        std::uint64_t point = 0;
        if (!returned.empty()) {
            point = returned.front().first;
            rerun = returned.front().second;
            returned.pop_front();
        } else if (!reruns.empty()) {
            rerun = true;
            point = reruns.front();
            reruns.pop_front();
        } else if (next < plan.points()) {
            point = next;
            next += o.part.count;
        } else {
            return false;
        }
        const bool keep = rerun || o.keep == keep_folders::all;
        const std::string line = std::to_string(point) + (keep ? " 1" : " 0") + "\n";
        if (!write_all(w.commands, line)) {
            // The worker is gone (its end shows when its records pipe closes): another runs it.
            give_back(point, rerun, 0);
            ::close(w.commands);
            w.commands = -1;
            return false;
        }
        w.busy = true;
        w.started = false;
        w.point = point;
        w.rerun = rerun;
        ++w.assigned;
        return true;
    };
    auto has_work = [&] { return !returned.empty() || !reruns.empty() || next < plan.points(); };
    const std::uint64_t per_process = o.points_per_process == 0 ? 1 : o.points_per_process;

    while (!interrupted) {
        for (worker& w : workers) {
            if (w.busy || w.commands < 0 || w.eof || interrupted) continue;
            // A worker that has run its share exits and a fresh one takes over: each point
            // leaves its kernel behind in the process.
            if (w.assigned >= per_process || !has_work()) {
                if (w.assigned >= per_process) {
                    ::close(w.commands);
                    w.commands = -1;
                }
                continue;
            }
            assign(w);
        }
        std::size_t live = 0;
        for (const worker& w : workers) live += w.commands >= 0 ? 1 : 0;
        while (live < jobs && has_work() && !interrupted) {
            spawn();
            ++live;
            if (!assign(workers.back())) break;
        }
        bool busy = false;
        for (const worker& w : workers) busy = busy || w.busy;
        if (!busy && !has_work()) break;
        std::vector<pollfd> fds;
        for (const worker& w : workers) fds.push_back(pollfd{w.records, POLLIN, 0});
        const int n = ::poll(fds.data(), fds.size(), 250);
        if (n < 0 && errno != EINTR) throw std::runtime_error("poll failed while running points");
        for (std::size_t i = 0; n > 0 && i < fds.size(); ++i) {
            if ((fds[i].revents & (POLLIN | POLLHUP | POLLERR)) == 0) continue;
            worker& w = workers[i];
            char buf[4096];
            const ssize_t got = ::read(w.records, buf, sizeof buf);
            if (got > 0)
                w.data.append(buf, static_cast<std::size_t>(got));
            else if (got == 0 || errno != EINTR)
                w.eof = true;
            std::size_t eol;
            while ((eol = w.data.find('\n')) != std::string::npos) {
                const std::string line = w.data.substr(0, eol);
                w.data.erase(0, eol + 1);
                if (!w.busy) continue;
                if (line == "started") {
                    w.started = true;
                    continue;
                }
                w.busy = false;
                point_record r;
                try {
                    r = parse_record_line(line, "a point's record");
                } catch (const sweep_error&) {
                    r = lost_point(w.point, 0);
                    r.message = "the point's process sent an unreadable record";
                }
                if (r.index != w.point) r = lost_point(w.point, 0);
                record_point(w.rerun, std::move(r));
            }
        }
        for (std::size_t i = workers.size(); i-- > 0;) {
            worker& w = workers[i];
            if (!w.eof) continue;
            int status = 0;
            while (::waitpid(w.pid, &status, 0) < 0 && errno == EINTR) {
            }
            if (w.commands >= 0) ::close(w.commands);
            ::close(w.records);
            // A point ended by Ctrl-C did not run to its end: it is left out.
            const bool stopped = WIFSIGNALED(status) && WTERMSIG(status) == SIGINT;
            if (w.busy && !w.started && !stopped) {
                // It ended before it started the point: another worker runs it.
                give_back(w.point, w.rerun, status);
            } else if (w.busy && !stopped) {
                record_point(w.rerun, lost_point(w.point, status));
            }
            workers.erase(workers.begin() + static_cast<std::ptrdiff_t>(i));
        }
        progress.show(finished, failed);
    }
    for (worker& w : workers) {
        if (w.commands >= 0) ::close(w.commands);
        if (interrupted) ::kill(w.pid, SIGKILL);
        int status = 0;
        while (::waitpid(w.pid, &status, 0) < 0 && errno == EINTR) {
        }
        ::close(w.records);
    }
    sigaction(SIGINT, &old_sa, nullptr);
    sigaction(SIGPIPE, &old_pipe, nullptr);
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
