#pragma once
// Renderers for board searches: text, JSON, a scenario file for the best
// board (ready for `tournament` or `certify`), and a drawing of a board with
// its jumps.
#include <nlohmann/json.hpp>
#include <string>
#include <utility>
#include <vector>

#include "render/svg.hpp"
#include "search/search.hpp"

namespace overshoot::render {

std::string search_text(const SearchResult& r, const SearchSpec& spec);
// The report's section of a board search (HTML, id "search"): what was
// searched, the unchanged board, the best board drawn with its jumps and head
// starts, and a table of it and the runners-up with their flags.
std::string search_section_html(const SearchResult& r, const SearchSpec& spec);
nlohmann::json search_json(const SearchResult& r, const SearchSpec& spec);

// The board flags that rebuild a board: "--length 100 --jump 97:20".
std::string board_flags(const Board& board, Order order);
// The head-start flags of one start square per option (0: none):
// " --head-start 2d6:4", naming each option by its spec (as the printed
// commands do) or by its name.
std::string head_start_flags(const std::vector<Option>& options, const std::vector<int>& starts, bool by_spec);

// A scenario file (TOML, docs/guide.md) of one board with the options and
// their head starts (one start square per option; empty: none).
std::string scenario_toml(const Board& board, Order order, const std::vector<Option>& options,
                          const std::vector<int>& starts = {});

// Labels for the start squares of a drawing: (option name, square) of each head start.
std::vector<std::pair<std::string, int>> start_marks(const std::vector<Option>& options, const std::vector<int>& starts);

// The board drawn as rows of ten squares, snaking; each jump an arrow
// (forward and backward in two colours); `added` jumps drawn bold; each
// head start a label on its square.
svg::Element board_figure(const Board& board, const std::vector<Jump>& added, const std::string& title,
                          const std::vector<std::pair<std::string, int>>& marks = {});

}  // namespace overshoot::render
