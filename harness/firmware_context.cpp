// The firmware's checks in constant memory; see firmware_context.h.

#include "harness/firmware_context.h"

#include <algorithm>

namespace harness {

void firmware_check_record::add(bool held, sim::time_ps when) {
    if (evaluations() == 0) first_at = when;
    last_at = when;
    if (held) {
        ++passes;
    } else {
        ++failures;
        if (failures == 1) {
            first_failure_at = when;
            first_failure_evaluation = evaluations();
        }
        passed = false;
    }
    at = passed ? last_at : first_failure_at;
    ring_[(evaluations() - 1) % recent_capacity] = {held, when};
}

std::vector<firmware_evaluation> firmware_check_record::recent() const {
    const std::uint64_t n = evaluations();
    const std::uint64_t kept = std::min<std::uint64_t>(n, recent_capacity);
    std::vector<firmware_evaluation> v;
    v.reserve(kept);
    for (std::uint64_t i = n - kept; i < n; ++i) v.push_back(ring_[i % recent_capacity]);
    return v;
}

void firmware_check_record::restore_recent(const std::vector<firmware_evaluation>& last) {
    const std::uint64_t n = evaluations();
    const std::uint64_t kept = std::min<std::uint64_t>({last.size(), n, recent_capacity});
    const std::size_t skip = last.size() - kept;
    for (std::uint64_t i = 0; i < kept; ++i)
        ring_[(n - kept + i) % recent_capacity] = last[skip + i];
}

std::size_t firmware_check_log::find_or_add(const place& p) {
    const auto it = index_.find(p);
    if (it != index_.end()) return it->second;
    firmware_check_record r;
    r.name = std::string(p.name);
    r.file = std::string(p.file);
    r.line = p.line;
    records_.push_back(std::move(r));
    index_.emplace(key{std::string(p.name), std::string(p.file), p.line}, records_.size() - 1);
    return records_.size() - 1;
}

const firmware_check_record& firmware_check_log::record(std::string_view name,
                                                        std::string_view file, int line,
                                                        bool passed, sim::time_ps at) {
    firmware_check_record& r = records_[find_or_add({name, file, line})];
    r.add(passed, at);
    return r;
}

void firmware_check_log::clear() {
    records_.clear();
    index_.clear();
}

std::size_t firmware_check_log::footprint_bytes() const {
    // A map node holds its key and value and, in the common implementations, three links and a
    // colour: counted as four pointers.
    constexpr std::size_t node_overhead = 4 * sizeof(void*);
    std::size_t n = sizeof(*this) + records_.capacity() * sizeof(firmware_check_record);
    for (const firmware_check_record& r : records_) n += r.name.capacity() + r.file.capacity();
    for (const auto& [k, i] : index_)
        n += sizeof(std::pair<const key, std::size_t>) + node_overhead + k.name.capacity() +
             k.file.capacity();
    return n;
}

}  // namespace harness
