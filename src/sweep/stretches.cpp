#include "sweep/stretches.hpp"

#include <algorithm>
#include <cmath>

#include "race/outcome.hpp"

namespace overshoot {

namespace {

// The bound of a margin as the sweep's verdicts use it (rounded to double once more).
double margin_bound(const LengthOutcome& o) { return rounded_margin_bound(o.error_bound()); }

}  // namespace

std::vector<Stretch> preference_stretches(const PairSweep& pair, const std::vector<int>& lengths) {
    std::vector<Stretch> out;
    for (std::size_t k = 0; k < lengths.size() && k < pair.at.size(); ++k) {
        const LengthOutcome& o = pair.at[k];
        const int v = decided(o.margin(), margin_bound(o));
        const double size = std::fabs(o.margin());
        if (out.empty() || out.back().verdict != v) {
            out.push_back({lengths[k], lengths[k], v, size, size, 1});
            continue;
        }
        Stretch& s = out.back();
        s.last = lengths[k];
        s.least = std::min(s.least, size);
        s.most = std::max(s.most, size);
        ++s.count;
    }
    return out;
}

LargestBound largest_bound(const SweepResult& r) {
    LargestBound best;
    for (std::size_t v = 0; v < r.variants.size(); ++v) {
        const VariantSweep& vs = r.variants[v];
        for (std::size_t p = 0; p < vs.pairs.size(); ++p)
            for (std::size_t k = 0; k < vs.pairs[p].at.size() && k < vs.lengths.size(); ++k) {
                const double b = margin_bound(vs.pairs[p].at[k]);
                if (b > best.bound) best = {b, vs.lengths[k], v, p};
            }
    }
    return best;
}

}  // namespace overshoot
