#include "search/search.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <map>
#include <set>

#include "chain/chain.hpp"
#include "core/error.hpp"
#include "core/parallel.hpp"
#include "search/screen.hpp"

namespace overshoot {

std::string_view to_string(SearchTarget t) {
    switch (t) {
        case SearchTarget::cycle: return "cycle";
        case SearchTarget::no_winner: return "no-winner";
        case SearchTarget::top_cycle: return "top-cycle";
        case SearchTarget::fair: return "fair";
    }
    return "?";
}

SearchTarget parse_search_target(std::string_view t) {
    if (t == "cycle") return SearchTarget::cycle;
    if (t == "no-winner") return SearchTarget::no_winner;
    if (t == "top-cycle") return SearchTarget::top_cycle;
    if (t == "fair") return SearchTarget::fair;
    throw InputError(fmt::format("target '{}': expected cycle, no-winner, top-cycle or fair", t));
}

std::vector<std::size_t> parse_cycle(std::string_view text, const std::vector<Option>& options) {
    std::vector<std::string> names;
    std::size_t at = 0;
    while (true) {
        const std::size_t gt = text.find('>', at);
        std::string_view part = text.substr(at, gt == std::string_view::npos ? std::string_view::npos : gt - at);
        while (!part.empty() && part.front() == ' ') part.remove_prefix(1);
        while (!part.empty() && part.back() == ' ') part.remove_suffix(1);
        if (part.empty()) throw InputError(fmt::format("cycle '{}': an empty name; write it as 'A > B > C > A'", text));
        names.emplace_back(part);
        if (gt == std::string_view::npos) break;
        at = gt + 1;
    }
    if (names.size() > 1 && names.back() == names.front()) names.pop_back();
    if (names.size() < 3)
        throw InputError(fmt::format("cycle '{}': a cycle needs at least 3 options (A > B > C > A)", text));
    std::vector<std::size_t> cycle;
    for (const auto& name : names) {
        std::size_t i = 0;
        while (i < options.size() && options[i].name != name) ++i;
        if (i == options.size()) throw InputError(fmt::format("cycle '{}': no option is named '{}'", text, name));
        if (std::find(cycle.begin(), cycle.end(), i) != cycle.end())
            throw InputError(fmt::format("cycle '{}': '{}' appears twice", text, name));
        cycle.push_back(i);
    }
    return cycle;
}

namespace {

// True when every vertex reaches every other along arcs with margin >= t.
bool strongly_connected_at(std::size_t n, const std::vector<double>& margin, double t) {
    for (int dir = 0; dir < 2; ++dir) {
        std::vector<char> seen(n, 0);
        std::vector<std::size_t> stack{0};
        seen[0] = 1;
        std::size_t count = 1;
        while (!stack.empty()) {
            const std::size_t v = stack.back();
            stack.pop_back();
            for (std::size_t w = 0; w < n; ++w) {
                if (w == v || seen[w]) continue;
                const double m = dir == 0 ? margin[v * n + w] : margin[w * n + v];
                if (m >= t) {
                    seen[w] = 1;
                    ++count;
                    stack.push_back(w);
                }
            }
        }
        if (count < n) return false;
    }
    return true;
}

}  // namespace

double score_of(SearchTarget target, const std::vector<std::size_t>& cycle, std::size_t n,
                const std::vector<double>& margin) {
    switch (target) {
        case SearchTarget::cycle: {
            double s = std::numeric_limits<double>::infinity();
            for (std::size_t k = 0; k < cycle.size(); ++k)
                s = std::min(s, margin[cycle[k] * n + cycle[(k + 1) % cycle.size()]]);
            return s;
        }
        case SearchTarget::no_winner: {
            double s = std::numeric_limits<double>::infinity();
            for (std::size_t i = 0; i < n; ++i) {
                double beaten = -std::numeric_limits<double>::infinity();
                for (std::size_t j = 0; j < n; ++j)
                    if (j != i) beaten = std::max(beaten, margin[j * n + i]);
                s = std::min(s, beaten);
            }
            return s;
        }
        case SearchTarget::top_cycle: {
            // The largest threshold keeping the digraph strongly connected: one of the margins.
            std::vector<double> ts;
            for (std::size_t i = 0; i < n; ++i)
                for (std::size_t j = 0; j < n; ++j)
                    if (i != j) ts.push_back(margin[i * n + j]);
            std::sort(ts.begin(), ts.end(), std::greater<>());
            ts.erase(std::unique(ts.begin(), ts.end()), ts.end());
            for (double t : ts)
                if (strongly_connected_at(n, margin, t)) return t;
            return ts.empty() ? 0 : ts.back();
        }
        case SearchTarget::fair: {
            double worst = 0;
            for (std::size_t i = 0; i < n; ++i)
                for (std::size_t j = 0; j < n; ++j)
                    if (i != j) worst = std::max(worst, std::fabs(margin[i * n + j]));
            return -worst;
        }
    }
    return 0;
}

bool target_holds(SearchTarget target, const std::vector<std::size_t>& cycle, const Tournament& t) {
    const std::size_t n = t.size();
    switch (target) {
        case SearchTarget::cycle:
            for (std::size_t k = 0; k < cycle.size(); ++k)
                if (!t.beats[cycle[k] * n + cycle[(k + 1) % cycle.size()]]) return false;
            return true;
        case SearchTarget::no_winner: return !t.condorcet_winner.has_value();
        case SearchTarget::top_cycle: return t.top_cycle.size() == n;
        case SearchTarget::fair: return true;
    }
    return false;
}

namespace {

// A deterministic generator (splitmix64): the same stream on every platform.
struct SplitMix {
    std::uint64_t state;
    std::uint64_t next() {
        std::uint64_t z = (state += 0x9E3779B97F4A7C15ULL);
        z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ULL;
        z = (z ^ (z >> 27)) * 0x94D049BB133111EBULL;
        return z ^ (z >> 31);
    }
    std::size_t below(std::size_t n) { return static_cast<std::size_t>(next() % n); }
};

struct Candidate {
    int length = 0;
    std::vector<Jump> added;  // sorted by source
    double score = -std::numeric_limits<double>::infinity();
    bool valid = true;
};

bool jump_less(const Jump& a, const Jump& b) { return std::pair(a.from, a.to) < std::pair(b.from, b.to); }

// Best first; ties by fewer jumps, then length, then the jumps themselves.
bool better(const Candidate& x, const Candidate& y) {
    if (x.score != y.score) return x.score > y.score;
    if (x.added.size() != y.added.size()) return x.added.size() < y.added.size();
    if (x.length != y.length) return x.length < y.length;
    return std::lexicographical_compare(x.added.begin(), x.added.end(), y.added.begin(), y.added.end(), jump_less);
}

class Searcher {
public:
    explicit Searcher(const SearchSpec& s) : spec_(s) {}

