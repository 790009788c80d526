#pragma once
// The zone-tail method of the all-lengths engine (docs/sweep.md, "Zone tail";
// the proof is docs/method.md, section 4.6). For a slow piece S and a fast
// piece F on long boards, F reaches its end zone long before S finishes, and
// from then on F's finishing time is that of a small triangular chain whose
// survival is an exact sum of geometric terms, one per zone square
// (its eigenvalues are the stay probabilities). The overlap of the two
// finishing times is then a sum of products of two generating functions:
// S's finishing time at a stay probability of F and F's zone-entry time at
// its reciprocal, each an O(L k) recursion over every length at once. The
// terms left out (fast geometric terms, and S finishing before F enters its
// zone) are bounded by one more such product. Lengths where that bound is
// above the target are left to the series.
// Internal to src/lengths/.
#include <cstdint>
#include <vector>

#include "core/board.hpp"
#include "core/option.hpp"
#include "lengths/distance.hpp"
#include "lengths/tallies.hpp"
#include "race/outcome.hpp"

namespace overshoot::lengths_engine {

// One piece's end zone from its integer weights (distances 1..z, z its
// largest move): the weight of staying and of finishing at each distance;
// a move m < e goes to e - m with weight w[m].
struct ExactZone {
    int z = 0;
    std::uint64_t den = 1;
    std::vector<std::uint64_t> w, stay, fin;  // w by move, stay and fin by distance
};

// The zone survival as geometric terms (docs/method.md, section 4.6):
// P(n < N < inf | e) = sum_j c[e][j] s_j^n (n >= 0) and
// P(N = n | e) = sum_j c'[e][j] s_j^(n-1) (n >= 1), over the distances j of
// the zone that can still finish (s_j their stay probability, all distinct).
struct Modes {
    using ld = long double;
    std::vector<int> states;             // distances that can finish, ascending
    std::vector<std::vector<ld>> c, cp;  // [state index][mode index]
    std::vector<ld> lambda, inv_lambda, one_minus;  // per mode
    std::vector<std::uint64_t> stay_w;
    ld c_max = 0, cp_max = 0;            // largest row sums of |c| and |c'|
    bool ok = false;
    bool nilpotent = false;              // no square can be stayed on: no terms, the zone time is at most z
};

// One option's zone for the method, computed once and shared by its pairs
// (the coefficients are exact rationals, O(z^3)).
struct ZoneChain {
    ExactZone zone;
    Modes modes;
    bool usable = false;  // no move of 0, zone of at most 40 squares, rule stay or pass
};
ZoneChain zone_chain(const Option& o, Overshoot rule);

// True when the method can apply to the pair: no move of 0 for either piece,
// and a zone of at most 40 squares for each (the coefficients are exact
// rationals, computed in O(z^3)).
bool zone_tail_applies(const Option& a, const Option& b);

struct ZoneTail {
    int first = 0;             // first length covered; max_length + 1 when none
    Tallies sim, af, bf;       // the ordered races, lengths first..L
    std::vector<double> bound;  // per length (first..L): each probability's bound
    int modes = 0;             // geometric terms kept
    double cut = 0;            // the smallest stay probability kept
    bool fast_is_a = false;    // which piece played the fast one
};

// Lengths from `first` to L where the proven truncation bound is at most
// `target`; the tallies hold P(A wins), P(B wins), P(tie) of each ordered
// race asked for. `first` is L + 1 when no length qualifies (or the method
// does not apply: equal stay probabilities in the fast piece's zone).
ZoneTail zone_tail(const Option& a, const Option& b, const ZoneChain& ca, const ZoneChain& cb, const DistanceModel& da,
                   const DistanceModel& db, OrderedRaces races, int L, double target);

}  // namespace overshoot::lengths_engine
