#pragma once
// Renderers for sweeps and hunts: text for people, JSON for programs (the
// sweep contract in DESIGN.md), CSV with one row per length and pair.
#include <nlohmann/json.hpp>
#include <string>

#include "sweep/hunt.hpp"
#include "sweep/sweep.hpp"

namespace overshoot::render {

std::string sweep_text(const SweepResult& r);
nlohmann::json sweep_json(const SweepResult& r);
std::string sweep_csv(const SweepResult& r);

std::string hunt_text(const HuntResult& r, const HuntSpec& spec);
nlohmann::json hunt_json(const HuntResult& r, const HuntSpec& spec);

}  // namespace overshoot::render
