#include "hunt/store.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <filesystem>

#include "core/error.hpp"

namespace overshoot {

namespace {

std::size_t pair_index(std::size_t n, std::size_t i, std::size_t j) {  // i < j
    return i * n - i * (i + 1) / 2 + (j - i - 1);
}

}  // namespace

HuntStore::HuntStore(std::size_t options, std::size_t variants, std::size_t lengths)
    : option_count(options), variant_count(variants), length_count(lengths), pair_count(options * (options - 1) / 2) {
    margin.resize(variant_count * pair_count);
    bound.resize(variant_count * pair_count);
    have.resize(variant_count * pair_count);
    have_count.assign(variant_count * pair_count, 0);
}

std::size_t HuntStore::slot(std::size_t v, std::size_t a, std::size_t b) const { return v * pair_count + pair_index(option_count, a, b); }

bool HuntStore::known(std::size_t v, std::size_t a, std::size_t b, std::size_t k) const {
    const auto& h = have[slot(v, a, b)];
    return !h.empty() && h[k];
}

std::size_t HuntStore::pairs_known() const {
    return static_cast<std::size_t>(std::count(have_count.begin(), have_count.end(), length_count));
}

void HuntStore::put(const CheckpointRecord& r, const std::string& where) {
    if (r.variant >= variant_count || r.a >= r.b || r.b >= option_count || r.first > length_count || r.margin.size() > length_count - r.first ||
        r.bound.size() != r.margin.size())
        throw InputError(fmt::format("{}: a record names a pair or lengths outside this hunt", where));
    const std::size_t s = slot(r.variant, r.a, r.b);
    if (have[s].empty()) {
        margin[s].assign(length_count, 0);
        bound[s].assign(length_count, 0);
        have[s].assign(length_count, 0);
    }
    for (std::size_t k = 0; k < r.margin.size(); ++k) {
        const std::size_t at = r.first + k;
        margin[s][at] = r.margin[k];
        bound[s][at] = r.bound[k];
        if (!have[s][at]) {
            have[s][at] = 1;
            ++have_count[s];
        }
    }
}

void HuntStore::merge(const Checkpoint& c, const std::string& where) {
    for (const auto& r : c.records) put(r, where);
}

Checkpoint HuntStore::checkpoint(std::uint64_t fingerprint) const {
    Checkpoint c;
    c.fingerprint = fingerprint;
    c.lengths = static_cast<std::uint32_t>(length_count);
    for (std::size_t v = 0; v < variant_count; ++v)
        for (std::size_t i = 0; i < option_count; ++i)
            for (std::size_t j = i + 1; j < option_count; ++j) {
                const std::size_t s = slot(v, i, j);
                if (have_count[s] == 0) continue;
                for (std::size_t k = 0; k < length_count;) {
                    if (!have[s][k]) {
                        ++k;
                        continue;
                    }
                    CheckpointRecord r;
                    r.variant = static_cast<std::uint32_t>(v);
                    r.a = static_cast<std::uint32_t>(i);
                    r.b = static_cast<std::uint32_t>(j);
                    r.first = static_cast<std::uint32_t>(k);
                    for (; k < length_count && have[s][k]; ++k) {
                        r.margin.push_back(margin[s][k]);
                        r.bound.push_back(bound[s][k]);
                    }
                    c.records.push_back(std::move(r));
                }
            }
    return c;
}

std::string rank_checkpoint_file(const std::string& checkpoint, int rank) {
    return fmt::format("{}.rank{}", checkpoint, rank);
}

void remove_rank_checkpoint_files(const std::string& checkpoint) {
    if (checkpoint.empty()) return;
    for (const auto& f : rank_checkpoint_files(checkpoint)) std::filesystem::remove(f);
}

std::vector<std::string> rank_checkpoint_files(const std::string& checkpoint) {
    namespace fs = std::filesystem;
    const fs::path p(checkpoint);
    const fs::path dir = p.has_parent_path() ? p.parent_path() : fs::path(".");
    const std::string stem = p.filename().string() + ".rank";
    std::vector<std::pair<long, std::string>> found;
    std::error_code ec;
    for (fs::directory_iterator it(dir, ec), end; !ec && it != end; it.increment(ec)) {
        const std::string name = it->path().filename().string();
        if (name.size() <= stem.size() || name.compare(0, stem.size(), stem) != 0) continue;
        const std::string digits = name.substr(stem.size());
        if (digits.size() > 6 || !std::all_of(digits.begin(), digits.end(), [](char ch) { return ch >= '0' && ch <= '9'; }))
            continue;
        found.emplace_back(std::stol(digits), (dir / name).string());
    }
    std::sort(found.begin(), found.end());
    std::vector<std::string> out;
    for (auto& f : found) out.push_back(std::move(f.second));
    return out;
}

HuntStore load_hunt_store(const HuntSpec& spec) {
    HuntStore st(spec.options.size(), spec.variants.size(), spec.grid.lengths().size());
    if (!spec.resume) return st;
    const std::uint64_t fp = hunt_fingerprint(spec);
    std::vector<std::string> files;
    if (std::filesystem::exists(spec.checkpoint)) files.push_back(spec.checkpoint);
    for (auto& f : rank_checkpoint_files(spec.checkpoint)) files.push_back(f);
    if (files.empty()) load_checkpoint(spec.checkpoint);  // throws the usual "cannot read" line
    for (const auto& f : files) {
        Checkpoint c = load_checkpoint(f);
        if (c.fingerprint != fp || c.lengths != st.length_count)
            throw InputError(fmt::format("{}: this checkpoint belongs to a different hunt (options, lengths, rules or "
                                         "method differ)",
                                         f));
        st.merge(c, f);
    }
    return st;
}

}  // namespace overshoot
