// Tests of src/sweep: the all-lengths engine against single-board duels,
// crossovers, cycle intervals, families, hunts and checkpoints.
#include <catch2/catch.hpp>
#include <cmath>
#include <cstdio>
#include <limits>
#include <random>
#include <set>
#include <string>
#include <unistd.h>

#include "chain/chain.hpp"
#include "core/board.hpp"
#include "core/error.hpp"
#include "core/option.hpp"
#include "race/duel.hpp"
#include "render/sweep.hpp"
#include "sweep/checkpoint.hpp"
#include "sweep/family.hpp"
#include "sweep/hunt.hpp"
#include "sweep/lengths.hpp"
#include "sweep/sweep.hpp"
#include "tournament/cycles.hpp"
#include "tournament/tournament.hpp"

#include "support.hpp"

using namespace overshoot;

namespace {

using testing::opts;

std::vector<PairRequest> all_pairs(std::size_t n) {
    std::vector<PairRequest> r;
    for (std::size_t i = 0; i < n; ++i)
        for (std::size_t j = i + 1; j < n; ++j) r.push_back({i, j});
    return r;
}

// |sweep figure - duel figure| must be within the sum of both proven bounds.
void require_agrees(const LengthOutcome& o, const DuelResult& r, const std::string& what) {
    const double allowed = o.bound + static_cast<double>(r.bound) + 1e-15;
    INFO(what << " win " << o.win << " vs " << static_cast<double>(r.p_a_wins) << " loss " << o.loss << " vs "
              << static_cast<double>(r.p_b_wins) << " bounds " << o.bound << " + " << static_cast<double>(r.bound));
    REQUIRE(std::fabs(o.win - static_cast<double>(r.p_a_wins)) <= allowed);
    REQUIRE(std::fabs(o.loss - static_cast<double>(r.p_b_wins)) <= allowed);
    REQUIRE(std::fabs(o.tie - static_cast<double>(r.p_tie)) <= allowed);
    REQUIRE(std::fabs(o.neither - static_cast<double>(r.p_neither)) <= allowed);
    REQUIRE(o.bound < 1e-9);
}

HuntSpec hunt_spec(const char* family, const char* lengths, std::vector<Variant> variants, int threads) {
    HuntSpec spec;
    spec.options = parse_family(family);
    spec.grid = parse_lengths(lengths, 1);
    spec.variants = std::move(variants);
    spec.engine.threads = threads;
    return spec;
}

// Everything a hunt prints, text and JSON.
std::string rendered(const HuntResult& r, const HuntSpec& spec) {
    return render::hunt_text(r, spec) + render::hunt_json(r, spec).dump();
}

std::string temp_path(const char* name) {
    return std::string("/tmp/overshoot-test-sweep-") + std::to_string(::getpid()) + "-" + name;
}

}  // namespace

TEST_CASE("1d6 against 2d6 over 100..130 crosses over once, at 116", "[sweep]") {
    // Fact of the trade, no published source: one die is preferred up to 115
    // squares, two dice from 116 on (stay rule, simultaneous turns).
    SweepSpec spec;
    spec.options = opts({"1d6", "2d6"});
    spec.grid = parse_lengths("100..130", 1);
    SweepResult r = run_sweep(spec);
    REQUIRE(r.variants.size() == 1);
    const auto& cr = r.variants[0].crossovers;
    REQUIRE(cr.size() == 1);
    REQUIRE(cr[0].length().has_value());
    REQUIRE(*cr[0].length() == 116);
    REQUIRE(cr[0].before == 115);
    REQUIRE(r.options[cr[0].preferred_before].name == "1d6");
    REQUIRE(r.options[cr[0].preferred_after].name == "2d6");
    REQUIRE(cr[0].margin_before > cr[0].bound_before);
    REQUIRE(-cr[0].margin_after > cr[0].bound_after);
    // The JSON contract: "length" is the first length with the new preference.
    auto j = render::sweep_json(r);
    REQUIRE(j["crossovers"].size() == 1);
    REQUIRE(j["crossovers"][0]["length"] == 116);
    REQUIRE(j["crossovers"][0]["a"] == "1d6");
    REQUIRE(j["crossovers"][0]["b"] == "2d6");
}

