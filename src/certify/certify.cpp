// Writing certificates: every duel a claim rests on, exact and by proven interval.
#include <fmt/format.h>

#include <cmath>
#include <map>

#include "certify/certificate.hpp"
#include "certify/lifting.hpp"
#include "core/parallel.hpp"
#include "chain/chain.hpp"
#include "core/error.hpp"
#include "race/duel.hpp"
#include "core/fraction.hpp"
#include "race/exact.hpp"

namespace overshoot {

std::string_view to_string(ClaimKind k) {
    switch (k) {
        case ClaimKind::cycle: return "cycle";
        case ClaimKind::crossover: return "crossover";
        case ClaimKind::winner: return "winner";
    }
    return "?";
}

std::string_view to_string(Verdict v) {
    switch (v) {
        case Verdict::a_beats_b: return "a beats b";
        case Verdict::b_beats_a: return "b beats a";
        case Verdict::undecided: return "undecided";
    }
    return "?";
}

std::vector<NeededDuel> needed_duels(const Claim& c, int length) {
    const auto& o = c.options;
    if (first_repeated_name(o)) throw InputError("claim: an option is named twice");
    std::vector<NeededDuel> out;
    switch (c.kind) {
        case ClaimKind::cycle:
            if (o.size() < 3) throw InputError("claim cycle: needs at least 3 options (each beats the next, the last beats the first)");
            for (std::size_t i = 0; i < o.size(); ++i)
                out.push_back({o[i], o[(i + 1) % o.size()], length, Verdict::a_beats_b});
            break;
        case ClaimKind::crossover:
            if (o.size() != 2) throw InputError("claim crossover: needs exactly 2 options");
            if (c.at < 2) throw InputError(fmt::format("claim crossover: --at {} must be at least 2", c.at));
            out.push_back({o[0], o[1], c.at - 1, std::nullopt});
            out.push_back({o[0], o[1], c.at, std::nullopt});
            break;
        case ClaimKind::winner:
            if (o.size() < 2) throw InputError("claim winner: needs the winner and at least one other option");
            for (std::size_t i = 1; i < o.size(); ++i) out.push_back({o[0], o[i], length, Verdict::a_beats_b});
            break;
    }
    return out;
}

std::string claim_statement(const Claim& c, const Board& b, Order order, const std::vector<int>& starts) {
    std::string rel;
    const auto& o = c.options;
    auto list = [](const std::vector<std::string>& parts) {
        std::string s;
        for (std::size_t i = 0; i < parts.size(); ++i)
            s += (i == 0 ? "" : i + 1 == parts.size() ? " and " : ", ") + parts[i];
        return s;
    };
    switch (c.kind) {
        case ClaimKind::cycle: {
            std::vector<std::string> parts;
            for (std::size_t i = 0; i < o.size(); ++i) parts.push_back(o[i] + " beats " + o[(i + 1) % o.size()]);
            rel = list(parts);
            break;
        }
        case ClaimKind::crossover:
            rel = fmt::format("the preference between {} and {} changes between lengths {} and {}", o.at(0), o.at(1),
                              c.at - 1, c.at);
            break;
        case ClaimKind::winner:
            rel = fmt::format("{} beats {}", o.at(0), list(std::vector<std::string>(o.begin() + 1, o.end())));
            break;
    }
    std::string jumps = "no jumps";
    if (!b.jumps.empty()) {
        jumps = "jumps";
        for (const Jump& j : b.jumps) jumps += fmt::format(" {}->{}", j.from, j.to);
    }
    std::string where = c.kind == ClaimKind::crossover ? std::string("a board") : fmt::format("a board of {} squares", b.length);
    for (std::size_t i = 0; i < starts.size() && i < o.size(); ++i)
        if (starts[i] != 0) jumps += fmt::format(", {} starts on {}", o[i], starts[i]);
    return fmt::format("{}, on {} (overshoot {}, {} turns, {})", rel, where, to_string(b.rule), to_string(order), jumps);
}

namespace {

double down(long double x) {
    double d = static_cast<double>(x);
    if (static_cast<long double>(d) > x) d = std::nextafter(d, -HUGE_VAL);
    return d;
}
double up(long double x) {
    double d = static_cast<double>(x);
    if (static_cast<long double>(d) < x) d = std::nextafter(d, HUGE_VAL);
    return d;
}

// [x - r, x + r] widened by the rounding of the subtraction itself, rounded outward.
CertValue interval(long double x, long double r, bool probability) {
    CertValue v;
    const long double slack = r + 4 * std::ldexp(1.0L, -63) * (1 + std::fabs(x));
    v.lo = down(x - slack);
    v.hi = up(x + slack);
    if (probability) {
        v.lo = std::max(v.lo, 0.0);
        v.hi = std::min(v.hi, 1.0);
    }
    v.decimal = fmt::format("{:.6f}", static_cast<double>(x));
    return v;
}

mpq_class exact(double x) { return mpq_class(x); }

// [centre - radius, centre + radius] as binary64 numbers rounded outward
// (probabilities clipped to [0, 1], which holds them anyway).
CertValue proven(const mpq_class& centre, const mpq_class& radius, bool probability) {
    mpq_class lo = centre - radius, hi = centre + radius;
    if (probability) {
        lo = std::max(lo, mpq_class(0));
        hi = std::min(hi, mpq_class(1));
    }
    CertValue v;
    v.lo = lo.get_d();
    if (exact(v.lo) > lo) v.lo = std::nextafter(v.lo, -HUGE_VAL);
    v.hi = hi.get_d();
    if (exact(v.hi) < hi) v.hi = std::nextafter(v.hi, HUGE_VAL);
    v.decimal = decimal_string(centre, 6);
    return v;
}

// A residual duel: proven intervals always; the exact fractions of lifting
// where they fit, otherwise the reason in the interval method.
void residual_values(CertDuel& d, ResidualWriting& w, const std::optional<ExactDuel>& e, const std::string& why) {
    const ResidualBounds& b = w.bounds;
    CertValue* v[5] = {&d.p_a_wins, &d.p_b_wins, &d.p_tie, &d.p_neither, &d.margin};
    for (int i = 0; i < 5; ++i) *v[i] = proven(b.centre[i], b.radius[i], i < 4);
    d.interval_method = "residual certificate";
    const mpq_class lo = b.centre[4] - b.radius[4], hi = b.centre[4] + b.radius[4];
    d.verdict = lo > 0 ? Verdict::a_beats_b : hi < 0 ? Verdict::b_beats_a : Verdict::undecided;
    d.residual = std::move(w.proof);
    if (!e) {
        d.interval_method += " (no exact fractions: " + why + ")";
        return;
    }
    d.exact_method = to_string(e->method);
    const mpq_class x[5] = {e->p_a_wins, e->p_b_wins, e->p_tie, e->p_neither, e->margin()};
    for (int i = 0; i < 5; ++i) {
        if (x[i] < b.centre[i] - b.radius[i] || x[i] > b.centre[i] + b.radius[i])
            throw InternalError("certify: an exact fraction lies outside its residual interval");
        v[i]->exact = x[i];
        v[i]->decimal = decimal_string(x[i], 6);
    }
    const int s = sgn(x[4]);
    d.verdict = s > 0 ? Verdict::a_beats_b : s < 0 ? Verdict::b_beats_a : Verdict::undecided;
}

}  // namespace

Certificate certify(const Claim& claim, const Board& board, Order order, const std::vector<Option>& options,
                    int threads, bool residual, const std::vector<int>& starts) {
    Certificate cert;
    cert.claim = claim;
    cert.board = board;
    cert.order = order;
    if (claim.kind == ClaimKind::crossover && board.length != claim.at)
        throw InputError(fmt::format("claim crossover: the board length {} differs from --at {}", board.length, claim.at));
    std::vector<NeededDuel> need = needed_duels(claim, board.length);
    if (options.size() != claim.options.size()) throw InternalError("certify: options and claim disagree");
    std::map<std::string, std::size_t> by_name;
    for (std::size_t i = 0; i < options.size(); ++i) {
        if (options[i].name != claim.options[i]) throw InternalError("certify: options and claim disagree");
        by_name[options[i].name] = i;
    }
    cert.options = options;
    if (!starts.empty() && starts.size() != options.size()) throw InternalError("certify: one start square per option");
    bool any_start = false;
    for (int q : starts) any_start = any_start || q != 0;
    if (any_start) cert.starts = starts;
    cert.statement = claim_statement(claim, board, order, cert.starts);
    // One board per length the claim needs (crossover: two).
    std::map<int, Board> boards;
    for (const auto& n : need)
        if (!boards.count(n.length)) boards[n.length] = make_board(n.length, board.rule, board.jumps);
    std::map<std::pair<int, std::size_t>, Chain> chains;
    for (const auto& [len, b] : boards)
        for (std::size_t i = 0; i < options.size(); ++i)
            chains[{len, i}] = build_chain(b, options[i], cert.starts.empty() ? 0 : cert.starts[i]);
    const std::size_t m = need.size();
    std::vector<std::optional<ExactDuel>> exact(m);
    std::vector<DuelResult> approx(m);
    std::vector<char> use_residual(m), use_exact(m);
    std::vector<std::string> why(m);  // why a residual duel has no fractions, or no residual proof
    std::vector<std::optional<ResidualWriting>> proof(m);
    for (std::size_t t = 0; t < m; ++t) {
        const auto& n = need[t];
        const Chain& ca = chains.at({n.length, by_name.at(n.a)});
        use_exact[t] = exact_refusal(ca, chains.at({n.length, by_name.at(n.b)})).empty();
        use_residual[t] = !ca.forward_only && (residual || !use_exact[t]);
    }
    DuelSettings s;
    s.want_median = false;
    // Tasks 0..m-1 exact or residual (the slow ones first), m..2m-1 floating point.
    parallel_for(2 * m, threads, [&](std::size_t t) {
        const auto& n = need[t % m];
        const Chain& ca = chains.at({n.length, by_name.at(n.a)});
        const Chain& cb = chains.at({n.length, by_name.at(n.b)});
        if (t < m && use_residual[t]) {
            try {
                proof[t] = write_residual(ca, cb, order);
                LiftedDuel l = lifted_duel(ca, cb, order);
                exact[t] = std::move(l.duel);
                why[t] = l.refusal;
            } catch (const LimitError& e) {  // too large: proven intervals of the floating engine instead
                why[t] = e.what();
                approx[t] = duel(ca, cb, order, s);
            }
        } else if (t < m && use_exact[t]) {
            exact[t] = exact_duel(ca, cb, order);
        } else if (t >= m && !use_residual[t - m]) {
            approx[t - m] = duel(ca, cb, order, s);
        }
    });
    for (std::size_t i = 0; i < m; ++i) {
        const DuelResult& r = approx[i];
        CertDuel d;
        d.a = need[i].a;
        d.b = need[i].b;
        d.length = need[i].length;
        if (proof[i]) {
            residual_values(d, *proof[i], exact[i], why[i]);
            cert.duels.push_back(std::move(d));
            continue;
        }
        const long double bound = r.bound_proven ? r.bound : 1.0L;
        d.p_a_wins = interval(r.p_a_wins, bound, true);
        d.p_b_wins = interval(r.p_b_wins, bound, true);
        d.p_tie = interval(r.p_tie, bound, true);
        d.p_neither = interval(r.p_neither, bound, true);
        d.margin = interval(r.p_a_wins - r.p_b_wins, 2 * bound, false);
        d.interval_method = to_string(r.method) + (r.bound_proven ? "" : " (bound not proven: interval widened to the trivial one)") +
                            (use_residual[i] ? " (no residual certificate: " + why[i] + ")" : "");
        if (exact[i]) {
            const ExactDuel& e = *exact[i];
            d.exact_method = to_string(e.method);
            auto set = [](CertValue& v, const mpq_class& q) {
                v.exact = q;
                v.decimal = decimal_string(q, 6);
            };
            set(d.p_a_wins, e.p_a_wins);
            set(d.p_b_wins, e.p_b_wins);
            set(d.p_tie, e.p_tie);
            set(d.p_neither, e.p_neither);
            set(d.margin, e.margin());
            const int sign = sgn(e.margin());
            d.verdict = sign > 0 ? Verdict::a_beats_b : sign < 0 ? Verdict::b_beats_a : Verdict::undecided;
        } else {
            d.verdict = d.margin.lo > 0 ? Verdict::a_beats_b : d.margin.hi < 0 ? Verdict::b_beats_a : Verdict::undecided;
        }
        cert.duels.push_back(std::move(d));
    }
    // The claim must hold before anything is written.
    auto where = [](const CertDuel& d) { return fmt::format("{} vs {} on {} squares", d.a, d.b, d.length); };
    for (std::size_t i = 0; i < m; ++i) {
        const CertDuel& d = cert.duels[i];
        if (need[i].want && d.verdict != *need[i].want)
            throw ClaimFailure(fmt::format("the claim does not hold: {} ({}, margin {})", where(d),
                                           d.verdict == Verdict::undecided ? "undecided" : fmt::format("{} beats {}", d.b, d.a),
                                           d.margin.decimal));
    }
    if (claim.kind == ClaimKind::crossover) {
        const CertDuel &x = cert.duels[0], &y = cert.duels[1];
        if (x.verdict == Verdict::undecided || y.verdict == Verdict::undecided || x.verdict == y.verdict)
            throw ClaimFailure(fmt::format("the claim does not hold: {} is '{}' and {} is '{}'", where(x),
                                           to_string(x.verdict), where(y), to_string(y.verdict)));
    }
    return cert;
}

}  // namespace overshoot
