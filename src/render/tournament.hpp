#pragma once
// Renderers for tournaments: text for people, JSON for programs (the contract
// in DESIGN.md), Markdown, LaTeX (booktabs), CSV (the --matrix format, so a
// matrix can be written and read back) and DOT for Graphviz.
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

#include "core/board.hpp"
#include "core/option.hpp"
#include "tournament/tournament.hpp"

namespace overshoot::render {

// Where the matrix came from: a board (races) or a matrix file.
struct TournamentSource {
    std::optional<Board> board;
    Order order = Order::simultaneous;
    std::vector<Option> options;  // with a board: the options raced
    std::vector<int> starts;      // with a board: one start square per option (empty: all on 0)
    std::string matrix_file;      // with --matrix
    double tolerance = 0;         // with --matrix
};

std::string tournament_text(const Tournament& t, const TournamentSource& src);
nlohmann::json tournament_json(const Tournament& t, const TournamentSource& src);
std::string tournament_markdown(const Tournament& t, const TournamentSource& src);
std::string tournament_latex(const Tournament& t, const TournamentSource& src);
std::string tournament_csv(const Tournament& t);
std::string tournament_dot(const Tournament& t, const TournamentSource& src);

}  // namespace overshoot::render
