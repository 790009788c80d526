#pragma once
// Races of several pieces (2 to 6) on one board, each with its own option and
// start square, in simultaneous or seated order, with a proven error bound.
// Method (docs/races.md): per-piece series combined round by round, closed on
// forward-only boards by a time-free programme over tuples of end-zone squares.
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "chain/chain.hpp"
#include "core/board.hpp"

namespace overshoot {

inline constexpr int max_race_pieces = 6;

// The shared Order enum is about duels; races of k pieces have their own.
enum class RaceOrder {
    simultaneous,  // every piece moves each round; same-round finishers share the finish
    seated,        // pieces move one after another in listed order; the first to land wins
};

RaceOrder parse_race_order(std::string_view text);  // throws InputError
std::string_view to_string(RaceOrder order);

enum class RaceMethod {
    series,       // the per-turn series alone
    series_zone,  // the series, closed by the end-zone programme (two pieces)
};
std::string_view to_string(RaceMethod m);  // "series", "series+zone"

struct RaceSettings {
    long double target = 1e-14L;       // the series stops once the unresolved mass is below this
    long double wanted = 1e-12L;       // target_met is false when the proven bound exceeds this
    std::uint64_t work_limit = 2'000'000'000ULL;     // transitions the series may apply
    std::uint64_t closure_limit = 300'000'000ULL;    // operations the zone programme may cost
    bool allow_closure = true;
};

struct RaceResult {
    int pieces = 0;
    std::vector<long double> p_wins;    // piece i finishes first, alone
    std::vector<long double> p_shares;  // piece i is among two or more first finishers
    // p_shared[mask]: the first finish is shared by exactly the pieces in mask
    // (bit i = piece i); nonzero only for masks of two or more pieces.
    std::vector<long double> p_shared;
    long double p_tie = 0;      // the first finish is shared (sum of p_shared)
    long double p_neither = 0;  // nobody ever finishes
    // Each probability lies within `bound` of its true value (proven).
    long double bound = 0;
    bool target_met = true;  // bound <= settings.wanted
    RaceMethod method = RaceMethod::series;
    int rounds = 0;          // rounds of the per-turn series
};

// chains: one per piece, all on the same board; starts: one start square per
// piece (empty = all on 0). A start square that is a jump source takes the jump.
RaceResult race(const std::vector<const Chain*>& chains, const std::vector<int>& starts, RaceOrder order,
                const RaceSettings& settings = {});

// The recorded series of one piece: f[t] = P(T = t+1), alive[t] / stuck[t] the
// mass after t+1 turns. Recorded until the live mass is below `threshold` or
// the turn cap; used to combine many races of the same pieces cheaply.
struct PieceTrack {
    std::vector<long double> f, alive, stuck;
    long double rounding = 0;
    bool complete = false;  // live mass at the end is below the threshold
};

PieceTrack record_track(const Chain& chain, int start, long double threshold, int max_turns);

// Combines recorded tracks into one race, stopping once the unresolved mass is
// below `target` / 16. Returns nothing when the proven bound would exceed
// `accept` (the caller then runs race()).
std::optional<RaceResult> race_from_tracks(const std::vector<const PieceTrack*>& tracks, RaceOrder order,
                                           long double target, long double accept);

// Many races of the same options on one board (choice games, balancing):
// chains and tracks are built once per option and start square.
class RaceCache {
public:
    RaceCache(const Board& board, const std::vector<const Chain*>& chains, RaceOrder order,
              const RaceSettings& settings = {});
    // picks: option index per piece; starts: start square per piece (empty = 0).
    RaceResult run(const std::vector<int>& picks, const std::vector<int>& starts = {});
    const PieceTrack& track(int option, int start);
    const Board& board() const { return *board_; }
    RaceOrder order() const { return order_; }
    std::uint64_t full_races() const { return full_races_; }

private:
    const Board* board_;
    std::vector<const Chain*> chains_;
    RaceOrder order_;
    RaceSettings settings_;
    std::vector<std::vector<std::optional<PieceTrack>>> tracks_;  // [option][start]
    std::uint64_t full_races_ = 0;
};

}  // namespace overshoot
