// Tests of src/race: duels under every turn order, the agreement of the
// independent methods (series, product chain, pair programme, end zone), the
// facts of the trade and the heavy-tail case.
#include <catch2/catch.hpp>

#include <cmath>
#include <random>
#include <string>
#include <vector>

#include "chain/chain.hpp"
#include "chain/series.hpp"
#include "core/board.hpp"
#include "core/error.hpp"
#include "core/option.hpp"
#include "race/duel.hpp"
#include "lengths/lengths.hpp"
#include "race/outcome.hpp"
#include "render/document.hpp"

using namespace overshoot;

namespace {

constexpr Order kOrders[] = {Order::simultaneous, Order::a_first, Order::b_first, Order::coin};
constexpr Overshoot kRules[] = {Overshoot::stay, Overshoot::bounce, Overshoot::pass};

struct Pair {
    Board board;
    Chain a, b;
};

Pair setup(const std::string& a, const std::string& b, int length, Overshoot rule = Overshoot::stay,
           std::vector<Jump> jumps = {}) {
    Board board = make_board(length, rule, std::move(jumps));
    Chain ca = build_chain(board, parse_option(a));
    Chain cb = build_chain(board, parse_option(b));
    return {board, std::move(ca), std::move(cb)};
}

DuelResult run(const Pair& p, Order order, DuelMethod method = DuelMethod::automatic) {
    return duel(p.a, p.b, order, DuelSettings{.method = method, .want_median = false});
}

double diff(const DuelResult& x, const DuelResult& y) {
    return std::max({std::fabs(static_cast<double>(x.p_a_wins - y.p_a_wins)),
                     std::fabs(static_cast<double>(x.p_b_wins - y.p_b_wins)),
                     std::fabs(static_cast<double>(x.p_tie - y.p_tie)),
                     std::fabs(static_cast<double>(x.p_neither - y.p_neither))});
}

double total(const DuelResult& r) { return static_cast<double>(r.p_a_wins + r.p_b_wins + r.p_tie + r.p_neither); }

}  // namespace

// ---------------------------------------------------------------- facts of the trade

TEST_CASE("100 squares, stay: one d6 beats two d6 about 51% of the time", "[race]") {
    // Fact of the trade, no published source; re-derived independently under
    // these rules: simultaneous rounds, a shared finish is a tie for neither.
    Pair p = setup("1d6", "2d6", 100);
    for (DuelMethod m : {DuelMethod::automatic, DuelMethod::series}) {
        DuelResult r = run(p, Order::simultaneous, m);
        INFO("method " << to_string(r.method) << " P(1d6 wins) " << static_cast<double>(r.p_a_wins));
        CHECK(std::round(100 * static_cast<double>(r.p_a_wins)) == 51);
        CHECK(r.a_beats_b());
        CHECK(r.error_bound() <= 1e-12);
        CHECK(total(r) == Approx(1.0).margin(1e-12));
    }
}

TEST_CASE("one d6 is preferred to two d6 up to 115 squares, two d6 from 116 on", "[race]") {
    // Fact of the trade, no published source (simultaneous, stay, ties count
    // for neither). Checked at every length 1..200 and at a few longer ones,
    // each length decided.
    std::vector<int> lengths;
    for (int length = 1; length <= 200; ++length) lengths.push_back(length);
    for (int length : {250, 300, 400, 600}) lengths.push_back(length);
    for (int length : lengths) {
        Pair p = setup("1d6", "2d6", length);
        DuelResult r = run(p, Order::simultaneous);
        INFO("length " << length << " margin " << r.margin() << " bound " << r.error_bound());
        if (length <= 115)
            CHECK(r.a_beats_b());
        else
            CHECK(r.b_beats_a());
    }
    // The two lengths at the flip also by the independent plain series.
    CHECK(run(setup("1d6", "2d6", 115), Order::simultaneous, DuelMethod::series).a_beats_b());
    CHECK(run(setup("1d6", "2d6", 116), Order::simultaneous, DuelMethod::series).b_beats_a());
}

