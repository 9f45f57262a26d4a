#include "tests/bench/interleaved.h"

#include <algorithm>

namespace bench {

double median(std::vector<double> v) {
    std::sort(v.begin(), v.end());
    const std::size_t n = v.size();
    return n % 2 == 1 ? v[n / 2] : (v[n / 2 - 1] + v[n / 2]) / 2;
}

std::vector<double> interleaved_medians(int rounds,
                                        const std::vector<std::function<double()>>& sides) {
    std::vector<std::vector<double>> samples(sides.size());
    for (int r = 0; r < rounds; ++r)
        for (std::size_t k = 0; k < sides.size(); ++k) {
            const std::size_t side = (k + static_cast<std::size_t>(r)) % sides.size();
            samples[side].push_back(sides[side]());
        }
    std::vector<double> out;
    for (const auto& s : samples) out.push_back(median(s));
    return out;
}

}  // namespace bench
