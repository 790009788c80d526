#pragma once
// Families by constraint (docs/sweep.md, "Families"): keyword items that
// enumerate options instead of listing them.
//
//   dice(count=C, sides=S)                       the sum of C fair S-sided dice (NdS),
//                                                every C with every S; counts outer
//   custom(faces=F, values=V [, sum=X | mean=M] [, count=C])
//                                                every fair die with F faces, each face
//                                                a value of V (0 allowed: a turn spent
//                                                in place), faces summing to X or with
//                                                mean M; with count, the sum of C copies
//   spinner(sectors=K, moves=V [, sum=X | mean=M] [, count=C])
//                                                the same for spinners with K equal
//                                                sectors, each labelled with a move of V
//
// A value list is numbers and ranges separated by commas: "4,6,8", "1..6",
// "0..3,6". A comma followed by a number continues the list of the key
// before it, so "sides=4,6,8, count=1..3" is two keys. M is a whole number,
// a fraction "7/2" or a decimal "3.5". A die is a multiset of faces, so each
// is listed once with its faces in ascending order, named by its spec
// ("[0,3,3,5]", "2[0,3,3,5]").
#include <cstddef>
#include <cstdint>
#include <optional>
#include <string_view>
#include <vector>

#include "core/option.hpp"

namespace overshoot {

// The options of one keyword item, or nullopt when `item` is not a keyword
// item (then it is something else: a spec, a file). Throws InputError naming
// the item and the problem, and LimitError (before enumerating) when the item
// would make more than `cap` options, with the number it would make.
std::optional<std::vector<Option>> expand_keyword_item(std::string_view item, std::size_t cap);

// Number of multisets of `faces` values taken from the sorted distinct
// `values` whose sum is `sum` (any sum when nullopt), saturating at 2^62.
std::uint64_t count_multisets(int faces, const std::vector<int>& values, std::optional<long long> sum);

// Removes options equal as distributions to an earlier one (same weights over
// the same denominator), keeping the first. Returns how many were removed.
std::size_t merge_equal_options(std::vector<Option>& options);

}  // namespace overshoot
