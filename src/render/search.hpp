#pragma once
// Renderers for board searches: text, JSON, a scenario file for the best
// board (ready for `tournament` or `certify`), and a drawing of a board with
// its jumps.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "render/svg.hpp"
#include "search/search.hpp"

namespace overshoot::render {

std::string search_text(const SearchResult& r, const SearchSpec& spec);
nlohmann::json search_json(const SearchResult& r, const SearchSpec& spec);

// The board flags that rebuild a board: "--length 100 --jump 97:20".
std::string board_flags(const Board& board, Order order);

// A scenario file (TOML, docs/guide.md) of one board with the options.
std::string scenario_toml(const Board& board, Order order, const std::vector<Option>& options);

// The board drawn as rows of ten squares, snaking; each jump an arrow
// (forward and backward in two colours); `added` jumps drawn bold.
svg::Element board_figure(const Board& board, const std::vector<Jump>& added, const std::string& title);

}  // namespace overshoot::render
