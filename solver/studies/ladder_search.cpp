#include "solver/studies/ladder_search.hpp"

#include <algorithm>
#include <cmath>
#include <map>
#include <stdexcept>

namespace heatbead {

std::size_t Ladder::size() const {
    if (!(step > 0) || !(highest >= lowest)) throw std::invalid_argument("a ladder needs step > 0 and highest >= lowest");
    return static_cast<std::size_t>(std::ceil((highest - lowest) / step - 1e-9)) + 1;
}

double Ladder::at(std::size_t k) const { return std::min(lowest + static_cast<double>(k) * step, highest); }

LadderSearch find_lowest_passing(const Ladder& ladder, std::size_t batch, const BatchTest& test) {
    LadderSearch out;
    batch = std::max<std::size_t>(batch, 1);
    const std::size_t top = ladder.size() - 1;
    std::map<std::size_t, bool> seen;
    const auto evaluate = [&](const std::vector<std::size_t>& ks) {
        std::vector<double> candidates;
        for (auto k : ks) candidates.push_back(ladder.at(k));
        const std::vector<bool> passed = test(candidates);
        if (passed.size() != ks.size()) throw std::logic_error("the batch test returned the wrong number of results");
        for (std::size_t i = 0; i < ks.size(); ++i) seen[ks[i]] = passed[i];
        out.evaluations += ks.size();
    };
    evaluate(batch == 1 || top == 0 ? std::vector<std::size_t>{0} : std::vector<std::size_t>{0, top});
    if (seen.at(0)) return out.lowest_passing = 0, out;
    if (!seen.contains(top)) evaluate({top});
    if (!seen.at(top)) return out;
    for (;;) {
        // Bracket: the lowest pass, and the highest failure below it.
        std::size_t pass = top, fail = 0;
        for (const auto& [k, ok] : seen) {
            if (ok) {
                pass = k;
                break;
            }
        }
        for (const auto& [k, ok] : seen) {
            if (!ok && k < pass) fail = k;
            if (!ok && k > pass) out.monotone = false;
        }
        if (pass - fail <= 1) return out.lowest_passing = pass, out;
        std::vector<std::size_t> next;
        const double width = static_cast<double>(pass - fail) / static_cast<double>(batch + 1);
        for (std::size_t i = 1; i <= batch; ++i) {
            const auto k = fail + static_cast<std::size_t>(std::lround(static_cast<double>(i) * width));
            if (k > fail && k < pass && (next.empty() || next.back() != k)) next.push_back(k);
        }
        evaluate(next);
    }
}

}  // namespace heatbead