TEST_CASE("with a step or undecided lengths a crossover is an interval", "[sweep]") {
    SweepSpec spec;
    spec.options = opts({"1d6", "2d6"});
    spec.grid = parse_lengths("100..130", 4);  // 100, 104, ..., 128
    SweepResult r = run_sweep(spec);
    const auto& cr = r.variants[0].crossovers;
    REQUIRE(cr.size() == 1);
    REQUIRE(cr[0].before == 112);
    REQUIRE(cr[0].after == 116);
    REQUIRE_FALSE(cr[0].length().has_value());  // never a guess
    auto j = render::sweep_json(r);
    REQUIRE(j["crossovers"][0]["length"].is_null());
    REQUIRE(j["crossovers"][0]["interval"] == nlohmann::json::array({113, 116}));
}

TEST_CASE("every per-length figure equals the single-board duel on random jump-free boards", "[sweep]") {
    // Internal consistency: the single-board duel (race/duel.cpp) is a
    // different computation (per-turn series closed by the pair programme on
    // the end zone, or the whole pair programme).
    std::mt19937 rng(20261201);
    const char* pool[] = {"1d6", "2d6", "3d6", "1d4", "2d4", "[0,1,3]", "{1:3,4:1}", "1d3+1", "[2,2,5]", "4d6", "1d12"};
    for (int round = 0; round < 6; ++round) {
        std::vector<Option> o;
        std::uniform_int_distribution<int> pick(0, 10);
        int a = pick(rng), b = pick(rng);
        while (b == a) b = pick(rng);
        o.push_back(parse_option(pool[a]));
        o.push_back(parse_option(pool[b]));
        const Overshoot rule = round % 3 == 2 ? Overshoot::pass : Overshoot::stay;
        const Order order = round % 4 == 0 ? Order::simultaneous
                            : round % 4 == 1 ? Order::coin
                            : round % 4 == 2 ? Order::a_first
                                             : Order::b_first;
        const int L = 60 + static_cast<int>(rng() % 80);
        for (LengthMethod m : {LengthMethod::series, LengthMethod::pairs}) {
            LengthSettings s;
            s.method = m;
            s.threads = 1;
            auto res = all_lengths(o, rule, order, L, all_pairs(2), s);
            REQUIRE(res.size() == 1);
            REQUIRE(res[0].done);
            for (int len : {1, 2, 3, 7, L / 3, L - 1, L}) {
                Board board = make_board(len, rule, {});
                Chain ca = build_chain(board, o[0]), cb = build_chain(board, o[1]);
                DuelSettings ds;
                ds.want_median = false;
                require_agrees(res[0].by_length[len], duel(ca, cb, order, ds),
                               std::string(pool[a]) + " vs " + pool[b] + " " + std::string(to_string(m)) +
                                   " length " + std::to_string(len));
            }
        }
    }
}

TEST_CASE("heavy options: the series closes stuck and lingering pieces exactly", "[sweep]") {
    // 3d6 is stuck at distances 1 and 2 and lingers at 3; 5d12 lingers for
    // about 250,000 turns at distance 5 (DESIGN.md, heavy tails).
    auto o = opts({"2d6", "3d6", "5d12"});
    LengthSettings s;
    s.threads = 2;
    auto res = all_lengths(o, Overshoot::stay, Order::simultaneous, 90, all_pairs(3), s);
    for (const auto& p : res) {
        REQUIRE(p.done);
        for (int len : {1, 3, 5, 6, 40, 90}) {
            Board board = make_board(len, Overshoot::stay, {});
            Chain ca = build_chain(board, o[p.a]), cb = build_chain(board, o[p.b]);
            DuelSettings ds;
            ds.want_median = false;
            require_agrees(p.by_length[len], duel(ca, cb, Order::simultaneous, ds),
                           o[p.a].name + " vs " + o[p.b].name + " at " + std::to_string(len) + " by " + p.method);
        }
    }
}

