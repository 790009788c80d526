#include "hunt/spec.hpp"

#include <fmt/format.h>


#include "core/error.hpp"
#include "core/hash.hpp"

namespace overshoot {

std::uint64_t hunt_fingerprint(const HuntSpec& s) {
    // Each text ends with a NUL, so that two texts side by side cannot run together.
    auto text = [](std::uint64_t h, std::string_view t) { return fnv1a(fnv1a(h, t), "\0", 1); };
    std::uint64_t h = fnv_offset_basis;
    h = text(h, "hunt/1");
    for (const auto& o : s.options) {
        h = text(h, o.name);
        h = fnv1a(h, o.weight.data(), o.weight.size() * sizeof(o.weight[0]));
        h = fnv1a(h, &o.denominator, sizeof o.denominator);
    }
    int g[3] = {s.grid.lo, s.grid.hi, s.grid.step};
    h = fnv1a(h, g, sizeof g);
    for (const auto& v : s.variants) {
        int r[2] = {static_cast<int>(v.rule), static_cast<int>(v.order)};
        h = fnv1a(h, r, sizeof r);
    }
    h = text(h, to_string(s.engine.method));
    h = fnv1a(h, &s.engine.close_target, sizeof s.engine.close_target);
    // Only boards with jumps add to it, so checkpoints of jump-free hunts stay valid.
    if (!s.jumps.empty()) {
        h = text(h, s.anchor == JumpAnchor::finish ? "jumps/finish" : "jumps/start");
        for (const auto& j : s.jumps) {
            int fj[2] = {j.from, j.to};
            h = fnv1a(h, fj, sizeof fj);
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
    require_distinct_names(spec.options);
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
