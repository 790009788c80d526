#include "hunt/spec.hpp"

#include <fmt/format.h>

#include <set>

#include "core/error.hpp"
#include "hunt/checkpoint.hpp"

namespace overshoot {

std::uint64_t hunt_fingerprint(const HuntSpec& s) {
    std::uint64_t h = 1469598103934665603ULL;
    h = fingerprint_text(h, "hunt/1");
    for (const auto& o : s.options) {
        h = fingerprint_text(h, o.name);
        h = fingerprint_bytes(h, o.weight.data(), o.weight.size() * sizeof(o.weight[0]));
        h = fingerprint_bytes(h, &o.denominator, sizeof o.denominator);
    }
    int g[3] = {s.grid.lo, s.grid.hi, s.grid.step};
    h = fingerprint_bytes(h, g, sizeof g);
    for (const auto& v : s.variants) {
        int r[2] = {static_cast<int>(v.rule), static_cast<int>(v.order)};
        h = fingerprint_bytes(h, r, sizeof r);
    }
    h = fingerprint_text(h, std::string(to_string(s.engine.method)));
    h = fingerprint_bytes(h, &s.engine.close_target, sizeof s.engine.close_target);
    // Only boards with jumps add to it, so checkpoints of jump-free hunts stay valid.
    if (!s.jumps.empty()) {
        h = fingerprint_text(h, s.anchor == JumpAnchor::finish ? "jumps/finish" : "jumps/start");
        for (const auto& j : s.jumps) {
            int fj[2] = {j.from, j.to};
            h = fingerprint_bytes(h, fj, sizeof fj);
        }
    }
    return h;
}

void validate_hunt(const HuntSpec& spec) {
    const std::size_t n = spec.options.size();
    const int K = spec.cycle_length;
    if (K < 3) throw InputError(fmt::format("--cycle-length {}: a cycle has at least 3 options", K));
    if (n < static_cast<std::size_t>(K))
        throw InputError(fmt::format("a hunt for {}-cycles needs at least {} options, got {}", K, K, n));
    if (spec.min_strength < 0) throw InputError("--min-strength must be 0 or more");
    {
        std::set<std::string> names;
        for (const auto& o : spec.options)
            if (!names.insert(o.name).second)
                throw InputError(fmt::format("option name '{}' appears twice; give each option its own name", o.name));
    }
    for (const auto& v : spec.variants)
        if (v.order == Order::a_first || v.order == Order::b_first)
            throw InputError(fmt::format("a hunt cannot use the turn order {}: the result would depend on the seat; "
                                         "use simultaneous or coin",
                                         to_string(v.order)));
    if (spec.resume && spec.checkpoint.empty()) throw InputError("--resume needs --checkpoint FILE");
    // The jumps must make a board at the longest length under every rule (then
    // every shorter board, which keeps a subset of them, is one too).
    if (!spec.jumps.empty()) {
        const std::vector<int> lengths = spec.grid.lengths();
        if (lengths.empty()) throw InputError("a hunt needs at least one length");
        for (const auto& v : spec.variants) make_board(lengths.back(), v.rule, spec.jumps);
    }
}

}  // namespace overshoot