TEST_CASE("sweeps with jumps go board by board with anchored jumps", "[sweep]") {
    std::mt19937 rng(7);
    for (JumpAnchor anchor : {JumpAnchor::start, JumpAnchor::finish}) {
        const int hi = 50;
        std::vector<Jump> jumps = {{4, 15}, {33, 12}, {41, 47}};
        SweepSpec spec;
        spec.options = opts({"1d6", "2d4"});
        spec.grid = parse_lengths("30..50", 1);
        spec.jumps = jumps;
        spec.anchor = anchor;
        spec.variants = {{Overshoot::stay, Order::simultaneous}, {Overshoot::bounce, Order::coin}};
        SweepResult r = run_sweep(spec);
        REQUIRE(r.variants.size() == 2);
        for (std::size_t v = 0; v < 2; ++v) {
            const auto& vs = r.variants[v];
            for (int k = 0; k < 3; ++k) {
                const std::size_t idx = rng() % vs.lengths.size();
                const int len = vs.lengths[idx];
                // The anchored board, written out by hand.
                std::vector<Jump> expect;
                for (const Jump& j : jumps) {
                    Jump m = anchor == JumpAnchor::start ? j : Jump{len - (hi - j.from), len - (hi - j.to)};
                    if (m.from >= 1 && m.from < len && m.to >= 0 && m.to <= len) expect.push_back(m);
                }
                REQUIRE(anchored_jumps(jumps, anchor, hi, len) == expect);
                Board board = make_board(len, vs.variant.rule, expect);
                Chain ca = build_chain(board, spec.options[0]), cb = build_chain(board, spec.options[1]);
                DuelSettings ds;
                ds.want_median = false;
                ds.method = DuelMethod::product;  // an independent method (sparse LU)
                DuelResult d = duel(ca, cb, vs.variant.order, ds);
                const LengthOutcome& o = vs.pairs[0].at[idx];
                REQUIRE(vs.pairs[0].method == "board");
                REQUIRE(std::fabs(o.win - static_cast<double>(d.p_a_wins)) <= o.bound + static_cast<double>(d.bound));
                REQUIRE(std::fabs(o.loss - static_cast<double>(d.p_b_wins)) <= o.bound + static_cast<double>(d.bound));
            }
        }
    }
}

TEST_CASE("the cycle 2d6 > 1d6 > 3d6 > 2d6 holds on an interval containing 600", "[sweep]") {
    SweepSpec spec;
    spec.options = opts({"1d6", "2d6", "3d6"});
    spec.grid = parse_lengths("400..1400", 1);
    SweepResult r = run_sweep(spec);
    const auto& cycles = r.variants[0].cycles;
    // Named from the option first in the input: 1d6 > 3d6 > 2d6 > 1d6.
    const std::vector<std::size_t> want = {0, 2, 1};
    const CycleSpan* span = nullptr;
    for (const auto& c : cycles)
        if (c.options == want) span = &c;
    REQUIRE(span != nullptr);
    std::pair<int, int> around{0, 0};
    for (auto iv : span->intervals)
        if (iv.first <= 600 && 600 <= iv.second) around = iv;
    REQUIRE(around.first > 400);  // the sweep sees both ends
    REQUIRE(around.second < 1400);
    // The ends verified one by one with the single-board tournament; just
    // outside the interval the cycle does not hold.
    auto holds = [&](int len) {
        Board board = make_board(len, Overshoot::stay, {});
        Tournament t = analyse(race_matrix(board, Order::simultaneous, spec.options));
        const auto& b = t.beats;
        return b[0 * 3 + 2] && b[2 * 3 + 1] && b[1 * 3 + 0];
    };
    INFO("interval " << around.first << ".." << around.second);
    REQUIRE(holds(around.first));
    REQUIRE(holds(around.second));
    REQUIRE_FALSE(holds(around.first - 1));
    REQUIRE_FALSE(holds(around.second + 1));
    // The JSON lists it with its intervals.
    auto j = render::sweep_json(r);
    bool listed = false;
    for (const auto& c : j["cycles"])
        if (c["options"] == nlohmann::json::array({"1d6", "3d6", "2d6"})) listed = true;
    REQUIRE(listed);
}