TEST_CASE("600 squares: two d6 beat one, one beats three, three beat two", "[race]") {
    // Fact of the trade, no published source: an intransitive cycle of plain
    // dice (simultaneous, stay, ties for neither).
    Board board = make_board(600, Overshoot::stay, {});
    Chain one = build_chain(board, parse_option("1d6"));
    Chain two = build_chain(board, parse_option("2d6"));
    Chain three = build_chain(board, parse_option("3d6"));
    DuelSettings s{.want_median = false};
    DuelResult r21 = duel(two, one, Order::simultaneous, s);
    DuelResult r13 = duel(one, three, Order::simultaneous, s);
    DuelResult r32 = duel(three, two, Order::simultaneous, s);
    INFO("2d6-1d6 " << r21.margin() << ", 1d6-3d6 " << r13.margin() << ", 3d6-2d6 " << r32.margin());
    CHECK(r21.a_beats_b());
    CHECK(r13.a_beats_b());
    CHECK(r32.a_beats_b());
    for (const auto* r : {&r21, &r13, &r32}) CHECK(r->error_bound() <= 1e-12);
    // The same three verdicts by the plain series (an independent method).
    DuelSettings ser{.method = DuelMethod::series, .want_median = false};
    CHECK(diff(duel(two, one, Order::simultaneous, ser), r21) < 1e-12);
    CHECK(diff(duel(one, three, Order::simultaneous, ser), r13) < 1e-12);
    CHECK(diff(duel(three, two, Order::simultaneous, ser), r32) < 1e-12);
}

// ---------------------------------------------------------------- independent methods

TEST_CASE("series, product chain and pair programme agree on 240 random small boards", "[race]") {
    // The product-chain solve (Eigen sparse LU over pairs of squares) is an
    // independent method: a different linear system, no per-turn truncation.
    // Deterministic seed; 80 boards per overshoot rule, every turn order.
    std::mt19937 rng(20261201);
    auto uniform = [&](int lo, int hi) { return std::uniform_int_distribution<int>(lo, hi)(rng); };
    auto random_spec = [&]() -> std::string {
        switch (uniform(0, 3)) {
            case 0: return std::to_string(uniform(1, 2)) + "d" + std::to_string(uniform(2, 6));
            case 1: {
                std::string s = "[";
                int faces = uniform(1, 4);
                for (int i = 0; i < faces; ++i) s += (i ? "," : "") + std::to_string(uniform(0, 5));
                return s + "]";
            }
            case 2: return "{" + std::to_string(uniform(0, 2)) + ":" + std::to_string(uniform(1, 3)) + "," +
                           std::to_string(uniform(3, 7)) + ":" + std::to_string(uniform(1, 3)) + "}";
            default: return "1d" + std::to_string(uniform(2, 4)) + "+[0," + std::to_string(uniform(1, 3)) + "]";
        }
    };
    int boards = 0, with_backward = 0, with_jumps = 0, forward = 0;
    double worst = 0;
    while (boards < 240) {
        const Overshoot rule = kRules[boards % 3];
        const int length = uniform(3, 16);
        std::vector<Jump> jumps;
        const int count = uniform(0, 3);
        for (int i = 0; i < count; ++i) jumps.push_back({uniform(1, length - 1), uniform(0, length)});
        Board board;
        try {
            board = make_board(length, rule, jumps);
        } catch (const InputError&) {
            continue;  // a loop or a repeated source: draw again
        }
        const std::string sa = random_spec(), sb = random_spec();
        Chain a = build_chain(board, parse_option(sa));
        Chain b = build_chain(board, parse_option(sb));
        ++boards;
        if (!board.jumps.empty()) ++with_jumps;
        for (const Jump& j : board.jumps)
            if (j.to < j.from) {
                ++with_backward;
                break;
            }
        if (board.forward_only()) ++forward;
        for (Order order : kOrders) {
            INFO(sa << " vs " << sb << ", " << render::describe(board, order));
            auto settings = [](DuelMethod m) { return DuelSettings{.method = m, .want_median = false}; };
            DuelResult product = duel(a, b, order, settings(DuelMethod::product));
            DuelResult series = duel(a, b, order, settings(DuelMethod::series));
            CHECK(series.target_met);
            CHECK(series.error_bound() <= 1e-12);
            CHECK(diff(series, product) <= 1e-12);
            worst = std::max(worst, diff(series, product));
            // Rounds to the first finish, given one happens, by both methods.
            if (std::isfinite(product.mean_rounds))
                CHECK(series.mean_rounds == Approx(product.mean_rounds).epsilon(1e-9).margin(1e-9));
            else
                CHECK_FALSE(std::isfinite(series.mean_rounds));
            CHECK(total(series) == Approx(1.0).margin(1e-12));
            CHECK(total(product) == Approx(1.0).margin(1e-12));
            if (order != Order::simultaneous) {
                CHECK(series.p_tie == 0);  // no shared finish when one piece moves first
                CHECK(product.p_tie == 0);
            }
            if (board.forward_only()) {
                DuelResult pairs = duel(a, b, order, settings(DuelMethod::pairs));
                DuelResult zone = duel(a, b, order, settings(DuelMethod::zone));
                CHECK(diff(pairs, product) <= 1e-12);
                CHECK(diff(zone, product) <= 1e-12);
                CHECK(pairs.error_bound() <= 1e-12);
                worst = std::max(worst, diff(pairs, product));
            } else {
                CHECK_THROWS_AS(duel(a, b, order, settings(DuelMethod::pairs)), InputError);
            }
        }
    }
    INFO("largest disagreement " << worst);
    // The sample must really cover jumps, backward moves and forward-only boards.
    CHECK(with_jumps >= 100);
    CHECK(with_backward >= 40);
    CHECK(forward >= 60);
}

