#pragma once
// Renderers for sweeps and hunts: text for people, JSON for programs (the
// sweep contract in DESIGN.md), CSV with one row per length and pair.
#include <nlohmann/json.hpp>
#include <string>

#include "hunt/hunt.hpp"
#include "sweep/sweep.hpp"

namespace overshoot::render {

std::string sweep_text(const SweepResult& r);
nlohmann::json sweep_json(const SweepResult& r);
std::string sweep_csv(const SweepResult& r);
// One line when some margin's bound is above the 1e-12 target, else empty:
// the text ends with it; the CLI says it on stderr for the other formats.
std::string sweep_bound_note(const SweepResult& r);
// Who is preferred over which lengths (and by how much), crossovers and cycles.
std::string sweep_markdown(const SweepResult& r);
std::string sweep_latex(const SweepResult& r);

std::string hunt_text(const HuntResult& r, const HuntSpec& spec);
nlohmann::json hunt_json(const HuntResult& r, const HuntSpec& spec);
// One line when some known margin's bound is above the 1e-12 target, else empty.
std::string hunt_bound_note(const HuntResult& r);
std::string hunt_markdown(const HuntResult& r, const HuntSpec& spec);
std::string hunt_latex(const HuntResult& r, const HuntSpec& spec);

// The shard plan of a hunt (`hunt --plan`): one row per shard, then per rank.
std::string hunt_plan_text(const HuntPlan& plan, const HuntSpec& spec, int threads);
nlohmann::json hunt_plan_json(const HuntPlan& plan, const HuntSpec& spec, int threads);
// What each rank spent computing its shards, and the imbalance (largest over mean).
std::string rank_times_text(const std::vector<double>& busy_seconds, const std::vector<std::size_t>& shards,
                            int threads);

}  // namespace overshoot::render