TEST_CASE("the engine gives the same bits whatever the thread count", "[sweep]") {
    auto o = opts({"1d6", "2d6", "3d6", "1d4", "2d8"});
    LengthSettings one, two;
    one.threads = 1;
    two.threads = 2;
    auto a = all_lengths(o, Overshoot::stay, Order::coin, 300, all_pairs(5), one);
    auto b = all_lengths(o, Overshoot::stay, Order::coin, 300, all_pairs(5), two);
    REQUIRE(a.size() == b.size());
    for (std::size_t k = 0; k < a.size(); ++k) {
        REQUIRE(a[k].method == b[k].method);
        for (int d = 1; d <= 300; ++d) {
            REQUIRE(a[k].by_length[d].win == b[k].by_length[d].win);
            REQUIRE(a[k].by_length[d].loss == b[k].by_length[d].loss);
            REQUIRE(a[k].by_length[d].bound == b[k].by_length[d].bound);
        }
    }
}

TEST_CASE("families expand ranges, lists and files", "[sweep]") {
    auto f = parse_family("1..6d{4,6,8,10,12,20}");
    REQUIRE(f.size() == 36);
    REQUIRE(f.front().name == "1d4");
    REQUIRE(f[1].name == "1d6");
    REQUIRE(f.back().name == "6d20");
    REQUIRE(parse_family("d2..4").size() == 3);
    REQUIRE(parse_family("2..3d6; [0,2,4]").size() == 3);
    const std::string path = temp_path("family.txt");
    {
        FILE* fp = std::fopen(path.c_str(), "w");
        std::fputs("# invented dice\nsteady = [2,3,3,4]\n\n{1:1,5:1}  # a spinner\n", fp);
        std::fclose(fp);
    }
    auto g = parse_family("@" + path);
    REQUIRE(g.size() == 2);
    REQUIRE(g[0].name == "steady");
    REQUIRE(g[1].name == "{1:1,5:1}");
    std::remove(path.c_str());
    REQUIRE_THROWS_AS(parse_family("1..0d6"), InputError);
    REQUIRE_THROWS_AS(parse_family("1..3d{4,x}"), InputError);
    REQUIRE_THROWS_AS(parse_families({"1d6", "1..2d6"}), InputError);  // 1d6 twice
    REQUIRE_THROWS_AS(parse_family("@/nonexistent/dice.txt"), InputError);
}

TEST_CASE("a hunt lists each cycle once and agrees with the tournament's cycles", "[sweep]") {
    HuntSpec spec;
    spec.options = parse_family("1..3d{4,6}");
    spec.grid = parse_lengths("20..60", 2);
    spec.engine.threads = 2;
    HuntResult h = run_hunt(spec);
    REQUIRE(h.complete);
    REQUIRE(h.lengths_examined == spec.grid.lengths().size());
    REQUIRE(h.sets_examined == 20ULL * h.lengths_examined);  // C(6, 3) sets per length
    // Cross-check at a few lengths with the tournament module's cycle listing.
    for (int len : {20, 34, 60}) {
        Board board = make_board(len, Overshoot::stay, {});
        TournamentSettings ts;
        ts.max_cycle_length = 3;
        Tournament t = analyse(race_matrix(board, Order::simultaneous, spec.options), ts);
        std::set<std::vector<std::size_t>> from_tournament, from_hunt;
        for (const auto& c : t.cycles)
            if (c.options.size() == 3) from_tournament.insert(c.options);
        for (const auto& c : h.cycles)
            for (auto iv : c.intervals)
                if (iv.first <= len && len <= iv.second) from_hunt.insert(c.options);
        INFO("length " << len);
        REQUIRE(from_hunt == from_tournament);
    }
    // Ranked by strength, each set once.
    std::set<std::vector<std::size_t>> seen;
    for (std::size_t i = 0; i < h.cycles.size(); ++i) {
        REQUIRE(seen.insert(h.cycles[i].options).second);
        if (i > 0) REQUIRE(h.cycles[i - 1].strongest >= h.cycles[i].strongest);
    }
}