TEST_CASE("end zone, pairs, series and product agree on 45 random medium boards", "[race]") {
    // Boards of 25..45 squares with moves of at most 5, so the end zone (the
    // last 2 max_move + 2 squares) is a small part of the board and the zone
    // method's series really runs before the pair programme closes it. The
    // product-chain solve is the independent reference. Deterministic seed.
    std::mt19937 rng(7031);
    auto uniform = [&](int lo, int hi) { return std::uniform_int_distribution<int>(lo, hi)(rng); };
    const char* specs[] = {"1d3", "1d5", "2d2", "[0,1,4]", "{1:3,5:1}", "[1,1,2]+[0,1]", "{0:1,2:1,3:2}", "[2,5]"};
    int boards = 0, zone_series = 0;
    while (boards < 45) {
        const Overshoot rule = kRules[boards % 3];
        const int length = uniform(25, 45);
        std::vector<Jump> jumps;
        for (int i = uniform(0, 4); i > 0; --i) jumps.push_back({uniform(1, length - 1), uniform(0, length)});
        Board board;
        try {
            board = make_board(length, rule, jumps);
        } catch (const InputError&) {
            continue;
        }
        ++boards;
        const char* sa = specs[uniform(0, 7)];
        const char* sb = specs[uniform(0, 7)];
        Chain a = build_chain(board, parse_option(sa));
        Chain b = build_chain(board, parse_option(sb));
        auto settings = [](DuelMethod m) { return DuelSettings{.method = m, .want_median = false}; };
        for (Order order : kOrders) {
            INFO(sa << " vs " << sb << ", " << render::describe(board, order));
            DuelResult product = duel(a, b, order, settings(DuelMethod::product));
            DuelResult series = duel(a, b, order, settings(DuelMethod::series));
            CHECK(diff(series, product) <= 1e-12);
            CHECK(series.error_bound() <= 1e-12);
            if (board.forward_only()) {
                DuelResult zone = duel(a, b, order, settings(DuelMethod::zone));
                DuelResult pairs = duel(a, b, order, settings(DuelMethod::pairs));
                CHECK(diff(zone, product) <= 1e-12);
                CHECK(diff(pairs, product) <= 1e-12);
                CHECK(zone.error_bound() <= 1e-12);
                CHECK(zone.mean_rounds == Approx(product.mean_rounds).epsilon(1e-9));
                CHECK(pairs.mean_rounds == Approx(product.mean_rounds).epsilon(1e-9));
                ++zone_series;
            }
            DuelResult automatic = duel(a, b, order, settings(DuelMethod::automatic));
            CHECK(diff(automatic, product) <= 1e-12);
        }
    }
    CHECK(zone_series >= 40);
}

