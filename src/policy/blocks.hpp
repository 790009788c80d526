#pragma once
// The squares of one side of a policy problem cut into blocks: the strongly
// connected components of the graph of every move of every option of its
// menu (Boost.Graph), listed sinks first. States of two pieces are solved
// block by block (a block of A times a block of B), each after every block it
// can move to: on a board where pieces never move backward every block is one
// square and the order is the backward sweep; elsewhere (the rule bounce, a
// backward jump) a block of several squares holds a loop and is iterated
// (docs/policy.md).
#include <vector>

#include "chain/chain.hpp"

namespace overshoot {

struct SquareBlocks {
    std::vector<int>
        squares;  // every live square: block by block, sinks first, squares descending within a block
    std::vector<int> start;  // block k is squares[start[k] .. start[k + 1])
    int count() const { return static_cast<int>(start.size()) - 1; }
    int size(int k) const { return start[k + 1] - start[k]; }
    bool single(int k) const { return size(k) == 1; }
    // Most blocks one piece passes through: the number of blocks.
};

// One block per square, descending, when the menu never moves backward.
SquareBlocks square_blocks(const std::vector<Chain>& menu);

}  // namespace overshoot
