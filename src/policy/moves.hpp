#pragma once
// One option's moves in the number type of a policy computation: long double
// for the fast programmes, exact fractions (GMP) for --exact. A square's turn
// either stays on it (`stay`) or goes to a later square or the finish.
#include <gmpxx.h>

#include <cstdint>
#include <vector>

#include "chain/chain.hpp"

namespace overshoot {

template <class T>
struct Moves {
    int length = 0;
    std::vector<std::int64_t> start;  // size length + 1
    std::vector<int> dest;            // never the square itself; `length` is the finish
    std::vector<T> p;
    std::vector<T> stay, leave;       // leave = 1 - stay, formed from integers
    std::vector<T> finish, unfinished;  // P(reach the finish this turn) and its complement
    std::vector<char> resting;          // 0 on jump sources
};

template <class T>
Moves<T> make_moves(const Chain& chain);

// Options of a menu as moves, in menu order.
template <class T>
std::vector<Moves<T>> make_menu(const std::vector<Chain>& chains) {
    std::vector<Moves<T>> out;
    out.reserve(chains.size());
    for (const auto& c : chains) out.push_back(make_moves<T>(c));
    return out;
}

}  // namespace overshoot
