#include "harness/trap/trap_engine.h"

#include "harness/trap/detail/host_backtrace.h"
#include "harness/trap/detail/instruction_emulator.h"

#include <pthread.h>
#include <signal.h>
#include <sys/mman.h>
#include <ucontext.h>
#include <unistd.h>

#include <atomic>
#include <cerrno>
#include <cinttypes>
#include <cstdio>
#include <cstring>
#include <map>
#include <memory>
#include <mutex>
#include <utility>
#include <vector>

namespace harness {
namespace {

std::string hex(std::uint64_t v) {
    char buf[24];
    std::snprintf(buf, sizeof buf, "0x%" PRIx64, v);
    return buf;
}

std::string range_text(std::uint64_t begin, std::uint64_t end) {
    return "[" + hex(begin) + ", " + hex(end) + ")";
}

std::string errno_text(int error) {
    const char* name = strerrorname_np(error);
    return std::string(std::strerror(error)) + " (" +
           (name ? name : "errno " + std::to_string(error)) + ")";
}

struct region_entry {
    std::uint64_t id = 0;
    std::string name;
    std::uint64_t base = 0;
    std::uint64_t size = 0;
    access_handler handler;

    std::uint64_t end() const { return base + size; }
    bool holds(std::uint64_t address) const { return address >= base && address - base < size; }
};

// The regions as the signal handler sees them. A table never changes once published and is never
// freed, so a handler that loaded it keeps a valid view whatever other threads map meanwhile.
struct region_table {
    std::vector<std::shared_ptr<const region_entry>> regions;
    std::uint64_t page_size = 4096;

    const region_entry* find(std::uint64_t address) const {
        for (const auto& r : regions) {
            if (r->holds(address)) return r.get();
        }
        return nullptr;
    }

    // True when `address` is on a page that the engine mapped (possibly between two regions).
    bool on_trapped_page(std::uint64_t address) const {
        const std::uint64_t page = address & ~(page_size - 1);
        for (const auto& r : regions) {
            const std::uint64_t first = r->base & ~(page_size - 1);
            const std::uint64_t last = (r->end() - 1) & ~(page_size - 1);
            if (page >= first && page <= last) return true;
        }
        return false;
    }
};

struct engine_state {
    std::mutex mutex;
    std::atomic<const region_table*> table{nullptr};
    std::vector<std::unique_ptr<region_table>> tables;  // every table published, kept alive
    std::map<std::uint64_t, unsigned> page_users;       // page address -> regions on it
    std::uint64_t next_id = 1;
    std::uint64_t page_size = 4096;
    bool installed = false;
    std::atomic<crash_hook*> hook{nullptr};
    std::vector<std::unique_ptr<crash_hook>> hooks;  // every hook set, kept alive
    std::atomic<std::uint64_t> served{0};
};

engine_state& state() {
    static engine_state s;
    return s;
}

// Set on the thread that is reporting a crash: a second fault there kills the process at once.
thread_local bool reporting_crash = false;
// Set while an access callback runs: a trapped page touched from the callback is a crash.
thread_local bool serving_access = false;
std::atomic<bool> crash_in_progress{false};

const char* signal_name(int sig) {
    switch (sig) {
        case SIGSEGV:
            return "SIGSEGV";
        case SIGBUS:
            return "SIGBUS";
        case SIGFPE:
            return "SIGFPE";
        case SIGILL:
            return "SIGILL";
        case SIGABRT:
            return "SIGABRT";
        default:
            return "signal";
    }
}

constexpr int handled_signals[] = {SIGSEGV, SIGBUS, SIGFPE, SIGILL, SIGABRT};

// Ends the process with `sig` and its default action (core dump where enabled).
[[noreturn]] void die_of(int sig) {
    struct sigaction dfl {};
    dfl.sa_handler = SIG_DFL;
    sigemptyset(&dfl.sa_mask);
    sigaction(sig, &dfl, nullptr);
    sigset_t set;
    sigemptyset(&set);
    sigaddset(&set, sig);
    pthread_sigmask(SIG_UNBLOCK, &set, nullptr);
    raise(sig);
    _exit(128 + sig);
}

// One line for a signal that is not a trapped access.
std::string plain_message(int sig, const siginfo_t* si, const ucontext_t* uc,
                          const region_table* table) {
    const auto address = reinterpret_cast<std::uint64_t>(si->si_addr);
    switch (sig) {
        case SIGSEGV: {
            // Page-fault error code bits (Intel SDM vol. 3, section 4.7): 1 = write, 4 = fetch.
            const auto error = static_cast<std::uint64_t>(uc->uc_mcontext.gregs[REG_ERR]);
            const char* kind = (error & 0x10) ? "instruction fetch"
                               : (error & 2)  ? "write"
                                              : "read";
            if (table != nullptr && table->on_trapped_page(address)) {
                return std::string(kind) + " of " + hex(address) +
                       ": a trapped peripheral page, but no mapped region holds this address";
            }
            if (si->si_code == SEGV_MAPERR)
                return std::string(kind) + " of unmapped address " + hex(address);
            if (si->si_code == SEGV_ACCERR) {
                return std::string(kind) + " of " + hex(address) +
                       " denied by the page's protection";
            }
            return std::string(kind) + " fault at " + hex(address);
        }
        case SIGBUS:
            return "bus error at address " + hex(address);
        case SIGFPE:
            switch (si->si_code) {
                case FPE_INTDIV:
                    return "integer division by zero";
                case FPE_INTOVF:
                    return "integer overflow";
                default:
                    return "arithmetic exception";
            }
        case SIGILL:
            return "illegal instruction";
        case SIGABRT:
            return "abort() called (SIGABRT)";
        default:
            return "fatal signal";
    }
}

[[noreturn]] void report_crash(int sig, const siginfo_t* si, const ucontext_t* uc,
                               std::string message) {
    if (reporting_crash) die_of(sig);
    reporting_crash = true;
    if (crash_in_progress.exchange(true)) {
        // Another thread is writing its report: let it finish and end the process.
        for (;;) pause();
    }
    crash_info info;
    info.signal_number = sig;
    info.signal_name = signal_name(sig);
    info.message = std::move(message);
    if (sig == SIGSEGV || sig == SIGBUS)
        info.fault_address = reinterpret_cast<std::uint64_t>(si->si_addr);
    info.instruction_address = static_cast<std::uint64_t>(uc->uc_mcontext.gregs[REG_RIP]);
    info.backtrace = detail::host_backtrace(info.instruction_address);
    crash_hook* hook = state().hook.load(std::memory_order_acquire);
    if (hook != nullptr && *hook) {
        (*hook)(info);
    } else {
        const std::string text = describe(info);
        (void)!write(STDERR_FILENO, text.data(), text.size());
    }
    die_of(sig);
}

// Sends the emulator's accesses to the regions of one table.
class table_port : public detail::access_port {
public:
    explicit table_port(const region_table& table) : table_(table) {}