TEST_CASE("an interrupted hunt resumed gives byte-identical output", "[sweep]") {
    const HuntSpec spec = hunt_spec("1..4d{4,6,8}", "10..120",
                                    {{Overshoot::stay, Order::simultaneous}, {Overshoot::pass, Order::coin}}, 2);
    const std::string whole = rendered(run_hunt(spec), spec);
    const std::string path = temp_path("hunt.ckpt");
    HuntSpec part = spec;
    part.checkpoint = path;
    part.stop_after_pairs = 25;
    HuntResult first = run_hunt(part);
    REQUIRE_FALSE(first.complete);
    REQUIRE(first.pairs_known >= 25);
    REQUIRE(first.pairs_known < first.pairs_total);
    Checkpoint c = load_checkpoint(path);
    REQUIRE(c.records.size() == first.pairs_known);
    HuntSpec again = spec;
    again.checkpoint = path;
    again.resume = true;
    HuntResult second = run_hunt(again);
    REQUIRE(second.complete);
    const std::string resumed = rendered(second, spec);
    REQUIRE(resumed == whole);
    // A checkpoint of another hunt is refused.
    HuntSpec other = again;
    other.grid = parse_lengths("10..121", 1);
    REQUIRE_THROWS_AS(run_hunt(other), InputError);
    std::remove(path.c_str());
}

TEST_CASE("bad sweep and hunt input is refused with a clear error", "[sweep]") {
    REQUIRE_THROWS_AS(parse_lengths("10..5", 1), InputError);
    REQUIRE_THROWS_AS(parse_lengths("0..5", 1), InputError);
    REQUIRE_THROWS_AS(parse_lengths("5..x", 1), InputError);
    REQUIRE_THROWS_AS(parse_lengths("5..9", 0), InputError);
    SweepSpec spec;
    spec.options = opts({"1d6", "2d6", "3d6"});
    spec.grid = parse_lengths("10..20", 1);
    spec.variants = {{Overshoot::stay, Order::a_first}};
    REQUIRE_THROWS_AS(run_sweep(spec), InputError);  // seat-dependent for 3 options
    HuntSpec h;
    h.options = opts({"1d6", "2d6"});
    h.grid = parse_lengths("10..20", 1);
    REQUIRE_THROWS_AS(run_hunt(h), InputError);  // fewer options than the cycle length
    const std::string path = temp_path("junk.ckpt");
    {
        FILE* fp = std::fopen(path.c_str(), "w");
        std::fputs("not a checkpoint\n", fp);
        std::fclose(fp);
    }
    REQUIRE_THROWS_AS(load_checkpoint(path), InputError);
    std::remove(path.c_str());
}