TEST_CASE("coin is the mean of the two alternating orders; seats and symmetry", "[race]") {
    for (Overshoot rule : kRules) {
        Pair p = setup("1d6", "2d4+[0,1]", 40, rule, {{6, 17}, {30, 12}});
        DuelResult af = run(p, Order::a_first), bf = run(p, Order::b_first), coin = run(p, Order::coin);
        CHECK(static_cast<double>(coin.p_a_wins) ==
              Approx(static_cast<double>(af.p_a_wins + bf.p_a_wins) / 2).margin(1e-13));
        CHECK(static_cast<double>(coin.p_b_wins) ==
              Approx(static_cast<double>(af.p_b_wins + bf.p_b_wins) / 2).margin(1e-13));
        // b-first with A and B swapped is a-first with the seats swapped.
        Pair q{p.board, p.b, p.a};
        DuelResult swapped = run(q, Order::a_first);
        CHECK(static_cast<double>(swapped.p_a_wins) == Approx(static_cast<double>(bf.p_b_wins)).margin(1e-13));
        // Simultaneous rounds are symmetric in the seats.
        DuelResult s1 = run(p, Order::simultaneous), s2 = run(q, Order::simultaneous);
        CHECK(static_cast<double>(s1.p_a_wins) == Approx(static_cast<double>(s2.p_b_wins)).margin(1e-13));
        CHECK(static_cast<double>(s1.p_tie) == Approx(static_cast<double>(s2.p_tie)).margin(1e-13));
        // Against itself, simultaneous: equal chances; moving first helps.
        Pair same = setup("2d6", "2d6", 40, rule);
        DuelResult even = run(same, Order::simultaneous);
        CHECK(static_cast<double>(even.p_a_wins) == Approx(static_cast<double>(even.p_b_wins)).margin(1e-13));
        CHECK_FALSE(even.a_beats_b());
        CHECK_FALSE(even.b_beats_a());
        CHECK(run(same, Order::a_first).a_beats_b());
    }
}

TEST_CASE("neither finishes: two pieces that can never finish", "[race]") {
    // A constant 3 on 10 squares stops on 9 for ever (9 + 3 overshoots).
    Pair p = setup("3", "3", 10);
    DuelResult r = run(p, Order::simultaneous);
    CHECK(static_cast<double>(r.p_neither) == Approx(1.0).margin(1e-15));
    // 2d6 vs the never-finisher: 2d6 wins exactly when it finishes.
    Pair q = setup("2d6", "3", 31);  // 3 stops on 30 of 31
    DuelResult w = run(q, Order::simultaneous);
    Chain c = build_chain(q.board, parse_option("2d6"));
    Series s(c);
    while (s.alive() > 1e-18L) s.step();
    CHECK(static_cast<double>(w.p_a_wins) == Approx(static_cast<double>(s.finished())).margin(1e-12));
    CHECK(static_cast<double>(w.p_neither) == Approx(static_cast<double>(s.stuck())).margin(1e-12));
    CHECK(w.p_b_wins == Approx(0.0).margin(1e-15));
}

TEST_CASE("rounds until the first finish: mean and median against the survival product", "[race]") {
    // Simultaneous rounds: P(R > t) = S_A(t) S_B(t) with S the survival of each
    // piece (independent pieces); mean and median follow by definition.
    Pair p = setup("1d6", "2d6", 60, Overshoot::stay, {{9, 31}, {50, 20}});
    DuelResult r = duel(p.a, p.b, Order::simultaneous);
    Series sa(p.a), sb(p.b);
    long double prev = 1, mean = 0;
    std::optional<long long> median;
    while (sa.alive() + sb.alive() > 1e-18L) {
        sa.step();
        sb.step();
        long double now = sa.survival() * sb.survival();
        mean += static_cast<long double>(sa.turn()) * (prev - now);
        if (!median && 1 - now >= 0.5L) median = sa.turn();
        prev = now;
    }
    const long double finishing = 1 - sa.stuck() * sb.stuck();
    CHECK(r.mean_rounds == Approx(static_cast<double>(mean / finishing)).epsilon(1e-10));
    REQUIRE(r.median_rounds.has_value());
    CHECK(r.median_rounds == median);
}

// ---------------------------------------------------------------- heavy tail

TEST_CASE("heavy tail: 5d12 against 1d6 on 80 squares has a proven bound <= 1e-12", "[race]") {
    // 5d12 at distance 5 waits for the one roll in 12^5 = 248,832 summing to 5
    // (counting), so a plain series would need millions of turns.
    Pair p = setup("5d12", "1d6", 80);
    for (Order order : kOrders) {
        INFO(to_string(order));
        DuelResult a = run(p, order, DuelMethod::automatic);
        CHECK(a.bound_proven);
        CHECK(a.target_met);
        CHECK(a.error_bound() <= 1e-12);
        DuelResult pairs = run(p, order, DuelMethod::pairs);
        DuelResult zone = run(p, order, DuelMethod::zone);
        CHECK(pairs.error_bound() <= 1e-12);
        CHECK(zone.error_bound() <= 1e-12);
        CHECK(diff(a, pairs) <= 1e-12);
        CHECK(diff(zone, pairs) <= 1e-12);
        CHECK(total(a) == Approx(1.0).margin(1e-12));
    }
    // The product chain (about a second here) as the method independent of both.
    DuelResult product = run(p, Order::simultaneous, DuelMethod::product);
    CHECK(diff(product, run(p, Order::simultaneous, DuelMethod::pairs)) <= 1e-12);
}

