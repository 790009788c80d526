#pragma once
// Duels from the board and the two options, for boards of any length: on a
// long board where pieces never move backward the two pieces usually finish
// in windows of turns that lie apart (the faster piece is finished or stuck
// for good before the slower can possibly arrive). Then the duel is closed by
// each piece's absorption from its start, in time linear in the length and
// with no chain stored (method `separated`, docs/method.md section 4.7);
// otherwise the chains are built and duel() runs as before.
#include <optional>

#include "core/board.hpp"
#include "core/option.hpp"
#include "race/duel.hpp"

namespace overshoot {

// The separated duel, or null when the board is not forward-only or the
// windows cannot be proven apart (each within 1e-16). Starts are as given
// (resolve_start is applied).
std::optional<DuelResult> separated_duel(const Board& board, const Option& a, const Option& b, int start_a,
                                         int start_b, const DuelSettings& settings = {});

// duel() from the board: `separated` when asked for (InputError when it does
// not apply) or under `auto` when it applies and the board is too long for
// the whole pair programme; otherwise builds the two chains and calls duel().
DuelResult duel_on_board(const Board& board, const Option& a, const Option& b, int start_a, int start_b,
                         Order order, const DuelSettings& settings = {});

}  // namespace overshoot
