#pragma once
// The overshoot library for other programs: boards and options from spec
// strings and scenario files, chains, profiles, duels and tournaments. Needs
// only the standard library; link overshoot::overshoot (CMake) or
// `pkg-config --libs overshoot`. The exact (GMP) and rendering (nlohmann-json)
// headers are installed beside it for programs that have those libraries
// (docs/library.md).
#include "chain/chain.hpp"
#include "chain/profile.hpp"
#include "core/board.hpp"
#include "core/error.hpp"
#include "core/limits.hpp"
#include "core/option.hpp"
#include "core/scenario.hpp"
#include "core/setup.hpp"
#include "race/duel.hpp"
#include "tournament/tournament.hpp"
