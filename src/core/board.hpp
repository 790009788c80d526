#pragma once
// The board: squares 0..length, the overshoot rule and the jumps. Plain data;
// make_board validates and precomputes where each square finally leads.
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace overshoot {

enum class Overshoot { stay, bounce, pass };
enum class Order { simultaneous, a_first, b_first, coin };

struct Jump {
    int from = 0;
    int to = 0;
    bool operator==(const Jump&) const = default;
};

struct Board {
    int length = 0;
    Overshoot rule = Overshoot::stay;
    std::vector<Jump> jumps;   // as given (sorted by `from`)
    std::vector<int> after_jumps;  // after_jumps[s]: the square reached after following jumps from s

    // True when no piece can ever move toward the start: no backward jump and a
    // rule other than bounce. Such boards admit the time-free pair programme.
    bool forward_only() const;
    bool has_jumps() const { return !jumps.empty(); }
};

// Validates: 1 <= length <= limits::max_length; each jump inside 1..length-1 as
// `from`, 0..length as `to`, from != to, one jump per square, no loop.
Board make_board(int length, Overshoot rule, std::vector<Jump> jumps);

// Validates a start square for `board` (0..length-1, not a jump into the finish)
// and returns where the piece actually rests: a start on a jump source takes
// the jump at once. Throws InputError.
int resolve_start(const Board& board, int start);

// The board seen from square `from` onward, renumbered to start on 0: length
// `length - from`, the jumps whose source lies past `from`, shifted. On a board
// where pieces never move backward a piece on `from` or beyond lives on it
// exactly. `from` must not be a jump source.
Board board_from(const Board& board, int from);

std::string_view to_string(Overshoot rule);
std::string_view to_string(Order order);
Overshoot parse_overshoot(std::string_view text);  // throws InputError
Order parse_order(std::string_view text);          // throws InputError
Jump parse_jump(std::string_view text);            // "FROM:TO", throws InputError

}  // namespace overshoot