TEST_CASE("a hunt plan covers every unknown cell once, for any number of ranks", "[sweep]") {
    const HuntSpec spec = hunt_spec("1..3d{4,6,8}", "10..60",
                                    {{Overshoot::stay, Order::simultaneous}, {Overshoot::bounce, Order::simultaneous}}, 1);
    HuntStore store(spec.options.size(), spec.variants.size(), spec.grid.lengths().size());
    // Some cells already known: a whole pair of the all-lengths variant, a block of the bounce one.
    CheckpointRecord whole;
    whole.variant = 0, whole.a = 0, whole.b = 1, whole.first = 0;
    whole.margin.assign(store.nl, 0.1);
    whole.bound.assign(store.nl, 1e-12);
    store.put(whole, "test");
    CheckpointRecord part = whole;
    part.variant = 1, part.first = 5;
    part.margin.assign(7, 0.2);
    part.bound.assign(7, 1e-12);
    store.put(part, "test");
    REQUIRE(store.pairs_known() == 1);
    REQUIRE(store.known(1, 0, 1, 5));
    REQUIRE_FALSE(store.known(1, 0, 1, 4));
    for (int ranks : {1, 2, 3, 5}) {
        const HuntPlan plan = plan_hunt(spec, store, ranks, 1);
        INFO("ranks " << ranks);
        REQUIRE(plan.ranks == ranks);
        REQUIRE(plan.rank_cost.size() == static_cast<std::size_t>(ranks));
        std::vector<int> covered(store.nv * store.np * store.nl, 0);
        double total = 0, largest = 0;
        std::vector<double> by_rank(ranks, 0);
        for (const auto& sh : plan.shards) {
            REQUIRE(sh.rank >= 0);
            REQUIRE(sh.rank < ranks);
            REQUIRE(sh.cost > 0);
            total += sh.cost;
            largest = std::max(largest, sh.cost);
            by_rank[sh.rank] += sh.cost;
            REQUIRE(sh.first + sh.count <= store.nl);
            for (const auto& p : sh.pairs)
                for (std::size_t k = sh.first; k < sh.first + sh.count; ++k)
                    covered[store.slot(sh.variant, p.a, p.b) * store.nl + k]++;
            if (sh.variant == 0)
                REQUIRE((sh.method == "series" || sh.method == "pairs"));
            else
                REQUIRE(sh.method == "board");
        }
        for (std::size_t v = 0; v < store.nv; ++v)
            for (std::size_t a = 0; a < store.n; ++a)
                for (std::size_t b = a + 1; b < store.n; ++b)
                    for (std::size_t k = 0; k < store.nl; ++k) {
                        const int c = covered[store.slot(v, a, b) * store.nl + k];
                        // Every unknown cell once; a known cell at most once (a board block
                        // recomputes a known cell when other pairs need that length).
                        REQUIRE(c <= 1);
                        if (!store.known(v, a, b, k)) REQUIRE(c == 1);
                        if (v == 0 && store.known(v, a, b, k)) REQUIRE(c == 0);
                    }
        // Longest-first greedy: no rank exceeds the mean by more than one shard (the list-scheduling
        // bound, R. L. Graham 1969, SIAM J. Appl. Math. 17(2); cited from memory).
        for (int r = 0; r < ranks; ++r) {
            REQUIRE(by_rank[r] == Approx(plan.rank_cost[r]));
            REQUIRE(by_rank[r] <= total / ranks + largest + 1e-9 * total);
        }
    }
}

TEST_CASE("shards computed apart and merged give the bytes of one run", "[sweep]") {
    const HuntSpec spec = hunt_spec("1..3d{4,6,8}", "10..90",
                                    {{Overshoot::stay, Order::simultaneous},
                                     {Overshoot::bounce, Order::simultaneous},
                                     {Overshoot::pass, Order::coin}},
                                    2);
    const HuntResult one = run_hunt(spec);
    const std::string whole = rendered(one, spec);
    REQUIRE(one.complete);
    REQUIRE(one.distinct > 0);
    const std::uint64_t fp = hunt_fingerprint(spec);
    for (int ranks : {2, 3}) {
        HuntStore empty(spec.options.size(), spec.variants.size(), spec.grid.lengths().size());
        const HuntPlan plan = plan_hunt(spec, empty, ranks, 2);
        HuntStore merged = empty;
        for (int r = ranks - 1; r >= 0; --r) {  // any order of arrival
            HuntStore mine = empty;
            REQUIRE(compute_shards(spec, plan, r, mine, {}));
            // What a rank sends: its cells as checkpoint bytes.
            const Checkpoint c = decode_checkpoint(encode_checkpoint(mine.checkpoint(fp)), "rank");
            REQUIRE(c.fingerprint == fp);
            merged.merge(c, "rank");
        }
        const HuntResult split = search_cycles(spec, merged);
        INFO("ranks " << ranks);
        REQUIRE(rendered(split, spec) == whole);
    }
}

