// Hardening (issue 7): every resource-limit message names the estimate and the
// limit, inputs the fuzzers found stay fixed, and the numerical self-checks
// refuse a probability vector that does not sum to 1.
#include <catch2/catch.hpp>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <limits>
#include <sstream>
#include <string>
#include <vector>

#include "certify/certificate.hpp"
#include "chain/chain.hpp"
#include "chain/profile.hpp"
#include "core/board.hpp"
#include "core/error.hpp"
#include "core/limits.hpp"
#include "core/option.hpp"
#include "core/scenario.hpp"
#include "core/selfcheck.hpp"
#include "race/duel.hpp"
#include "race/several_pieces.hpp"
#include "support.hpp"
#include "tournament/matrix_csv.hpp"

using namespace overshoot;
namespace fs = std::filesystem;

namespace {

// Message of the exception of type E thrown by f, or "" when none is thrown.
template <class E, class F>
std::string message_of(F&& f) {
    try {
        f();
    } catch (const E& e) {
        return e.what();
    }
    return "";
}

// Restores the default memory cap whatever a test does.
struct MemoryCap {
    explicit MemoryCap(std::uint64_t bytes) { limits::set_memory_bytes(bytes); }
    ~MemoryCap() { limits::set_memory_bytes(limits::default_memory_bytes); }
};

fs::path scratch() {
    fs::path d = fs::temp_directory_path() / ("overshoot-hardening-" + std::to_string(::getpid()));
    fs::create_directories(d);
    return d;
}

using testing::Run;

Run run(const std::string& args) {
    return testing::run_shell(std::string("'") + OVERSHOOT_BINARY + "' " + args, scratch() / "stderr.txt");
}

std::vector<Chain> chains_of(const Board& b, std::initializer_list<const char*> specs) {
    std::vector<Chain> out;
    for (const char* s : specs) out.push_back(build_chain(b, parse_option(s)));
    return out;
}

}  // namespace

// ------------------------------------------------------------ limit messages

TEST_CASE("limit: a length beyond the maximum names the length and the limit", "[hardening]") {
    std::string m = message_of<LimitError>([] { make_board(limits::max_length + 1, Overshoot::stay, {}); });
    CHECK_THAT(m, Catch::Contains("1000001") && Catch::Contains("1000000"));
    std::string s = message_of<InputError>([] { parse_scenario("[board]\nlength = 2000000\n", "big.toml"); });
    CHECK_THAT(s, Catch::Contains("2000000") && Catch::Contains("1000000") && Catch::Contains("big.toml:2"));
}

TEST_CASE("limit: dice counts, sides, faces and moves name the limit", "[hardening]") {
    CHECK_THAT(message_of<InputError>([] { parse_option("5000d6"); }),
               Catch::Contains("5000d6") && Catch::Contains("1000 dice"));
    CHECK_THAT(message_of<InputError>([] { parse_option("2d999999"); }), Catch::Contains("limit 100000"));
    CHECK_THAT(message_of<InputError>([] { parse_option("[1,100001]"); }), Catch::Contains("limit 100000"));
    CHECK_THAT(message_of<InputError>([] { parse_option("10d20000"); }), Catch::Contains("limit"));
}

TEST_CASE("limit: a denominator overflow names the product and 2^62", "[hardening]") {
    CHECK_THAT(message_of<InputError>([] { parse_option("1000d1000"); }),
               Catch::Contains("1000^") && Catch::Contains("2^62"));
    // 2^31 * 2^32 = 2^63: above the limit, found by a sum of two spinners.
    CHECK_THAT(message_of<InputError>([] { parse_option("{0:1,1:2147483647}+{0:1,1:4294967295}"); }),
               Catch::Contains("2147483648 x 4294967296") && Catch::Contains("2^62"));
}

TEST_CASE("regression (fuzzing): a weight that wrapped past 2^64 is refused", "[hardening]") {
    // 2e19 used to wrap to 1553255926290448384 and be accepted as a weight.
    CHECK_THAT(message_of<InputError>([] { parse_option("{1:20000000000000000000}"); }),
               Catch::Contains("larger than the limit"));
    CHECK_THAT(message_of<InputError>([] { parse_option("184467440737095516161d6"); }),
               Catch::Contains("larger than the limit"));
    // The limit itself is still accepted: 2^62 - 1 and 1 sum to exactly 2^62.
    Option o = parse_option("{1:4611686018427387903,2:1}");
    CHECK(o.denominator == limits::max_denominator);
}

TEST_CASE("regression (fuzzing): a certificate with a number beyond double range is an InputError", "[hardening]") {
    // nlohmann::json throws out_of_range (not parse_error) for 1e400; it used to escape the reader.
    std::string m = message_of<InputError>([] { parse_certificate("{\"schema\": 1e400}", "big.json"); });
    CHECK_THAT(m, Catch::Contains("big.json") && Catch::Contains("JSON"));
    std::string r = message_of<InputError>([] { parse_certificate("[1, 2", "cut.json"); });
    CHECK_THAT(r, Catch::Contains("cut.json") && Catch::Contains("not valid JSON"));
}

