#pragma once
// Command-line arguments checked in our own words. CLI11's validators (Range,
// IsMember, NonNegativeNumber) do the checking underneath; every refusal names
// the flag, the value and the limit it broke. One whole-number parser and one
// LO..HI parser serve every command.
#include <CLI/CLI.hpp>
#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "core/numbers.hpp"

namespace overshoot::cli {

// whole_number and number_range (core/numbers.hpp) read every number.

// Validators: a whole number in lo..hi; a range LO..HI with lo <= LO <= HI <= hi;
// a real number in [lo, hi] (or (lo, hi) when `open`); one of `words`.
CLI::Validator whole_in(long long lo, long long hi);
CLI::Validator range_in(long long lo, long long hi);
CLI::Validator real_in(double lo, double hi, bool open = false);
CLI::Validator one_of(std::vector<std::string> words);

// An already validated LO..HI text as ints; throws InputError naming `what` otherwise.
std::pair<int, int> parse_range(const std::string& text, const char* what);

// --memory-limit MIB: one flag and one check (1 MiB to 2^43 MiB, so the shift
// to bytes never wraps); apply sets the cap when the flag was given.
CLI::Option* add_memory_limit(CLI::App& cmd, std::optional<long long>& mib);
void apply_memory_limit(const std::optional<long long>& mib);

// A CLI11 parse error in our words: which flag, what was wrong, the limit.
std::string in_our_words(const CLI::ParseError& e);

// The closest known word to `word` (edit distance at most 2), or "".
std::string closest(const std::string& word, const std::vector<std::string>& known);

}  // namespace overshoot::cli
