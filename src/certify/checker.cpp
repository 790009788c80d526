// Checking certificates by algorithms other than the writer's (docs/certificate.md):
// fractions modulo primes through the one-round product-chain equations, the
// claim and every interval through the floating-point engine's proven bound.
#include <fmt/format.h>

#include <cmath>
#include <map>

#include "certify/certificate.hpp"
#include "certify/modular.hpp"
#include "core/parallel.hpp"
#include "chain/chain.hpp"
#include "core/error.hpp"
#include "core/hash.hpp"
#include "core/limits.hpp"
#include "race/duel.hpp"
#include "core/fraction.hpp"
#include "race/exact.hpp"
#include "race/pairs.hpp"

namespace overshoot {

namespace {

using u64 = std::uint64_t;
__extension__ typedef unsigned __int128 u128;

struct Failure {
    std::string what;
};

[[noreturn]] void fail(const std::string& what) { throw Failure{what}; }

u64 residue(const mpz_class& z, u64 p) { return static_cast<u64>(mpz_fdiv_ui(z.get_mpz_t(), static_cast<unsigned long>(p))); }

mpq_class exact_of(double d) { return mpq_class(d); }  // exact: every double is a dyadic rational

const char* value_names[] = {"p_a_wins", "p_b_wins", "p_tie", "p_neither", "margin"};

std::vector<const CertValue*> values(const CertDuel& d) {
    return {&d.p_a_wins, &d.p_b_wins, &d.p_tie, &d.p_neither, &d.margin};
}

// A residual duel: the proof must hold, every recorded interval must contain
// the proven one and every decimal must be its centre; returns the verdict
// the proven margin decides.
Verdict check_recorded(const std::string& where, const CertDuel& d, const std::string& failure,
                       const ResidualBounds& b) {
    if (!failure.empty()) fail(fmt::format("{}: residual certificate: {}", where, failure));
    auto v = values(d);
    for (int i = 0; i < 5; ++i) {
        mpq_class lo = b.centre[i] - b.radius[i], hi = b.centre[i] + b.radius[i];
        if (i < 4) {
            lo = std::max(lo, mpq_class(0));
            hi = std::min(hi, mpq_class(1));
        }
        if (exact_of(v[i]->lo) > lo || exact_of(v[i]->hi) < hi)
            fail(fmt::format("{}: {}: the recorded interval [{:.17g}, {:.17g}] does not contain the proven one [{:.17g}, "
                             "{:.17g}]",
                             where, value_names[i], v[i]->lo, v[i]->hi, lo.get_d(), hi.get_d()));
        if (v[i]->exact && (*v[i]->exact < b.centre[i] - b.radius[i] || *v[i]->exact > b.centre[i] + b.radius[i]))
            fail(fmt::format("{}: {}: the fraction lies outside the proven interval", where, value_names[i]));
        if (!v[i]->exact && v[i]->decimal != decimal_string(b.centre[i], 6))
            fail(fmt::format("{}: {}: the decimal {} is not the proven centre rounded to 6 places", where,
                             value_names[i], v[i]->decimal));
    }
    const mpq_class lo = b.centre[4] - b.radius[4], hi = b.centre[4] + b.radius[4];
    Verdict got = lo > 0 ? Verdict::a_beats_b : hi < 0 ? Verdict::b_beats_a : Verdict::undecided;
    if (d.margin.exact) {  // the fractions are confirmed modulo primes by the caller
        const int s = sgn(*d.margin.exact);
        got = s > 0 ? Verdict::a_beats_b : s < 0 ? Verdict::b_beats_a : Verdict::undecided;
    }
    if (d.verdict != got)
        fail(fmt::format("{}: verdict '{}' is wrong: the proven margin gives '{}'", where, to_string(d.verdict),
                         to_string(got)));
    return got;
}

}  // namespace

CheckReport check_certificate(const Certificate& c, const std::string& text, int threads) {
    CheckReport rep;
    // Two fixed primes and one that depends on the file, so that no edit can be
    // tailored to pass a known set of moduli.
    rep.primes = {next_prime((u64{1} << 61) - (u64{1} << 40)), next_prime((u64{1} << 61) - (u64{1} << 44)),
                  next_prime((u64{1} << 60) + (fnv1a(fnv_offset_basis, text) >> 4))};
    try {
        // 1. Options: each listed distribution must be what its spec says.
        std::map<std::string, const Option*> opt;
        for (const Option& o : c.options) {
            opt[o.name] = &o;
            Option parsed;
            try {
                parsed = parse_option(o.spec);
            } catch (const InputError& e) {
                fail(fmt::format("option '{}': its spec does not parse: {}", o.name, e.what()));
            }
            if (parsed.weight != o.weight || parsed.denominator != o.denominator)
                fail(fmt::format("option '{}': the listed distribution is not that of its spec '{}'", o.name, o.spec));
        }
        rep.passed.push_back({"options", fmt::format("{} distributions match their specs", c.options.size())});
        // 2. The claim, its statement and the duels it needs.
        for (const auto& name : c.claim.options)
            if (!opt.count(name)) fail(fmt::format("claim: option '{}' is not among the options", name));
        if (!c.starts.empty() && c.starts.size() != c.options.size())
            fail("board: the head starts do not give one square per option");
        if (claim_statement(c.claim, c.board, c.order, c.starts) != c.statement)
            fail("claim: the statement does not match the claim, its options and the board");
        if (c.claim.kind == ClaimKind::crossover && c.board.length != c.claim.at)
            fail(fmt::format("claim: a crossover at {} needs board length {}, not {}", c.claim.at, c.claim.at, c.board.length));
        std::vector<NeededDuel> need = needed_duels(c.claim, c.board.length);
        std::vector<std::size_t> need_at;
        for (const auto& n : need) {
            std::size_t k = 0;
            while (k < c.duels.size() &&
                   !(c.duels[k].a == n.a && c.duels[k].b == n.b && c.duels[k].length == n.length))
                ++k;
            if (k == c.duels.size())
                fail(fmt::format("claim: it needs the duel {} vs {} on {} squares, which the certificate does not hold",
                                 n.a, n.b, n.length));
            need_at.push_back(k);
        }
        rep.passed.push_back({"claim", fmt::format("statement matches; all {} duels it needs are present", need.size())});
        // 3. Cheap checks of each fraction: lowest terms, a probability, its decimal.
        auto where = [](const CertDuel& d) { return fmt::format("duel {} vs {} on {} squares", d.a, d.b, d.length); };
        for (const CertDuel& d : c.duels) {
            if (d.exact_method.empty()) continue;
            auto v = values(d);
            for (int i = 0; i < 5; ++i) {
                const mpq_class& q = *v[i]->exact;
                mpz_class g;
                mpz_gcd(g.get_mpz_t(), q.get_num().get_mpz_t(), q.get_den().get_mpz_t());
                if (q.get_den() <= 0 || g != 1)
                    fail(fmt::format("{}: {}: the fraction is not in lowest terms", where(d), value_names[i]));
                if (i < 4 && (q < 0 || q > 1)) fail(fmt::format("{}: {}: not a probability", where(d), value_names[i]));
                if (v[i]->decimal != decimal_string(q, 6))
                    fail(fmt::format("{}: {}: the decimal {} is not the fraction rounded to 6 places", where(d),
                                     value_names[i], v[i]->decimal));
            }
        }
        // 4. The heavy part, in parallel: per duel the floating-point engine and
        //    the modular programme for each prime.
        std::map<int, Board> boards;
        for (const CertDuel& d : c.duels)
            if (!boards.count(d.length)) boards[d.length] = make_board(d.length, c.board.rule, c.board.jumps);
        std::map<std::pair<int, std::string>, Chain> chains;
        for (const CertDuel& d : c.duels)
            for (const auto* n : {&d.a, &d.b})
                if (!chains.count({d.length, *n})) {
                    int start = 0;
                    for (std::size_t i = 0; i < c.starts.size(); ++i)
                        if (c.options[i].name == *n) start = c.starts[i];
                    chains[{d.length, *n}] = build_chain(boards.at(d.length), *opt.at(*n), start);
                }
        const std::size_t m = c.duels.size(), np = rep.primes.size();
        std::vector<DuelResult> approx(m);
        std::vector<std::optional<std::array<u64, 3>>> mod(m * np);
        std::vector<std::string> residual_failure(m);
        std::vector<ResidualBounds> residual_bounds(m);
        parallel_for(m * (np + 1), threads, [&](std::size_t t) {
            const CertDuel& d = c.duels[t % m];
            const Chain& ca = chains.at({d.length, d.a});
            const Chain& cb = chains.at({d.length, d.b});
            const std::size_t job = t / m;
            if (job < np) {
                if (!d.exact_method.empty()) mod[(t % m) * np + job] = modular_duel(ca, cb, c.order, rep.primes[job]);
            } else if (d.residual) {
                residual_failure[t % m] = check_residual(*d.residual, ca, cb, c.order, residual_bounds[t % m]);
            } else {
                DuelSettings s;
                s.want_median = false;
                // A method other than the writer's automatic choice where one is proven.
                // (the full pair programme only while it fits the memory cap comfortably).
                s.method = !ca.forward_only ? DuelMethod::series
                           : pair_programme_memory(ca.length, 0, 0) <= limits::memory_bytes() / 2 ? DuelMethod::pairs
                                                                                                   : DuelMethod::automatic;
                approx[t % m] = duel(ca, cb, c.order, s);
            }
        });
        // Each fraction against the one-round equations modulo the primes.
        auto confirm_fractions = [&](std::size_t k) -> std::string {
            const CertDuel& d = c.duels[k];
            auto v = values(d);
            int confirmed = 0;
            for (std::size_t j = 0; j < np; ++j) {
                if (!mod[k * np + j]) continue;  // p divides a denominator: skip this prime
                const u64 p = rep.primes[j];
                const auto& x = *mod[k * np + j];
                const u64 neither = (3 * p + 1 - x[0] - x[1] - x[2]) % p;
                const u64 margin = (x[0] + p - x[1]) % p;
                const u64 want[5] = {x[0], x[1], x[2], neither, margin};
                bool used = false;
                for (int i = 0; i < 5; ++i) {
                    const mpq_class& q = *v[i]->exact;
                    const u64 den = residue(q.get_den(), p);
                    if (den == 0) continue;
                    used = true;
                    const u64 lhs = residue(q.get_num(), p);
                    const u64 rhs = static_cast<u64>(static_cast<u128>(want[i]) * den % p);
                    if (lhs != rhs)
                        fail(fmt::format("{}: {}: the fraction is wrong (it differs from the one-round product-chain "
                                         "value modulo the prime {})",
                                         where(d), value_names[i], p));
                }
                if (used) ++confirmed;
            }
            if (confirmed == 0) fail(fmt::format("{}: no prime could confirm the fractions", where(d)));
            // Identities (also implied by the residues; named here for a clear message).
            if (*d.p_a_wins.exact + *d.p_b_wins.exact + *d.p_tie.exact + *d.p_neither.exact != 1)
                fail(fmt::format("{}: the four outcomes do not add up to 1", where(d)));
            if (*d.p_a_wins.exact - *d.p_b_wins.exact != *d.margin.exact)
                fail(fmt::format("{}: margin is not P(A wins) - P(B wins)", where(d)));
            return fmt::format("5 fractions confirmed modulo {} primes; ", confirmed);
        };
        std::vector<Verdict> verdict(m);
        std::vector<bool> exact_only(m, false);
        for (std::size_t k = 0; k < m; ++k) {
            const CertDuel& d = c.duels[k];
            if (d.residual) {
                const std::string confirmed = d.exact_method.empty() ? "" : confirm_fractions(k);
                verdict[k] = check_recorded(where(d), d, residual_failure[k], residual_bounds[k]);
                const ResidualBounds& b = residual_bounds[k];
                const mpq_class lo = b.centre[4] - b.radius[4], hi = b.centre[4] + b.radius[4], width = 2 * b.radius[4];
                rep.passed.push_back(CheckItem{
                    where(d), fmt::format("{}residual certificate verified in exact arithmetic; margin {} in [{:.17g}, "
                                          "{:.17g}] (proven width {:.3g})",
                                          confirmed, d.margin.decimal, lo.get_d(), hi.get_d(), width.get_d())});
                continue;
            }
            const DuelResult& r = approx[k];
            if (!r.bound_proven) fail(fmt::format("{}: the floating-point engine gave no proven bound", where(d)));
            auto v = values(d);
            std::string detail;
            if (!d.exact_method.empty()) detail = confirm_fractions(k);
            // Proven intervals of the checker's own float run.
            const long double bound = r.bound;
            const long double own[5] = {r.p_a_wins, r.p_b_wins, r.p_tie, r.p_neither, r.p_a_wins - r.p_b_wins};
            for (int i = 0; i < 5; ++i) {
                const long double rad = (i == 4 ? 2 * bound : bound) + 4 * std::ldexp(1.0L, -63) * (1 + std::fabs(own[i]));
                const double lo = static_cast<double>(own[i] - rad), hi = static_cast<double>(own[i] + rad);
                // One ulp outward covers the conversion to double.
                const double lo2 = std::nextafter(lo, -HUGE_VAL), hi2 = std::nextafter(hi, HUGE_VAL);
                if (v[i]->exact) {
                    if (*v[i]->exact < exact_of(lo2) || *v[i]->exact > exact_of(hi2))
                        fail(fmt::format("{}: {}: the fraction lies outside the proven interval [{:.17g}, {:.17g}] of "
                                         "the floating-point engine",
                                         where(d), value_names[i], lo2, hi2));
                    if (*v[i]->exact < exact_of(v[i]->lo) || *v[i]->exact > exact_of(v[i]->hi))
                        fail(fmt::format("{}: {}: the recorded interval does not contain the fraction", where(d),
                                         value_names[i]));
                } else if (v[i]->hi < lo2 || v[i]->lo > hi2) {
                    fail(fmt::format("{}: {}: the recorded interval [{:.17g}, {:.17g}] misses the recomputed one [{:.17g}, {:.17g}]",
                                     where(d), value_names[i], v[i]->lo, v[i]->hi, lo2, hi2));
                }
                if (i == 4) {
                    Verdict iv = lo2 > 0 ? Verdict::a_beats_b : hi2 < 0 ? Verdict::b_beats_a : Verdict::undecided;
                    Verdict ev = iv;
                    if (v[i]->exact) {
                        int s = sgn(*v[i]->exact);
                        ev = s > 0 ? Verdict::a_beats_b : s < 0 ? Verdict::b_beats_a : Verdict::undecided;
                        if (iv != Verdict::undecided && iv != ev)
                            fail(fmt::format("{}: the exact margin and the proven interval disagree", where(d)));
                        exact_only[k] = iv == Verdict::undecided && ev != Verdict::undecided;
                    }
                    verdict[k] = ev;
                    if (d.verdict != ev)
                        fail(fmt::format("{}: verdict '{}' is wrong: re-derived '{}'", where(d), to_string(d.verdict),
                                         to_string(ev)));
                    detail += fmt::format("inside the proven intervals ({}, bound {:.2g}); margin {} in [{:.12g}, {:.12g}]",
                                          to_string(r.method), static_cast<double>(bound), d.margin.decimal, lo2, hi2);
                }
            }
            rep.passed.push_back({where(d), detail});
        }
        // 5. The claim itself.
        for (std::size_t i = 0; i < need.size(); ++i) {
            const CertDuel& d = c.duels[need_at[i]];
            if (need[i].want && verdict[need_at[i]] != *need[i].want)
                fail(fmt::format("claim: {} does not show '{}' (re-derived '{}')", where(d), to_string(*need[i].want),
                                 to_string(verdict[need_at[i]])));
        }
        if (c.claim.kind == ClaimKind::crossover) {
            Verdict x = verdict[need_at[0]], y = verdict[need_at[1]];
            if (x == Verdict::undecided || y == Verdict::undecided || x == y)
                fail(fmt::format("claim: the preference does not change between lengths {} and {}", c.claim.at - 1,
                                 c.claim.at));
        }
        std::string how = "every arc decided by the proven interval of the floating-point engine";
        for (std::size_t i = 0; i < need.size(); ++i)
            if (c.duels[need_at[i]].residual) how = "arcs decided by proven intervals (residual certificates, exact arithmetic)";
        for (std::size_t i = 0; i < need.size(); ++i)
            if (exact_only[need_at[i]]) how = "some arcs decided only by the exact margin (their intervals are too wide)";
        rep.passed.push_back({"claim", how});
        rep.holds = true;
    } catch (const Failure& f) {
        rep.holds = false;
        rep.failure = f.what;
    }
    return rep;
}

}  // namespace overshoot
