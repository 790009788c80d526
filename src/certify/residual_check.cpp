// Checking residual certificates in exact arithmetic only (docs/method.md,
// "Residual certificates"). Nothing here is shared with the writer: the
// round's outcomes, the live states and the residuals are derived afresh from
// the chains' integer weights, in GMP integers.
#include <fmt/format.h>

#include <cstdint>

#include "certify/residual.hpp"

namespace overshoot {

namespace {

// Squares from which the piece can still finish: a fixed point over the rows
// (a square can finish if some destination is the finish or can finish).
std::vector<char> can_finish(const Chain& c) {
    const int n = c.length;
    std::vector<char> ok(static_cast<std::size_t>(n) + 1, 0);
    ok[n] = 1;
    for (bool grown = true; grown;) {
        grown = false;
        for (int s = 0; s < n; ++s) {
            if (ok[s]) continue;
            for (auto k = c.row_start[s]; k < c.row_start[s + 1] && !ok[s]; ++k)
                if (ok[c.dest[k]]) ok[s] = grown = true;
        }
    }
    return ok;
}

// The outcome of one round in which A moves to da and B to db: 0 A wins,
// 1 B wins, 2 tie, 3 the race goes on. With an alternating order the first
// mover's finish ends the round before the other moves, so the other's
// move does not matter (its weights sum to its denominator).
int outcome(Mover first, bool fa, bool fb) {
    switch (first) {
        case Mover::both:
            return fa && fb ? 2 : fa ? 0 : fb ? 1 : 3;
        case Mover::a:
            return fa ? 0 : fb ? 1 : 3;
        case Mover::b:
            return fb ? 1 : fa ? 0 : 3;
    }
    return 3;
}

struct Fail {
    std::string why;
};

// Checks one part; returns the centres and radii of its start state.
void check_part(const ResidualPart& part, int rounds_digits, const Chain& A, const Chain& B,
                mpq_class centre[5], mpq_class radius[5]) {
    const int n = A.length;
    const std::size_t m = part.states.size();
    const bool ties = part.first == Mover::both;
    if (part.p_a_wins.size() != m || part.p_b_wins.size() != m || part.rounds.size() != m ||
        part.p_tie.size() != (ties ? m : 0))
        throw Fail{"a list of values does not have one value per state"};
    // Live states (the race can still end: one of the pieces can still
    // finish, and the pieces move independently) reachable from the start.
    const std::vector<char> fin_a = can_finish(A), fin_b = can_finish(B);
    auto live = [&](int a, int b) { return fin_a[a] || fin_b[b]; };
    std::vector<std::int64_t> index(static_cast<std::size_t>(n) * n, -1);
    auto at = [&](int a, int b) -> std::int64_t& { return index[static_cast<std::size_t>(a) * n + b]; };
    for (std::size_t i = 0; i < m; ++i) {
        const auto& s = part.states[i];
        if (s.first < 0 || s.first >= n || s.second < 0 || s.second >= n)
            throw Fail{fmt::format("state ({}, {}) is not a pair of squares", s.first, s.second)};
        if (i > 0 && !(part.states[i - 1] < s)) throw Fail{"the states are not in increasing order"};
        at(s.first, s.second) = static_cast<std::int64_t>(i);
    }
    std::vector<char> seen(static_cast<std::size_t>(n) * n, 0);
    std::vector<std::pair<int, int>> todo;
    if (live(A.start, B.start)) {
        todo.push_back({A.start, B.start});
        seen[static_cast<std::size_t>(A.start) * n + B.start] = 1;
    }
    std::size_t reached = 0;
    while (!todo.empty()) {
        const auto [a, b] = todo.back();
        todo.pop_back();
        ++reached;
        if (at(a, b) < 0)
            throw Fail{
                fmt::format("state ({}, {}) is live and reachable from the start but has no values", a, b)};
        for (auto ka = A.row_start[a]; ka < A.row_start[a + 1]; ++ka)
            for (auto kb = B.row_start[b]; kb < B.row_start[b + 1]; ++kb) {
                const int da = A.dest[ka], db = B.dest[kb];
                if (outcome(part.first, da == n, db == n) != 3 || !live(da, db)) continue;
                char& s = seen[static_cast<std::size_t>(da) * n + db];
                if (!s) {
                    s = 1;
                    todo.push_back({da, db});
                }
            }
    }
    if (reached != m) {
        for (const auto& s : part.states)
            if (!seen[static_cast<std::size_t>(s.first) * n + s.second])
                throw Fail{
                    fmt::format("state ({}, {}) is listed but is not a live state reachable from the start",
                                s.first, s.second)};
    }
    if (m == 0) {
        centre[3] = 1;  // the race never ends
        return;
    }
    // Residuals times full * 10^D, exactly; the rounds bound h >= 1 + Q h.
    const mpz_class full =
        mpz_class(static_cast<unsigned long>(A.denominator)) * static_cast<unsigned long>(B.denominator);
    mpz_class scale, hscale;
    mpz_ui_pow_ui(scale.get_mpz_t(), 10, static_cast<unsigned long>(part.digits));
    mpz_ui_pow_ui(hscale.get_mpz_t(), 10, static_cast<unsigned long>(rounds_digits));
    const mpz_class one_round = full * hscale;
    mpz_class worst[5];  // |residual| of A, B, tie, neither, margin
    mpz_class acc[4], won[3], w;
    const mpz_class zero = 0;
    for (std::size_t i = 0; i < m; ++i) {
        const auto [a, b] = part.states[i];
        const mpz_class* x[4] = {&part.p_a_wins[i], &part.p_b_wins[i], ties ? &part.p_tie[i] : &zero,
                                 &part.rounds[i]};
        for (int c = 0; c < 4; ++c) acc[c] = full * *x[c];
        for (int c = 0; c < 3; ++c) won[c] = 0;
        for (auto ka = A.row_start[a]; ka < A.row_start[a + 1]; ++ka)
            for (auto kb = B.row_start[b]; kb < B.row_start[b + 1]; ++kb) {
                const int da = A.dest[ka], db = B.dest[kb];
                w = static_cast<unsigned long>(A.weight[ka]);
                w *= static_cast<unsigned long>(B.weight[kb]);
                const int o = outcome(part.first, da == n, db == n);
                if (o < 3) {
                    won[o] += w;
                    continue;
                }
                if (!live(da, db)) continue;  // never ends from there: all values 0
                const auto j = static_cast<std::size_t>(at(da, db));
                acc[0] -= w * part.p_a_wins[j];
                acc[1] -= w * part.p_b_wins[j];
                if (ties) acc[2] -= w * part.p_tie[j];
                acc[3] -= w * part.rounds[j];
            }
        for (int c = 0; c < 3; ++c) acc[c] -= scale * won[c];
        if (acc[3] < one_round) throw Fail{fmt::format("rounds: h >= 1 + Q h fails at state ({}, {})", a, b)};
        const mpz_class margin = acc[0] - acc[1], neither = acc[0] + acc[1] + acc[2];
        const mpz_class* r[5] = {&acc[0], &acc[1], &acc[2], &neither, &margin};
        for (int c = 0; c < 5; ++c)
            if (abs(*r[c]) > worst[c]) worst[c] = abs(*r[c]);
    }
    // The start state: the two pieces' start squares (0, 0 without head starts).
    const std::int64_t s0 = at(A.start, B.start);
    if (s0 < 0) throw Fail{fmt::format("the start ({}, {}) is not among the states", A.start, B.start)};
    const auto i0 = static_cast<std::size_t>(s0);
    centre[0] = mpq_class(part.p_a_wins[i0], scale);
    centre[1] = mpq_class(part.p_b_wins[i0], scale);
    centre[2] = mpq_class(ties ? part.p_tie[i0] : zero, scale);
    for (int c = 0; c < 3; ++c) centre[c].canonicalize();
    centre[3] = 1 - centre[0] - centre[1] - centre[2];
    centre[4] = centre[0] - centre[1];
    for (int c = 0; c < 5; ++c) {
        radius[c] = mpq_class(worst[c] * part.rounds[i0], full * scale * hscale);
        radius[c].canonicalize();
    }
}

}  // namespace

std::string check_residual(const ResidualProof& proof, const Chain& a, const Chain& b, Order order,
                           ResidualBounds& bounds) {
    const std::vector<Mover> want = parts_of(order);
    if (proof.parts.size() != want.size())
        return fmt::format("the turn order {} needs {} part(s), not {}", to_string(order), want.size(),
                           proof.parts.size());
    bounds = ResidualBounds{};
    for (std::size_t k = 0; k < want.size(); ++k) {
        const ResidualPart& part = proof.parts[k];
        if (part.first != want[k])
            return fmt::format("part {}: first mover '{}' does not fit the turn order {}", k + 1,
                               to_string(part.first), to_string(order));
        mpq_class centre[5], radius[5];
        try {
            check_part(part, proof.rounds_digits, a, b, centre, radius);
        } catch (const Fail& f) {
            return fmt::format("part {} (first mover {}): {}", k + 1, to_string(part.first), f.why);
        }
        // Coin: the mean of the two alternating orders.
        const mpq_class weight(1, static_cast<unsigned long>(want.size()));
        for (int c = 0; c < 5; ++c) {
            bounds.centre[c] += weight * centre[c];
            bounds.radius[c] += weight * radius[c];
        }
    }
    return {};
}

}  // namespace overshoot