    std::vector<Jump> base_jumps() const { return spec_.board.jumps; }

    Board board_of(const Candidate& c) const {
        std::vector<Jump> js = spec_.board.jumps;
        js.insert(js.end(), c.added.begin(), c.added.end());
        return make_board(c.length, spec_.board.rule, js);
    }

    // Scores every candidate (in parallel; each writes its own slot).
    void score(std::vector<Candidate>& cs) {
        parallel_for(cs.size(), spec_.threads, [&](std::size_t k) {
            Candidate& c = cs[k];
            Board b;
            try {
                b = board_of(c);
            } catch (const InputError&) {
                c.valid = false;
                return;
            }
            std::vector<ScreenTrack> tracks;
            for (const auto& o : spec_.options) tracks.push_back(screen_track(build_chain(b, o)));
            const std::size_t n = spec_.options.size();
            std::vector<double> margin(n * n, 0.0);
            for (std::size_t i = 0; i < n; ++i)
                for (std::size_t j = i + 1; j < n; ++j) {
                    margin[i * n + j] = screen_margin(tracks[i], tracks[j], spec_.order);
                    margin[j * n + i] = -margin[i * n + j];
                }
            c.score = score_of(spec_.target, spec_.cycle, n, margin);
        });
        for (const auto& c : cs) {
            if (c.valid)
                ++raced_;
            else
                ++invalid_;
        }
    }

