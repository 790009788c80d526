#pragma once
// Certificates: a claim (a cycle, a crossover, a winner) with every
// probability it rests on as an exact fraction or a proven interval, written
// so that an independent program can re-derive every number
// (docs/certificate.md). This header holds the plain data, the writer that
// computes it and the checker that re-derives it by other algorithms.
#include <gmpxx.h>

#include <optional>
#include <string>
#include <vector>

#include "certify/residual.hpp"
#include "core/board.hpp"
#include "core/option.hpp"

namespace overshoot {

enum class ClaimKind { cycle, crossover, winner };
std::string_view to_string(ClaimKind k);

struct Claim {
    ClaimKind kind = ClaimKind::cycle;
    std::vector<std::string> options;  // cycle: in order; crossover: A, B; winner: A, then the others
    int at = 0;                        // crossover: the length where the preference has changed
};

// One probability: the exact fraction when known, and always a proven
// interval [lo, hi] (binary64 endpoints, rounded outward).
struct CertValue {
    std::optional<mpq_class> exact;
    std::string decimal;  // the exact value (or the interval's midpoint) to 6 places
    double lo = 0, hi = 0;
};

enum class Verdict { a_beats_b, b_beats_a, undecided };
std::string_view to_string(Verdict v);

struct CertDuel {
    std::string a, b;  // option names
    int length = 0;
    CertValue p_a_wins, p_b_wins, p_tie, p_neither, margin;
    std::string exact_method;     // empty when no exact value could be computed
    std::string interval_method;  // the floating-point method whose proven bound gave the intervals
    Verdict verdict = Verdict::undecided;
    // General boards beyond exact elimination: the values and rounds bound
    // from which the intervals are proven in exact arithmetic.
    std::optional<ResidualProof> residual;
};

struct Certificate {
    Claim claim;
    std::string statement;  // the claim in words, derived from claim and board
    Board board;            // the claim's board (crossover: at length `claim.at`)
    Order order = Order::simultaneous;
    std::vector<Option> options;  // exactly the options the claim names, in claim order
    std::vector<int> starts;      // one start square per option, as given (empty: every piece on 0)
    std::vector<CertDuel> duels;
};

// The duels a claim rests on and what each must show.
struct NeededDuel {
    std::string a, b;
    int length = 0;
    std::optional<Verdict> want;  // crossover: nullopt (the two must be decided and opposite)
};
std::vector<NeededDuel> needed_duels(const Claim& claim, int length);
// starts: one start square per claim option (empty: every piece on 0).
std::string claim_statement(const Claim& claim, const Board& board, Order order, const std::vector<int>& starts = {});

// Why a claim could not be certified (it is false, or undecided).
struct ClaimFailure : std::runtime_error {
    using std::runtime_error::runtime_error;
};

// Computes every duel the claim needs (exact fractions where exact mode can,
// proven intervals always) on `threads` threads (0 = all cores). On boards
// where pieces can move backward and exact elimination does not fit (or
// always, with `residual`), the intervals come from a residual certificate.
// Throws ClaimFailure when the claim does not hold, InputError on a
// malformed claim.
// starts: one start square per option (empty: every piece on 0).
Certificate certify(const Claim& claim, const Board& board, Order order, const std::vector<Option>& options,
                    int threads = 0, bool residual = false, const std::vector<int>& starts = {});

// Reads a certificate JSON document; throws InputError naming the first
// missing or malformed field.
Certificate parse_certificate(const std::string& text, const std::string& source);

struct CheckItem {
    std::string item;    // e.g. "duel 2d6 vs 1d6 on 600 squares: p_a_wins"
    std::string detail;  // what was re-derived
};

struct CheckReport {
    bool holds = false;
    std::string failure;  // the first failing item and why (empty when it holds)
    std::vector<CheckItem> passed;
    std::vector<unsigned long long> primes;  // the moduli used
};

// Re-derives every number of the certificate by algorithms other than the
// writer's: each fraction modulo several primes by the one-round equations of
// the product chain (one prime derived from a hash of `text`), each interval
// and the claim by the floating-point engine's proven bound.
CheckReport check_certificate(const Certificate& cert, const std::string& text, int threads = 0);

}  // namespace overshoot