TEST_CASE("methods refuse what they cannot do", "[race]") {
    Pair back = setup("1d6", "2d6", 20, Overshoot::stay, {{15, 3}});
    CHECK_THROWS_AS(run(back, Order::simultaneous, DuelMethod::pairs), InputError);
    CHECK_THROWS_AS(run(back, Order::simultaneous, DuelMethod::zone), InputError);
    Pair bounce = setup("1d6", "2d6", 20, Overshoot::bounce);
    CHECK_THROWS_AS(run(bounce, Order::simultaneous, DuelMethod::pairs), InputError);
    CHECK(parse_duel_method("product") == DuelMethod::product);
    CHECK_THROWS_AS(parse_duel_method("guess"), InputError);
}

TEST_CASE("duel_matrix matches single duels and does not depend on the thread count", "[race]") {
    Board board = make_board(50, Overshoot::stay, {{4, 14}, {33, 21}});
    std::vector<Chain> chains;
    for (const char* s : {"1d6", "2d6", "[0,1,5]", "{1:1,4:2}"}) chains.push_back(build_chain(board, parse_option(s)));
    for (Order order : kOrders) {
        auto one = duel_matrix(chains, order, {}, 1);
        auto two = duel_matrix(chains, order, {}, 2);
        for (std::size_t i = 0; i < chains.size(); ++i)
            for (std::size_t j = 0; j < chains.size(); ++j) {
                const auto& x = one[i * chains.size() + j];
                CHECK(x.p_a_wins == two[i * chains.size() + j].p_a_wins);
                CHECK(diff(x, duel(chains[i], chains[j], order)) <= 1e-13);
            }
    }
}

TEST_CASE("outcome: a pair is decided only beyond its bound, never at it", "[race]") {
    CHECK(decided(0.2, 0.1) == 1);
    CHECK(decided(-0.2, 0.1) == -1);
    CHECK(decided(0.1, 0.1) == 0);
    CHECK(decided(-0.1, 0.1) == 0);
    CHECK(decided(0.0, 0.0) == 0);
    // The bound of a margin rounded to double is wider than the probabilities' bound.
    CHECK(rounded_margin_bound(0.0) > 0.0);
}

