#include "sweep/sweep.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>

#include "core/error.hpp"
#include "core/limits.hpp"
#include "core/numbers.hpp"
#include "race/outcome.hpp"

namespace overshoot {

std::vector<int> LengthGrid::lengths() const {
    std::vector<int> out;
    for (long long l = lo; l <= hi; l += step) out.push_back(static_cast<int>(l));
    return out;
}

namespace {
long long parse_int(std::string_view t, std::string_view whole) {
    auto v = whole_number(t);
    if (!v) throw InputError(fmt::format("--lengths '{}': '{}' is not a whole number", whole, t));
    return *v;
}
}  // namespace

LengthGrid parse_lengths(std::string_view text, int step) {
    long long lo = 0, hi = 0;
    auto dots = text.find("..");
    if (dots == std::string_view::npos) {
        lo = hi = parse_int(text, text);
    } else {
        lo = parse_int(text.substr(0, dots), text);
        hi = parse_int(text.substr(dots + 2), text);
    }
    if (step < 1) throw InputError(fmt::format("--step {}: the step must be at least 1", step));
    if (lo < 1) throw InputError(fmt::format("--lengths '{}': lengths start at 1", text));
    if (hi < lo) throw InputError(fmt::format("--lengths '{}': the range is empty (LO must not exceed HI)", text));
    if (hi > limits::max_length)
        throw LimitError(fmt::format("--lengths '{}': length {} exceeds the limit of {} squares", text, hi,
                                     limits::max_length));
    LengthGrid g;
    g.lo = static_cast<int>(lo);
    g.hi = static_cast<int>(hi);
    g.step = step;
    return g;
}

std::vector<std::pair<int, int>> runs_of(const std::vector<int>& lengths, int step) {
    std::vector<std::pair<int, int>> out;
    for (int l : lengths) {
        if (!out.empty() && out.back().second + step == l)
            out.back().second = l;
        else
            out.emplace_back(l, l);
    }
    return out;
}

VariantSweep analyse_variant(const std::vector<Option>& options, const Variant& v, const std::vector<int>& lengths,
                             std::vector<PairSweep> pairs, int max_cycle_length) {
    VariantSweep out;
    out.variant = v;
    out.lengths = lengths;
    const std::size_t n = options.size();
    const int step = lengths.size() > 1 ? lengths[1] - lengths[0] : 1;
    std::vector<const PairSweep*> at(n * n, nullptr);
    for (const auto& p : pairs) at[p.a * n + p.b] = &p;
    std::map<std::vector<std::size_t>, std::vector<std::pair<int, double>>> seen;  // cycle -> (length, strength)
    std::vector<int> no_winner;
    TournamentSettings ts;
    ts.max_cycle_length = std::max(3, std::min<int>(max_cycle_length, static_cast<int>(n)));
    ts.want_mix = false;  // a length's summary has no equilibrium mix
    for (std::size_t k = 0; k < lengths.size(); ++k) {
        PairwiseMatrix m;
        for (const auto& o : options) m.names.push_back(o.name);
        m.win.assign(n * n, 0);
        m.tie.assign(n * n, 0);
        m.neither.assign(n * n, 0);
        m.bound.assign(n * n, 0);
        for (std::size_t i = 0; i < n; ++i)
            for (std::size_t j = i + 1; j < n; ++j) {
                const LengthOutcome& o = at[i * n + j]->at[k];
                m.win[i * n + j] = o.p_a_wins;
                m.win[j * n + i] = o.p_b_wins;
                m.tie[i * n + j] = m.tie[j * n + i] = o.p_tie;
                m.neither[i * n + j] = m.neither[j * n + i] = o.p_neither;
                // The margin is rounded once more here: widen the bound by it.
                m.bound[i * n + j] = m.bound[j * n + i] = rounded_margin_bound(o.error_bound());
            }
        Tournament t = analyse(std::move(m), ts);
        LengthSummary s;
        s.length = lengths[k];
        s.arcs = t.arcs;
        s.undecided = t.undecided;
        s.condorcet_winner = t.condorcet_winner;
        s.top_cycle = t.top_cycle;
        s.cycles = t.cycles;
        s.cap_hit = t.cap_hit;
        if (t.cap_hit) out.cycles_cap_hit = true;
        if (!s.condorcet_winner) no_winner.push_back(s.length);
        for (const Cycle& c : s.cycles) seen[c.options].emplace_back(s.length, c.strength);
        out.per_length.push_back(std::move(s));
    }
    out.no_dominant = runs_of(no_winner, step);
    for (auto& [opts, list] : seen) {
        CycleSpan span;
        span.options = opts;
        std::vector<int> ls;
        span.weakest = list.front().second;
        span.strongest = list.front().second;
        span.strongest_length = list.front().first;
        for (auto [l, st] : list) {
            ls.push_back(l);
            span.weakest = std::min(span.weakest, st);
            if (st > span.strongest) {
                span.strongest = st;
                span.strongest_length = l;
            }
        }
        span.count = ls.size();
        span.intervals = runs_of(ls, step);
        out.cycles.push_back(std::move(span));
    }
    std::stable_sort(out.cycles.begin(), out.cycles.end(), [](const CycleSpan& x, const CycleSpan& y) {
        if (x.strongest != y.strongest) return x.strongest > y.strongest;
        if (x.options.size() != y.options.size()) return x.options.size() < y.options.size();
        return x.options < y.options;
    });
    // Crossovers, pair by pair.
    for (const auto& p : pairs) {
        int prev_len = 0, prev_sign = 0;
        double prev_margin = 0, prev_bound = 0;
        std::vector<int> between;
        for (std::size_t k = 0; k < lengths.size(); ++k) {
            const LengthOutcome& o = p.at[k];
            const double bound = rounded_margin_bound(o.error_bound());
            const double mg = o.margin();
            const int sign = decided(mg, bound);
            if (sign == 0) {
                if (prev_sign != 0) between.push_back(lengths[k]);
                continue;
            }
            if (prev_sign != 0 && sign != prev_sign) {
                Crossover c;
                c.a = p.a;
                c.b = p.b;
                c.before = prev_len;
                c.after = lengths[k];
                c.undecided = between;
                c.preferred_before = prev_sign > 0 ? p.a : p.b;
                c.preferred_after = sign > 0 ? p.a : p.b;
                c.margin_before = prev_margin;
                c.bound_before = prev_bound;
                c.margin_after = mg;
                c.bound_after = bound;
                out.crossovers.push_back(std::move(c));
            }
            prev_sign = sign;
            prev_len = lengths[k];
            prev_margin = mg;
            prev_bound = bound;
            between.clear();
        }
    }
    std::stable_sort(out.crossovers.begin(), out.crossovers.end(), [](const Crossover& x, const Crossover& y) {
        if (x.after != y.after) return x.after < y.after;
        if (x.a != y.a) return x.a < y.a;
        return x.b < y.b;
    });
    out.pairs = std::move(pairs);
    return out;
}

SweepResult run_sweep(const SweepSpec& spec) {
    const std::size_t n = spec.options.size();
    if (n < 2) throw InputError("a sweep needs at least two options");
    require_distinct_names(spec.options);
    for (const auto& v : spec.variants)
        if (n > 2 && (v.order == Order::a_first || v.order == Order::b_first))
            throw InputError(fmt::format(
                "a sweep of {} options cannot use the turn order {}: the result would depend on the seat; use "
                "simultaneous or coin (a sweep of exactly two options takes any order)",
                n, to_string(v.order)));
    SweepResult res;
    res.options = spec.options;
    res.grid = spec.grid;
    res.jumps = spec.jumps;
    res.anchor = spec.anchor;
    const std::vector<int> lengths = spec.grid.lengths();
    if (lengths.empty()) throw InputError("the length range is empty");
    std::vector<PairRequest> requests;
    for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = i + 1; j < n; ++j) requests.push_back({i, j});
    for (const auto& v : spec.variants) {
        std::vector<PairLengths> raw;
        if (all_lengths_applies(v.rule, !spec.jumps.empty()))
            raw = all_lengths(spec.options, v.rule, v.order, spec.grid.hi, requests, spec.engine);
        else
            raw = board_by_board(spec.options, v.rule, v.order, spec.jumps, spec.anchor, lengths, requests,
                                 spec.engine);
        std::vector<PairSweep> pairs;
        for (auto& r : raw) {
            if (!r.done) throw InputError("the sweep was interrupted before it finished");
            PairSweep p;
            p.a = r.a;
            p.b = r.b;
            p.method = r.method;
            p.tail_from = r.tail_from;
            for (int l : lengths) p.at.push_back(r.by_length[l]);
            pairs.push_back(std::move(p));
        }
        res.variants.push_back(analyse_variant(spec.options, v, lengths, std::move(pairs), spec.max_cycle_length));
    }
    return res;
}

}  // namespace overshoot
