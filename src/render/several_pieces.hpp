#pragma once
// Renderers for races of several pieces, choice games and balancing: text for
// people, JSON for programs. Plain functions of the library's result structs.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "core/board.hpp"
#include "core/option.hpp"
#include "race/choice.hpp"
#include "race/several_pieces.hpp"
#include "race/balance.hpp"

namespace overshoot::render {

// Option names made unique for display: the second 1d6 is "1d6#2".
std::vector<std::string> unique_names(const std::vector<std::string>& names);

nlohmann::json race_board_json(const Board& board, RaceOrder order);

// One race: the pieces' names (as given, made unique here) and start squares.
struct RaceView {
    const Board* board;
    RaceOrder order;
    const std::vector<Option>* options;  // one per piece
    std::vector<int> starts;             // empty = all on 0
    const RaceResult* result;
};

nlohmann::json race_result_json(const RaceResult& r, const std::vector<std::string>& names);
nlohmann::json race_json(const RaceView& v);
std::string race_text(const RaceView& v);

struct ChoiceView {
    const Board* board;
    RaceOrder order;
    const std::vector<Option>* options;
    const ChoiceResult* result;
};

nlohmann::json choice_json(const ChoiceView& v);
std::string choice_text(const ChoiceView& v);

struct BalanceView {
    const Board* board;
    RaceOrder order;
    const std::vector<Option>* options;
    const HeadStartResult* starts = nullptr;
    const LengthsResult* lengths = nullptr;
    const JumpSearchResult* jumps = nullptr;
};

nlohmann::json balance_json(const BalanceView& v);
std::string balance_text(const BalanceView& v);

}  // namespace overshoot::render