TEST_CASE("checkpoint bytes: format 2 round trip, format 1 still read, damage refused", "[sweep]") {
    Checkpoint c;
    c.fingerprint = 0x0123456789abcdefULL;
    c.lengths = 5;
    CheckpointRecord r;
    r.variant = 1, r.a = 0, r.b = 2, r.first = 1;
    r.margin = {0.25, -0.5, 1.0};
    r.bound = {1e-12, 2e-12, std::numeric_limits<double>::infinity()};
    c.records.push_back(r);
    const std::string bytes = encode_checkpoint(c);
    const Checkpoint back = decode_checkpoint(bytes, "t");
    REQUIRE(back.fingerprint == c.fingerprint);
    REQUIRE(back.lengths == 5);
    REQUIRE(back.records.size() == 1);
    REQUIRE(back.records[0].first == 1);
    REQUIRE(back.records[0].margin == r.margin);
    REQUIRE(back.records[0].bound == r.bound);
    REQUIRE(encode_checkpoint(back) == bytes);
    // Format 1: records without first and count hold every length.
    std::string v1 = "overshoot hunt checkpoint 1\nfingerprint 0123456789abcdef\nlengths 2\nrecords 1\n";
    auto put32 = [&](std::string& s, std::uint32_t x) { s.append(reinterpret_cast<const char*>(&x), 4); };
    auto put64 = [&](std::string& s, double x) { s.append(reinterpret_cast<const char*>(&x), 8); };
    put32(v1, 0), put32(v1, 1), put32(v1, 2);
    put64(v1, 0.5), put64(v1, 1e-12), put64(v1, -0.25), put64(v1, 1e-12);
    const Checkpoint old = decode_checkpoint(v1, "v1");
    REQUIRE(old.records.size() == 1);
    REQUIRE(old.records[0].first == 0);
    REQUIRE(old.records[0].margin == std::vector<double>{0.5, -0.25});
    // Damage: cut short, trailing bytes, a record past the lengths, a margin out of range, NaN.
    REQUIRE_THROWS_AS(decode_checkpoint(bytes.substr(0, bytes.size() - 1), "t"), InputError);
    REQUIRE_THROWS_AS(decode_checkpoint(bytes + "x", "t"), InputError);
    REQUIRE_THROWS_AS(decode_checkpoint(v1.substr(0, v1.size() - 8), "t"), InputError);
    Checkpoint bad = c;
    bad.records[0].first = 3;  // 3 + 3 > 5 lengths
    REQUIRE_THROWS_AS(decode_checkpoint(encode_checkpoint(bad), "t"), InputError);
    bad = c;
    bad.records[0].margin[0] = 1.5;
    REQUIRE_THROWS_AS(decode_checkpoint(encode_checkpoint(bad), "t"), InputError);
    bad = c;
    bad.records[0].margin[1] = std::numeric_limits<double>::quiet_NaN();
    REQUIRE_THROWS_AS(decode_checkpoint(encode_checkpoint(bad), "t"), InputError);
    bad = c;
    bad.records[0].bound[0] = -1;
    REQUIRE_THROWS_AS(decode_checkpoint(encode_checkpoint(bad), "t"), InputError);
    REQUIRE_THROWS_AS(decode_checkpoint("overshoot hunt checkpoint 2\nfingerprint 1\nlengths 5\nrecords 99999999999\n", "t"),
                      InputError);
    // A record outside the hunt is refused by the store, naming the file.
    HuntStore st(3, 1, 5);
    REQUIRE_THROWS_WITH(st.merge(c, "old.ckpt"), Catch::Contains("old.ckpt"));
}