TEST_CASE("regression (fuzzing): NdS no longer squares dense distributions", "[hardening]") {
    // 5d3013 took seconds to expand by repeated squaring (a fuzzer timeout);
    // NdS is now a sliding-window sum. Both paths must agree: NdS against N
    // copies of the listed faces 1..S, which still go through convolution.
    for (auto [n, s] : std::vector<std::pair<int, int>>{{1, 1}, {2, 6}, {3, 6}, {5, 12}, {4, 7}, {7, 3}}) {
        std::string faces = "[";
        for (int f = 1; f <= s; ++f) faces += (f > 1 ? "," : "") + std::to_string(f);
        faces += "]";
        Option a = parse_option(std::to_string(n) + "d" + std::to_string(s));
        Option b = parse_option(std::to_string(n) + faces);
        INFO(n << "d" << s);
        CHECK(a.weight == b.weight);
        CHECK(a.denominator == b.denominator);
    }
    // 2d50000 is 50000 * 50001 multiply-adds by squaring; now it is quick and exact:
    // P(sum = 50001) = 50000 / 50000^2, the peak of the triangle (handbook closed form).
    Option big = parse_option("2d50000");
    CHECK(big.max_move() == 100000);
    CHECK(big.denominator == 2'500'000'000ULL);
    CHECK(big.weight[50001] == 50000);
    CHECK(big.weight[2] == 1);
}

TEST_CASE("limit: expanding a spec beyond the work cap is refused with the estimate", "[hardening]") {
    // d50000 + d50000: 50000 nonzero moves times 50001 squares of the other term.
    std::string m = message_of<LimitError>([] { parse_option("d50000+d50000"); });
    CHECK_THAT(m, Catch::Contains("2500050000") && Catch::Contains(std::to_string(limits::max_spec_work)));
    CHECK_NOTHROW(parse_option("d1000+d1000+d6"));
}

TEST_CASE("limit: the memory cap names the estimate and the limit", "[hardening]") {
    {
        MemoryCap cap(std::uint64_t{5} << 20);
        std::string m = message_of<LimitError>([] { limits::check_memory(std::uint64_t{7} << 20, "a test buffer"); });
        CHECK_THAT(m, Catch::Contains("a test buffer") && Catch::Contains("about 8 MiB") &&
                          Catch::Contains("limit of 5 MiB") && Catch::Contains("--memory-limit"));
        CHECK_NOTHROW(limits::check_memory(std::uint64_t{5} << 20, "a test buffer"));
        // A real allocation: the chain of 2d6 on the longest board.
        Board b = make_board(limits::max_length, Overshoot::stay, {});
        std::string c = message_of<LimitError>([&] { build_chain(b, parse_option("2d6")); });
        CHECK_THAT(c, Catch::Contains("chain") && Catch::Contains("MiB") && Catch::Contains("limit of 5 MiB"));
    }
    CHECK(limits::memory_bytes() == limits::default_memory_bytes);
}

TEST_CASE("limit: --memory-limit on the command line, one line and exit 2", "[hardening]") {
    Run r = run("duel 1d6 2d6 --length 1000000 --memory-limit 1");
    INFO(r.err);
    CHECK(r.status == 2);
    CHECK(r.out.empty());
    CHECK_THAT(r.err, Catch::Contains("MiB") && Catch::Contains("memory limit of 1 MiB"));
    CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
}

TEST_CASE("limit: the tournament matrix estimate is checked before its series", "[hardening]") {
    Board b = make_board(20000, Overshoot::stay, {});
    std::vector<Chain> cs = chains_of(b, {"1d6", "2d6", "3d6"});
    MemoryCap cap(std::uint64_t{1} << 20);
    // At least length * options * 64 bytes = 3.7 MiB here.
    std::string m = message_of<LimitError>([&] { duel_matrix(cs, Order::simultaneous, DuelSettings{}, 1); });
    CHECK_THAT(m, Catch::Contains("tournament") && Catch::Contains("limit of 1 MiB"));
}

TEST_CASE("limit: a win matrix file names its estimate and the limit", "[hardening]") {
    std::string header = "label";
    for (int i = 0; i < 200; ++i) header += ",o" + std::to_string(i);
    {
        MemoryCap cap(std::uint64_t{1} << 20);
        // 200 * 200 * 64 bytes = 2.4 MiB: refused from the header, before any row is read.
        std::string m = message_of<LimitError>([&] { parse_matrix_csv(header + "\n", "wide.csv"); });
        CHECK_THAT(m, Catch::Contains("win matrix") && Catch::Contains("about 3 MiB") &&
                          Catch::Contains("limit of 1 MiB"));
    }
    std::string huge = "label";
    for (int i = 0; i < 100001; ++i) huge += ",o" + std::to_string(i);
    std::string m = message_of<LimitError>([&] { parse_matrix_csv(huge + "\n", "huge.csv"); });
    CHECK_THAT(m, Catch::Contains("100001") && Catch::Contains("limit of 100000"));
}

TEST_CASE("limit: a scenario file above 16 MiB is refused before it is read", "[hardening]") {
    fs::path p = scratch() / "huge.toml";
    {
        std::ofstream out(p, std::ios::binary);
        out << "[board]\nlength = 10\n";
        std::string comment = "# " + std::string(1 << 20, 'x') + "\n";
        for (int i = 0; i < 17; ++i) out << comment;
    }
    const auto size = fs::file_size(p);
    std::string m = message_of<LimitError>([&] { load_scenario(p.string()); });
    CHECK_THAT(m, Catch::Contains(std::to_string(size)) && Catch::Contains("16777216"));
    Run r = run("profile 1d6 --scenario '" + p.string() + "'");
    CHECK(r.status == 2);
    CHECK_THAT(r.err, Catch::Contains(std::to_string(size)));
    fs::remove(p);
}

// ------------------------------------------------------------ self-checks

TEST_CASE("self-check: a vector that does not sum to 1 is an InternalError", "[hardening]") {
    using selfcheck::check_distribution;
    CHECK_NOTHROW(check_distribution({0.25L, 0.25L, 0.5L, 0.0L}, 0, "t"));
    CHECK_NOTHROW(check_distribution({0.25L, 0.25L, 0.5L - 1e-12L, 0.0L}, 1e-12L, "t"));
    std::string low = message_of<InternalError>([] { check_distribution({0.3L, 0.3L, 0.3L}, 1e-12L, "duel"); });
    CHECK_THAT(low, Catch::Contains("duel") && Catch::Contains("sum to 0.9"));
    CHECK_THROWS_AS(check_distribution({0.6L, 0.6L}, 1e-3L, "t"), InternalError);
    // Sums to 1 but one part is not a probability.
    CHECK_THROWS_AS(check_distribution({1.5L, -0.5L}, 1e-3L, "t"), InternalError);
    // NaN passes a plain `fabs(total - 1) > tol` test; it must not pass this one.
    const long double nan = std::numeric_limits<long double>::quiet_NaN();
    CHECK_THROWS_AS(check_distribution({0.5L, nan}, 1e-3L, "t"), InternalError);
    CHECK_THROWS_AS(check_distribution({0.5L, 0.5L}, nan, "t"), InternalError);
    CHECK_THROWS_AS(selfcheck::check_probability(1.01L, 1e-6L, "p"), InternalError);
    CHECK_THROWS_AS(selfcheck::check_within(0.7L, 0.2L, 0.5L, 1e-6L, "p"), InternalError);
    CHECK_NOTHROW(selfcheck::check_within(0.5L, 0.2L, 0.5L, 0, "p"));
}

TEST_CASE("self-check: the engine's finishes agree with an independent P(finish)", "[hardening]") {
    // The checks inside duel, duel_matrix, race and distribution test that the
    // outcomes sum to 1. Here the part where somebody finishes is compared with
    // what the pieces' P(finish) imply, computed apart by profile() (absorption
    // by sparse LU, docs/method.md section 2): the pieces are independent, so
    // P(some piece finishes) = 1 - prod_i (1 - P_i(finish)) for every order.
    for (Overshoot rule : {Overshoot::stay, Overshoot::bounce, Overshoot::pass}) {
        Board b = make_board(40, rule, {{5, 17}, {30, 8}});
        std::vector<Chain> cs = chains_of(b, {"1d6", "2d6", "[0,2,2,5]"});
        std::vector<double> never;
        for (const Chain& c : cs) never.push_back(1 - profile(c).p_finish);
        const std::size_t n = cs.size();
        for (Order order : {Order::simultaneous, Order::a_first, Order::coin}) {
            std::vector<DuelResult> m = duel_matrix(cs, order, DuelSettings{}, 1);
            for (std::size_t i = 0; i < n; ++i)
                for (std::size_t j = 0; j < n; ++j) {
                    const DuelResult& d = m[i * n + j];
                    const long double finished = d.p_a_wins + d.p_b_wins + d.p_tie;
                    CHECK(std::fabs(static_cast<double>(finished) - (1 - never[i] * never[j])) <=
                          static_cast<double>(3 * d.bound) + 1e-9);
                }
            DuelResult d = duel(cs[0], cs[1], order);
            CHECK(std::fabs(static_cast<double>(d.p_a_wins + d.p_b_wins + d.p_tie) - (1 - never[0] * never[1])) <=
                  static_cast<double>(3 * d.bound) + 1e-9);
        }
        RaceResult r = race({&cs[0], &cs[1], &cs[2]}, {}, RaceOrder::simultaneous);
        long double finished = r.p_tie;
        for (long double p : r.p_wins) finished += p;
        CHECK(std::fabs(static_cast<double>(finished) - (1 - never[0] * never[1] * never[2])) <=
              static_cast<double>(8 * r.bound) + 1e-9);
        for (std::size_t i = 0; i < n; ++i) {
            // The listed distribution never finishes exactly as often as the absorption says.
            Distribution dist = distribution(cs[i], 1e-12, 100000);
            CHECK(std::fabs(static_cast<double>(dist.never) - never[i]) < 1e-9);
        }
    }
}
