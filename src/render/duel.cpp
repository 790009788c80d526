#include "render/duel.hpp"

#include <fmt/format.h>

#include <array>
#include <cmath>

#include "core/fraction.hpp"
#include "render/document.hpp"
#include "render/exact.hpp"
#include "render/format.hpp"

namespace overshoot::render {

namespace {

enum class Verdict { a_beats_b, b_beats_a, even, undecided };

// The four outcomes of a duel in the order every format lists them: the label,
// the probability and, when exact values are given, the fraction.
struct OutcomeRow {
    std::string what;
    long double p;
    const mpq_class* exact;
};

std::array<OutcomeRow, 4> outcome_rows(const std::string& na, const std::string& nb, const DuelResult& r,
                                       const ExactDuel* exact) {
    return {{{na + " wins", r.p_a_wins, exact ? &exact->p_a_wins : nullptr},
             {nb + " wins", r.p_b_wins, exact ? &exact->p_b_wins : nullptr},
             {"tie (shared finish)", r.p_tie, exact ? &exact->p_tie : nullptr},
             {"neither finishes", r.p_neither, exact ? &exact->p_neither : nullptr}}};
}

// How the margin's sign is known: from exact fractions, from symmetry (the
// same option in both seats of a symmetric turn order), or from the bound.
struct Reading {
    Verdict verdict = Verdict::undecided;
    const char* basis = "bound";  // "exact", "symmetry" or "bound"
};

Reading read(Order order, const Option& a, const Option& b, const DuelResult& r, const std::vector<int>& starts, const ExactDuel* exact) {
    if (exact) {
        const int s = sgn(exact->margin());
        return {s > 0 ? Verdict::a_beats_b : s < 0 ? Verdict::b_beats_a : Verdict::even, "exact"};
    }
    // Simultaneous and coin turns treat the seats alike, so one option against
    // itself has P(A wins) = P(B wins) exactly; the alternating orders do not.
    const bool same_start = starts.size() < 2 || starts[0] == starts[1];
    if (a.spec == b.spec && same_start && (order == Order::simultaneous || order == Order::coin))
        return {Verdict::even, "symmetry"};
    if (r.a_beats_b()) return {Verdict::a_beats_b, "bound"};
    if (r.b_beats_a()) return {Verdict::b_beats_a, "bound"};
    return {Verdict::undecided, "bound"};
}

const char* verdict_key(Verdict v) {
    switch (v) {
        case Verdict::a_beats_b: return "a_beats_b";
        case Verdict::b_beats_a: return "b_beats_a";
        case Verdict::even: return "even";
        case Verdict::undecided: return "undecided";
    }
    return "undecided";
}

// The verdict in one sentence (no final newline); names as shown.
std::string verdict_sentence(const std::string& a, const std::string& b, const DuelResult& r, const Reading& k,
                             Order order) {
    const double m = r.margin();
    switch (k.verdict) {
        case Verdict::a_beats_b:
            return fmt::format("{} beats {} by {} of probability{}.", a, b, points(m),
                               std::string(k.basis) == "exact" ? " (the exact margin is positive)" : "");
        case Verdict::b_beats_a:
            return fmt::format("{} beats {} by {} of probability{}.", b, a, points(-m),
                               std::string(k.basis) == "exact" ? " (the exact margin is negative)" : "");
        case Verdict::even:
            return std::string(k.basis) == "exact"
                       ? fmt::format("{} and {} are even: the exact margin is 0.", a, b)
                       : fmt::format("{} and {} are even: the same option in both seats, and {} turns treat the seats "
                                     "alike, so the margin is 0.",
                                     a, b, to_string(order));
        case Verdict::undecided: break;
    }
    return fmt::format("{} and {} are undecided: the margin {} is within the error bound.", a, b, points(m));
}

std::string bound_words(const DuelResult& r) {
    return r.bound_proven ? (r.target_met ? "proven" : "proven, target not reached within the work limit")
                          : "estimated, not proven";
}

}  // namespace

std::string duel_text(const Board& board, Order order, const Option& a, const Option& b, const DuelResult& r,
                      const std::vector<int>& starts, const ExactDuel* exact) {
    const auto [na, nb] = seat_names(a.name, b.name);
    std::string out = describe(board, order) + "\n";
    if (any_head_start(starts)) out += head_starts_text({a.name, b.name}, starts) + "\n";
    out += "\n";
    std::vector<std::vector<std::string>> rows;
    for (const OutcomeRow& o : outcome_rows(na, nb, r, nullptr)) rows.push_back({o.what, percent(static_cast<double>(o.p))});
    out += table({"outcome", "probability"}, rows);
    out += "\n" + verdict_sentence(na, nb, r, read(order, a, b, r, starts, exact), order) + "\n";
    out += fmt::format("error bound on the margin: {:.2g} ({}, method {})\n", r.error_bound(), bound_words(r), to_string(r.method));
    if (std::isfinite(r.mean_rounds))
        out += fmt::format("race length: mean {:.3f} rounds to the first finish, median {}\n", r.mean_rounds,
                           r.median_resolved ? optional_int(r.median_rounds) : "unresolved");
    else
        out += "race length: no piece can ever finish\n";
    if (r.error_bound() > 1e-12)
        out += fmt::format("note: the target bound 1e-12 was not reached; {:.2g} is the bound proven.\n",
                           r.error_bound());
    if (exact) out += exact_duel_text(na, nb, *exact);
    return out;
}

nlohmann::json duel_json(const Board& board, Order order, const Option& a, const Option& b, const DuelResult& r,
                         const std::vector<int>& starts, const ExactDuel* exact) {
    nlohmann::json j = document("duel", 1);
    j["board"] = board_json(board, order);
    if (any_head_start(starts)) j["board"]["head_starts"] = head_starts_json({a.name, b.name}, starts);
    j["a"] = {{"name", a.name}, {"spec", a.spec}};
    j["b"] = {{"name", b.name}, {"spec", b.spec}};
    j["p_a_wins"] = static_cast<double>(r.p_a_wins);
    j["p_b_wins"] = static_cast<double>(r.p_b_wins);
    j["p_tie"] = static_cast<double>(r.p_tie);
    j["p_neither"] = static_cast<double>(r.p_neither);
    j["margin"] = r.margin();
    j["error_bound"] = r.error_bound();
    j["probability_error_bound"] = static_cast<double>(r.bound);
    j["bound_proven"] = r.bound_proven;
    j["target_met"] = r.target_met;
    j["method"] = to_string(r.method);
    const Reading k = read(order, a, b, r, starts, exact);
    j["verdict"] = verdict_key(k.verdict);
    j["verdict_basis"] = k.basis;
    j["mean_rounds"] = number_or_null(r.mean_rounds);
    j["median_rounds"] = r.median_resolved ? number_or_null(r.median_rounds) : nlohmann::json(nullptr);
    j["median_resolved"] = r.median_resolved;
    if (exact) j["exact"] = exact_duel_json(*exact);
    return j;
}

std::string duel_markdown(const Board& board, Order order, const Option& a, const Option& b, const DuelResult& r,
                          const std::vector<int>& starts, const ExactDuel* exact) {
    const auto [na, nb] = seat_names(a.name, b.name);
    std::string out = md_escape(describe(board, order)) + "\n\n";
    if (any_head_start(starts)) out += md_escape(head_starts_text({a.name, b.name}, starts)) + "\n\n";
    out += exact ? "| outcome | probability | exact |\n|---|---:|---:|\n" : "| outcome | probability |\n|---|---:|\n";
    for (const OutcomeRow& o : outcome_rows(na, nb, r, exact)) {
        out += fmt::format("| {} | {} |", md_escape(o.what), percent(static_cast<double>(o.p)));
        if (o.exact) out += " " + fraction_string(*o.exact) + " |";
        out += "\n";
    }
    out += "\n" + md_escape(verdict_sentence(na, nb, r, read(order, a, b, r, starts, exact), order)) + "\n";
    out += fmt::format("\nError bound on the margin: {:.2g} ({}, method {}).\n", r.error_bound(), bound_words(r),
                       md_escape(std::string(to_string(r.method))));
    return out;
}

std::string duel_latex(const Board& board, Order order, const Option& a, const Option& b, const DuelResult& r,
                       const std::vector<int>& starts, const ExactDuel* exact) {
    const auto [na, nb] = seat_names(a.name, b.name);
    std::string out = "% " + describe(board, order) + "\n";
    if (any_head_start(starts)) out += "% " + head_starts_text({a.name, b.name}, starts) + "\n";
    out += "% needs \\usepackage{booktabs}\n";
    out += exact ? "\\begin{tabular}{lrl}\n\\toprule\noutcome & probability & exact \\\\\n\\midrule\n"
                 : "\\begin{tabular}{lr}\n\\toprule\noutcome & probability \\\\\n\\midrule\n";
    for (const OutcomeRow& o : outcome_rows(na, nb, r, exact)) {
        out += fmt::format("{} & {:.4f}\\%", latex_escape(o.what), 100 * static_cast<double>(o.p));
        if (o.exact) out += " & $" + fraction_string(*o.exact) + "$";
        out += " \\\\\n";
    }
    out += "\\bottomrule\n\\end{tabular}\n\n";
    out += latex_escape(verdict_sentence(na, nb, r, read(order, a, b, r, starts, exact), order)) + "\n";
    out += fmt::format("% error bound on the margin: {:.2g} ({}, method {})\n", r.error_bound(), bound_words(r), to_string(r.method));
    return out;
}

}  // namespace overshoot::render
