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
    std::vector<int> starts;  // one start square per option, as given
    int changes = 0;          // added jumps plus start squares moved off the board's own
    double score = -std::numeric_limits<double>::infinity();
    bool valid = true;
};

bool jump_less(const Jump& a, const Jump& b) { return std::pair(a.from, a.to) < std::pair(b.from, b.to); }

// Length, jumps and starts: the identity of a candidate board.
bool same_board(const Candidate& a, const Candidate& b) {
    return a.length == b.length && a.added == b.added && a.starts == b.starts;
}
bool board_less(const Candidate& a, const Candidate& b) {
    if (a.length != b.length) return a.length < b.length;
    if (a.added != b.added)
        return std::lexicographical_compare(a.added.begin(), a.added.end(), b.added.begin(), b.added.end(), jump_less);
    return a.starts < b.starts;
}

// Best first; ties by fewer changes, then length, then the jumps and starts themselves.
bool better(const Candidate& x, const Candidate& y) {
    if (x.score != y.score) return x.score > y.score;
    if (x.changes != y.changes) return x.changes < y.changes;
    return board_less(x, y);
}

void sort_unique(std::vector<Candidate>& cs) {
    std::sort(cs.begin(), cs.end(), board_less);
    cs.erase(std::unique(cs.begin(), cs.end(), same_board), cs.end());
}

// One change to a board: an added jump, or an option's start square.
struct Change {
    bool jump = true;
    Jump j;
    std::size_t option = 0;
    int square = 0;
};

class Searcher {
public:
    explicit Searcher(const SearchSpec& s) : spec_(s) {
        base_starts_ = s.starts.empty() ? std::vector<int>(s.options.size(), 0) : s.starts;
    }

    const std::vector<int>& base_starts() const { return base_starts_; }

    Candidate base(int length) const {
        Candidate c;
        c.length = length;
        c.starts = base_starts_;
        return c;
    }

    Board board_of(const Candidate& c) const {
        std::vector<Jump> js = spec_.board.jumps;
        js.insert(js.end(), c.added.begin(), c.added.end());
        return make_board(c.length, spec_.board.rule, js);
    }

    int count_changes(const Candidate& c) const {
        int k = static_cast<int>(c.added.size());
        for (std::size_t i = 0; i < c.starts.size(); ++i) k += c.starts[i] != base_starts_[i];
        return k;
    }