    // Every jump that may be added to a candidate (source free, inside the board, allowed).
    std::vector<Jump> additions(const Candidate& c) const {
        const int L = c.length;
        std::set<int> taken;
        for (const auto& j : spec_.board.jumps) taken.insert(j.from);
        for (const auto& j : c.added) taken.insert(j.from);
        std::vector<int> froms, tos;
        if (spec_.from_squares.empty())
            for (int s = 1; s < L; ++s) froms.push_back(s);
        else
            for (int s : spec_.from_squares)
                if (s >= 1 && s < L) froms.push_back(s);
        if (spec_.to_squares.empty())
            for (int s = 0; s <= L; ++s) tos.push_back(s);
        else
            for (int s : spec_.to_squares)
                if (s >= 0 && s <= L) tos.push_back(s);
        std::vector<Jump> out;
        for (int f : froms) {
            if (taken.count(f)) continue;
            for (int t : tos)
                if (t != f) out.push_back({f, t});
        }
        return out;
    }

    static Candidate with(const Candidate& c, Jump j) {
        Candidate x;
        x.length = c.length;
        x.added = c.added;
        x.added.push_back(j);
        std::sort(x.added.begin(), x.added.end(), jump_less);
        return x;
    }

    // Keeps every scored candidate once (by length and jump set).
    void remember(const std::vector<Candidate>& cs) {
        for (const auto& c : cs)
            if (c.valid) pool_.emplace(std::pair(c.length, key(c.added)), c);
    }
    bool seen(const Candidate& c) const { return pool_.count(std::pair(c.length, key(c.added))) > 0; }

    std::vector<Candidate> best_of_pool(std::size_t count, std::size_t jumps) const {
        std::vector<Candidate> all;
        for (const auto& [k, c] : pool_)
            if (c.added.size() == jumps) all.push_back(c);
        std::sort(all.begin(), all.end(), better);
        if (all.size() > count) all.resize(count);
        return all;
    }

    std::vector<Candidate> ranked() const {
        std::vector<Candidate> all;
        for (const auto& [k, c] : pool_) all.push_back(c);
        std::sort(all.begin(), all.end(), better);
        return all;
    }

    std::uint64_t raced() const { return raced_; }
    std::uint64_t invalid() const { return invalid_; }

private:
    static std::vector<int> key(const std::vector<Jump>& js) {
        std::vector<int> k;
        for (const auto& j : js) {
            k.push_back(j.from);
            k.push_back(j.to);
        }
        return k;
    }