    std::string perform(access& a) override {
        const region_entry* r = table_.find(a.address);
        if (r == nullptr) return "data address " + hex(a.address) + " is in no mapped region";
        if (a.address + a.width > r->end()) {
            return "an access of " + std::to_string(a.width) + " bytes at " + hex(a.address) +
                   " runs past the end of region '" + r->name + "' " +
                   range_text(r->base, r->end());
        }
        serving_access = true;
        try {
            r->handler(a);
        } catch (const std::exception& e) {
            serving_access = false;
            return "the access callback of region '" + r->name + "' threw: " + e.what();
        } catch (...) {
            serving_access = false;
            return "the access callback of region '" + r->name + "' threw";
        }
        serving_access = false;
        return {};
    }

private:
    const region_table& table_;
};

void on_signal(int sig, siginfo_t* si, void* context) {
    auto* uc = static_cast<ucontext_t*>(context);
    const int saved_errno = errno;
    const region_table* table = state().table.load(std::memory_order_acquire);
    if (sig == SIGSEGV && table != nullptr && !reporting_crash) {
        const auto address = reinterpret_cast<std::uint64_t>(si->si_addr);
        if (const region_entry* region = table->find(address)) {
            if (serving_access) {
                report_crash(sig, si, uc,
                             "the access callback of a trapped region touched " + hex(address) +
                                 " in region '" + region->name + "'");
            }
            table_port port(*table);
            const detail::emulation_result r =
                detail::emulate_instruction(uc->uc_mcontext, address, port);
            if (r.completed) {
                state().served.fetch_add(1, std::memory_order_relaxed);
                errno = saved_errno;
                return;
            }
            report_crash(sig, si, uc,
                         "trapped access to region '" + region->name + "' failed: " + r.error);
        }
    }
    report_crash(sig, si, uc, plain_message(sig, si, uc, table));
}

// Maps [begin, end) with no access rights, exactly there, or throws naming `what`.
void map_pages(std::uint64_t begin, std::uint64_t end, const std::string& what) {
    void* want = reinterpret_cast<void*>(begin);
    void* got = mmap(want, end - begin, PROT_NONE,
                     MAP_PRIVATE | MAP_ANONYMOUS | MAP_FIXED_NOREPLACE, -1, 0);
    if (got == MAP_FAILED) {
        const int error = errno;
        std::string hint;
        if (error == EEXIST) {
            hint =
                ": something else is mapped there (see /proc/self/maps; a non-PIE executable and "
                "its"
                " heap live in the low addresses)";
        } else if (error == EPERM || error == EACCES) {
            hint = ": the kernel refuses this address range to this process";
        }
        throw trap_error("cannot map " + what + ": mmap of pages " + range_text(begin, end) +
                         " failed: " + errno_text(error) + hint);
    }
    if (got != want) {
        munmap(got, end - begin);
        throw trap_error("cannot map " + what + ": the kernel placed pages " +
                         range_text(begin, end) +
                         " elsewhere (MAP_FIXED_NOREPLACE needs Linux 4.17 or later)");
    }
}

void unmap_pages(std::uint64_t begin, std::uint64_t end) {
    munmap(reinterpret_cast<void*>(begin), end - begin);
}

// Publishes `regions` as the handler's new view. Caller holds the state mutex.
void publish(engine_state& s, std::vector<std::shared_ptr<const region_entry>> regions) {
    auto table = std::make_unique<region_table>();
    table->regions = std::move(regions);
    table->page_size = s.page_size;
    s.table.store(table.get(), std::memory_order_release);
    s.tables.push_back(std::move(table));
}

// The kernel's vm.mmap_min_addr. Privileged processes may map below it, but the engine never
// does. Falls back to 64 KiB, a common setting, when the file cannot be read.
std::uint64_t lowest_mappable_address() {
    static const std::uint64_t value = [] {
        unsigned long long v = 65536;
        if (FILE* f = std::fopen("/proc/sys/vm/mmap_min_addr", "r")) {
            if (std::fscanf(f, "%llu", &v) != 1) v = 65536;
            std::fclose(f);
        }
        return static_cast<std::uint64_t>(v);
    }();
    return value;
}

struct alt_stack_owner {
    void* base = nullptr;
    std::size_t length = 0;
    ~alt_stack_owner() {
        if (base == nullptr) return;
        stack_t off{};
        off.ss_flags = SS_DISABLE;
        sigaltstack(&off, nullptr);
        munmap(base, length);
    }
};

constexpr std::size_t alt_stack_size = 256 * 1024;

}  // namespace

std::string describe(const crash_info& info) {
    std::string text = info.signal_name + ": " + info.message + "\n";
    text += "  instruction " + hex(info.instruction_address);
    if (info.signal_number == SIGSEGV || info.signal_number == SIGBUS) {
        text += ", fault address " + hex(info.fault_address);
    }
    text += "\n  host backtrace:\n";
    for (const auto& frame : info.backtrace) text += "    " + frame + "\n";
    return text;
}

mapped_region::mapped_region(mapped_region&& other) noexcept : id_(std::exchange(other.id_, 0)) {}

mapped_region& mapped_region::operator=(mapped_region&& other) noexcept {
    if (this != &other) {
        reset();
        id_ = std::exchange(other.id_, 0);
    }
    return *this;
}

mapped_region::~mapped_region() { reset(); }

void mapped_region::reset() noexcept {
    if (id_ != 0) trap_engine::instance().unmap_region(std::exchange(id_, 0));
}

trap_engine& trap_engine::instance() {
    static trap_engine engine;
    return engine;
}

trap_engine::trap_engine() {
    engine_state& s = state();
    s.page_size = static_cast<std::uint64_t>(sysconf(_SC_PAGESIZE));
    std::lock_guard<std::mutex> lock(s.mutex);
    publish(s, {});
}

void trap_engine::install() {
    ensure_alt_stack();
    engine_state& s = state();
    std::lock_guard<std::mutex> lock(s.mutex);
    if (s.installed) return;
    detail::prepare_backtrace();
    (void)detail::format_instruction(reinterpret_cast<std::uint64_t>(&detail::format_instruction));
    struct sigaction action {};
    action.sa_sigaction = on_signal;
    // SA_NODEFER: a fault inside an access callback or the crash hook re-enters the handler and
    // is reported (or ends the process) instead of the kernel killing it silently.
    action.sa_flags = SA_SIGINFO | SA_ONSTACK | SA_NODEFER;
    sigemptyset(&action.sa_mask);
    for (int sig : handled_signals) {
        if (sigaction(sig, &action, nullptr) != 0) {
            throw trap_error(std::string("cannot install the handler for ") + signal_name(sig) +
                             ": " + errno_text(errno));
        }
    }
    s.installed = true;
}

void trap_engine::ensure_alt_stack() {
    thread_local alt_stack_owner owner;
    if (owner.base != nullptr) return;
    stack_t current{};
    if (sigaltstack(nullptr, &current) == 0 && !(current.ss_flags & SS_DISABLE) &&
        current.ss_size >= alt_stack_size) {
        return;  // the thread already has a large enough one
    }
    const auto page = static_cast<std::size_t>(sysconf(_SC_PAGESIZE));
    const std::size_t length = alt_stack_size + page;
    void* base = mmap(nullptr, length, PROT_READ | PROT_WRITE,
                      MAP_PRIVATE | MAP_ANONYMOUS | MAP_STACK, -1, 0);
    if (base == MAP_FAILED)
        throw trap_error("cannot allocate a signal stack: " + errno_text(errno));
    mprotect(base, page, PROT_NONE);  // guard page below the stack
    stack_t stack{};
    stack.ss_sp = static_cast<char*>(base) + page;
    stack.ss_size = alt_stack_size;
    if (sigaltstack(&stack, nullptr) != 0) {
        const int error = errno;
        munmap(base, length);
        throw trap_error("cannot install a signal stack: " + errno_text(error));
    }
    owner.base = base;
    owner.length = length;
}

void trap_engine::set_crash_hook(crash_hook hook) {
    install();
    engine_state& s = state();
    std::lock_guard<std::mutex> lock(s.mutex);
    s.hooks.push_back(std::make_unique<crash_hook>(std::move(hook)));
    s.hook.store(s.hooks.back().get(), std::memory_order_release);
}

mapped_region trap_engine::map_region(std::string name, std::uint64_t base, std::uint64_t size,
                                      access_handler on_access) {
    const std::string what = "region '" + name + "' " + range_text(base, base + size);
    if (size == 0)
        throw trap_error("cannot map region '" + name + "' at " + hex(base) + ": its size is 0");
    if (base + size < base)
        throw trap_error("cannot map region '" + name + "': its range wraps past 2^64");
    if (!on_access) throw trap_error("cannot map " + what + ": no access callback");
    const std::uint64_t min_address = lowest_mappable_address();
    if (base < min_address) {
        throw trap_error("cannot map " + what + ": addresses below vm.mmap_min_addr (" +
                         hex(min_address) +
                         ") are refused, so that null-pointer accesses keep faulting");
    }
    install();

    engine_state& s = state();
    std::lock_guard<std::mutex> lock(s.mutex);
    const region_table* current = s.table.load(std::memory_order_relaxed);
    for (const auto& r : current->regions) {
        if (base < r->end() && r->base < base + size) {
            throw trap_error("cannot map " + what + ": it overlaps region '" + r->name + "' " +
                             range_text(r->base, r->end()));
        }
    }

    // Map the pages no other region uses yet, in contiguous runs; undo all of them on failure.
    const std::uint64_t first = base & ~(s.page_size - 1);
    const std::uint64_t last = (base + size - 1) & ~(s.page_size - 1);
    std::vector<std::pair<std::uint64_t, std::uint64_t>> runs;
    try {
        std::uint64_t page = first;
        for (;;) {
            if (s.page_users.count(page) == 0) {
                if (!runs.empty() && runs.back().second == page) {
                    runs.back().second = page + s.page_size;
                } else {
                    runs.emplace_back(page, page + s.page_size);
                }
            }
            if (page == last) break;
            page += s.page_size;
        }
        for (std::size_t i = 0; i < runs.size(); ++i) {
            try {
                map_pages(runs[i].first, runs[i].second, what);
            } catch (...) {
                runs.resize(i);
                throw;
            }
        }
    } catch (...) {
        for (const auto& run : runs) unmap_pages(run.first, run.second);
        throw;
    }
    for (std::uint64_t page = first;; page += s.page_size) {
        ++s.page_users[page];
        if (page == last) break;
    }

    auto entry = std::make_shared<region_entry>();
    entry->id = s.next_id++;
    entry->name = std::move(name);
    entry->base = base;
    entry->size = size;
    entry->handler = std::move(on_access);
    auto regions = current->regions;
    regions.push_back(entry);
    publish(s, std::move(regions));
    return mapped_region(entry->id);
}

void trap_engine::unmap_region(std::uint64_t id) noexcept {
    engine_state& s = state();
    std::lock_guard<std::mutex> lock(s.mutex);
    const region_table* current = s.table.load(std::memory_order_relaxed);
    std::vector<std::shared_ptr<const region_entry>> regions;
    std::shared_ptr<const region_entry> gone;
    for (const auto& r : current->regions) {
        if (r->id == id) {
            gone = r;
        } else {
            regions.push_back(r);
        }
    }
    if (!gone) return;
    publish(s, std::move(regions));
    const std::uint64_t first = gone->base & ~(s.page_size - 1);
    const std::uint64_t last = (gone->end() - 1) & ~(s.page_size - 1);
    for (std::uint64_t page = first;; page += s.page_size) {
        auto it = s.page_users.find(page);
        if (it != s.page_users.end() && --it->second == 0) {
            s.page_users.erase(it);
            unmap_pages(page, page + s.page_size);
        }
        if (page == last) break;
    }
}

std::uint64_t trap_engine::accesses_served() const noexcept {
    return state().served.load(std::memory_order_relaxed);
}

}  // namespace harness