    // Scores every candidate (in parallel; each writes its own slot).
    void score(std::vector<Candidate>& cs) {
        parallel_for(cs.size(), spec_.threads, [&](std::size_t k) {
            Candidate& c = cs[k];
            c.changes = count_changes(c);
            std::vector<ScreenTrack> tracks;
            try {
                const Board b = board_of(c);
                for (std::size_t i = 0; i < spec_.options.size(); ++i)
                    tracks.push_back(screen_track(build_chain(b, spec_.options[i], c.starts[i])));
            } catch (const InputError&) {  // a loop of jumps, or a start whose jump leads to the finish
                c.valid = false;
                return;
            }
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

    // Every change that may be made to a candidate: jumps while fewer than
    // max_jumps are added, and start squares of options still on their own.
    std::vector<Change> changes(const Candidate& c) const {
        std::vector<Change> out;
        if (static_cast<int>(c.added.size()) < spec_.max_jumps)
            for (const Jump& j : additions(c)) out.push_back({true, j, 0, 0});
        for (std::size_t i = 0; i < c.starts.size(); ++i) {
            if (c.starts[i] != base_starts_[i]) continue;
            for (int h = 0; h <= spec_.head_start_max && h < c.length; ++h)
                if (h != base_starts_[i]) out.push_back({false, {}, i, h});
        }
        return out;
    }

    static Candidate with(const Candidate& c, const Change& ch) {
        Candidate x;
        x.length = c.length;
        x.added = c.added;
        x.starts = c.starts;
        if (ch.jump) {
            x.added.push_back(ch.j);
            std::sort(x.added.begin(), x.added.end(), jump_less);
        } else {
            x.starts[ch.option] = ch.square;
        }
        return x;
    }

    // Keeps every scored candidate once (by length, jumps and starts).
    void remember(const std::vector<Candidate>& cs) {
        for (const auto& c : cs)
            if (c.valid) pool_.emplace(key(c), c);
    }
    bool seen(const Candidate& c) const { return pool_.count(key(c)) > 0; }

    std::vector<Candidate> best_of_pool(std::size_t count, int changes) const {
        std::vector<Candidate> all;
        for (const auto& [k, c] : pool_)
            if (c.changes == changes) all.push_back(c);
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
    static std::vector<int> key(const Candidate& c) {
        std::vector<int> k{c.length};
        for (const auto& j : c.added) {
            k.push_back(j.from);
            k.push_back(j.to);
        }
        k.push_back(-1);
        k.insert(k.end(), c.starts.begin(), c.starts.end());
        return k;
    }

    const SearchSpec& spec_;
    std::vector<int> base_starts_;
    std::map<std::vector<int>, Candidate> pool_;
    std::uint64_t raced_ = 0, invalid_ = 0;
};

// Moves of one added jump by a few squares at either end, and of one head
// start by a few squares: the local step of the beam search.
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
    for (std::size_t i = 0; i < c.starts.size(); ++i) {
        if (c.starts[i] == s.base_starts()[i]) continue;
        for (int d : {-3, -2, -1, 1, 2, 3}) {
            Candidate x = c;
            x.starts[i] += d;
            if (x.starts[i] < 0 || x.starts[i] > spec.head_start_max || x.starts[i] >= c.length ||
                x.starts[i] == s.base_starts()[i])
                continue;
            if (!s.seen(x)) out.push_back(std::move(x));
        }
    }
    return out;
}

// Head starts alone are searched as a grid when it has at most this many boards.
constexpr double kStartGrid = 400'000;

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
    if (!spec.starts.empty() && spec.starts.size() != n) throw InternalError("search: one start square per option");
    if (spec.head_start_max < 0) throw InputError(fmt::format("--head-starts {}: expected 0 or more", spec.head_start_max));
    SearchResult out;
    out.target = spec.target;
    if (spec.length_lo == 0 && spec.length_hi == 0)
        out.lengths = {spec.board.length};
    else {
        if (spec.length_lo < 1 || spec.length_hi < spec.length_lo)
            throw InputError(fmt::format("--lengths {}..{}: expected 1 <= LO <= HI", spec.length_lo, spec.length_hi));
        for (int L = spec.length_lo; L <= spec.length_hi; ++L) out.lengths.push_back(L);
    }
    for (int L : out.lengths) {
        Board b;
        try {
            b = make_board(L, spec.board.rule, spec.board.jumps);
        } catch (const InputError& e) {
            throw InputError(fmt::format("length {}: the board's own jumps do not fit: {}", L, e.what()));
        }
        for (std::size_t i = 0; i < spec.starts.size(); ++i) {
            try {
                resolve_start(b, spec.starts[i]);
            } catch (const InputError& e) {
                throw InputError(fmt::format("length {}: the head start of {}: {}", L, spec.options[i].name, e.what()));
            }
        }
    }
    if (spec.head_start_max >= out.lengths.front())
        throw InputError(fmt::format("--head-starts {}: a start square lies in 0..{} (the shortest length searched is {})",
                                     spec.head_start_max, out.lengths.front() - 1, out.lengths.front()));
    for (int s : spec.from_squares)
        if (s < 1 || s >= out.lengths.back())
            throw InputError(fmt::format("--from {}: a jump starts on a square 1..{}", s, out.lengths.back() - 1));
    for (int s : spec.to_squares)
        if (s < 0 || s > out.lengths.back())
            throw InputError(fmt::format("--to {}: a jump ends on a square 0..{}", s, out.lengths.back()));

    Searcher searcher(spec);
    const int heads = spec.head_start_max > 0 ? static_cast<int>(n) : 0;  // options that may be given a start
    const int max_changes = spec.max_jumps + heads;
    const double grid = static_cast<double>(out.lengths.size()) * std::pow(spec.head_start_max + 1.0, static_cast<double>(n));
    out.start_grid = spec.head_start_max > 0 && spec.max_jumps == 0 && grid <= kStartGrid;
    out.exhaustive = max_changes <= 1 || out.start_grid;
    // Level 0 and 1: the unchanged boards and every single change (exhaustive);
    // or, for head starts alone on a small grid, every assignment of starts.
    std::vector<Candidate> level;
    for (int L : out.lengths) level.push_back(searcher.base(L));
    if (out.start_grid) {
        const std::size_t bases = level.size();
        for (std::size_t b = 0; b < bases; ++b) {
            std::vector<int> st(n, 0);
            while (true) {
                Candidate x = level[b];
                x.starts = st;
                if (x.starts != searcher.base_starts()) level.push_back(x);
                std::size_t i = 0;
                while (i < n && ++st[i] > spec.head_start_max) st[i++] = 0;
                if (i == n) break;
            }
        }
    } else if (max_changes >= 1) {
        const std::size_t bases = level.size();
        for (std::size_t b = 0; b < bases; ++b)
            for (const Change& ch : searcher.changes(level[b])) level.push_back(Searcher::with(level[b], ch));
    }
    searcher.score(level);
    searcher.remember(level);
    // Levels 2..K: a beam. From each of the best boards with k-1 changes, a
    // seeded sample of further changes; then each kept board's jumps and head
    // starts moved a few squares at a time while that improves it.
    for (int k = 2; !out.start_grid && k <= max_changes; ++k) {
        const auto beam = searcher.best_of_pool(static_cast<std::size_t>(spec.beam), k - 1);
        std::vector<Candidate> next;
        for (std::size_t b = 0; b < beam.size(); ++b) {
            std::vector<Change> adds = searcher.changes(beam[b]);
            if (adds.empty()) continue;
            SplitMix rng{spec.seed * 0x100000001B3ULL + static_cast<std::uint64_t>(k) * 1000003ULL + b};
            const std::size_t take = std::min(adds.size(), static_cast<std::size_t>(spec.sample));
            for (std::size_t i = 0; i < take; ++i) std::swap(adds[i], adds[i + rng.below(adds.size() - i)]);
            adds.resize(take);
            for (const Change& ch : adds) {
                Candidate x = Searcher::with(beam[b], ch);
                if (!searcher.seen(x)) next.push_back(std::move(x));
            }
        }
        // The same board reached from two beam boards is raced once.
        sort_unique(next);
        searcher.score(next);
        searcher.remember(next);
        // Local moves until no kept board improves (at most 30 rounds).
        for (int round = 0; round < 30; ++round) {
            const auto kept = searcher.best_of_pool(static_cast<std::size_t>(spec.beam), k);
            std::vector<Candidate> moves;
            for (const auto& c : kept)
                for (auto& x : neighbours(c, searcher, spec)) moves.push_back(std::move(x));
            sort_unique(moves);
            if (moves.empty()) break;
            searcher.score(moves);
            searcher.remember(moves);
            const auto after = searcher.best_of_pool(static_cast<std::size_t>(spec.beam), k);
            bool changed = after.size() != kept.size();
            for (std::size_t i = 0; !changed && i < after.size(); ++i) changed = !same_board(after[i], kept[i]);
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
        f.starts = c.starts;
        f.verified = analyse(race_matrix(f.board, spec.order, spec.options, full, spec.threads, c.starts));
        f.score = score_of(spec.target, spec.cycle, n, f.verified.margin);
        f.holds = target_holds(spec.target, spec.cycle, f.verified);
        return f;
    };
    out.base = verify(searcher.base(out.lengths.front()));
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