    const SearchSpec& spec_;
    std::map<std::pair<int, std::vector<int>>, Candidate> pool_;
    std::uint64_t raced_ = 0, invalid_ = 0;
};

// Moves of one added jump by a few squares at either end: the local step of the beam search.
std::vector<Candidate> neighbours(const Candidate& c, const Searcher& s, const SearchSpec& spec) {
    std::vector<Candidate> out;
    std::set<int> allowed_from(spec.from_squares.begin(), spec.from_squares.end());
    std::set<int> allowed_to(spec.to_squares.begin(), spec.to_squares.end());
    for (std::size_t q = 0; q < c.added.size(); ++q)
        for (int end = 0; end < 2; ++end)
            for (int d : {-3, -2, -1, 1, 2, 3}) {
                Candidate x = c;
                Jump& j = x.added[q];
                (end == 0 ? j.from : j.to) += d;
                if (j.from < 1 || j.from >= c.length || j.to < 0 || j.to > c.length || j.from == j.to) continue;
                if (!allowed_from.empty() && !allowed_from.count(j.from)) continue;
                if (!allowed_to.empty() && !allowed_to.count(j.to)) continue;
                bool clash = false;
                for (std::size_t r = 0; r < x.added.size(); ++r)
                    if (r != q && x.added[r].from == j.from) clash = true;
                for (const auto& b : spec.board.jumps)
                    if (b.from == j.from) clash = true;
                if (clash) continue;
                std::sort(x.added.begin(), x.added.end(), jump_less);
                if (!s.seen(x)) out.push_back(std::move(x));
            }
    return out;
}

}  // namespace

SearchResult search_board(const SearchSpec& spec) {
    const std::size_t n = spec.options.size();
    if (n < 2) throw InputError(fmt::format("a board search needs at least 2 options, got {}", n));
    require_distinct_names(spec.options);
    if (spec.target == SearchTarget::cycle && spec.cycle.size() < 3)
        throw InputError("the target cycle needs a cycle of at least 3 options: --cycle 'A > B > C > A'");
    if (spec.target != SearchTarget::cycle && !spec.cycle.empty())
        throw InputError(fmt::format("--cycle goes with the target cycle, not {}", to_string(spec.target)));
    if (spec.order == Order::a_first || spec.order == Order::b_first)
        throw InputError(fmt::format("a board search cannot use the turn order {}: the tournament would depend on the "
                                     "seat; use simultaneous or coin",
                                     to_string(spec.order)));
    if (spec.max_jumps < 0 || spec.max_jumps > 8)
        throw InputError(fmt::format("--jumps {}: expected 0 to 8 added jumps", spec.max_jumps));
    if (spec.keep < 1 || spec.keep > 100) throw InputError(fmt::format("--keep {}: expected 1 to 100", spec.keep));
    if (spec.beam < 1 || spec.beam > 1000) throw InputError(fmt::format("--beam {}: expected 1 to 1000", spec.beam));
    if (spec.sample < 1) throw InputError(fmt::format("--sample {}: expected at least 1", spec.sample));
    SearchResult out;
    out.target = spec.target;
    out.exhaustive = spec.max_jumps <= 1;
    if (spec.length_lo == 0 && spec.length_hi == 0)
        out.lengths = {spec.board.length};
    else {
        if (spec.length_lo < 1 || spec.length_hi < spec.length_lo)
            throw InputError(fmt::format("--lengths {}..{}: expected 1 <= LO <= HI", spec.length_lo, spec.length_hi));
        for (int L = spec.length_lo; L <= spec.length_hi; ++L) out.lengths.push_back(L);
    }
    for (int L : out.lengths) {
        try {
            make_board(L, spec.board.rule, spec.board.jumps);
        } catch (const InputError& e) {
            throw InputError(fmt::format("length {}: the board's own jumps do not fit: {}", L, e.what()));
        }
    }
    for (int s : spec.from_squares)
        if (s < 1 || s >= out.lengths.back())
            throw InputError(fmt::format("--from {}: a jump starts on a square 1..{}", s, out.lengths.back() - 1));
    for (int s : spec.to_squares)
        if (s < 0 || s > out.lengths.back())
            throw InputError(fmt::format("--to {}: a jump ends on a square 0..{}", s, out.lengths.back()));

    Searcher searcher(spec);
    // Level 0 and 1: the unchanged boards and every single added jump (exhaustive).
    std::vector<Candidate> level;
    for (int L : out.lengths) {
        Candidate base;
        base.length = L;
        level.push_back(base);
    }
    if (spec.max_jumps >= 1) {
        const std::size_t bases = level.size();
        for (std::size_t b = 0; b < bases; ++b)
            for (const Jump& j : searcher.additions(level[b])) level.push_back(Searcher::with(level[b], j));
    }
    searcher.score(level);
    searcher.remember(level);
    // Levels 2..K: a beam. From each of the best boards with k-1 added jumps,
    // a seeded sample of further jumps; then each kept board's jumps moved a
    // few squares at a time while that improves it.
    for (int k = 2; k <= spec.max_jumps; ++k) {
        const auto beam = searcher.best_of_pool(static_cast<std::size_t>(spec.beam), static_cast<std::size_t>(k - 1));
        std::vector<Candidate> next;
        for (std::size_t b = 0; b < beam.size(); ++b) {
            std::vector<Jump> adds = searcher.additions(beam[b]);
            SplitMix rng{spec.seed * 0x100000001B3ULL + static_cast<std::uint64_t>(k) * 1000003ULL + b};
            const std::size_t take = std::min(adds.size(), static_cast<std::size_t>(spec.sample));
            for (std::size_t i = 0; i < take; ++i) std::swap(adds[i], adds[i + rng.below(adds.size() - i)]);
            adds.resize(take);
            for (const Jump& j : adds) {
                Candidate x = Searcher::with(beam[b], j);
                if (!searcher.seen(x)) next.push_back(std::move(x));
            }
        }
        // The same board reached from two beam boards is raced once.
        std::sort(next.begin(), next.end(), [](const Candidate& a, const Candidate& b) {
            if (a.length != b.length) return a.length < b.length;
            return std::lexicographical_compare(a.added.begin(), a.added.end(), b.added.begin(), b.added.end(), jump_less);
        });
        next.erase(std::unique(next.begin(), next.end(),
                               [](const Candidate& a, const Candidate& b) { return a.length == b.length && a.added == b.added; }),
                   next.end());
        searcher.score(next);
        searcher.remember(next);
        // Local moves until no kept board improves (at most 30 rounds).
        for (int round = 0; round < 30; ++round) {
            const auto kept = searcher.best_of_pool(static_cast<std::size_t>(spec.beam), static_cast<std::size_t>(k));
            std::vector<Candidate> moves;
            for (const auto& c : kept)
                for (auto& x : neighbours(c, searcher, spec)) moves.push_back(std::move(x));
            std::sort(moves.begin(), moves.end(), [](const Candidate& a, const Candidate& b) {
                if (a.length != b.length) return a.length < b.length;
                return std::lexicographical_compare(a.added.begin(), a.added.end(), b.added.begin(), b.added.end(), jump_less);
            });
            moves.erase(std::unique(moves.begin(), moves.end(),
                                    [](const Candidate& a, const Candidate& b) { return a.length == b.length && a.added == b.added; }),
                        moves.end());
            if (moves.empty()) break;
            searcher.score(moves);
            searcher.remember(moves);
            const auto after = searcher.best_of_pool(static_cast<std::size_t>(spec.beam), static_cast<std::size_t>(k));
            bool changed = after.size() != kept.size();
            for (std::size_t i = 0; !changed && i < after.size(); ++i)
                changed = after[i].added != kept[i].added || after[i].length != kept[i].length;
            if (!changed) break;
        }
    }
    out.boards_raced = searcher.raced();
    out.boards_invalid = searcher.invalid();

    // The reported boards, raced again at full precision and analysed.
    DuelSettings full;
    full.want_median = false;
    auto verify = [&](const Candidate& c) {
        FoundBoard f;
        f.board = searcher.board_of(c);
        f.added = c.added;
        f.verified = analyse(race_matrix(f.board, spec.order, spec.options, full, spec.threads));
        f.score = score_of(spec.target, spec.cycle, n, f.verified.margin);
        f.holds = target_holds(spec.target, spec.cycle, f.verified);
        return f;
    };
    {
        Candidate base;
        base.length = out.lengths.front();
        out.base = verify(base);
    }
    // A few more than asked are raced again, so that boards whose screening
    // scores were within the screening's error of each other end up in the
    // order of their verified scores.
    const auto ranked = searcher.ranked();
    const std::size_t verified = std::min(ranked.size(), static_cast<std::size_t>(spec.keep) + 4);
    for (std::size_t i = 0; i < verified; ++i) out.best.push_back(verify(ranked[i]));
    std::stable_sort(out.best.begin(), out.best.end(),
                     [](const FoundBoard& x, const FoundBoard& y) { return x.score > y.score; });
    if (out.best.size() > static_cast<std::size_t>(spec.keep)) out.best.resize(static_cast<std::size_t>(spec.keep));
    return out;
}

}  // namespace overshoot
