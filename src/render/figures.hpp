#pragma once
// The three figures, drawn with render/svg: the dominance digraph of a
// tournament, margin against length for every pair of a sweep, and the
// finishing-time distributions of options on one board. Each returns the root
// <svg> element (inline it in HTML, or svg::file() for a stand-alone file).
#include <string>
#include <vector>

#include "chain/profile.hpp"
#include "render/svg.hpp"
#include "sweep/sweep.hpp"
#include "tournament/tournament.hpp"

namespace overshoot::render {

// The palette (docs/report.md): the eight colours of Okabe and Ito's
// colour-universal-design set, in an order of our own; ink and paper tones.
const std::vector<std::string>& palette();
inline constexpr const char* ink = "#22262b";
inline constexpr const char* muted = "#6b7078";
inline constexpr const char* paper = "#fbfaf6";
inline constexpr const char* highlight = "#d55e00";  // the strongest cycle, crossovers

svg::Element digraph_figure(const Tournament& t);

// One variant of a sweep (its index in r.variants).
svg::Element sweep_figure(const SweepResult& r, std::size_t variant = 0);

// names[i] and dist[i] belong together; p_never[i] = P(never finishing).
svg::Element distribution_figure(const std::vector<std::string>& names, const std::vector<Distribution>& dist);

// 1, 2 or 5 times a power of ten, giving about `count` steps over `range` (axis ticks).
double nice_step(double range, int count);

// Shown percentages in figures: two decimals ("12.34%"), "<0.01%" for tiny positive values.
std::string figure_percent(double p);
// Shown margins in figures, in percentage points: "12.34 points" ("<0.01 points"
// for tiny positive ones, never "-0.00"); the number alone for arc labels.
std::string figure_points(double margin);
std::string figure_points_number(double margin);

}  // namespace overshoot::render
