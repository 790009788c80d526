#include "core/board.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <limits>

#include "core/error.hpp"
#include "core/limits.hpp"
#include "core/numbers.hpp"

namespace overshoot {

bool Board::forward_only() const {
    if (rule == Overshoot::bounce) return false;
    return std::all_of(jumps.begin(), jumps.end(), [](const Jump& j) { return j.to > j.from; });
}

Board make_board(int length, Overshoot rule, std::vector<Jump> jumps) {
    if (length < 1) throw InputError(fmt::format("length {}: a board needs at least 1 square", length));
    if (length > limits::max_length)
        throw LimitError(fmt::format("length {} exceeds the limit of {} squares", length, limits::max_length));
    std::sort(jumps.begin(), jumps.end(), [](const Jump& a, const Jump& b) { return a.from < b.from; });
    Board b;
    b.length = length;
    b.rule = rule;
    std::vector<int> next(static_cast<std::size_t>(length) + 1);
    for (int s = 0; s <= length; ++s) next[s] = s;
    for (std::size_t i = 0; i < jumps.size(); ++i) {
        const Jump& j = jumps[i];
        auto where = fmt::format("jump {}:{}", j.from, j.to);
        if (j.from == 0) throw InputError(where + ": a jump cannot start on square 0 (the start)");
        if (j.from == length) throw InputError(where + ": a jump cannot start on the finish");
        if (j.from < 0 || j.from > length || j.to < 0 || j.to > length)
            throw InputError(fmt::format("{}: outside the board 0..{}", where, length));
        if (j.from == j.to) throw InputError(where + ": a jump must lead to another square");
        if (i > 0 && jumps[i - 1].from == j.from)
            throw InputError(fmt::format("{}: square {} already has a jump", where, j.from));
        next[j.from] = j.to;
    }
    // Follow chains; a chain longer than the number of jumps is a loop.
    b.after_jumps.resize(next.size());
    for (int s = 0; s <= length; ++s) {
        int at = s;
        std::size_t steps = 0;
        while (next[at] != at) {
            at = next[at];
            if (++steps > jumps.size())
                throw InputError(fmt::format("jump {}:{}: the jumps form a loop through square {}", s,
                                             next[s], s));
        }
        b.after_jumps[s] = at;
    }
    b.jumps = std::move(jumps);
    return b;
}

int resolve_start(const Board& board, int start) {
    if (start < 0 || start >= board.length)
        throw InputError(fmt::format("start square {}: must be in 0..{} on a board of length {}", start,
                                     board.length - 1, board.length));
    const int r = board.after_jumps[start];
    if (r >= board.length)
        throw InputError(fmt::format("start square {}: its jump leads straight to the finish", start));
    return r;
}

Board board_from(const Board& board, int from) {
    if (from < 0 || from >= board.length || board.after_jumps[from] != from)
        throw InternalError(fmt::format("board_from: square {} is not a resting square of the board", from));
    std::vector<Jump> shifted;
    for (const Jump& j : board.jumps)
        if (j.from > from) shifted.push_back({j.from - from, j.to - from});
    return make_board(board.length - from, board.rule, std::move(shifted));
}

std::string_view to_string(Overshoot rule) {
    switch (rule) {
        case Overshoot::stay: return "stay";
        case Overshoot::bounce: return "bounce";
        case Overshoot::pass: return "pass";
    }
    return "?";
}

std::string_view to_string(Order order) {
    switch (order) {
        case Order::simultaneous: return "simultaneous";
        case Order::a_first: return "a-first";
        case Order::b_first: return "b-first";
        case Order::coin: return "coin";
    }
    return "?";
}

Overshoot parse_overshoot(std::string_view t) {
    if (t == "stay") return Overshoot::stay;
    if (t == "bounce") return Overshoot::bounce;
    if (t == "pass") return Overshoot::pass;
    throw InputError(fmt::format("overshoot rule '{}': expected stay, bounce or pass", t));
}

Order parse_order(std::string_view t) {
    if (t == "simultaneous") return Order::simultaneous;
    if (t == "a-first") return Order::a_first;
    if (t == "b-first") return Order::b_first;
    if (t == "coin") return Order::coin;
    throw InputError(fmt::format("turn order '{}': expected simultaneous, a-first, b-first or coin", t));
}

Jump parse_jump(std::string_view t) {
    auto colon = t.find(':');
    auto bad = [&] { return InputError(fmt::format("jump '{}': expected FROM:TO with two square numbers", t)); };
    if (colon == std::string_view::npos) throw bad();
    auto num = [&](std::string_view s) {
        const auto v = whole_number(s);
        if (!v || *v < std::numeric_limits<int>::min() || *v > std::numeric_limits<int>::max()) throw bad();
        return static_cast<int>(*v);
    };
    return Jump{num(t.substr(0, colon)), num(t.substr(colon + 1))};
}

}  // namespace overshoot