// Head starts. On a board without jumps under the rule stay (or pass) a
// piece's moves from square s depend only on its distance L - s to the finish
// (a move m finishes when m = L - s, is refused under stay when m > L - s, and
// otherwise leaves the distance L - s - m), so a piece starting on h on a
// board of length L walks exactly as one starting on 0 on a board of length
// L - h. Proof by induction on turns: the distributions of distances agree
// after every turn. Hence, pieces moving independently, (1) both pieces with
// a head start h on length L race as on length L - h, and (2) one piece with a
// head start h against the other on 0 wins with sum_t P(T_A^{L-h} = t)
// P(T_B^L > t) in simultaneous order (DESIGN.md, "Semantics"). Both facts are
// proved here, not published; the engines below must meet them.
TEST_CASE("head starts: a head start h on length L is the board of length L - h", "[race][head-start]") {
    const Option a = parse_option("1d6"), b = parse_option("2d6");
    for (Overshoot rule : {Overshoot::stay, Overshoot::pass}) {
        for (int h : {1, 7, 23}) {
            const int L = 60;
            const Board full = make_board(L, rule, {}), shorter = make_board(L - h, rule, {});
            // (1) both pieces start on h: the duel of length L - h, by every method.
            const Chain ah = build_chain(full, a, h), bh = build_chain(full, b, h);
            const Chain a0 = build_chain(shorter, a), b0 = build_chain(shorter, b);
            for (DuelMethod m : {DuelMethod::pairs, DuelMethod::zone, DuelMethod::series, DuelMethod::product}) {
                DuelSettings s;
                s.method = m;
                const DuelResult x = duel(ah, bh, Order::simultaneous, s), y = duel(a0, b0, Order::simultaneous, s);
                const double tol = m == DuelMethod::product ? 1e-12 : 1e-14;
                CHECK(static_cast<double>(x.p_a_wins) == Approx(static_cast<double>(y.p_a_wins)).margin(tol));
                CHECK(static_cast<double>(x.p_b_wins) == Approx(static_cast<double>(y.p_b_wins)).margin(tol));
                CHECK(static_cast<double>(x.p_tie) == Approx(static_cast<double>(y.p_tie)).margin(tol));
            }
            // ... and the all-lengths engine's duel at length L - h.
            const auto lens = all_lengths({a, b}, rule, Order::simultaneous, L, {{0, 1}});
            const DuelResult x = duel(ah, bh, Order::simultaneous);
            CHECK(lens[0].by_length[L - h].p_a_wins == Approx(static_cast<double>(x.p_a_wins)).margin(1e-13));
            CHECK(lens[0].by_length[L - h].p_b_wins == Approx(static_cast<double>(x.p_b_wins)).margin(1e-13));
            // (2) A on h, B on 0: the sum over turns of A's finishing times on
            // length L - h against B's survival on length L.
            const Chain b_full = build_chain(full, b);
            Series sa(a0), sb(b_full);
            long double win = 0, loss = 0;
            while (sa.alive() + sb.alive() > 1e-18L) {
                const long double fa = sa.step(), fb = sb.step();
                win += fa * sb.survival();
                loss += fb * sa.survival();
            }
            for (Order order : {Order::simultaneous}) {
                const DuelResult d = duel(ah, b_full, order);
                CHECK(static_cast<double>(d.p_a_wins) == Approx(static_cast<double>(win)).margin(1e-13));
                CHECK(static_cast<double>(d.p_b_wins) == Approx(static_cast<double>(loss)).margin(1e-13));
            }
        }
    }
}

TEST_CASE("head starts: every method agrees on boards with jumps and bounce", "[race][head-start]") {
    // On general boards the distance argument fails (a jump or a bounce ties a
    // square to the board); the methods are independent ways to the same number.
    const Option a = parse_option("1d6"), b = parse_option("2d6");
    const Board fwd = make_board(40, Overshoot::stay, {{5, 17}, {22, 31}});
    const Board back = make_board(30, Overshoot::bounce, {{9, 2}, {25, 12}});
    // Start on a jump source: the piece takes the jump at once (rests on 17).
    CHECK(build_chain(fwd, a, 5).start == 17);
    CHECK_THROWS_AS(build_chain(fwd, a, 40), InputError);
    for (Order order : {Order::simultaneous, Order::a_first, Order::coin}) {
        const Chain x = build_chain(fwd, a, 5), y = build_chain(fwd, b, 3);
        DuelSettings p, z, q;
        p.method = DuelMethod::pairs;
        z.method = DuelMethod::zone;
        q.method = DuelMethod::product;
        const DuelResult rp = duel(x, y, order, p), rz = duel(x, y, order, z), rq = duel(x, y, order, q);
        CHECK(static_cast<double>(rz.p_a_wins) == Approx(static_cast<double>(rp.p_a_wins)).margin(1e-13));
        CHECK(static_cast<double>(rq.p_a_wins) == Approx(static_cast<double>(rp.p_a_wins)).margin(1e-11));
        const Chain u = build_chain(back, a, 4), v = build_chain(back, b, 0);
        DuelSettings s;
        s.method = DuelMethod::series;
        const DuelResult ss = duel(u, v, order, s), sq = duel(u, v, order, q);
        CHECK(static_cast<double>(ss.p_a_wins) == Approx(static_cast<double>(sq.p_a_wins)).margin(1e-11));
        CHECK(static_cast<double>(ss.p_tie) == Approx(static_cast<double>(sq.p_tie)).margin(1e-11));
    }
    // A head start changes the answer (the check above is not vacuous).
    const DuelResult with = duel(build_chain(fwd, a, 5), build_chain(fwd, b), Order::simultaneous);
    const DuelResult without = duel(build_chain(fwd, a), build_chain(fwd, b), Order::simultaneous);
    CHECK(std::fabs(with.margin() - without.margin()) > 1e-3);
}
