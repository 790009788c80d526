// Tests of src/hunt: hunts, their plan and shards, resuming, checkpoints.
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
#include "hunt/checkpoint.hpp"
#include "core/family.hpp"
#include "hunt/hunt.hpp"
#include "lengths/lengths.hpp"
#include "sweep/sweep.hpp"
#include "tournament/cycles.hpp"
#include "tournament/tournament.hpp"

#include "support.hpp"

using namespace overshoot;

namespace {

using testing::opts;

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
    return std::string("/tmp/overshoot-test-hunt-") + std::to_string(::getpid()) + "-" + name;
}

}  // namespace

TEST_CASE("a hunt lists each cycle once and agrees with the tournament's cycles", "[hunt]") {
    HuntSpec spec;
    spec.options = parse_family("dice(count=1..3, sides=4,6)");
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

TEST_CASE("an interrupted hunt resumed gives byte-identical output", "[hunt]") {
    const HuntSpec spec = hunt_spec("dice(count=1..4, sides=4,6,8)", "10..120",
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

TEST_CASE("a hunt plan covers every unknown cell once, for any number of ranks", "[hunt]") {
    const HuntSpec spec = hunt_spec("dice(count=1..3, sides=4,6,8)", "10..60",
                                    {{Overshoot::stay, Order::simultaneous}, {Overshoot::bounce, Order::simultaneous}}, 1);
    HuntStore store(spec.options.size(), spec.variants.size(), spec.grid.lengths().size());
    // Some cells already known: a whole pair of the all-lengths variant, a block of the bounce one.
    CheckpointRecord whole;
    whole.variant = 0, whole.a = 0, whole.b = 1, whole.first = 0;
    whole.margin.assign(store.length_count, 0.1);
    whole.bound.assign(store.length_count, 1e-12);
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
        std::vector<int> covered(store.variant_count * store.pair_count * store.length_count, 0);
        double total = 0, largest = 0;
        std::vector<double> by_rank(ranks, 0);
        for (const auto& sh : plan.shards) {
            REQUIRE(sh.rank >= 0);
            REQUIRE(sh.rank < ranks);
            REQUIRE(sh.cost > 0);
            total += sh.cost;
            largest = std::max(largest, sh.cost);
            by_rank[sh.rank] += sh.cost;
            REQUIRE(sh.first + sh.count <= store.length_count);
            for (const auto& p : sh.pairs)
                for (std::size_t k = sh.first; k < sh.first + sh.count; ++k)
                    covered[store.slot(sh.variant, p.a, p.b) * store.length_count + k]++;
            if (sh.variant == 0)
                REQUIRE((sh.method == LengthMethod::series || sh.method == LengthMethod::pairs ||
                         sh.method == LengthMethod::closure));
            else
                REQUIRE(sh.method == LengthMethod::board);
        }
        for (std::size_t v = 0; v < store.variant_count; ++v)
            for (std::size_t a = 0; a < store.option_count; ++a)
                for (std::size_t b = a + 1; b < store.option_count; ++b)
                    for (std::size_t k = 0; k < store.length_count; ++k) {
                        const int c = covered[store.slot(v, a, b) * store.length_count + k];
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

TEST_CASE("a hunt plan names the method the engine uses for each pair", "[hunt]") {
    // Light and heavy dice: programme pairs the whole programme does, and those
    // the end-zone closure takes (labelled closure, costed by its own estimate).
    const HuntSpec spec = hunt_spec("dice(count=1..6, sides=6,20)", "7..600", {{Overshoot::stay, Order::simultaneous}}, 2);
    HuntStore store(spec.options.size(), spec.variants.size(), spec.grid.lengths().size());
    const HuntPlan plan = plan_hunt(spec, store, 1, 2);
    std::vector<PairRequest> all;
    std::set<LengthMethod> seen;
    for (const auto& sh : plan.shards) {
        seen.insert(sh.method);
        for (const auto& p : sh.pairs) all.push_back(p);
    }
    REQUIRE(seen == std::set<LengthMethod>{LengthMethod::pairs, LengthMethod::closure});
    const auto res = all_lengths(spec.options, Overshoot::stay, Order::simultaneous, spec.grid.hi, all, spec.engine);
    std::size_t k = 0;
    for (const auto& sh : plan.shards)
        for (std::size_t q = 0; q < sh.pairs.size(); ++q, ++k) {
            INFO(spec.options[sh.pairs[q].a].name << " vs " << spec.options[sh.pairs[q].b].name);
            REQUIRE(res[k].method == sh.method);
        }
}

TEST_CASE("shards computed apart and merged give the bytes of one run", "[hunt]") {
    const HuntSpec spec = hunt_spec("dice(count=1..3, sides=4,6,8)", "10..90",
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

TEST_CASE("checkpoint bytes: format 2 round trip, format 1 still read, damage refused", "[hunt]") {
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
